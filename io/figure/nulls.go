package figure

import (
	"cmp"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"

	"github.com/areatest/areatest/internal/numtext"
)

// NullPanel is one null distribution of NullPanels: the values a
// statistic took under one null model.
type NullPanel struct {
	// Name names the null model, e.g. "free" or "spectral surrogates".
	Name string
	// Detail is written after the name, e.g. "p = 0.0004 · 9,999 draws".
	Detail string
	// Null holds the statistic's null values, each counted once (an exact
	// enumeration gives one value per equally likely arrangement). NaN
	// values are left out.
	Null []float64
}

// RateRow is one row of the false-positive check of NullPanels: the share
// of true nulls a test called significant, with its interval.
type RateRow struct {
	// Name names the test; Detail is written to the right of its row,
	// e.g. "27% (23–31%) of 500".
	Name, Detail string
	// Rate and Interval are shares, 0 to 1.
	Rate     float64
	Interval [2]float64
	// Unsound marks a row whose rate lies above the level: it is drawn in
	// the warning colour.
	Unsound bool
}

// NullOptions set the frame of NullPanels. XLabel names the statistic and
// its units; Height 0 sizes the picture from its panels.
type NullOptions struct {
	ChartOptions
	// Alpha is the level of the check's reference line (0: 0.05).
	Alpha float64
	// CheckTitle heads the false-positive check, CheckLabel labels its
	// axis; empty ones get a plain default.
	CheckTitle, CheckLabel string
}

// The false-positive check is drawn in a slate blue for a sound rate and a
// warning vermilion for an unsound one: cool against warm, so the two stay
// apart under the common forms of colour-blindness and in greyscale (the
// vermilion is the lighter); the row's own text says it in words too.
var (
	rateInk = rgb(0x3b, 0x55, 0x8c)
	warnInk = rgb(0xc4, 0x3e, 0x1c)
	gridInk = rgb(0xe4, 0xe4, 0xe4)
)

// NullPanels draws the null distributions of one statistic under several
// null models, one histogram per panel, stacked on a shared axis of the
// statistic with the same bins in every panel (chosen from all the values
// and the observed one), and the observed value as a line across all the
// panels: a narrow null that the line falls far outside of beside a wide
// one that holds it shows at a glance why the p-values differ. Each panel
// counts its own draws, so its bars reach the same height whatever its
// number of draws. When rates are given, the false-positive check follows
// below: each rate as a point with its 95% interval as a bar, and a dashed
// line at the level α. In SVG, the parts carry classes (panel, bar,
// observed, x-axis, rate, alpha) and data attributes with what they stand
// for, so that a page or a test can find them.
func NullPanels(w io.Writer, f Format, panels []NullPanel, observed float64, rates []RateRow, opt NullOptions) error {
	if err := f.check(); err != nil {
		return err
	}
	if err := checkNullInput(panels, observed, rates, opt); err != nil {
		return err
	}
	ff, err := loadFonts()
	if err != nil {
		return err
	}
	bins, err := binNulls(panels, observed)
	if err != nil {
		return err
	}
	L, err := layoutNulls(ff, opt, bins, rates)
	if err != nil {
		return err
	}
	var cv canvas
	if f == SVG {
		cv = newSVGCanvas(w, int(L.w), int(L.h))
	} else {
		cv = newRasterCanvas(w, int(L.w), int(L.h), ff)
	}
	cv.rect(0, 0, L.w, L.h, style{fill: white})
	putLines(cv, L.text.head())
	for p := range panels {
		openPart(cv, "panel", "scheme", panels[p].Name, "draws", strconv.Itoa(bins.drawn[p]))
		drawPanelBars(cv, L, bins, p)
		closePart(cv)
	}
	drawObserved(cv, L, observed)
	for p := range panels {
		// Over the observed line, on white: names and p-values stay legible
		// wherever the line falls.
		drawPanelLabel(cv, ff, L.x0, L.x1, L.tops[p], panels[p])
	}
	drawValueAxis(cv, ff, L, cmp.Or(opt.XLabel, "statistic"))
	if len(rates) > 0 {
		drawRates(cv, ff, L.rates, rates, opt)
	}
	putLines(cv, L.text.foot(L.h))
	return cv.finish()
}

// checkNullInput refuses what NullPanels cannot draw, before any work.
func checkNullInput(panels []NullPanel, observed float64, rates []RateRow, opt NullOptions) error {
	if len(panels) == 0 {
		return errors.New("plot: no null distribution to draw")
	}
	if math.IsNaN(observed) || math.IsInf(observed, 0) {
		return fmt.Errorf("plot: the observed value must be a finite number, got %v", observed)
	}
	if a := opt.Alpha; a < 0 || a >= 1 {
		return fmt.Errorf("plot: the level must be between 0 and 1, got %v", a)
	}
	for _, r := range rates {
		lo, hi := r.Interval[0], r.Interval[1]
		if !(lo >= 0 && lo <= r.Rate && r.Rate <= hi && hi <= 1) {
			return fmt.Errorf("plot: the rate of %q, %v, is not a share inside its interval [%v, %v]", r.Name, r.Rate, lo, hi)
		}
	}
	return checkSize(opt.Width, opt.Height)
}

// nullBins are the bins every panel shares: k of them, of equal width,
// from lo; counts[p][j] is panel p's number of values in bin j, and
// drawn[p] its number of values drawn (the NaN ones left out).
type nullBins struct {
	lo, width float64
	k         int
	counts    [][]int
	drawn     []int
}

func (b nullBins) edge(j int) float64 { return b.lo + float64(j)*b.width }

// Bins: as many as the narrowest null needs by the Freedman–Diaconis rule
// (width 2·IQR·n^(−1/3)), so that it is not drawn as one spike, but at
// least minNullBins and at most maxNullBins across the whole axis.
const (
	minNullBins = 12
	maxNullBins = 80
)

// binNulls counts every panel's finite values into bins that cover all of
// them and the observed value.
func binNulls(panels []NullPanel, observed float64) (nullBins, error) {
	sorted := make([][]float64, len(panels))
	lo, hi := observed, observed
	for p, pn := range panels {
		s := make([]float64, 0, len(pn.Null))
		for i, v := range pn.Null {
			switch {
			case math.IsNaN(v):
				continue
			case math.IsInf(v, 0):
				return nullBins{}, fmt.Errorf("plot: draw %d of %q is infinite", i+1, pn.Name)
			}
			s = append(s, v)
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		slices.Sort(s)
		sorted[p] = s
	}
	if hi == lo {
		d := math.Max(math.Abs(lo)*0.05, 0.5)
		lo, hi = lo-d, hi+d
	}
	width := (hi - lo) / minNullBins
	for _, s := range sorted {
		if n := len(s); n > 1 {
			if iqr := quantileSorted(s, 0.75) - quantileSorted(s, 0.25); iqr > 0 {
				width = math.Min(width, 2*iqr/math.Cbrt(float64(n)))
			}
		}
	}
	k := min(max(int(math.Ceil((hi-lo)/width)), minNullBins), maxNullBins)
	b := nullBins{lo: lo, width: (hi - lo) / float64(k), k: k, counts: make([][]int, len(panels)), drawn: make([]int, len(panels))}
	for p, s := range sorted {
		b.counts[p] = make([]int, k)
		for _, v := range s {
			b.counts[p][min(int((v-lo)/b.width), k-1)]++
		}
		b.drawn[p] = len(s)
	}
	return b, nil
}

// nullLayout is where the parts of NullPanels go, in pixels from the top
// left.
type nullLayout struct {
	w, h     float64
	text     frameText
	x0, x1   float64 // the value axis
	vlo, vhi float64 // the values at x0 and x1
	obsY     float64 // baseline of the observed value's label
	tops     []float64
	panelH   float64
	axisY    float64
	rates    rateLayout
}

// x maps a value of the statistic to its position on the shared axis.
func (L nullLayout) x(v float64) float64 {
	return L.x0 + (v-L.vlo)/(L.vhi-L.vlo)*(L.x1-L.x0)
}

// Heights in the null picture, in pixels.
const (
	panelLabelH  = 22.0  // a panel's name line, above its bars
	panelGap     = 12.0  // between panels
	defaultPanel = 118.0 // a panel, name line included
	minPanel     = 64.0
	valueAxisH   = 56.0 // ticks, their labels and the axis label
	yAxisW       = 58.0 // the count labels left of the panels
	rateRowH     = 26.0
	rateAxisH    = 52.0
)

// layoutNulls sizes the picture and places the panels, the shared axis
// and the false-positive check.
func layoutNulls(ff *fontFaces, opt NullOptions, bins nullBins, rates []RateRow) (nullLayout, error) {
	n := float64(len(bins.counts))
	L := nullLayout{w: float64(cmp.Or(opt.Width, 900))}
	L.text = wrapFrameText(ff, opt.Title, opt.Subtitle, opt.Note, L.w)
	head := L.text.headH()
	if head > 0 {
		head += 12
	}
	foot := 0.0
	if len(L.text.note) > 0 {
		foot = L.text.noteH() + 14
	}
	rateH := 0.0
	if len(rates) > 0 {
		rateH = rateHeight(ff, L.w, rates, opt)
	}
	fixed := 2*margin + head + 22 + (n-1)*panelGap + valueAxisH + rateH + foot
	L.panelH = defaultPanel
	if opt.Height > 0 {
		L.panelH = (float64(opt.Height) - fixed) / n
	}
	L.h = math.Ceil(fixed + n*L.panelH)
	L.x0, L.x1 = margin+yAxisW, L.w-margin-10
	if L.panelH < minPanel || L.x1-L.x0 < 160 {
		return L, fmt.Errorf("plot: a %d×%d picture is too small for %d panels and their text", int(L.w), int(L.h), len(bins.counts))
	}
	pad := 0.03 * bins.width * float64(bins.k)
	L.vlo, L.vhi = bins.lo-pad, bins.edge(bins.k)+pad
	L.obsY = margin + head + 15
	y := margin + head + 22
	for range bins.counts {
		L.tops = append(L.tops, y)
		y += L.panelH + panelGap
	}
	L.axisY = y - panelGap
	if len(rates) > 0 {
		var err error
		if L.rates, err = layoutRates(ff, L.w, L.axisY+valueAxisH+28, rates, opt); err != nil {
			return L, err
		}
	}
	return L, nil
}

// drawPanelBars draws panel p's faint count lines with their labels, one
// bar per bin with values, and its base line.
func drawPanelBars(cv canvas, L nullLayout, bins nullBins, p int) {
	top := L.tops[p]
	base := top + L.panelH
	counts := bins.counts[p]
	tallest := slices.Max(counts)
	cv.text(L.x0-8, top+15, "draws", 11, false, inkMuted, anchorEnd)
	perDraw := 0.0
	if tallest > 0 {
		perDraw = (L.panelH - panelLabelH - 4) / float64(tallest)
	}
	for _, c := range countTicks(tallest) {
		y := base - float64(c)*perDraw
		cv.line(L.x0, y, L.x1, y, 1, gridInk)
		cv.text(L.x0-8, y+4, numtext.Count(c), 11, false, axisInk, anchorEnd)
	}
	openPart(cv, "bars", "per-draw", dataNum(perDraw))
	for j, c := range counts {
		if c == 0 {
			continue
		}
		x, xe := L.x(bins.edge(j)), L.x(bins.edge(j+1))
		h := float64(c) * perDraw
		openPart(cv, "bar", "count", strconv.Itoa(c))
		cv.rect(x, base-h, xe-x, h, style{fill: barFill, stroke: white, strokeW: 0.6})
		closePart(cv)
	}
	closePart(cv)
	cv.line(L.x0, base, L.x1, base, 1, axisInk)
}

// drawPanelLabel writes a panel's name and detail on a white box at the
// top left of the panel between x0 and x1.
func drawPanelLabel(cv canvas, ff *fontFaces, x0, x1, top float64, pn NullPanel) {
	name := ff.ellipsize(pn.Name, true, 13, (x1-x0)*0.6)
	dx := x0 + 6 + ff.width(true, 13, name) + 10
	detail := ff.ellipsize(pn.Detail, false, 13, x1-dx-6)
	w := dx - x0
	if detail != "" {
		w += ff.width(false, 13, detail) + 6
	}
	openPart(cv, "panel-label")
	cv.rect(x0+1, top+1, w, 19, style{fill: white})
	cv.text(x0+6, top+15, name, 13, true, inkTitle, anchorStart)
	if detail != "" {
		cv.text(dx, top+15, detail, 13, false, inkText, anchorStart)
	}
	closePart(cv)
}

// countTicks are at most four round counts (1, 2 or 5 times a power of
// ten) from the first step up to top.
func countTicks(top int) []int {
	if top < 1 {
		return nil
	}
	step := 1
	for mag := 1; ; mag *= 10 {
		if step = mag; top/step <= 4 {
			break
		}
		if step = 2 * mag; top/step <= 4 {
			break
		}
		if step = 5 * mag; top/step <= 4 {
			break
		}
	}
	var ticks []int
	for c := step; c <= top; c += step {
		ticks = append(ticks, c)
	}
	return ticks
}

// drawObserved draws the observed value as one line across every panel,
// labelled above the first on the side with more room.
func drawObserved(cv canvas, L nullLayout, observed float64) {
	x := L.x(observed)
	openPart(cv, "observed", "value", dataNum(observed))
	cv.line(x, L.tops[0]-2, x, L.axisY, 2.4, observedInk)
	a, lx := anchorStart, x+6
	if x-L.x0 > 0.6*(L.x1-L.x0) {
		a, lx = anchorEnd, x-6
	}
	cv.text(lx, L.obsY, "observed "+formatStat(observed), 13, true, observedInk, a)
	closePart(cv)
}

// drawValueAxis draws the shared axis of the statistic under the last
// panel, with round ticks and the statistic's name.
func drawValueAxis(cv canvas, ff *fontFaces, L nullLayout, label string) {
	openPart(cv, "x-axis")
	drawTicks(cv, L.axisY, L.vlo, L.vhi, L.x, "")
	closePart(cv)
	cv.text((L.x0+L.x1)/2, L.axisY+44, ff.ellipsize(label, false, 14, L.x1-L.x0), 14, false, axisInk, anchorMiddle)
}

// drawTicks draws the round ticks between lo and hi along a horizontal
// axis at y, mapped by at, labelled with the suffix after each number.
func drawTicks(cv canvas, y, lo, hi float64, at func(float64) float64, suffix string) {
	for _, t := range (niceTicks{}).Ticks(lo, hi) {
		x := at(t.Value)
		if t.Label == "" {
			cv.line(x, y, x, y+3, 1, axisInk)
			continue
		}
		cv.line(x, y, x, y+6, 1, axisInk)
		cv.text(x, y+20, t.Label+suffix, 12, false, axisInk, anchorMiddle)
	}
}
