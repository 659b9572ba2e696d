package figure

import (
	"cmp"
	"fmt"
	"io"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// LagPoint is a statistic at one lag of a correlogram.
type LagPoint struct {
	// Label names the lag on the axis: its neighbour order ("2") or its
	// distance class ("25–50").
	Label string
	// Value is the statistic at this lag; Low and High bound its 95%
	// interval under the null; Expected is its value without any
	// autocorrelation.
	Value, Low, High, Expected float64
}

// CorrelogramPanel is one variable's correlogram, its lags in order.
type CorrelogramPanel struct {
	Title string
	Lags  []LagPoint
}

// bandFill is the fill of the null interval: the bars' colour, since both
// show the null.
var bandFill = barFill

// Correlogram draws each panel's statistic against its lags (one step of
// the x axis each, labelled with LagPoint.Label) as a line with points in
// the observed colour, over the band of its interval under the null and a
// dashed reference line at the expected value. Panels are laid out as in
// MoranScatterPanels.
func Correlogram(w io.Writer, f Format, panels []CorrelogramPanel, opt ChartOptions) error {
	build := func(k int) (*plot.Plot, error) {
		p, err := correlogramPlot(panels[k].Lags, cmp.Or(opt.XLabel, "lag"), cmp.Or(opt.YLabel, "Moran's I"))
		if err == nil {
			panelTitle(p, panels[k].Title)
		}
		return p, err
	}
	key := func() []legendItem {
		return []legendItem{
			{label: "observed, at each lag", c: observedInk},
			{label: "95% interval under the null", c: bandFill, kind: 2},
			{label: "expected without autocorrelation", c: guideInk, kind: 1},
		}
	}
	return panelChart(w, f, opt, len(panels), 200, false, build, key)
}

// correlogramPlot is the plot of one correlogram; lag k (from 0) sits at
// x = k+1.
func correlogramPlot(lags []LagPoint, xlabel, ylabel string) (*plot.Plot, error) {
	if len(lags) == 0 {
		return nil, fmt.Errorf("plot: a correlogram needs at least one lag")
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	var band, line, expected plotter.XYs
	for k, l := range lags {
		for _, v := range []float64{l.Value, l.Low, l.High, l.Expected} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, fmt.Errorf("plot: lag %q has a value that is not a finite number", l.Label)
			}
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		if l.Low > l.High {
			return nil, fmt.Errorf("plot: lag %q: the interval %g to %g runs backwards", l.Label, l.Low, l.High)
		}
		x := float64(k + 1)
		band = append(band, plotter.XY{X: x, Y: l.High})
		line = append(line, plotter.XY{X: x, Y: l.Value})
		expected = append(expected, plotter.XY{X: x, Y: l.Expected})
	}
	// The reference line runs across the whole axis, so that it shows with
	// a single lag too.
	expected = append(plotter.XYs{{X: 0.5, Y: lags[0].Expected}}, expected...)
	expected = append(expected, plotter.XY{X: float64(len(lags)) + 0.5, Y: lags[len(lags)-1].Expected})
	for k := len(lags) - 1; k >= 0; k-- {
		band = append(band, plotter.XY{X: float64(k + 1), Y: lags[k].Low})
	}
	p := newChart(xlabel, ylabel)
	pad := math.Max((hi-lo)*0.08, 0.01)
	p.X.Min, p.X.Max = 0.5, float64(len(lags))+0.5
	p.Y.Min, p.Y.Max = lo-pad, hi+pad
	p.X.Tick.Marker = lagTicks(lags)
	if len(lags) > 1 {
		poly, err := plotter.NewPolygon(band)
		if err != nil {
			return nil, err
		}
		poly.Color = bandFill
		poly.LineStyle.Width = 0
		p.Add(poly)
	} else {
		// One lag: the band is a bar around it.
		p.Add(intervalBar{x: 1, lo: lags[0].Low, hi: lags[0].High})
	}
	ref, _ := plotter.NewLine(expected)
	ref.LineStyle = draw.LineStyle{Color: guideInk, Width: px(1.4), Dashes: []vg.Length{px(6), px(4)}}
	p.Add(ref)
	obs, _ := plotter.NewLine(line)
	obs.LineStyle = draw.LineStyle{Color: observedInk, Width: px(2)}
	p.Add(obs)
	dots, err := plotter.NewScatter(line)
	if err != nil {
		return nil, err
	}
	dots.GlyphStyle = draw.GlyphStyle{Color: observedInk, Radius: px(4.5), Shape: rimmedDot{rim: darker(observedInk, 0.4, 1)}}
	p.Add(dots)
	return p, nil
}

// lagTicks labels the x axis of a correlogram at each lag.
type lagTicks []LagPoint

func (t lagTicks) Ticks(_, _ float64) []plot.Tick {
	out := make([]plot.Tick, len(t))
	for k, l := range t {
		out[k] = plot.Tick{Value: float64(k + 1), Label: l.Label}
	}
	return out
}

// intervalBar is the null interval of a single lag: a bar half a step
// wide.
type intervalBar struct{ x, lo, hi float64 }

func (b intervalBar) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	x0, x1 := trX(b.x-0.25), trX(b.x+0.25)
	c.FillPolygon(bandFill, []vg.Point{{X: x0, Y: trY(b.lo)}, {X: x1, Y: trY(b.lo)}, {X: x1, Y: trY(b.hi)}, {X: x0, Y: trY(b.hi)}})
}
