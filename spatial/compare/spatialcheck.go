package compare

import (
	"errors"
	"fmt"
	"strings"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// spatialCheck computes Moran's I of the outcome and of each group
// indicator on the graph among the tested areas, with the scaling asked
// for. Areas with no neighbour there are left out (their spatial lag is
// undefined) unless the input keeps them, with a zero lag.
func (c *comparison) spatialCheck(res *Result) error {
	in, opt := c.in, c.opt
	r, err := weights.Restrict(in.Graph, c.keep, in.IDs, in.Scaling, in.KeepIslands)
	if err != nil {
		return err
	}
	res.Weights = r.Summary
	res.Warnings = append(res.Warnings, res.Weights.Warnings...)
	res.Autocorrelation.Alpha = opt.Alpha
	if linkedAreas := r.Summary.Areas - r.Summary.Islands; linkedAreas < 3 {
		res.Autocorrelation.Skipped = fmt.Sprintf("only %d of the %d tested areas have a neighbour among the tested areas, too few for Moran's I", linkedAreas, r.Summary.Areas)
		res.Warnings = append(res.Warnings, fmt.Sprintf("The spatial check could not run: %s.", res.Autocorrelation.Skipped))
		return nil
	}
	if err := c.morans(r.Graph, r.Used, res); err != nil {
		return err
	}
	switch w := res.Weights; {
	case w.Islands > 0 && in.KeepIslands:
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d tested area(s) have no neighbour (%s); they are kept in the spatial check with a spatial lag of zero.",
			w.Islands, listIDs(w.IslandIDs, w.Islands, 5)))
	case w.Islands > 0:
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d tested area(s) have no neighbour (%s) and are left out of the spatial check; they still count in the group test.",
			w.Islands, listIDs(w.IslandIDs, w.Islands, 5)))
	}
	significant := func(m VariableMoran) bool { return m.MoransI > m.Expected && m.PValue <= opt.Alpha }
	if significant(res.Autocorrelation.Outcome) {
		for _, m := range res.Autocorrelation.Group {
			if significant(m) {
				res.Autocorrelation.Clustered = true
				break
			}
		}
	}
	return nil
}

// morans tests Moran's I of the outcome and of the group indicators on g,
// the graph among the linked tested areas (positions into the tested
// areas).
func (c *comparison) morans(g *weights.Graph, linked []int, res *Result) error {
	in, opt := c.in, c.opt
	plan := shuffle.Plan{Scheme: "free", Permutations: opt.Permutations, ExactLimit: opt.ExactLimit,
		Seed: opt.Seed, Workers: opt.Workers, Alternative: shuffle.TwoSided, Shard: opt.Shard}
	ys := make([]float64, len(linked))
	for k, i := range linked {
		ys[k] = c.spatialY()[i]
	}
	plan.Purpose = streamMoranOutcome
	plan.Progress = opt.progress("Moran's I of " + in.OutcomeName)
	name := in.OutcomeName
	if c.rates != nil {
		name += " (empirical-Bayes standardised)"
	}
	outcome, err := moranOf(name, ys, g, plan)
	if err != nil {
		return dataErr("Moran's I of %s: %w", in.OutcomeName, err)
	}
	res.Autocorrelation.Outcome = outcome
	// With two groups one indicator carries all the information (the other
	// is its complement, with the same I).
	indicators := c.levels
	if len(c.levels) == 2 {
		indicators = c.levels[:1]
	}
	for k, level := range indicators {
		x := make([]float64, len(linked))
		for t, i := range linked {
			if c.lab[i] == int32(k) {
				x[t] = 1
			}
		}
		plan.Purpose = streamMoranGroup + uint64(k)
		name := in.GroupName + "=" + level
		plan.Progress = opt.progress("Moran's I of " + name)
		m, err := moranOf(name, x, g, plan)
		if errors.Is(err, autocorr.ErrConstant) {
			res.Warnings = append(res.Warnings, fmt.Sprintf("Every area with a neighbour has the same value of %s, so its clustering cannot be measured.", name))
			continue
		}
		if err != nil {
			return dataErr("Moran's I of %s: %w", name, err)
		}
		res.Autocorrelation.Group = append(res.Autocorrelation.Group, m)
	}
	return nil
}

func moranOf(name string, x []float64, g *weights.Graph, plan shuffle.Plan) (VariableMoran, error) {
	t, err := autocorr.RunTest(x, g, plan)
	if err != nil {
		return VariableMoran{}, err
	}
	return VariableMoran{Variable: name, MoransI: t.MoransI, Expected: t.Expected, PValue: t.Permutation.PValue,
		Permutations: t.Permutation.Permutations, Exact: t.Permutation.Exact}, nil
}

// listIDs lists up to max of ids, and how many more of total there are:
// ids may itself be cut short (weights.Summary lists only the first few
// islands), so the count comes from total, not from len(ids).
func listIDs(ids []string, total, max int) string {
	ids = ids[:min(len(ids), max)]
	if total <= len(ids) {
		return strings.Join(ids, ", ")
	}
	return strings.Join(ids, ", ") + fmt.Sprintf(" and %d more", total-len(ids))
}
