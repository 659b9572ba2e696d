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
	if err := f.check(); err != nil {
		return err
	}
	W, H, cols, ff, err := panelSetup(opt, len(panels), 230)
	if err != nil {
		return err
	}
	plots := make([]*plot.Plot, len(panels))
	points := 0
	for k, pn := range panels {
		if len(pn.Lag) != len(pn.Z) {
			return fmt.Errorf("plot: panel %d: %d spatial lags for %d values", k+1, len(pn.Lag), len(pn.Z))
		}
		if math.IsNaN(pn.Slope) || math.IsInf(pn.Slope, 0) {
			return fmt.Errorf("plot: panel %d: the slope must be a finite number, got %v", k+1, pn.Slope)
		}
		sg, err := groupPoints(pn.Z, pn.Lag, nil, nil)
		if err != nil {
			return fmt.Errorf("panel %d: %w", k+1, err)
		}
		points = max(points, sg.n)
		if plots[k], err = scatterPlot(sg, pn.Slope, cmp.Or(opt.XLabel, "value (standardised)"), cmp.Or(opt.YLabel, "mean of the neighbours (standardised)")); err != nil {
			return err
		}
		panelTitle(plots[k], pn.Title)
	}
	items := []legendItem{{label: "an area", c: pointGrey}, {label: "line through the points: its slope is Moran's I", c: lineInk, kind: 1}}
	fr := newFrame(ff, opt, W, H, items)
	return renderPanels(w, f, fr, ff, plots, cols, true)
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
	if err := f.check(); err != nil {
		return err
	}
	W, H, cols, ff, err := panelSetup(opt, len(panels), 200)
	if err != nil {
		return err
	}
	plots := make([]*plot.Plot, len(panels))
	counts := map[int]bool{}
	for k, pn := range panels {
		if math.IsNaN(pn.Observed) || math.IsInf(pn.Observed, 0) {
			return fmt.Errorf("plot: panel %d: the observed value must be a finite number, got %v", k+1, pn.Observed)
		}
		var n int
		plots[k], n, err = histogramPlot(pn.Draws, pn.Observed, cmp.Or(opt.XLabel, "statistic"), cmp.Or(opt.YLabel, "shuffles"))
		if err != nil {
			return fmt.Errorf("panel %d: %w", k+1, err)
		}
		counts[n] = true
		panelTitle(plots[k], pn.Title)
	}
	key := "shuffles"
	if len(counts) == 1 {
		for n := range counts {
			key = numtext.Count(n) + " shuffles in each panel"
		}
	}
	items := []legendItem{
		{label: key, c: barFill, kind: 2},
		{label: "observed value", c: observedInk, kind: 1},
	}
	fr := newFrame(ff, opt, W, H, items)
	return renderPanels(w, f, fr, ff, plots, cols, false)
}
