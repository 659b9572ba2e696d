package figure

import (
	"cmp"
	"fmt"
	"math"
	"strconv"
)

// rateLayout is where the false-positive check of NullPanels goes, in
// pixels from the top left.
type rateLayout struct {
	heading        []string
	headY          float64 // baseline of the heading's first line
	alphaY         float64 // baseline of the level's label
	rowsTop        float64
	nameX, x0, x1  float64 // names start at nameX; the rate axis runs x0 to x1
	detailX        float64
	names, details []string // shortened to fit
	max            float64  // the rate at x1
	alpha          float64
	axisY          float64
}

// rateHeadLineH is the height of a line of the check's heading, which
// wraps to two lines at most.
const rateHeadLineH = 20.0

// rateHeight is the height the check takes, from the gap above its
// heading to the label of its axis.
func rateHeight(ff *fontFaces, w float64, rates []RateRow, opt NullOptions) float64 {
	lines := len(ff.wrap(cmp.Or(opt.CheckTitle, "False-positive check"), true, 15, w-2*margin, 2))
	return 28 + 22 + 18 + float64(lines-1)*rateHeadLineH + float64(len(rates))*rateRowH + rateAxisH
}

// x maps a rate to its position on the check's axis.
func (R rateLayout) x(v float64) float64 { return R.x0 + v/R.max*(R.x1-R.x0) }

// layoutRates places the check from top down in a picture w pixels wide:
// names on the left, details on the right, the rate axis between them,
// reaching past the highest interval and at least to twice the level.
func layoutRates(ff *fontFaces, w, top float64, rates []RateRow, opt NullOptions) (rateLayout, error) {
	R := rateLayout{alpha: cmp.Or(opt.Alpha, 0.05), nameX: margin}
	R.heading = ff.wrap(cmp.Or(opt.CheckTitle, "False-positive check"), true, 15, w-2*margin, 2)
	R.headY = top + 16
	top += float64(len(R.heading)-1) * rateHeadLineH
	R.alphaY = top + 22 + 14
	R.rowsTop = top + 22 + 18
	nameW, detailW := 0.0, 0.0
	R.max = 2 * R.alpha
	for _, r := range rates {
		name := ff.ellipsize(r.Name, false, labelSize, 0.28*w)
		detail := ff.ellipsize(r.Detail, r.Unsound, labelSize, 0.36*w)
		R.names, R.details = append(R.names, name), append(R.details, detail)
		nameW = math.Max(nameW, ff.width(false, labelSize, name))
		detailW = math.Max(detailW, ff.width(r.Unsound, labelSize, detail))
		R.max = math.Max(R.max, r.Interval[1])
	}
	R.max = math.Min(R.max*1.08, 1)
	R.x0 = R.nameX + nameW + 16
	R.x1 = w - margin - detailW - 16
	R.detailX = R.x1 + 16
	R.axisY = R.rowsTop + float64(len(rates))*rateRowH + 6
	if R.x1-R.x0 < 120 {
		return R, fmt.Errorf("plot: a picture %d pixels wide leaves too little room for the false-positive check", int(w))
	}
	return R, nil
}

// drawRates draws the false-positive check: its heading, the dashed line
// at the level, one row per test (interval bar, point, name and detail,
// in the warning colour when unsound) and the axis of rates in percent.
func drawRates(cv canvas, ff *fontFaces, R rateLayout, rates []RateRow, opt NullOptions) {
	for k, line := range R.heading {
		cv.text(margin, R.headY+float64(k)*rateHeadLineH, line, 15, true, inkTitle, anchorStart)
	}
	ax := R.x(R.alpha)
	openPart(cv, "alpha", "value", dataNum(R.alpha))
	for y := R.rowsTop - 2; y < R.axisY; y += 7 {
		cv.line(ax, y, ax, math.Min(y+4, R.axisY), 1.2, axisInk)
	}
	cv.text(ax+5, R.alphaY, "α = "+formatPercent(R.alpha), 12, false, axisInk, anchorStart)
	closePart(cv)
	for k, r := range rates {
		cy := R.rowsTop + float64(k)*rateRowH + rateRowH/2
		ink := rateInk
		if r.Unsound {
			ink = warnInk
		}
		openPart(cv, "rate", "scheme", r.Name, "rate", dataNum(r.Rate), "low", dataNum(r.Interval[0]),
			"high", dataNum(r.Interval[1]), "unsound", strconv.FormatBool(r.Unsound))
		cv.text(R.nameX, cy+4.5, R.names[k], labelSize, false, inkText, anchorStart)
		lo, hi := R.x(r.Interval[0]), R.x(r.Interval[1])
		cv.line(lo, cy, hi, cy, 3, ink)
		cv.line(lo, cy-5, lo, cy+5, 1.5, ink)
		cv.line(hi, cy-5, hi, cy+5, 1.5, ink)
		cv.circle(R.x(r.Rate), cy, 5, style{fill: ink, stroke: white, strokeW: 1.2})
		cv.text(R.detailX, cy+4.5, R.details[k], labelSize, r.Unsound, ink, anchorStart)
		closePart(cv)
	}
	cv.line(R.x0, R.axisY, R.x1, R.axisY, 1, axisInk)
	openPart(cv, "rate-axis")
	drawTicks(cv, R.axisY, 0, 100*R.max, func(v float64) float64 { return R.x(v / 100) }, "%")
	closePart(cv)
	label := cmp.Or(opt.CheckLabel, "share of true nulls called significant")
	cv.text((R.x0+R.x1)/2, R.axisY+44, ff.ellipsize(label, false, 14, R.x1-R.x0), 14, false, axisInk, anchorMiddle)
}

// formatPercent writes a share as a percentage with at most one decimal.
func formatPercent(v float64) string {
	return strconv.FormatFloat(math.Round(v*1000)/10, 'f', -1, 64) + "%"
}
