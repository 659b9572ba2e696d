package compare

import (
	"errors"
	"fmt"

	"github.com/areatest/areatest/spatial/effective"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// effectiveSize runs the modified t-test (Dutilleul 1993) of the outcome
// against the group indicators on the binary graph among the tested areas,
// islands included as independent areas.
func (c *comparison) effectiveSize(res *Result) error {
	r, err := weights.Restrict(c.in.Graph, c.keep, c.in.IDs, weights.Binary, true)
	if err != nil {
		return err
	}
	if r.Graph.Links() == 0 {
		return nil
	}
	lags, err := effective.NewLags(r.Binary, 0)
	if err != nil {
		return err
	}
	k := c.k()
	out, err := lags.Groups(c.spatialY(), c.lab, k, c.opt.Alternative)
	if errors.Is(err, effective.ErrTooFew) || errors.Is(err, effective.ErrConstant) {
		res.Warnings = append(res.Warnings, fmt.Sprintf("The effective sample size could not be estimated: %v.", err))
		return nil
	}
	if err != nil {
		return err
	}
	if k > 2 {
		p := make([]float64, len(out))
		for g := range out {
			p[g] = out[g].PValue
		}
		adj := shuffle.Adjust(p, shuffle.Holm)
		for g := range out {
			out[g].PValue = adj[g]
		}
	}
	best := 0
	for g := range out {
		if out[g].EffectiveSampleSize < out[best].EffectiveSampleSize {
			best = g
		}
	}
	e := &EffectiveInfo{Result: out[best], Level: c.levels[best]}
	if k > 2 {
		e.Note = "each group against the others; the smallest effective sample size is shown, p-values Holm-adjusted across groups"
		for g := range out {
			e.ByGroup = append(e.ByGroup, EffectiveByGroup{Level: c.levels[g], Result: out[g]})
		}
	}
	res.EffectiveSampleSize = e
	return nil
}
