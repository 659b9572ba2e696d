package figure

import (
	"fmt"
	"image/color"
	"io"
	"math"
	"slices"
	"sort"

	"github.com/paulmach/orb"

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
		lg.entries = append(lg.entries, legendEntry{label: spec.missingName(), count: spec.missing, st: style{hatch: true}})
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
		lg.heading = ff.wrap(spec.heading, true, headSize, headW, maxHeadingLines)
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
	text              frameText
	headerH, footerH  float64
	scale, mapX, mapY float64
	mapW, mapH        float64
	legX, legY        float64
	legCols           int
}

// textBlocks wraps the map's text to the picture's width and gives the
// room it takes above and below the map.
func textBlocks(ff *fontFaces, opt MapOptions, width float64) (text frameText, headerH, footerH float64) {
	text = wrapFrameText(ff, opt.Title, opt.Subtitle, opt.Note, width)
	if headerH = text.headH(); headerH > 0 {
		headerH += 14
	}
	if len(text.note) > 0 {
		footerH = text.noteH() + 12
	}
	return text, headerH, footerH
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
		_, hh, fh := textBlocks(ff, opt, defaultWidth)
		mh := H - 2*margin - hh - fh
		W = math.Round(2*margin + mh*aspect + legendGap + lg.w)
		W = min(max(W, 320), maxSide)
	}
	if W == 0 {
		W = defaultWidth
	}
	text, hh, fh := textBlocks(ff, opt, W)
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
	L := mapLayout{w: int(W), h: int(H), text: text, headerH: hh, footerH: fh}
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

// drawMap lays out and draws a map of either kind: the page, the areas
// class by class, the markers of islets, then the text and the legend.
func drawMap(w io.Writer, f Format, spec mapSpec, opt MapOptions) error {
	fl, ff, err := prepareMap(f, spec.geoms, opt)
	if err != nil {
		return err
	}
	lg := measureLegend(ff, spec)
	L, err := layoutMap(ff, fl.maxX-fl.minX, fl.maxY-fl.minY, lg, opt)
	if err != nil {
		return err
	}
	fl.toPixels(L.mapX, L.mapY, L.scale)
	cv := newCanvas(w, f, L.w, L.h, ff)
	paintAreas(cv, fl, spec)
	putLines(cv, L.text.head())
	drawLegend(cv, lg, L)
	putLines(cv, L.text.foot(float64(L.h)))
	return cv.finish()
}

// prepareMap checks the format and the options of a map of geoms, and
// projects and flattens the layer and loads the fonts.
func prepareMap(f Format, geoms []orb.MultiPolygon, opt MapOptions) (*flatLayer, *fontFaces, error) {
	if err := f.check(); err != nil {
		return nil, nil, err
	}
	if err := checkSize(opt.Width, opt.Height); err != nil {
		return nil, nil, err
	}
	if opt.IDs != nil && len(opt.IDs) != len(geoms) {
		return nil, nil, fmt.Errorf("plot: %d ids for %d areas", len(opt.IDs), len(geoms))
	}
	proj, err := newProjector(geoms, opt.LonLat)
	if err != nil {
		return nil, nil, err
	}
	fl, err := flatten(geoms, proj)
	if err != nil {
		return nil, nil, err
	}
	ff, err := loadFonts()
	if err != nil {
		return nil, nil, err
	}
	return fl, ff, nil
}

// newCanvas starts a w×h picture of format f (checked) on a white page.
func newCanvas(out io.Writer, f Format, w, h int, ff *fontFaces) canvas {
	var cv canvas
	if f == PNG {
		cv = newRasterCanvas(out, w, h, ff)
	} else {
		cv = newSVGCanvas(out, w, h)
	}
	cv.rect(0, 0, float64(w), float64(h), style{fill: white})
	return cv
}

// paintAreas draws the areas of fl (in pixels) in the classes of spec,
// then the markers of its islets.
func paintAreas(cv canvas, fl *flatLayer, spec mapSpec) {
	ol := outlineFor(fl.medianSize())
	isl := findIslands(fl, ol)
	ap := &areaPainter{cv: cv, fl: fl, spec: spec, ol: ol}
	ap.areas(isl)
	ap.markers(isl)
}

// medianSize is the median size of the areas in pixels, each the geometric
// mean of the sides of its box.
func (fl *flatLayer) medianSize() float64 {
	nAreas := len(fl.areaRing) - 1
	sizes := make([]float64, nAreas)
	for i := range nAreas {
		b := fl.ringsBox(fl.areaRing[i], fl.areaRing[i+1])
		sizes[i] = math.Sqrt(math.Max(b.x1-b.x0, 0.01) * math.Max(b.y1-b.y0, 0.01))
	}
	sort.Float64s(sizes)
	return sizes[len(sizes)/2]
}

// islands are the parts of areas that no other area comes near.
type islands struct {
	boxes  []bbox // per part, in pixels
	alone  []bool // per part
	ringed []bool // per area: it has a part that is alone
}

// findIslands looks for isolated parts. Without outlines between areas an
// island in a pale class would melt into the white page, so parts of any
// size are looked at then; otherwise only tiny parts, which get a marker.
func findIslands(fl *flatLayer, ol outline) islands {
	nParts := len(fl.partArea)
	isl := islands{boxes: make([]bbox, nParts), ringed: make([]bool, len(fl.areaRing)-1)}
	for p := range nParts {
		isl.boxes[p] = fl.ringsBox(fl.partRing[p], fl.partRing[p+1])
	}
	isl.alone = fl.isolation(isl.boxes, func(p int) bool { return ol.own || isl.tiny(p) })
	for p, a := range isl.alone {
		if a {
			isl.ringed[fl.partArea[p]] = true
		}
	}
	return isl
}

func (isl islands) tiny(p int) bool {
	b := isl.boxes[p]
	return math.Max(b.x1-b.x0, b.y1-b.y0) < tinyPart
}

// areaPainter draws the areas of a laid-out map onto its canvas.
type areaPainter struct {
	cv   canvas
	fl   *flatLayer // in pixels
	spec mapSpec
	ol   outline
	ends []int // scratch: ring ends of the area being drawn
}

// missingClass is the class number drawing gives areas without data: one
// past the last class.
func (ap *areaPainter) missingClass() int { return len(ap.spec.fills) }

// drawOrder groups the areas by class and orders the classes: those with
// many areas first, so that the few areas of a rare class are drawn last
// and are not overpainted at their edges; missing data last of all.
func (ap *areaPainter) drawOrder() (members [][]int32, order []int) {
	nc := ap.missingClass()
	members = make([][]int32, nc+1)
	for i, c := range ap.spec.class {
		if c < 0 {
			c = nc
		}
		members[c] = append(members[c], int32(i))
	}
	order = make([]int, nc)
	for j := range order {
		order[j] = j
	}
	sort.SliceStable(order, func(a, b int) bool { return len(members[order[a]]) > len(members[order[b]]) })
	return members, append(order, nc)
}

// classStyle is how areas of class c are painted; c may be missingClass.
func (ap *areaPainter) classStyle(c int) style {
	if c == ap.missingClass() {
		return style{hatch: true, stroke: hatchInk, strokeW: 0.6}
	}
	st := style{fill: ap.spec.fills[c], strokeW: ap.ol.w, stroke: ap.ol.c}
	if ap.ol.own {
		st.stroke = ap.spec.fills[c]
	}
	return st
}

// areas draws every area in its class's style. When areas are outlined in
// their own colour, those with an isolated part get a dark outline, in a
// group of their own after the others of the class.
func (ap *areaPainter) areas(isl islands) {
	members, order := ap.drawOrder()
	for _, c := range order {
		plain, isles := members[c], []int32(nil)
		if ap.ol.own && c != ap.missingClass() {
			plain = nil
			for _, i := range members[c] {
				if isl.ringed[i] {
					isles = append(isles, i)
				} else {
					plain = append(plain, i)
				}
			}
		}
		ap.group(ap.classStyle(c), plain)
		st := ap.classStyle(c)
		st.stroke, st.strokeW = markerRim, 0.7
		ap.group(st, isles)
	}
}

// group draws areas in one style, with their tooltips.
func (ap *areaPainter) group(st style, areas []int32) {
	if len(areas) == 0 {
		return
	}
	fl := ap.fl
	ap.cv.group(st)
	for _, i := range areas {
		r0, r1 := fl.areaRing[i], fl.areaRing[i+1]
		base := fl.ringStart(r0)
		ap.ends = ap.ends[:0]
		for r := r0; r < r1; r++ {
			ap.ends = append(ap.ends, fl.ringEnd[r]-base)
		}
		tip := ""
		if ap.spec.tip != nil {
			tip = ap.spec.tip(int(i))
			if ap.spec.class[i] < 0 {
				tip += ": " + ap.spec.missingName()
			}
		}
		ap.cv.area(fl.pts[base:fl.ringEnd[r1-1]], ap.ends, fl.ringHole[r0:r1], tip)
	}
	ap.cv.endGroup()
}

// markers puts a disc in its area's style on each tiny isolated part, on
// top of the areas. A part of an area without data — whether the whole
// area or one part of several — gets the hatched disc of missingClass.
func (ap *areaPainter) markers(isl islands) {
	for p, a := range isl.alone {
		if !a || !isl.tiny(p) {
			continue
		}
		b := isl.boxes[p]
		c := ap.spec.class[ap.fl.partArea[p]]
		if c < 0 {
			c = ap.missingClass()
		}
		st := ap.classStyle(c)
		st.stroke, st.strokeW = markerRim, 0.9
		ap.cv.circle((b.x0+b.x1)/2, (b.y0+b.y1)/2, markerR, st)
	}
}

// putLines draws lines of frame text at the left margin.
func putLines(cv canvas, lines []textLine) {
	for _, l := range lines {
		cv.text(margin, l.y, l.s, l.size, l.bold, l.c, anchorStart)
	}
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
