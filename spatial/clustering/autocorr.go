package clustering

import (
	"errors"
	"fmt"
	"sort"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/weights"
)

// Autocorr computes the global clustering statistics of every variable of
// the input. Each variable is analysed on the areas that have a value, with
// the neighbour graph cut down to them.
func Autocorr(in Input, opt Options) (*Result, error) {
	n := len(in.IDs)
	if in.Graph == nil || in.Graph.Len() != n {
		return nil, errors.New("clustering: the graph does not match the layer")
	}
	res := &Result{Seed: opt.Seed, Input: in.File, Areas: n, Warnings: []string{}, Cautions: Cautions}
	all, err := weights.Restrict(in.Graph, present(n), in.IDs, in.Transform, in.KeepIslands)
	if err != nil {
		return nil, err
	}
	res.Weights = all.Summary
	res.Warnings = append(res.Warnings, all.Summary.Warnings...)
	if !in.KeepIslands {
		res.IslandsLeftOut = all.Summary.Islands
	}
	for c, col := range in.Numeric {
		v, err := in.variable(col, opt, uint64(100*(c+1)), res)
		if err != nil {
			return nil, err
		}
		res.Variables = append(res.Variables, v)
	}
	for c, cat := range in.Categorical {
		j, err := in.joins(cat, opt, uint64(100*(len(in.Numeric)+c+1)))
		if err != nil {
			return nil, err
		}
		res.Joins = append(res.Joins, j)
	}
	if in.Events != nil && in.Population != nil {
		r, err := in.rate(opt, res)
		if err != nil {
			return nil, err
		}
		res.Rate = r
	}
	return res, nil
}

func (in *Input) variable(col Column, opt Options, purpose uint64, res *Result) (Variable, error) {
	masks := [][]bool{col.Missing}
	if in.Against != nil {
		masks = append(masks, in.Against.Missing)
	}
	keep := present(len(in.IDs), masks...)
	v := Variable{Name: col.Name, Missing: len(in.IDs) - len(keep)}
	r, err := in.restrict(keep)
	if err != nil {
		return v, named(err, col.Name)
	}
	summary := r.Summary
	if v.Missing > 0 {
		v.Weights = &summary
	}
	v.Areas, v.Islands = len(r.Used), len(keep)-len(r.Used)
	x := pick(col.Values, keep, r.Used)
	alt := opt.Alternative
	m, err := autocorr.RunTest(x, r.Graph, planFor(opt, col.Name+": Moran's I", purpose, alt))
	if err != nil {
		return v, named(err, col.Name)
	}
	v.MoransI = fromMoran(m, alt)
	if v.Bounds, err = autocorr.MoranBounds(r.Graph); err != nil {
		return v, named(err, col.Name)
	}
	gt, err := autocorr.RunGeary(x, r.Graph, planFor(opt, col.Name+": Geary's C", purpose+1, flip(alt)))
	if err != nil {
		return v, named(err, col.Name)
	}
	v.GearysC = Statistic{Value: gt.GearysC, Expected: gt.Expected, VarianceNormality: gt.VarianceNormality,
		VarianceRandomisation: gt.VarianceRandomisation, ZNormality: gt.ZNormality, ZRandomisation: gt.ZRandomisation,
		PNormality: normalP(gt.ZNormality, flip(alt)), PRandomisation: normalP(gt.ZRandomisation, flip(alt)), Permutation: gt.Permutation}
	gg, err := autocorr.RunGeneralG(x, r.Graph, plan(opt, purpose+2, alt))
	switch {
	case errors.Is(err, autocorr.ErrNegative):
		count, firstID := 0, ""
		for k, val := range x {
			if val < 0 {
				if count == 0 {
					firstID = in.IDs[keep[r.Used[k]]]
				}
				count++
			}
		}
		v.GeneralGSkipped = fmt.Sprintf("General G needs values that are zero or more; %s has %d negative value(s), the first in area %q", col.Name, count, firstID)
	case errors.Is(err, autocorr.ErrConstant):
		v.GeneralGSkipped = "General G needs at least two values above zero"
	case err != nil:
		return v, named(err, col.Name)
	default:
		v.GeneralG = &Statistic{Value: gg.G, Expected: gg.Expected, VarianceRandomisation: gg.VarianceRandomisation,
			ZRandomisation: gg.ZRandomisation, PRandomisation: normalP(gg.ZRandomisation, alt), Permutation: gg.Permutation}
	}
	if in.Against != nil && in.Against.Name != col.Name {
		y := pick(in.Against.Values, keep, r.Used)
		b, err := autocorr.RunBivariate(x, y, r.Graph, plan(opt, purpose+3, alt))
		if err != nil {
			return v, named(err, col.Name+" against "+in.Against.Name)
		}
		v.Bivariate = &Bivariate{Against: in.Against.Name, Areas: len(x), Statistic: Statistic{Value: b.BivariateI,
			Expected: b.Expected, VarianceRandomisation: b.VarianceRandomisation, ZRandomisation: b.ZRandomisation,
			PRandomisation: normalP(b.ZRandomisation, alt), Permutation: b.Permutation}}
	}
	if in.Lags > 0 {
		graphs, err := autocorr.LagGraphs(r.Binary, in.Lags, weights.Transform(r.Summary.Transform))
		if err != nil {
			return v, named(err, col.Name)
		}
		// Orders beyond the widest reach of the graph have no links: stop
		// there and say so rather than fail.
		usable := graphs[:0]
		for _, g := range graphs {
			if g.Links() == 0 {
				break
			}
			usable = append(usable, g)
		}
		if len(usable) < in.Lags {
			res.Warnings = append(res.Warnings, fmt.Sprintf("%s: no two areas are %d steps apart, so the correlogram stops at order %d.", col.Name, len(usable)+1, len(usable)))
		}
		if v.Correlogram, err = autocorr.Correlogram(x, usable, plan(opt, purpose+4, alt)); err != nil {
			return v, named(err, col.Name)
		}
		for k := range v.Correlogram {
			v.CorrelogramClasses = append(v.CorrelogramClasses, fmt.Sprintf("order %d", k+1))
		}
	}
	if len(in.DistanceClasses) > 0 {
		var usable []*weights.Graph
		var names []string
		for _, class := range in.DistanceClasses {
			g, err := class.Subset(keep).Subset(r.Used).Transformed(weights.Transform(r.Summary.Transform))
			if err != nil {
				return v, named(err, col.Name)
			}
			if g.Links() == 0 {
				res.Warnings = append(res.Warnings, fmt.Sprintf("%s: no two areas with a value fall in the %s; the correlogram leaves it out.", col.Name, class.Kind))
				continue
			}
			usable = append(usable, g)
			names = append(names, class.Kind)
		}
		if len(usable) > 0 {
			if v.Correlogram, err = autocorr.Correlogram(x, usable, plan(opt, purpose+4, alt)); err != nil {
				return v, named(err, col.Name)
			}
			v.CorrelogramClasses = names
		}
	}
	return v, nil
}

func (in *Input) joins(cat Categories, opt Options, purpose uint64) (Joins, error) {
	keep := present(len(in.IDs), cat.Missing)
	j := Joins{Name: cat.Name, Missing: len(in.IDs) - len(keep)}
	r, err := in.restrict(keep)
	if err != nil {
		return j, named(err, cat.Name)
	}
	j.Areas = len(r.Used)
	seen := map[string]bool{}
	for _, u := range r.Used {
		seen[cat.Labels[keep[u]]] = true
	}
	for l := range seen {
		j.Levels = append(j.Levels, l)
	}
	sort.Strings(j.Levels)
	if len(j.Levels) < 2 {
		return j, named(fmt.Errorf("every area with a value has the same category %q; join counts need at least two", j.Levels[0]), cat.Name)
	}
	code := map[string]int32{}
	for k, l := range j.Levels {
		code[l] = int32(k)
	}
	codes := make([]int32, len(r.Used))
	for k, u := range r.Used {
		codes[k] = code[cat.Labels[keep[u]]]
	}
	// Joins count linked pairs, so the binary graph is the right one.
	if j.Test, err = autocorr.RunJoins(codes, r.Binary, plan(opt, purpose, opt.Alternative)); err != nil {
		return j, named(err, cat.Name)
	}
	return j, nil
}

func (in *Input) rate(opt Options, res *Result) (*Rate, error) {
	keep := present(len(in.IDs), in.Events.Missing, in.Population.Missing)
	rt := &Rate{Events: in.Events.Name, Population: in.Population.Name, Missing: len(in.IDs) - len(keep),
		Floored: []string{}, AboveOne: []string{}}
	name := in.Events.Name + "/" + in.Population.Name
	r, err := in.restrict(keep)
	if err != nil {
		return nil, named(err, name)
	}
	if rt.Missing > 0 {
		s := r.Summary
		rt.Weights = &s
	}
	rt.Areas = len(r.Used)
	ev := pick(in.Events.Values, keep, r.Used)
	pop := pick(in.Population.Values, keep, r.Used)
	// Check here, where areas can be named by id.
	for k, u := range r.Used {
		id := in.IDs[keep[u]]
		switch {
		case !(pop[k] > 0):
			return nil, fmt.Errorf("area %q: %s is %v; a rate needs a population above zero", id, in.Population.Name, pop[k])
		case ev[k] < 0:
			return nil, fmt.Errorf("area %q: %s is %v; event counts cannot be negative", id, in.Events.Name, ev[k])
		}
	}
	raw, err := autocorr.Rates(ev, pop)
	if err != nil {
		return nil, named(err, name)
	}
	alt := opt.Alternative
	m, err := autocorr.RunTest(raw, r.Graph, plan(opt, 50, alt))
	if err != nil {
		return nil, named(err, name)
	}
	rt.Raw = fromMoran(m, alt)
	eb, err := autocorr.EBMoran(ev, pop, r.Graph, plan(opt, 51, alt))
	if err != nil {
		return nil, named(err, name)
	}
	rt.EB = fromMoran(eb.Moran, alt)
	rt.MeanRate = eb.Mean
	for _, k := range eb.Floored {
		rt.Floored = append(rt.Floored, in.IDs[keep[r.Used[k]]])
	}
	for _, k := range eb.AboveOne {
		rt.AboveOne = append(rt.AboveOne, in.IDs[keep[r.Used[k]]])
	}
	rt.Smallest, rt.Largest = pop[0], pop[0]
	for _, p := range pop {
		rt.Smallest, rt.Largest = min(rt.Smallest, p), max(rt.Largest, p)
	}
	if len(rt.AboveOne) > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d area(s) have more %s than %s (e.g. %s); that is fine for repeated events or person-time, but check the columns.", len(rt.AboveOne), in.Events.Name, in.Population.Name, rt.AboveOne[0]))
	}
	if rt.Largest > 20*rt.Smallest {
		res.Warnings = append(res.Warnings, fmt.Sprintf("Populations range from %.0f to %.0f: raw rates of the smallest areas swing widely by chance, so read the empirical-Bayes Moran's I rather than the raw one.", rt.Smallest, rt.Largest))
	}
	return rt, nil
}
