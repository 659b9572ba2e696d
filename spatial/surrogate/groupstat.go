package surrogate

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
)

// GroupStatistic evaluates one of the group statistics of spatial/groups
// on outcomes that change from draw to draw while the grouping stays
// fixed: the surrogate null turned round from the label shuffles, where the
// outcome stays and the labels move. groups.Prepare sorts and allocates for
// each outcome; this sorts into scratch space that each evaluator owns, and
// then follows the definitions in spatial/groups operation for operation
// (same sorted order, ties broken by area index as a stable sort does, same
// sums in the same order), so on the observed outcome it returns the very
// value groups.Data.Observed does.
type GroupStatistic struct {
	stat   groups.Statistic
	labels []int32 // group of each area, in area order
	k      int
	sizes  []int
}

// NewGroupStatistic fixes the statistic and the grouping: labels[i] in
// 0..k−1 is the group of area i (group 0 is A and group 1 is B for the
// two-group statistics). Every group needs at least two areas.
func NewGroupStatistic(stat groups.Statistic, labels []int32, k int) (*GroupStatistic, error) {
	if k < 2 {
		return nil, fmt.Errorf("surrogate: need at least two groups, have %d", k)
	}
	if stat < groups.DiffMedians || stat > groups.OneWayF {
		return nil, fmt.Errorf("surrogate: unknown statistic %d", stat)
	}
	if stat.TwoGroupsOnly() && k != 2 {
		return nil, fmt.Errorf("surrogate: the %s compares two groups, not %d", stat, k)
	}
	g := &GroupStatistic{stat: stat, labels: append([]int32(nil), labels...), k: k, sizes: make([]int, k)}
	for _, l := range labels {
		if l < 0 || int(l) >= k {
			return nil, fmt.Errorf("surrogate: label %d out of range", l)
		}
		g.sizes[l]++
	}
	for gi, s := range g.sizes {
		if s < 2 {
			return nil, fmt.Errorf("surrogate: group %d has %d area(s); each group needs at least 2", gi, s)
		}
	}
	return g, nil
}

// Value computes the statistic for y (allocates; use Factory in loops).
func (g *GroupStatistic) Value(y []float64) float64 { return g.Factory()()(y) }

// Factory returns evaluators for shuffle.RunSurrogates, one per goroutine,
// each with its own scratch space; an evaluation allocates nothing.
func (g *GroupStatistic) Factory() func() shuffle.OutcomeEvaluator {
	return func() shuffle.OutcomeEvaluator {
		e := newGroupEval(g)
		return e.eval
	}
}

// keyed is one area's value with its index, so that sorting by (value,
// index) reproduces a stable sort by value.
type keyed struct {
	v float64
	i int32
}

func byValueThenIndex(a, b keyed) int {
	if c := cmp.Compare(a.v, b.v); c != 0 {
		return c
	}
	return cmp.Compare(a.i, b.i)
}

type groupEval struct {
	g       *GroupStatistic
	pairs   []keyed
	y       []float64 // sorted values
	lab     []int32   // labels in sorted order
	centred []float64
	ranks   []float64
	sums    []float64
	a, b    []float64 // the values of groups A and B, for selection
}

func newGroupEval(g *GroupStatistic) *groupEval {
	n := len(g.labels)
	e := &groupEval{g: g, pairs: make([]keyed, n), y: make([]float64, n), lab: make([]int32, n),
		centred: make([]float64, n), ranks: make([]float64, n), sums: make([]float64, g.k)}
	if g.stat == groups.DiffMedians {
		e.a, e.b = make([]float64, g.sizes[0]), make([]float64, g.sizes[1])
	}
	return e
}

func (e *groupEval) eval(y []float64) float64 {
	g := e.g
	if g.stat == groups.DiffMedians {
		return e.diffMedians(y)
	}
	// Sort as groups.Prepare does, then its sums over the sorted order.
	n := len(g.labels)
	for i, v := range y[:n] {
		e.pairs[i] = keyed{v, int32(i)}
	}
	slices.SortFunc(e.pairs, byValueThenIndex)
	var sum float64
	for i, p := range e.pairs {
		e.y[i] = p.v
		e.lab[i] = g.labels[p.i]
		sum += p.v
	}
	mean := sum / float64(n)
	var ssTotal float64
	for i, v := range e.y {
		e.centred[i] = v - mean
		ssTotal += e.centred[i] * e.centred[i]
	}
	switch g.stat {
	case groups.DiffMeans:
		nA, nB := float64(g.sizes[0]), float64(g.sizes[1])
		var sa float64
		for i, l := range e.lab {
			sa += e.centred[i] * inA[l&1]
		}
		return sa/nA + sa/nB
	case groups.WelchT:
		nA, nB := float64(g.sizes[0]), float64(g.sizes[1])
		var sa, qa float64
		for i, l := range e.lab {
			c := e.centred[i] * inA[l&1]
			sa += c
			qa += c * c
		}
		sb, qb := -sa, ssTotal-qa
		ma, mb := sa/nA, sb/nB
		va := (qa - nA*ma*ma) / (nA - 1)
		vb := (qb - nB*mb*mb) / (nB - 1)
		return (ma - mb) / math.Sqrt(va/nA+vb/nB)
	case groups.RankSum:
		e.midRanks()
		nA := float64(g.sizes[0])
		var r float64
		for i, l := range e.lab {
			r += e.ranks[i] * inA[l&1]
		}
		return r - nA*(nA+1)/2
	case groups.KruskalWallis:
		tieTerm := e.midRanks()
		N := float64(n)
		correction := 1 - tieTerm/(N*N*N-N)
		h := e.betweenGroups(e.ranks)
		h = 12/(N*(N+1))*h - 3*(N+1)
		if correction <= 0 {
			return 0
		}
		return h / correction
	case groups.OneWayF:
		N, K := float64(n), float64(g.k)
		between := e.betweenGroups(e.centred)
		within := ssTotal - between
		if within <= 0 {
			return math.Inf(1)
		}
		return (between / (K - 1)) / (within / (N - K))
	}
	return math.NaN() // not reached: NewGroupStatistic checked the statistic
}

// midRanks fills e.ranks with the 1-based mid-ranks of the sorted values
// and returns Σ(t³ − t) over tied runs.
func (e *groupEval) midRanks() float64 {
	n := len(e.y)
	var tieTerm float64
	for i := 0; i < n; {
		j := i + 1
		for j < n && e.y[j] == e.y[i] {
			j++
		}
		r := float64(i+j+1) / 2
		for t := i; t < j; t++ {
			e.ranks[t] = r
		}
		t := float64(j - i)
		tieTerm += t*t*t - t
		i = j
	}
	return tieTerm
}

// betweenGroups is Σ_g S_g²/n_g with S_g the sum of v over group g, in
// sorted order.
func (e *groupEval) betweenGroups(v []float64) float64 {
	for gi := range e.sums {
		e.sums[gi] = 0
	}
	for i, l := range e.lab {
		e.sums[l] += v[i]
	}
	var b float64
	for gi, s := range e.sums {
		b += s * s / float64(e.g.sizes[gi])
	}
	return b
}

// diffMedians needs only the two middle values of each group, found by
// selection in linear time instead of a sort. groups adds the middle
// values of a group (the one middle value twice for an odd size) and
// halves the difference of the sums; the same operations here give the
// same number.
func (e *groupEval) diffMedians(y []float64) float64 {
	na, nb := 0, 0
	for i, l := range e.g.labels {
		if l == 0 {
			e.a[na] = y[i]
			na++
		} else {
			e.b[nb] = y[i]
			nb++
		}
	}
	return (middleSum(e.a) - middleSum(e.b)) / 2
}

// middleSum returns x_((m−1)/2) + x_(m/2) of the sorted values, reordering
// x in place.
func middleSum(x []float64) float64 {
	m := len(x)
	lo, hi := (m-1)/2, m/2
	a := selectKth(x, lo)
	if hi == lo {
		return a + a
	}
	// After selection everything above position lo is ≥ x[lo]; the next
	// order statistic is the smallest of them.
	b := x[lo+1]
	for _, v := range x[lo+2:] {
		if v < b {
			b = v
		}
	}
	return a + b
}

// selectKth moves the k-th smallest value (0-based) of x to x[k], smaller
// ones before it and larger ones after, and returns it (Hoare's selection
// with a median-of-three pivot; values are finite, so the order is total).
func selectKth(x []float64, k int) float64 {
	lo, hi := 0, len(x)-1
	for hi > lo {
		mid := lo + (hi-lo)/2
		// Median of three to the middle, guarding against sorted input.
		if x[mid] < x[lo] {
			x[mid], x[lo] = x[lo], x[mid]
		}
		if x[hi] < x[lo] {
			x[hi], x[lo] = x[lo], x[hi]
		}
		if x[hi] < x[mid] {
			x[hi], x[mid] = x[mid], x[hi]
		}
		pivot := x[mid]
		i, j := lo, hi
		for i <= j {
			for x[i] < pivot {
				i++
			}
			for x[j] > pivot {
				j--
			}
			if i <= j {
				x[i], x[j] = x[j], x[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return x[k]
		}
	}
	return x[k]
}

// inA maps a two-group label (0 = A, 1 = B) to its indicator of group A.
var inA = [2]float64{1, 0}

// GroupTest runs the spectral surrogate test of a group statistic: its
// observed value (groups.Data.Observed, so that every scheme of a
// comparison reports the same number) against its values on p.Draws
// surrogates of o with the grouping of gs held fixed. p.Alternative is used
// as given (the comparison tests H and F in their upper tail only).
func GroupTest(o *Outcome, gs *GroupStatistic, observed float64, p shuffle.SurrogatePlan) (shuffle.Result, error) {
	if len(gs.labels) != o.Len() {
		return shuffle.Result{}, fmt.Errorf("surrogate: %d labels for %d areas", len(gs.labels), o.Len())
	}
	return shuffle.RunSurrogates(p, observed, o.NewDraw, gs.Factory(), o.Len())
}
