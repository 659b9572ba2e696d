package figure

import (
	"bytes"
	"cmp"
	"fmt"
	"image/color"
	"io"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	xfont "golang.org/x/image/font"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"

	"github.com/areatest/areatest/internal/numtext"
)

// ChartOptions set the frame of a scatter plot or a histogram. Sizes are in
// pixels; 0 picks a default. Empty axis labels get a plain default.
type ChartOptions struct {
	Title, Subtitle string
	XLabel, YLabel  string
	Width, Height   int
	// Note is printed small at the foot of the picture.
	Note string
}

// Charts are drawn with gonum/plot, whose vgsvg and vgimg backends give
// the SVG and the PNG from one drawing. Its lengths are points; pictures
// are sized in pixels at 96 per inch, the CSS pixel, so an SVG shows at
// the size asked for and a PNG has exactly that many pixels.
const pxPerPt = 96.0 / 72.0

func px(v float64) vg.Length { return vg.Length(v / pxPerPt) }

var (
	sansFont = font.Font{Typeface: "Liberation", Variant: "Sans"}
	boldFont = font.Font{Typeface: "Liberation", Variant: "Sans", Weight: xfont.WeightBold}
	handler  = text.Plain{Fonts: font.DefaultCache}
	axisInk  = rgb(0x44, 0x44, 0x44)
	guideInk = rgb(0x9a, 0x9a, 0x9a)
	barFill  = rgb(0xa9, 0xb6, 0xc8)
	// The observed value is marked in the dark orange of the local
	// categories: the one thing on the histogram that is not the null.
	observedInk = rgb(0xb8, 0x4a, 0x06)
	lineInk     = rgb(0x1f, 0x1f, 0x1f)
	pointGrey   = rgb(0x6b, 0x6b, 0x6b)
)

func textStyle(sizePx float64, bold bool, c color.Color) text.Style {
	f := sansFont
	if bold {
		f = boldFont
	}
	return text.Style{Color: c, Font: font.From(f, px(sizePx)), Handler: handler}
}

// newChart is a gonum plot in the project's look: sans-serif text, no
// frame, grey axes.
func newChart(xlabel, ylabel string) *plot.Plot {
	p := plot.New()
	p.BackgroundColor = color.Transparent
	for _, ax := range []*plot.Axis{&p.X, &p.Y} {
		// Only font and colour change: gonum's styles carry the alignment
		// and the rotation of the vertical label.
		ax.Label.TextStyle.Font = font.From(sansFont, px(14))
		ax.Label.TextStyle.Color = axisInk
		ax.Label.TextStyle.Handler = handler
		ax.Tick.Label.Font = font.From(sansFont, px(12))
		ax.Tick.Label.Color = axisInk
		ax.Tick.Label.Handler = handler
		ax.Tick.Marker = niceTicks{}
		ax.Tick.Length = px(6)
		ax.LineStyle.Color = axisInk
		ax.LineStyle.Width = px(1)
		ax.Tick.LineStyle.Color = axisInk
		ax.Tick.LineStyle.Width = px(1)
		ax.Padding = px(6)
		ax.Label.Padding = px(6)
	}
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	return p
}

// chartFrame is the part of a chart around the plot: title, subtitle,
// legend row and note.
type chartFrame struct {
	w, h    float64 // pixels
	text    frameText
	legend  []legendItem
	legRows [][]legendItem
}

// legendItem is one key below a chart: a dot, a line or a bar, and a label.
type legendItem struct {
	label string
	c     color.RGBA
	kind  int // 0 dot, 1 line, 2 bar
}

func newFrame(ff *fontFaces, opt ChartOptions, w, h int, legend []legendItem) chartFrame {
	fr := chartFrame{w: float64(w), h: float64(h), legend: legend}
	fr.text = wrapFrameText(ff, opt.Title, opt.Subtitle, opt.Note, fr.w)
	tw := fr.w - 2*margin
	var row []legendItem
	rowW := 0.0
	for _, it := range legend {
		iw := it.width(ff)
		if len(row) > 0 && rowW+iw > tw {
			fr.legRows = append(fr.legRows, row)
			row, rowW = nil, 0
		}
		row = append(row, it)
		rowW += iw
	}
	if len(row) > 0 {
		fr.legRows = append(fr.legRows, row)
	}
	return fr
}

// width is the room the item takes in its row: key, label and the gap to
// the next item.
func (it legendItem) width(ff *fontFaces) float64 {
	return 26 + ff.width(false, labelSize, it.label) + 22
}

func (fr chartFrame) headerH() float64 {
	h := fr.text.headH()
	if h > 0 {
		h += 10
	}
	return h
}

func (fr chartFrame) footerH() float64 {
	h := 0.0
	if len(fr.legRows) > 0 {
		h += float64(len(fr.legRows))*rowH + 12
	}
	if len(fr.text.note) > 0 {
		h += fr.text.noteH() + 10
	}
	return h
}

// draw puts the frame on c (whose origin is bottom-left, in points) and
// returns the canvas left for the plot.
func (fr chartFrame) draw(ff *fontFaces, c draw.Canvas) draw.Canvas {
	top := func(yPx float64) vg.Length { return px(fr.h - yPx) } // from the top, in pixels
	put := func(l textLine) {
		c.FillText(textStyle(l.size, l.bold, l.c), vg.Point{X: px(margin), Y: top(l.y)}, l.s)
	}
	for _, l := range fr.text.head() {
		put(l)
	}
	ly := fr.h - margin - fr.footerH() + 12
	for _, row := range fr.legRows {
		x := margin
		for _, it := range row {
			cy := top(ly + rowH/2)
			it.drawKey(c, x, cy)
			c.FillText(textStyle(labelSize, false, inkText), vg.Point{X: px(x + 26), Y: top(ly + rowH/2 + 4.5)}, it.label)
			x += it.width(ff)
		}
		ly += rowH
	}
	for _, l := range fr.text.foot(fr.h) {
		put(l)
	}
	return draw.Crop(c, px(margin-6), -px(margin), px(margin+fr.footerH()), -px(margin+fr.headerH()))
}

// drawKey draws the item's dot, line or bar at x pixels from the left,
// centred on the height cy.
func (it legendItem) drawKey(c draw.Canvas, x float64, cy vg.Length) {
	switch it.kind {
	case 0:
		c.DrawGlyph(draw.GlyphStyle{Color: it.c, Radius: px(4.5), Shape: rimmedDot{rim: darker(it.c, 0.4, 1)}}, vg.Point{X: px(x + 10), Y: cy})
	case 1:
		c.StrokeLine2(draw.LineStyle{Color: it.c, Width: px(2.2)}, px(x), cy, px(x+20), cy)
	case 2:
		c.FillPolygon(it.c, []vg.Point{{X: px(x + 2), Y: cy - px(6)}, {X: px(x + 18), Y: cy - px(6)}, {X: px(x + 18), Y: cy + px(6)}, {X: px(x + 2), Y: cy + px(6)}})
	}
}

// render draws the frame and the plot onto a canvas of the format and
// writes it out. squareData makes the plot's data area square by trimming
// the longer side, for plots whose slope must look like what it is.
func render(w io.Writer, f Format, fr chartFrame, ff *fontFaces, p *plot.Plot, squareData bool) error {
	return renderPanels(w, f, fr, ff, []*plot.Plot{p}, 1, squareData)
}

// panelGapPx is the room between the panels of a grid.
const panelGapPx = 28.0

// renderPanels is render for several plots in a grid of cols columns, row
// by row, in the room the frame leaves.
func renderPanels(w io.Writer, f Format, fr chartFrame, ff *fontFaces, plots []*plot.Plot, cols int, squareData bool) error {
	W, H := px(fr.w), px(fr.h)
	var vc vg.CanvasWriterTo
	switch f {
	case SVG:
		vc = vgsvg.New(W, H)
	case PNG:
		ic := vgimg.NewWith(vgimg.UseWH(W, H), vgimg.UseDPI(96), vgimg.UseBackgroundColor(color.White))
		vc = vgimg.PngCanvas{Canvas: ic}
	default:
		return f.check()
	}
	dc := draw.New(vc)
	if f == SVG {
		// vgsvg leaves the page transparent; paint it as the PNG is.
		dc.FillPolygon(color.White, []vg.Point{{X: 0, Y: 0}, {X: W, Y: 0}, {X: W, Y: H}, {X: 0, Y: H}})
	}
	area := fr.draw(ff, dc)
	rows := (len(plots) + cols - 1) / cols
	gap := px(panelGapPx)
	tw := (area.Max.X - area.Min.X - gap*vg.Length(cols-1)) / vg.Length(cols)
	th := (area.Max.Y - area.Min.Y - gap*vg.Length(rows-1)) / vg.Length(rows)
	if tw < px(120) || th < px(120) {
		return fmt.Errorf("plot: a %d×%d picture leaves too little room for the plot", int(fr.w), int(fr.h))
	}
	for k, p := range plots {
		r, c := k/cols, k%cols
		tile := area
		tile.Min.X = area.Min.X + vg.Length(c)*(tw+gap)
		tile.Max.X = tile.Min.X + tw
		tile.Max.Y = area.Max.Y - vg.Length(r)*(th+gap) // rows from the top
		tile.Min.Y = tile.Max.Y - th
		drawTile(ff, p, tile, squareData)
	}
	if f == PNG {
		_, err := vc.WriteTo(w)
		return err
	}
	var buf bytes.Buffer
	if _, err := vc.WriteTo(&buf); err != nil {
		return err
	}
	// vgsvg names only the embedded font; add the metric-compatible
	// fallbacks the maps use.
	out := strings.ReplaceAll(buf.String(), "font-family:Liberation Sans;", "font-family:"+fontFamily+";")
	_, err := io.WriteString(w, out)
	return err
}

// drawTile draws p in area, its data area made square first when asked.
func drawTile(ff *fontFaces, p *plot.Plot, area draw.Canvas, squareData bool) {
	if squareData {
		data := p.DataCanvas(area)
		dw, dh := data.Max.X-data.Min.X, data.Max.Y-data.Min.Y
		if d := dw - dh; d > 0 {
			area.Min.X += d / 2
			area.Max.X -= d / 2
		} else if d < 0 {
			area.Max.Y += d // trim the top, keeping the axis by the legend
		}
	}
	fitAxisLabels(ff, p, area)
	p.Draw(area)
}

// fitAxisLabels cuts an axis label longer than its axis with "…", so that
// a long variable name is not drawn past the edges of the picture.
func fitAxisLabels(ff *fontFaces, p *plot.Plot, area draw.Canvas) {
	data := p.DataCanvas(area)
	toPx := func(l vg.Length) float64 { return float64(l) * pxPerPt }
	p.X.Label.Text = ff.ellipsize(p.X.Label.Text, false, 14, toPx(data.Max.X-data.Min.X))
	p.Y.Label.Text = ff.ellipsize(p.Y.Label.Text, false, 14, toPx(data.Max.Y-data.Min.Y))
}

// chartSetup checks the size asked for a chart, filling a side left 0
// with its default, and loads the fonts.
func chartSetup(opt ChartOptions, dw, dh int) (w, h int, ff *fontFaces, err error) {
	w, h = opt.Width, opt.Height
	if err := checkSize(w, h); err != nil {
		return 0, 0, nil, err
	}
	if w == 0 {
		w = dw
	}
	if h == 0 {
		h = dh
	}
	ff, err = loadFonts()
	if err != nil {
		return 0, 0, nil, err
	}
	return w, h, ff, nil
}

// formatStat writes a statistic for a label: two decimals from 0.1 up,
// two significant digits below, with a true minus sign.
func formatStat(v float64) string {
	var s string
	if a := math.Abs(v); a >= 0.1 || a == 0 {
		s = strconv.FormatFloat(v, 'f', 2, 64)
		if a >= 1000 {
			s = strconv.FormatFloat(v, 'g', 4, 64)
		}
	} else {
		s = strconv.FormatFloat(v, 'g', 2, 64)
	}
	return strings.Replace(s, "-", "−", 1)
}

// MoranScatter plots each area's standardised value z against its spatial
// lag, with dashed lines at 0 that cut the plane into the four quadrants
// (high among high top right, low among low bottom left, and the two kinds
// of outlier), and the line through the origin with slope slope, which is
// Moran's I when lag is the row-standardised lag of z. Both axes share one
// scale and the data area is square, so the line's steepness reads true.
// Points are coloured by categories[i], an index into legend (nil: all
// grey; −1: an area without a category, grey); areas where z or lag is NaN
// are left out.
func MoranScatter(w io.Writer, f Format, z, lag []float64, categories []int, legend []Category, slope float64, opt ChartOptions) error {
	if err := f.check(); err != nil {
		return err
	}
	if len(lag) != len(z) {
		return fmt.Errorf("plot: %d spatial lags for %d values", len(lag), len(z))
	}
	if categories != nil && len(categories) != len(z) {
		return fmt.Errorf("plot: %d categories for %d values", len(categories), len(z))
	}
	if math.IsNaN(slope) || math.IsInf(slope, 0) {
		return fmt.Errorf("plot: the slope must be a finite number, got %v", slope)
	}
	W, H, ff, err := chartSetup(opt, 760, 820)
	if err != nil {
		return err
	}
	sg, err := groupPoints(z, lag, categories, legend)
	if err != nil {
		return err
	}
	p, err := scatterPlot(sg, slope, cmp.Or(opt.XLabel, "value (standardised)"), cmp.Or(opt.YLabel, "spatial lag: mean of the neighbours (standardised)"))
	if err != nil {
		return err
	}
	items := []legendItem{{label: "slope = Moran's I = " + formatStat(slope), c: lineInk, kind: 1}}
	items = append(items, sg.legendItems(categories != nil)...)
	fr := newFrame(ff, opt, W, H, items)
	return render(w, f, fr, ff, p, true)
}

// scatterPlot is the plot of a Moran scatter: the quadrants, the points
// and the line through the origin with slope slope, on square axes.
func scatterPlot(sg scatterGroups, slope float64, xlabel, ylabel string) (*plot.Plot, error) {
	R := sg.reach * 1.06
	p := newChart(xlabel, ylabel)
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = -R, R, -R, R
	guide := draw.LineStyle{Color: guideInk, Width: px(1), Dashes: []vg.Length{px(5), px(4)}}
	for _, seg := range [][2]plotter.XY{{{X: -R, Y: 0}, {X: R, Y: 0}}, {{X: 0, Y: -R}, {X: 0, Y: R}}} {
		l, _ := plotter.NewLine(plotter.XYs{seg[0], seg[1]})
		l.LineStyle = guide
		p.Add(l)
	}
	p.Add(quadrantLabels{R: R})
	if err := sg.add(p); err != nil {
		return nil, err
	}
	l, _ := plotter.NewLine(plotter.XYs{{X: -R, Y: -R * slope}, {X: R, Y: R * slope}})
	l.LineStyle = draw.LineStyle{Color: lineInk, Width: px(2.2)}
	p.Add(l)
	return p, nil
}

// scatterGroups are the points of a Moran scatter by category: group g is
// legend[g], the last group the points without a category.
type scatterGroups struct {
	pts    []plotter.XYs
	legend []Category
	n      int     // points in all
	reach  float64 // the largest |z| or |lag|, at least 1
}

// groupPoints sorts the points where both z and lag are known into their
// groups.
func groupPoints(z, lag []float64, categories []int, legend []Category) (scatterGroups, error) {
	sg := scatterGroups{pts: make([]plotter.XYs, len(legend)+1), legend: legend, reach: 1}
	for i := range z {
		if math.IsNaN(z[i]) || math.IsNaN(lag[i]) {
			continue
		}
		if math.IsInf(z[i], 0) || math.IsInf(lag[i], 0) {
			return sg, fmt.Errorf("plot: point %d is not finite (%v, %v)", i+1, z[i], lag[i])
		}
		g := len(legend)
		if categories != nil {
			c := categories[i]
			if c < -1 || c >= len(legend) {
				return sg, fmt.Errorf("plot: point %d has category %d; the legend has %d (0 to %d, or −1 for none)", i+1, c, len(legend), len(legend)-1)
			}
			if c >= 0 {
				g = c
			}
		}
		sg.pts[g] = append(sg.pts[g], plotter.XY{X: z[i], Y: lag[i]})
		sg.reach = math.Max(sg.reach, math.Max(math.Abs(z[i]), math.Abs(lag[i])))
		sg.n++
	}
	if sg.n == 0 {
		return sg, fmt.Errorf("plot: no point has both a value and a spatial lag")
	}
	return sg, nil
}

func (sg scatterGroups) color(g int) color.RGBA {
	if g < len(sg.legend) {
		return sg.legend[g].Color
	}
	return pointGrey
}

// add puts the groups on p as dots, the common groups first so that rare
// ones are not buried; big clouds get smaller, fainter dots so that
// density still shows.
func (sg scatterGroups) add(p *plot.Plot) error {
	radius, alpha := 3.4, 0.85
	switch {
	case sg.n > 20000:
		radius, alpha = 1.5, 0.45
	case sg.n > 3000:
		radius, alpha = 2.2, 0.6
	}
	order := make([]int, len(sg.pts))
	for g := range order {
		order[g] = g
	}
	sort.SliceStable(order, func(a, b int) bool { return len(sg.pts[order[a]]) > len(sg.pts[order[b]]) })
	for _, g := range order {
		if len(sg.pts[g]) == 0 {
			continue
		}
		s, err := plotter.NewScatter(sg.pts[g])
		if err != nil {
			return err
		}
		c := sg.color(g)
		s.GlyphStyle = draw.GlyphStyle{Color: withAlpha(c, alpha), Radius: px(radius), Shape: rimmedDot{rim: darker(c, 0.4, alpha)}}
		p.Add(s)
	}
	return nil
}

// legendItems lists the groups that have points, with their counts; the
// points without a category only when there are categories at all.
func (sg scatterGroups) legendItems(categorised bool) []legendItem {
	var items []legendItem
	none := len(sg.pts) - 1
	for g, pts := range sg.pts {
		if len(pts) == 0 || (g == none && !categorised) {
			continue
		}
		name := "no category"
		if g < len(sg.legend) {
			name = sg.legend[g].Name
		}
		items = append(items, legendItem{label: fmt.Sprintf("%s (%s)", name, numtext.Count(len(pts))), c: sg.color(g)})
	}
	return items
}

// rimmedDot is a filled circle with a darker rim, so that dots in pale
// colours (the grey of "no significant pattern") still show on white.
type rimmedDot struct{ rim color.Color }

func (g rimmedDot) DrawGlyph(c *draw.Canvas, sty draw.GlyphStyle, pt vg.Point) {
	p := make(vg.Path, 0, 3)
	p.Move(vg.Point{X: pt.X + sty.Radius, Y: pt.Y})
	p.Arc(pt, sty.Radius, 0, 2*math.Pi)
	p.Close()
	c.SetColor(sty.Color)
	c.Fill(p)
	c.SetLineStyle(draw.LineStyle{Color: g.rim, Width: px(0.7)})
	c.Stroke(p)
}

func darker(c color.RGBA, f float64, a float64) color.NRGBA {
	d := func(v uint8) uint8 { return uint8(math.Round(float64(v) * (1 - f))) }
	return color.NRGBA{R: d(c.R), G: d(c.G), B: d(c.B), A: uint8(math.Round(a * 255))}
}

// niceTicks labels an axis at 1, 2 or 5 times a power of ten, four to
// eight steps across, with a minor tick between labels and a true minus
// sign.
type niceTicks struct{}

func (niceTicks) Ticks(lo, hi float64) []plot.Tick {
	if !(hi > lo) {
		return []plot.Tick{{Value: lo, Label: formatNum(lo, 0)}}
	}
	raw := (hi - lo) / 6
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	step := mag
	for _, m := range []float64{1, 2, 5, 10} {
		if step = m * mag; (hi-lo)/step <= 8 {
			break
		}
	}
	d := 0
	for d < 10 && math.Abs(step*math.Pow(10, float64(d))-math.Round(step*math.Pow(10, float64(d)))) > 1e-6 {
		d++
	}
	var ticks []plot.Tick
	for k := math.Ceil(lo/step*2) / 2; k*step <= hi+step*1e-9; k += 0.5 {
		v := k * step
		if math.Abs(v) < step*1e-9 {
			v = 0
		}
		t := plot.Tick{Value: v}
		if k == math.Trunc(k) {
			t.Label = formatNum(v, d)
		}
		ticks = append(ticks, t)
	}
	return ticks
}

func withAlpha(c color.RGBA, a float64) color.NRGBA {
	return color.NRGBA{R: c.R, G: c.G, B: c.B, A: uint8(math.Round(a * 255))}
}

// quadrantLabels names the four quadrants of a Moran scatter in its
// corners, in plain words.
type quadrantLabels struct{ R float64 }

func (q quadrantLabels) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	st := textStyle(12, false, guideInk)
	pad := px(8)
	put := func(x, y float64, s string, right, upper bool) {
		st := st
		pt := vg.Point{X: trX(x), Y: trY(y)}
		if right {
			st.XAlign = text.XRight
			pt.X -= pad
		} else {
			pt.X += pad
		}
		if upper {
			st.YAlign = text.YTop
			pt.Y -= pad
		} else {
			st.YAlign = text.YBottom
			pt.Y += pad
		}
		c.FillText(st, pt, s)
	}
	put(q.R, q.R, "high, neighbours high", true, true)
	put(-q.R, q.R, "low, neighbours high", false, true)
	put(-q.R, -q.R, "low, neighbours low", false, false)
	put(q.R, -q.R, "high, neighbours low", true, false)
}

// Histogram plots the distribution of a statistic over the shuffles (null)
// and marks the observed value with a labelled line, the axis widened if
// it lies outside the shuffles' range. Bins follow the Freedman–Diaconis
// rule (width 2·IQR·n^(−1/3)), kept between 10 and 60 bins. NaN values of
// null are left out.
func Histogram(w io.Writer, f Format, null []float64, observed float64, opt ChartOptions) error {
	if err := f.check(); err != nil {
		return err
	}
	if math.IsNaN(observed) || math.IsInf(observed, 0) {
		return fmt.Errorf("plot: the observed value must be a finite number, got %v", observed)
	}
	W, H, ff, err := chartSetup(opt, 900, 560)
	if err != nil {
		return err
	}
	p, shuffles, err := histogramPlot(null, observed, cmp.Or(opt.XLabel, "statistic"), cmp.Or(opt.YLabel, "shuffles"))
	if err != nil {
		return err
	}
	items := []legendItem{
		{label: numtext.Count(shuffles) + " shuffles", c: barFill, kind: 2},
		{label: "observed value", c: observedInk, kind: 1},
	}
	fr := newFrame(ff, opt, W, H, items)
	return render(w, f, fr, ff, p, false)
}

// histogramPlot is the plot of a histogram of null with the observed
// value marked; shuffles is the number of values drawn (those not NaN).
func histogramPlot(null []float64, observed float64, xlabel, ylabel string) (p *plot.Plot, shuffles int, err error) {
	vals := make([]float64, 0, len(null))
	for i, v := range null {
		if math.IsNaN(v) {
			continue
		}
		if math.IsInf(v, 0) {
			return nil, 0, fmt.Errorf("plot: shuffle %d gave an infinite value", i+1)
		}
		vals = append(vals, v)
	}
	if len(vals) == 0 {
		return nil, 0, fmt.Errorf("plot: no shuffled values to draw")
	}
	slices.Sort(vals)
	bins := histBins(vals)
	p = newChart(xlabel, ylabel)
	h := &plotter.Histogram{Bins: bins, Width: bins[0].Max - bins[0].Min, FillColor: barFill}
	h.LineStyle = draw.LineStyle{Color: color.White, Width: px(0.8)}
	p.Add(h)
	top := 0.0
	for _, b := range bins {
		top = math.Max(top, b.Weight)
	}
	lo, hi := math.Min(bins[0].Min, observed), math.Max(bins[len(bins)-1].Max, observed)
	padX := (hi - lo) * 0.04
	p.X.Min, p.X.Max = lo-padX, hi+padX
	p.Y.Min, p.Y.Max = 0, top*1.16
	p.Add(observedMark{x: observed, top: top * 1.16, label: "observed " + formatStat(observed)})
	return p, len(vals), nil
}

func histBins(s []float64) []plotter.HistogramBin {
	n := len(s)
	lo, hi := s[0], s[n-1]
	if hi == lo {
		d := math.Max(math.Abs(lo)*0.05, 0.5)
		return []plotter.HistogramBin{{Min: lo - d, Max: lo + d, Weight: float64(n)}}
	}
	iqr := quantileSorted(s, 0.75) - quantileSorted(s, 0.25)
	k := int(math.Ceil(math.Sqrt(float64(n))))
	if iqr > 0 {
		width := 2 * iqr / math.Cbrt(float64(n))
		k = int(math.Ceil((hi - lo) / width))
	}
	k = min(max(k, 10), 60)
	width := (hi - lo) / float64(k)
	bins := make([]plotter.HistogramBin, k)
	for j := range bins {
		bins[j] = plotter.HistogramBin{Min: lo + float64(j)*width, Max: lo + float64(j+1)*width}
	}
	for _, v := range s {
		j := min(int((v-lo)/width), k-1)
		bins[j].Weight++
	}
	return bins
}

// quantileSorted interpolates linearly between order statistics.
func quantileSorted(s []float64, q float64) float64 {
	pos := q * float64(len(s)-1)
	i := int(pos)
	if i >= len(s)-1 {
		return s[len(s)-1]
	}
	return s[i] + (pos-float64(i))*(s[i+1]-s[i])
}

// observedMark is the vertical line at the observed value with its label,
// put on the side of the line with more room.
type observedMark struct {
	x, top float64
	label  string
}

func (m observedMark) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	x := trX(m.x)
	c.StrokeLine2(draw.LineStyle{Color: observedInk, Width: px(2.4)}, x, trY(0), x, trY(m.top))
	st := textStyle(13, true, observedInk)
	st.YAlign = text.YTop
	pt := vg.Point{X: x + px(7), Y: trY(m.top) - px(4)}
	if x-c.Min.X > (c.Max.X-c.Min.X)*0.6 {
		st.XAlign = text.XRight
		pt.X = x - px(7)
	}
	c.FillText(st, pt, m.label)
}
