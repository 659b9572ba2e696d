package report

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/clustering"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// AutocorrPictures draws the pictures of the numeric variables of an
// autocorr result, one panel per variable in one file: the Moran scatter,
// the permutation distribution of Moran's I and the correlogram. Input
// and Options must be those the result was computed with: the scatter and
// the histogram are drawn from the variables' values and graphs, rebuilt
// from them.
type AutocorrPictures struct {
	Input   clustering.Input
	Options clustering.Options
	Result  *clustering.Result
}

// autocorrCaution ends the note of every picture of clustering.
const autocorrCaution = "Clusters are patterns across areas, not causes."

func (p AutocorrPictures) note() string {
	return fmt.Sprintf("%s · seed %d · %s shuffles per test · areatest %s. %s",
		p.Result.Input, p.Result.Seed, numtext.Count(p.Result.Shuffles()), p.Result.Version, autocorrCaution)
}

// errNoVariables is returned when the result has no numeric variable to draw.
var errNoVariables = errors.New("the result has no numeric variable to draw (join counts and rates have no pictures)")

func (p AutocorrPictures) names() string {
	var n []string
	for _, v := range p.Result.Variables {
		n = append(n, v.Name)
	}
	return strings.Join(n, ", ")
}

// perVariable makes one panel for each numeric variable of r, in order.
func perVariable[T any](r *clustering.Result, panel func(c int, v clustering.Variable) (T, error)) ([]T, error) {
	if len(r.Variables) == 0 {
		return nil, errNoVariables
	}
	out := make([]T, len(r.Variables))
	for c, v := range r.Variables {
		var err error
		if out[c], err = panel(c, v); err != nil {
			return nil, err
		}
	}
	return out, nil
}

// sample is variable c on the areas Autocorr analysed it on: its values
// x there and the restricted graph, as clustering chooses them (the areas
// with a value, and a value of Input.Against when set).
func (p AutocorrPictures) sample(c int) ([]float64, *weights.Restricted, error) {
	in := p.Input
	if c >= len(in.Numeric) || in.Numeric[c].Name != p.Result.Variables[c].Name {
		return nil, nil, fmt.Errorf("the pictures' input does not match the result (variable %d)", c+1)
	}
	col := in.Numeric[c]
	masks := [][]bool{col.Missing}
	if in.Against != nil {
		masks = append(masks, in.Against.Missing)
	}
	r, err := weights.Restrict(in.Graph, weights.Present(len(in.IDs), masks...), in.IDs, in.Scaling, in.KeepIslands)
	if err != nil {
		return nil, nil, err
	}
	return r.Pick(col.Values), r, nil
}

// MoranDraws returns the value of Moran's I in every shuffle of the
// permutation test of variable c (in Result.Variables), in draw order.
// clustering.Autocorr keeps no draws, so the test is run again with the
// same plan — the same seed, the same stream (purpose 100·(c+1), the
// first of the variable's streams) and the same number of shuffles — which
// gives the very draws of the reported test whatever the number of
// workers: it costs one more Moran's I test per variable.
func (p AutocorrPictures) MoranDraws(c int) ([]float64, error) {
	x, r, err := p.sample(c)
	if err != nil {
		return nil, err
	}
	opt := p.Options
	plan := shuffle.Plan{Scheme: "free", Permutations: opt.Permutations, ExactLimit: opt.ExactLimit, Seed: opt.Seed,
		Purpose: uint64(100 * (c + 1)), Workers: opt.Workers, Alternative: opt.Alternative, KeepNull: true}
	t, err := autocorr.RunTest(x, r.Graph, plan)
	if err != nil {
		return nil, fmt.Errorf("column %q: %w", p.Result.Variables[c].Name, err)
	}
	return t.Permutation.Null, nil
}

// Scatter draws the Moran scatter of each variable: its standardised
// values against the mean of their neighbours' (row-standardised weights
// of the run's graph), with the line through the origin whose slope,
// Σ z·lag / Σ z², is Moran's I on those weights.
func (p AutocorrPictures) Scatter(w io.Writer, f figure.Format) error {
	r := p.Result
	panels, err := perVariable(r, func(c int, v clustering.Variable) (figure.ScatterPanel, error) {
		x, rs, err := p.sample(c)
		if err != nil {
			return figure.ScatterPanel{}, err
		}
		z, lag, slope := scatterAxes(x, rs.Binary.RowStandardised())
		return figure.ScatterPanel{Title: fmt.Sprintf("%s: Moran's I %s", v.Name, Number(v.MoransI.Value)), Z: z, Lag: lag, Slope: slope}, nil
	})
	if err != nil {
		return err
	}
	sub := r.Weights.Kind + "; the lag is the mean of the neighbours"
	if s := weights.Scaling(r.Weights.Scaling); s != weights.RowStandardised {
		sub += fmt.Sprintf(" (row-standardised weights; the reported Moran's I uses %s weights)", s)
	}
	opt := figure.ChartOptions{Title: "Moran scatter of " + p.names(), Subtitle: sub, Note: p.note()}
	return figure.MoranScatterPanels(w, f, panels, opt)
}

// scatterAxes standardises x (mean 0, standard deviation 1 over the n
// areas) and returns the spatial lag of the standardised values on g, and
// the least-squares slope through the origin of lag on z.
func scatterAxes(x []float64, g *weights.Graph) (z, lag []float64, slope float64) {
	n := float64(len(x))
	var mean, ss float64
	for _, v := range x {
		mean += v
	}
	mean /= n
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	sd := math.Sqrt(ss / n)
	z, lag = make([]float64, len(x)), make([]float64, len(x))
	for i, v := range x {
		z[i] = (v - mean) / sd
	}
	var zl, zz float64
	for i := range x {
		nb, wt := g.Row(i)
		for k, j := range nb {
			lag[i] += wt[k] * z[j]
		}
		zl += z[i] * lag[i]
		zz += z[i] * z[i]
	}
	return z, lag, zl / zz
}

// Histogram draws the permutation distribution of Moran's I of each
// variable (MoranDraws) with the observed value marked.
func (p AutocorrPictures) Histogram(w io.Writer, f figure.Format) error {
	r := p.Result
	panels, err := perVariable(r, func(c int, v clustering.Variable) (figure.HistogramPanel, error) {
		draws, err := p.MoranDraws(c)
		title := fmt.Sprintf("%s: I = %s, p shuffle %s", v.Name, Number(v.MoransI.Value), PValue(v.MoransI.Permutation.PValue))
		return figure.HistogramPanel{Title: title, Draws: draws, Observed: v.MoransI.Value}, err
	})
	if err != nil {
		return err
	}
	opt := figure.ChartOptions{Title: "Moran's I of " + p.names() + " against shuffled maps",
		Subtitle: fmt.Sprintf("each panel: Moran's I of the values shuffled freely across the areas (%s); %s", r.Weights.Kind, r.Weights.Scaling),
		XLabel:   "Moran's I", YLabel: "shuffles", Note: p.note()}
	return figure.HistogramPanels(w, f, panels, opt)
}
