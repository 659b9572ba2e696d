package figure

import (
	"cmp"
	"fmt"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"

	"github.com/areatest/areatest/internal/numtext"
)

// Pictures of several variables put one panel per variable in a grid, in
// the order given, row by row: one column for one panel, two for two to
// four, three from five on. Each panel has its own axes and its title
// above it; the frame (title, subtitle, key, note) is shared.

// MaxPanels is the most panels one picture holds.
const MaxPanels = 12

// Default size of one panel, in pixels, before the frame is added.
const (
	panelW = 560
	panelH = 470
)

// gridCols is the number of columns of a grid of n panels.
func gridCols(n int) int {
	switch {
	case n <= 1:
		return 1
	case n <= 4:
		return 2
	}
	return 3
}

// panelSetup checks the number of panels and sizes the picture: a side
// left 0 in opt gets room for the grid at the default panel size, with
// extraH pixels for the frame.
func panelSetup(opt ChartOptions, n int, extraH int) (w, h, cols int, ff *fontFaces, err error) {
	if n == 0 || n > MaxPanels {
		return 0, 0, 0, nil, fmt.Errorf("plot: a picture holds 1 to %d panels, got %d", MaxPanels, n)
	}
	cols = gridCols(n)
	rows := (n + cols - 1) / cols
	dw := int(2*margin) + cols*panelW + (cols-1)*int(panelGapPx)
	dh := extraH + rows*panelH + (rows-1)*int(panelGapPx)
	w, h, ff, err = chartSetup(opt, dw, dh)
	return w, h, cols, ff, err
}

// panelTitle heads a panel's plot with title.
func panelTitle(p *plot.Plot, title string) {
	p.Title.Text = title
	p.Title.TextStyle = textStyle(15, true, inkTitle)
	// Hung from the top of the panel, centred over it.
	p.Title.TextStyle.XAlign, p.Title.TextStyle.YAlign = text.XCenter, text.YTop
	p.Title.Padding = px(8)
}

// ScatterPanel is one variable's Moran scatter: the standardised values
// Z, their spatial lags Lag (NaN pairs are left out) and the slope of the
// line through the origin.
type ScatterPanel struct {
	Title  string
	Z, Lag []float64
	Slope  float64
}

// MoranScatterPanels draws the Moran scatter of each panel, as
// MoranScatter draws one without categories: grey points, the quadrants,
// the line of each panel's slope (named in its title by the caller).
func MoranScatterPanels(w io.Writer, f Format, panels []ScatterPanel, opt ChartOptions) error {
	build := func(k int) (*plot.Plot, error) {
		pn := panels[k]
		if len(pn.Lag) != len(pn.Z) {
			return nil, fmt.Errorf("plot: %d spatial lags for %d values", len(pn.Lag), len(pn.Z))
		}
		if math.IsNaN(pn.Slope) || math.IsInf(pn.Slope, 0) {
			return nil, fmt.Errorf("plot: the slope must be a finite number, got %v", pn.Slope)
		}
		sg, err := groupPoints(pn.Z, pn.Lag, nil, nil)
		if err != nil {
			return nil, err
		}
		p, err := scatterPlot(sg, pn.Slope, cmp.Or(opt.XLabel, "value (standardised)"), cmp.Or(opt.YLabel, "mean of the neighbours (standardised)"))
		if err == nil {
			panelTitle(p, pn.Title)
		}
		return p, err
	}
	key := func() []legendItem {
		return []legendItem{{label: "an area", c: pointGrey}, {label: "line through the points: its slope is Moran's I", c: lineInk, kind: 1}}
	}
	return panelChart(w, f, opt, len(panels), 230, true, build, key)
}

// panelChart draws the n panels that build makes (the plot of panel k,
// with its title) in a grid, under the frame of opt with the key that key
// returns once every panel is built; extraH and square as for panelSetup
// and renderPanels.
func panelChart(w io.Writer, f Format, opt ChartOptions, n, extraH int, square bool, build func(k int) (*plot.Plot, error), key func() []legendItem) error {
	if err := f.check(); err != nil {
		return err
	}
	W, H, cols, ff, err := panelSetup(opt, n, extraH)
	if err != nil {
		return err
	}
	plots := make([]*plot.Plot, n)
	for k := range n {
		if plots[k], err = build(k); err != nil {
			return fmt.Errorf("%w (panel %d)", err, k+1)
		}
	}
	fr := newFrame(ff, opt, W, H, key())
	return renderPanels(w, f, fr, ff, plots, cols, square)
}

// HistogramPanel is the permutation distribution of one variable's
// statistic: the value of every shuffle (NaN values are left out) and the
// observed value.
type HistogramPanel struct {
	Title    string
	Draws    []float64
	Observed float64
}

// HistogramPanels draws the histogram of each panel's draws with its
// observed value marked, as Histogram draws one.
func HistogramPanels(w io.Writer, f Format, panels []HistogramPanel, opt ChartOptions) error {
	counts := map[int]bool{}
	build := func(k int) (*plot.Plot, error) {
		pn := panels[k]
		if math.IsNaN(pn.Observed) || math.IsInf(pn.Observed, 0) {
			return nil, fmt.Errorf("plot: the observed value must be a finite number, got %v", pn.Observed)
		}
		p, n, err := histogramPlot(pn.Draws, pn.Observed, cmp.Or(opt.XLabel, "statistic"), cmp.Or(opt.YLabel, "shuffles"))
		if err == nil {
			counts[n] = true
			panelTitle(p, pn.Title)
		}
		return p, err
	}
	key := func() []legendItem {
		label := "shuffles"
		if len(counts) == 1 {
			for n := range counts {
				label = numtext.Count(n) + " shuffles in each panel"
			}
		}
		return []legendItem{{label: label, c: barFill, kind: 2}, {label: "observed value", c: observedInk, kind: 1}}
	}
	return panelChart(w, f, opt, len(panels), 200, false, build, key)
}
