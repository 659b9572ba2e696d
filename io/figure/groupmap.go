package figure

import (
	"cmp"
	"fmt"
	"io"
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// GroupsAndOutcome is what GroupOutcomeMap draws: the groups of a
// comparison and its outcome, on one layer.
type GroupsAndOutcome struct {
	Geoms []orb.MultiPolygon
	// Group[i] is the group of area i, an index into Levels, or −1 for an
	// area left out of the comparison: such areas are hatched in both maps
	// and counted in both legends as "left out".
	Group  []int
	Levels []string
	// GroupName and OutcomeName head the two legends.
	GroupName, OutcomeName string
	// Outcome holds one value per area; those of areas left out are not
	// drawn and do not shape the classes.
	Outcome []float64
	// Classes and K cut the outcome into classes, as in Choropleth.
	Classes Classes
	K       int
}

// leftOutLabel is the legend's name for areas outside the comparison.
const leftOutLabel = "left out"

// GroupOutcomeMap draws two maps of the layer side by side, in the same
// projection and at the same scale: on the left each area in the colour
// of its group (the Groups palette, legend in the order of Levels with the
// number of areas of each), on the right the outcome in classes (the
// Sequential palette, as Choropleth). Areas left out are hatched in both.
// opt.LegendTitle is not used: each legend is headed by its column's name.
func GroupOutcomeMap(w io.Writer, f Format, d GroupsAndOutcome, opt MapOptions) error {
	pal, err := Groups(len(d.Levels))
	if err != nil {
		return err
	}
	legend := make([]Category, len(d.Levels))
	for j, l := range d.Levels {
		legend[j] = Category{Name: l, Color: pal[j]}
	}
	opt.LegendTitle = d.GroupName
	groups, err := categorySpec(d.Geoms, d.Group, legend, opt)
	if err != nil {
		return err
	}
	opt.LegendTitle = d.OutcomeName
	leftOut := func(i int) bool { return d.Group[i] < 0 }
	outcome, err := choroplethSpec(d.Geoms, d.Outcome, leftOut, d.Classes, d.K, d.OutcomeName, opt)
	if err != nil {
		return err
	}
	if outcome.missing != groups.missing {
		return fmt.Errorf("plot: every area in a group needs an outcome value (%d areas have none)", outcome.missing-groups.missing)
	}
	groups.missingLabel, outcome.missingLabel = leftOutLabel, leftOutLabel
	return drawPair(w, f, [2]mapSpec{groups, outcome}, opt)
}

// mapPairGap is the room between the two maps of a pair.
const mapPairGap = 40.0

// pairLayout places two maps of one layer side by side, each with its
// legend under it.
type pairLayout struct {
	w, h             int
	text             frameText
	scale            float64
	mapX             [2]float64 // left edge of each map
	panelX           [2]float64 // left edge of each panel: its legend starts here
	mapY, mapH, legY float64
	legCols          [2]int
}

// layoutPair sizes the picture when a side is left 0 (the width is then
// 1400) and gives both maps the largest scale at which they and their
// legends fit in their halves of it.
func layoutPair(ff *fontFaces, lw, lh float64, lgs [2]legendBox, opt MapOptions) (pairLayout, error) {
	W := float64(cmp.Or(opt.Width, 1400))
	pw := (W - 2*margin - mapPairGap) / 2
	text, hh, fh := textBlocks(ff, opt, W)
	L := pairLayout{w: int(W), text: text}
	legH := 0.0
	for k, lg := range lgs {
		L.legCols[k] = fitCols(lg, pw)
		if lg.widthCols(L.legCols[k]) > pw {
			return L, fmt.Errorf("plot: a picture %d pixels wide is too narrow for two maps and their legends", L.w)
		}
		legH = math.Max(legH, lg.height(L.legCols[k]))
	}
	under := legendGap*0.6 + legH
	H := float64(opt.Height)
	if H == 0 {
		H = math.Ceil(min(2*margin+hh+fh+pw/lw*lh+under, 1.5*W, maxSide))
	}
	L.h = int(H)
	L.scale = math.Min(pw/lw, (H-2*margin-hh-fh-under)/lh)
	if L.scale <= 0 {
		return L, fmt.Errorf("plot: a %d×%d picture is too small for two maps with their title, legends and note", L.w, L.h)
	}
	L.mapH = L.scale * lh
	L.mapY = margin + hh
	L.legY = L.mapY + L.mapH + legendGap*0.6
	for k := range 2 {
		L.panelX[k] = margin + float64(k)*(pw+mapPairGap)
		L.mapX[k] = L.panelX[k] + (pw-L.scale*lw)/2
	}
	return L, nil
}

// drawPair draws two maps of the same areas side by side, the left one
// first, with the frame text over both.
func drawPair(w io.Writer, f Format, specs [2]mapSpec, opt MapOptions) error {
	fl, ff, err := prepareMap(f, specs[0].geoms, opt)
	if err != nil {
		return err
	}
	lgs := [2]legendBox{measureLegend(ff, specs[0]), measureLegend(ff, specs[1])}
	L, err := layoutPair(ff, fl.maxX-fl.minX, fl.maxY-fl.minY, lgs, opt)
	if err != nil {
		return err
	}
	right := *fl
	right.pts = slices.Clone(fl.pts)
	fl.toPixels(L.mapX[0], L.mapY, L.scale)
	right.toPixels(L.mapX[1], L.mapY, L.scale)
	cv := newCanvas(w, f, L.w, L.h, ff)
	for k, layer := range []*flatLayer{fl, &right} {
		paintAreas(cv, layer, specs[k])
		drawLegend(cv, lgs[k], mapLayout{legX: L.panelX[k], legY: L.legY, legCols: L.legCols[k]})
	}
	putLines(cv, L.text.head())
	putLines(cv, L.text.foot(float64(L.h)))
	return cv.finish()
}
