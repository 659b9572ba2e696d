package plot

import (
	"fmt"
	"image/color"
	"io"
	"math"
	"slices"
	"sort"

	"github.com/areatest/areatest/internal/numtext"
)

// legendBox is the legend measured, before it is placed.
type legendBox struct {
	heading      []string
	sub          string
	entries      []legendEntry
	labels       []string // entries' labels, shortened to fit
	counts       []string
	labelW       float64
	countW       float64
	entryW       float64 // one entry: swatch, label, count
	headH        float64
	w            float64 // as one column
	missingEntry bool    // the last entry is "no data", set apart
	// countsOwnLine puts the "areas" heading of the count column on a line
	// of its own, when it does not fit beside the subheading.
	countsOwnLine bool
}

const countsHead = "areas"

const colGap = 28.0

func measureLegend(ff *fontFaces, spec mapSpec) legendBox {
	lg := legendBox{sub: spec.subheading, entries: slices.Clone(spec.entries)}
	if spec.missing > 0 {
		lg.entries = append(lg.entries, legendEntry{label: "no data", count: spec.missing, st: style{hatch: true}})
		lg.missingEntry = true
	}
	for _, e := range lg.entries {
		l := ff.ellipsize(e.label, false, labelSize, maxLabelW)
		c := numtext.Count(e.count)
		lg.labels = append(lg.labels, l)
		lg.counts = append(lg.counts, c)
		lg.labelW = math.Max(lg.labelW, ff.width(false, labelSize, l))
		lg.countW = math.Max(lg.countW, ff.width(false, labelSize, c))
	}
	lg.entryW = swatchW + 9 + lg.labelW + 16 + lg.countW
	headW := math.Max(lg.entryW, 200)
	if spec.heading != "" {
		lg.heading = ff.wrap(spec.heading, true, headSize, headW)
	}
	lg.w = lg.entryW
	for _, h := range lg.heading {
		lg.w = math.Max(lg.w, ff.width(true, headSize, h))
	}
	if lg.sub != "" {
		lg.sub = ff.ellipsize(lg.sub, false, 12, headW)
		lg.w = math.Max(lg.w, ff.width(false, 12, lg.sub))
	}
	lg.headH = float64(len(lg.heading)) * 18
	if lg.sub != "" {
		lg.headH += 17
	}
	lg.countsOwnLine = lg.sub == "" || ff.width(false, 12, lg.sub)+14+ff.width(false, 12, countsHead) > lg.entryW
	if lg.countsOwnLine {
		lg.headH += 17
	}
	if lg.headH > 0 {
		lg.headH += 7
	}
	return lg
}

// height of the legend laid out in cols columns.
func (lg legendBox) height(cols int) float64 {
	rows := (len(lg.entries) + cols - 1) / cols
	h := lg.headH + float64(rows)*rowH
	if cols == 1 && lg.missingEntry {
		h += 6
	}
	return h
}

func (lg legendBox) widthCols(cols int) float64 {
	w := float64(cols)*lg.entryW + float64(cols-1)*colGap
	return math.Max(w, lg.w)
}

// mapLayout is where everything goes, in pixels.
type mapLayout struct {
	w, h              int
	title, sub, note  []string
	headerH, footerH  float64
	scale, mapX, mapY float64
	mapW, mapH        float64
	legX, legY        float64
	legCols           int
}

func textBlocks(ff *fontFaces, opt MapOptions, width float64) (title, sub, note []string, headerH, footerH float64) {
	tw := width - 2*margin
	if opt.Title != "" {
		title = ff.wrap(opt.Title, true, titleSize, tw)
		headerH += float64(len(title)) * 27
	}
	if opt.Subtitle != "" {
		sub = ff.wrap(opt.Subtitle, false, subSize, tw)
		headerH += float64(len(sub)) * 19
	}
	if headerH > 0 {
		headerH += 14
	}
	if opt.Note != "" {
		note = ff.wrap(opt.Note, false, noteSize, tw)
		footerH = float64(len(note))*15 + 12
	}
	return
}

// layoutMap sizes the picture (when a side is left 0) and places the map
// and its legend: beside the map, or under it in columns, whichever lets
// the map be drawn larger.
func layoutMap(ff *fontFaces, lw, lh float64, lg legendBox, opt MapOptions) (mapLayout, error) {
	aspect := lw / lh
	W, H := float64(opt.Width), float64(opt.Height)
	besideFits := func(W float64) float64 { return W - 2*margin - legendGap - lg.w }
	if W == 0 && H > 0 {
		// Width from height: guess the text at the default width, then
		// give the map its aspect beside the legend.
		_, _, _, hh, fh := textBlocks(ff, opt, defaultWidth)
		mh := H - 2*margin - hh - fh
		W = math.Round(2*margin + mh*aspect + legendGap + lg.w)
		W = min(max(W, 320), maxSide)
	}
	if W == 0 {
		W = defaultWidth
	}
	title, sub, note, hh, fh := textBlocks(ff, opt, W)
	if H == 0 {
		if aspect < 1.6 {
			s := besideFits(W) / lw
			H = 2*margin + hh + fh + math.Max(s*lh, lg.height(1))
		} else {
			cols := fitCols(lg, W-2*margin)
			s := (W - 2*margin) / lw
			H = 2*margin + hh + fh + s*lh + legendGap*0.6 + lg.height(cols)
		}
		H = math.Ceil(min(max(H, 240), 1.5*W, maxSide))
	}
	L := mapLayout{w: int(W), h: int(H), title: title, sub: sub, note: note, headerH: hh, footerH: fh}
	availH := H - 2*margin - hh - fh

	// Beside: legend to the right of the map.
	sR := -1.0
	if lg.height(1) <= availH {
		sR = math.Min(besideFits(W)/lw, availH/lh)
	}
	// Under: legend below in as many columns as fit.
	cols := fitCols(lg, W-2*margin)
	sB := -1.0
	if lg.widthCols(cols) <= W-2*margin {
		sB = math.Min((W-2*margin)/lw, (availH-legendGap*0.6-lg.height(cols))/lh)
	}
	top := margin + hh
	switch {
	case sR <= 0 && sB <= 0:
		return L, fmt.Errorf("plot: a %d×%d picture is too small for this map's title, legend and note", L.w, L.h)
	case sR >= sB:
		L.scale = sR
		L.mapW, L.mapH = sR*lw, sR*lh
		total := L.mapW + legendGap + lg.w
		L.mapX = math.Max(margin, (W-total)/2)
		// Top-aligned under the title: any room left over goes to the
		// foot, not between the title and its map.
		L.mapY = top
		L.legX, L.legY = L.mapX+L.mapW+legendGap, L.mapY
		L.legCols = 1
	default:
		L.scale = sB
		L.mapW, L.mapH = sB*lw, sB*lh
		L.mapX = (W - L.mapW) / 2
		L.mapY = top
		// The legend starts under the map's left edge, unless it is wider
		// than the map.
		L.legX = math.Min(L.mapX, (W-lg.widthCols(cols))/2)
		L.legY = L.mapY + L.mapH + legendGap*0.6
		L.legCols = cols
	}
	return L, nil
}

func fitCols(lg legendBox, w float64) int {
	cols := int((w + colGap) / (lg.entryW + colGap))
	return min(max(cols, 1), max(len(lg.entries), 1))
}

// Outlines between areas follow the size areas are drawn at: a clear
// grey line when areas are large, a faint one when they are small, and
// none when they are only a few pixels across, where lines would drown the
// colours. Then each area is outlined in its own colour instead, which
// closes the pale seams anti-aliasing leaves between neighbours.
type outline struct {
	c   color.RGBA
	w   float64
	own bool // in each area's own colour
}

// outlineFor chooses the outline from the median size of the areas in
// pixels (the geometric mean of the sides of their boxes).
func outlineFor(median float64) outline {
	switch {
	case median >= 14:
		return outline{c: rgb(0x5c, 0x5c, 0x5c), w: 0.6}
	case median >= 6:
		return outline{c: rgb(0x80, 0x80, 0x80), w: 0.4}
	}
	return outline{own: true, w: 0.6}
}

func drawMap(w io.Writer, f Format, spec mapSpec, opt MapOptions) error {
	if err := f.check(); err != nil {
		return err
	}
	if opt.Width < 0 || opt.Height < 0 || opt.Width > maxSide || opt.Height > maxSide {
		return fmt.Errorf("plot: picture size %d×%d out of range (0 to %d pixels a side; 0 picks one)", opt.Width, opt.Height, maxSide)
	}
	if opt.IDs != nil && len(opt.IDs) != len(spec.geoms) {
		return fmt.Errorf("plot: %d ids for %d areas", len(opt.IDs), len(spec.geoms))
	}
	proj, err := newProjector(spec.geoms, opt.LonLat)
	if err != nil {
		return err
	}
	fl, err := flatten(spec.geoms, proj)
	if err != nil {
		return err
	}
	ff, err := loadFonts()
	if err != nil {
		return err
	}
	lg := measureLegend(ff, spec)
	L, err := layoutMap(ff, fl.maxX-fl.minX, fl.maxY-fl.minY, lg, opt)
	if err != nil {
		return err
	}
	fl.toPixels(L.mapX, L.mapY, L.scale)

	nAreas := len(spec.geoms)
	sizes := make([]float64, nAreas)
	for i := range nAreas {
		b := fl.ringsBox(fl.areaRing[i], fl.areaRing[i+1])
		sizes[i] = math.Sqrt(math.Max(b.x1-b.x0, 0.01) * math.Max(b.y1-b.y0, 0.01))
	}
	sorted := slices.Clone(sizes)
	sort.Float64s(sorted)
	median := sorted[len(sorted)/2]
	ol := outlineFor(median)

	nParts := len(fl.partArea)
	boxes := make([]bbox, nParts)
	for p := range nParts {
		boxes[p] = fl.ringsBox(fl.partRing[p], fl.partRing[p+1])
	}
	tiny := func(p int) bool {
		b := boxes[p]
		return math.Max(b.x1-b.x0, b.y1-b.y0) < tinyPart
	}
	// Without outlines between areas, an island in a pale class would
	// melt into the white page: isolated parts of any size are looked for
	// then, and their areas outlined.
	alone := fl.isolation(boxes, func(p int) bool { return ol.own || tiny(p) })
	ringed := make([]bool, nAreas)
	for p, a := range alone {
		if a {
			ringed[fl.partArea[p]] = true
		}
	}

	var cv canvas
	switch f {
	case SVG:
		cv = newSVGCanvas(w, L.w, L.h)
	case PNG:
		cv = newRasterCanvas(w, L.w, L.h, ff)
	}
	cv.rect(0, 0, float64(L.w), float64(L.h), style{fill: white})

	// Classes with many areas first, so that the few areas of a rare class
	// are drawn last and are not overpainted at their edges; missing data
	// last of all.
	nc := len(spec.fills)
	members := make([][]int32, nc+1)
	for i, c := range spec.class {
		if c < 0 {
			c = nc
		}
		members[c] = append(members[c], int32(i))
	}
	order := make([]int, nc)
	for j := range order {
		order[j] = j
	}
	sort.SliceStable(order, func(a, b int) bool { return len(members[order[a]]) > len(members[order[b]]) })
	order = append(order, nc)

	classStyle := func(c int) style {
		if c == nc {
			return style{hatch: true, stroke: hatchInk, strokeW: 0.6}
		}
		st := style{fill: spec.fills[c], strokeW: ol.w, stroke: ol.c}
		if ol.own {
			st.stroke = spec.fills[c]
		}
		return st
	}
	var ends []int
	drawGroup := func(st style, areas []int32) {
		if len(areas) == 0 {
			return
		}
		cv.group(st)
		for _, i := range areas {
			r0, r1 := fl.areaRing[i], fl.areaRing[i+1]
			base := fl.ringStart(r0)
			ends = ends[:0]
			for r := r0; r < r1; r++ {
				ends = append(ends, fl.ringEnd[r]-base)
			}
			tip := ""
			if spec.tip != nil {
				tip = spec.tip(int(i))
			}
			cv.area(fl.pts[base:fl.ringEnd[r1-1]], ends, fl.ringHole[r0:r1], tip)
		}
		cv.endGroup()
	}
	for _, c := range order {
		plain, isles := members[c], []int32(nil)
		if ol.own && c != nc {
			// Areas with an isolated part get a dark outline of their own.
			plain = nil
			for _, i := range members[c] {
				if ringed[i] {
					isles = append(isles, i)
				} else {
					plain = append(plain, i)
				}
			}
		}
		drawGroup(classStyle(c), plain)
		st := classStyle(c)
		st.stroke, st.strokeW = markerRim, 0.7
		drawGroup(st, isles)
	}
	for p, a := range alone {
		if !a || !tiny(p) {
			continue
		}
		b := boxes[p]
		st := classStyle(spec.class[fl.partArea[p]])
		if spec.class[fl.partArea[p]] < 0 {
			st = classStyle(nc)
		}
		st.stroke, st.strokeW = markerRim, 0.9
		cv.circle((b.x0+b.x1)/2, (b.y0+b.y1)/2, markerR, st)
	}

	// Text.
	y := margin
	for _, t := range L.title {
		cv.text(margin, y+21, t, titleSize, true, inkTitle, anchorStart)
		y += 27
	}
	for _, t := range L.sub {
		cv.text(margin, y+15, t, subSize, false, inkText, anchorStart)
		y += 19
	}
	drawLegend(cv, lg, L)
	y = float64(L.h) - margin - L.footerH + 12
	for _, t := range L.note {
		cv.text(margin, y+11, t, noteSize, false, inkMuted, anchorStart)
		y += 15
	}
	return cv.finish()
}

func drawLegend(cv canvas, lg legendBox, L mapLayout) {
	x, y := L.legX, L.legY
	for _, h := range lg.heading {
		cv.text(x, y+14, h, headSize, true, inkTitle, anchorStart)
		y += 18
	}
	if lg.sub != "" {
		cv.text(x, y+13, lg.sub, 12, false, inkMuted, anchorStart)
	}
	if lg.countsOwnLine && lg.sub != "" {
		y += 17
	}
	// Heading the first column only: the others read the same way.
	cv.text(x+lg.entryW, y+13, countsHead, 12, false, inkMuted, anchorEnd)
	y += 17
	if lg.headH > 0 {
		y += 7
	}
	rows := (len(lg.entries) + L.legCols - 1) / L.legCols
	for k, e := range lg.entries {
		col, row := k/rows, k%rows
		ex := x + float64(col)*(lg.entryW+colGap)
		ey := y + float64(row)*rowH
		if L.legCols == 1 && lg.missingEntry && k == len(lg.entries)-1 {
			ey += 6
		}
		st := e.st
		st.stroke, st.strokeW = swatchRim, 0.8
		cv.rect(ex+0.5, ey+2.5, swatchW, swatchH, st)
		cv.text(ex+swatchW+9, ey+14.5, lg.labels[k], labelSize, false, inkText, anchorStart)
		cv.text(ex+lg.entryW, ey+14.5, lg.counts[k], labelSize, false, inkMuted, anchorEnd)
	}
}
