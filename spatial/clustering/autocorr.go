package clustering

import (
	"errors"
	"fmt"
	"sort"
	"strings"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/rates"
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
	all, err := weights.Restrict(in.Graph, weights.Present(n), in.IDs, in.Scaling, in.KeepIslands)
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

// variable computes everything reported for one numeric column on the
// areas that have a value (and a value of Against, when set).
func (in *Input) variable(col Column, opt Options, purpose uint64, res *Result) (Variable, error) {
	masks := [][]bool{col.Missing}
	if in.Against != nil {
		masks = append(masks, in.Against.Missing)
	}
	keep := weights.Present(len(in.IDs), masks...)
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
	x := r.Pick(col.Values)
	if err := checkMagnitude(x, in.IDs, r); err != nil {
		return v, named(err, col.Name)
	}
	sm := &sample{x: x, ids: in.IDs, r: r, opt: opt, purpose: purpose, res: res}
	if err := v.global(sm); err != nil {
		return v, named(err, col.Name)
	}
	if err := v.generalG(sm); err != nil {
		return v, named(err, col.Name)
	}
	if in.Against != nil && in.Against.Name != col.Name {
		y := r.Pick(in.Against.Values)
		if err := checkMagnitude(y, in.IDs, r); err != nil {
			return v, named(err, in.Against.Name)
		}
		b, err := autocorr.RunBivariate(x, y, r.Graph, plan(opt, purpose+3, opt.Alternative))
		if err != nil {
			return v, named(err, col.Name+" against "+in.Against.Name)
		}
		v.Bivariate = &Bivariate{Against: in.Against.Name, Areas: len(x), Statistic: Statistic{Value: b.BivariateI,
			Expected: b.Expected, VarianceRandomisation: b.VarianceRandomisation, ZRandomisation: b.ZRandomisation,
			PRandomisation: normalP(b.ZRandomisation, opt.Alternative), Permutation: b.Permutation}}
	}
	if in.Lags > 0 {
		if err := v.orderCorrelogram(sm, in.Lags); err != nil {
			return v, named(err, col.Name)
		}
	}
	if len(in.DistanceClasses) > 0 {
		if err := v.distanceCorrelogram(sm, in.DistanceClasses); err != nil {
			return v, named(err, col.Name)
		}
	}
	return v, nil
}

// sample is one numeric column on the areas it is analysed on, with what
// its tests share.
type sample struct {
	// x holds the values of the used areas: x[k] is area
	// ids[r.Areas[k]].
	x   []float64
	ids []string
	r   *weights.Restricted
	opt Options
	// purpose is the first of the column's shuffle streams.
	purpose uint64
	// res collects the warnings.
	res *Result
}

func (s *sample) id(k int) string { return s.ids[s.r.Areas[k]] }

// global sets Moran's I with its bounds and Geary's C.
func (v *Variable) global(s *sample) error {
	x, g, opt, purpose, alt := s.x, s.r.Graph, s.opt, s.purpose, s.opt.Alternative
	m, err := autocorr.RunTest(x, g, planFor(opt, v.Name+": Moran's I", purpose, alt))
	if err != nil {
		return err
	}
	v.MoransI = fromMoran(m, alt)
	if err := v.moranRange(s); err != nil {
		return err
	}
	gt, err := autocorr.RunGeary(x, g, planFor(opt, v.Name+": Geary's C", purpose+1, flip(alt)))
	if err != nil {
		return err
	}
	v.GearysC = Statistic{Value: gt.GearysC, Expected: gt.Expected, VarianceNormality: gt.VarianceNormality,
		VarianceRandomisation: gt.VarianceRandomisation, ZNormality: gt.ZNormality, ZRandomisation: gt.ZRandomisation,
		PNormality: normalP(gt.ZNormality, flip(alt)), PRandomisation: normalP(gt.ZRandomisation, flip(alt)), Permutation: gt.Permutation}
	return nil
}

// generalG sets General G, or says why it was skipped: it needs values
// that are zero or more.
func (v *Variable) generalG(s *sample) error {
	x, opt := s.x, s.opt
	gg, err := autocorr.RunGeneralG(x, s.r.Graph, plan(opt, s.purpose+2, opt.Alternative))
	switch {
	case errors.Is(err, autocorr.ErrNegative):
		count, firstID := 0, ""
		for k, val := range x {
			if val < 0 {
				if count == 0 {
					firstID = s.id(k)
				}
				count++
			}
		}
		v.GeneralGSkipped = fmt.Sprintf("General G needs values that are zero or more; %s has %d negative value(s), the first in area %q", v.Name, count, firstID)
	case errors.Is(err, autocorr.ErrConstant):
		v.GeneralGSkipped = "General G needs at least two values above zero"
	case err != nil:
		return err
	default:
		v.GeneralG = &Statistic{Value: gg.G, Expected: gg.Expected, VarianceRandomisation: gg.VarianceRandomisation,
			ZRandomisation: gg.ZRandomisation, PRandomisation: normalP(gg.ZRandomisation, opt.Alternative), Permutation: gg.Permutation}
	}
	return nil
}

// orderCorrelogram sets the correlogram over neighbour orders 1..lags.
// Orders beyond the widest reach of the graph have no links: it stops
// there and says so rather than fail.
func (v *Variable) orderCorrelogram(s *sample, lags int) error {
	graphs, err := autocorr.LagGraphs(s.r.Binary, lags, weights.Scaling(s.r.Summary.Scaling))
	if err != nil {
		return err
	}
	usable := graphs[:0]
	for _, g := range graphs {
		if g.Links() == 0 {
			break
		}
		usable = append(usable, g)
	}
	if len(usable) < lags {
		s.res.Warnings = append(s.res.Warnings, fmt.Sprintf("%s: no two areas are %d steps apart, so the correlogram stops at order %d.", v.Name, len(usable)+1, len(usable)))
	}
	if v.Correlogram, err = autocorr.Correlogram(s.x, usable, plan(s.opt, s.purpose+4, s.opt.Alternative)); err != nil {
		return err
	}
	for k := range v.Correlogram {
		v.CorrelogramClasses = append(v.CorrelogramClasses, fmt.Sprintf("order %d", k+1))
	}
	return nil
}

// distanceCorrelogram sets the correlogram over distance classes (graphs
// of all areas), each cut down to the analysed areas; a class without a
// pair of them is left out, with a warning.
func (v *Variable) distanceCorrelogram(s *sample, classes []*weights.Graph) error {
	var usable []*weights.Graph
	var names []string
	for _, class := range classes {
		g, err := class.Subset(s.r.Areas).Scaled(weights.Scaling(s.r.Summary.Scaling))
		if err != nil {
			return err
		}
		if g.Links() == 0 {
			s.res.Warnings = append(s.res.Warnings, fmt.Sprintf("%s: no two areas with a value fall in the %s; the correlogram leaves it out.", v.Name, class.Kind))
			continue
		}
		usable = append(usable, g)
		names = append(names, class.Kind)
	}
	if len(usable) == 0 {
		return nil
	}
	var err error
	if v.Correlogram, err = autocorr.Correlogram(s.x, usable, plan(s.opt, s.purpose+4, s.opt.Alternative)); err != nil {
		return err
	}
	v.CorrelogramClasses = names
	return nil
}

func (in *Input) joins(cat Categories, opt Options, purpose uint64) (Joins, error) {
	keep := weights.Present(len(in.IDs), cat.Missing)
	j := Joins{Name: cat.Name, Missing: len(in.IDs) - len(keep)}
	r, err := in.restrict(keep)
	if err != nil {
		return j, named(err, cat.Name)
	}
	j.Areas = len(r.Used)
	seen := map[string]bool{}
	for _, i := range r.Areas {
		seen[cat.Labels[i]] = true
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
	size := make([]int, len(j.Levels))
	for k, i := range r.Areas {
		codes[k] = code[cat.Labels[i]]
		size[codes[k]]++
	}
	if err := checkCategories(size); err != nil {
		return j, named(err, cat.Name)
	}
	// Joins count linked pairs, so the binary graph is the right one.
	if j.Test, err = autocorr.RunJoins(codes, r.Binary, plan(opt, purpose, opt.Alternative)); err != nil {
		return j, named(err, cat.Name)
	}
	return j, nil
}

func (in *Input) rate(opt Options, res *Result) (*Rate, error) {
	keep := weights.Present(len(in.IDs), in.Events.Missing, in.Population.Missing)
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
	ev := r.Pick(in.Events.Values)
	pop := r.Pick(in.Population.Values)
	// Check here, where areas can be named by id.
	for k, i := range r.Areas {
		id := in.IDs[i]
		switch {
		case !(pop[k] > 0):
			return nil, fmt.Errorf("area %q: %s is %v; a rate needs a population above zero", id, in.Population.Name, pop[k])
		case ev[k] < 0:
			return nil, fmt.Errorf("area %q: %s is %v; event counts cannot be negative", id, in.Events.Name, ev[k])
		}
	}
	raw, err := rates.Raw(ev, pop)
	if err != nil {
		return nil, named(err, name)
	}
	if err := checkMagnitude(raw, in.IDs, r); err != nil {
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
		rt.Floored = append(rt.Floored, in.IDs[r.Areas[k]])
	}
	for _, k := range eb.AboveOne {
		rt.AboveOne = append(rt.AboveOne, in.IDs[r.Areas[k]])
	}
	rt.Smallest, rt.Largest = pop[0], pop[0]
	for _, p := range pop {
		rt.Smallest, rt.Largest = min(rt.Smallest, p), max(rt.Largest, p)
	}
	if len(rt.AboveOne) > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d area(s) have more %s than %s (e.g. %s); that is fine for repeated events or person-time, but check the columns.", len(rt.AboveOne), in.Events.Name, in.Population.Name, rt.AboveOne[0]))
	}
	if unstable := rates.Unstable(ev, rates.DefaultUnstable); len(unstable) > 0 {
		ids := make([]string, 0, 5)
		for _, k := range unstable[:min(5, len(unstable))] {
			ids = append(ids, in.IDs[r.Areas[k]])
		}
		more := ""
		if len(unstable) > len(ids) {
			more = fmt.Sprintf(" and %d more", len(unstable)-len(ids))
		}
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d of %d areas have fewer than %d %s (%s%s): their rates are unstable, and a few chance events move them widely.",
			len(unstable), len(ev), rates.DefaultUnstable, in.Events.Name, strings.Join(ids, ", "), more))
	}
	if rt.Largest > 20*rt.Smallest {
		res.Warnings = append(res.Warnings, fmt.Sprintf("Populations range from %.0f to %.0f: raw rates of the smallest areas swing widely by chance, so read the empirical-Bayes Moran's I rather than the raw one.", rt.Smallest, rt.Largest))
	}
	return rt, nil
}

// checkMagnitude is autocorr.CheckMagnitude on the analysed areas of r,
// with the area of the value it names filled in from ids.
func checkMagnitude(x []float64, ids []string, r *weights.Restricted) error {
	err := autocorr.CheckMagnitude(x)
	var tl *autocorr.TooLargeError
	if errors.As(err, &tl) {
		tl.ID = ids[r.Areas[tl.Index]]
	}
	return err
}

// ErrNotCategories is matched (errors.Is) by every *NotCategoriesError.
var ErrNotCategories = errors.New("not a column of categories")

// NotCategoriesError refuses join counts on a text column whose values are
// not plainly categories: the rule is that more than half of its categories
// (among the analysed areas) have a single area, as in a column of names or
// codes. Join counts of such a column count almost no same-category joins
// and say nothing.
type NotCategoriesError struct {
	// Areas is the number of analysed areas, Levels the number of
	// categories among them, Single how many of those have one area.
	Areas, Levels, Single int
}

// Is makes errors.Is(err, ErrNotCategories) true.
func (e *NotCategoriesError) Is(target error) bool { return target == ErrNotCategories }

func (e *NotCategoriesError) Error() string {
	return fmt.Sprintf("%d categories among %d areas, %d of them with a single area: this does not look like a column of categories (names or codes?), and join counts need categories that several areas share", e.Levels, e.Areas, e.Single)
}

// checkCategories applies the rule of NotCategoriesError to the number of
// areas in each category.
func checkCategories(size []int) error {
	areas, single := 0, 0
	for _, s := range size {
		areas += s
		if s == 1 {
			single++
		}
	}
	if 2*single > len(size) {
		return &NotCategoriesError{Areas: areas, Levels: len(size), Single: single}
	}
	return nil
}
