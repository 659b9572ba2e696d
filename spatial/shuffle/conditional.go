package shuffle

import (
	"errors"
	"fmt"
	"math"
	"math/bits"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/internal/parallel"
)

// Conditional permutation (Anselin 1995, Geogr. Anal. 27:93–115, section
// "Inference"): to test a statistic of one area i, its own value stays where
// it is and the other n−1 values are drawn at random, without replacement,
// into i's neighbour slots. Each area gets its own null distribution, so a
// per-area statistic is judged against the values it could have met, given
// its own.

// Folded is the alternative of the conditional test: the p-value counts the
// tail of the permutation distribution that the observed value falls in,
// (1 + min(AtLeast, AtMost))/(1 + B), the pseudo p-value of Anselin's
// conditional approach. It is not doubled, so it answers "how unusual is
// this area in the direction it departs", not "in either direction": under
// the null it falls at or below alpha for about 2·alpha of the areas, and
// it is to be read against alpha/2 for a two-sided level alpha. Which tail
// it counted shows in AtLeast and AtMost (the smaller one). Ties count on
// both sides, so where the usual form takes B − AtLeast for the lower tail
// (the draws strictly below) this one takes AtMost and is never smaller.
//
// Only RunLocal knows Folded; Run and RunMany reject it.
const Folded Alternative = 3

// ParseLocalAlternative reads "folded", "two-sided", "greater" or "less",
// in any case.
func ParseLocalAlternative(s string) (Alternative, error) {
	return choice.Parse("alternative", s, append([]choice.Name[Alternative]{{Name: "folded", Value: Folded}}, alternatives...)...)
}

// LocalEvaluator computes area i's statistic when the areas drawn fill its
// neighbour slots: drawn[k] is the area whose value sits in slot k (the k-th
// link of i's row), len(drawn) is i's number of neighbours, and i keeps its
// own value. It must not keep or modify drawn, and should not allocate: it
// runs once per draw.
type LocalEvaluator func(i int, drawn []int32) float64

// LocalFactory makes one LocalEvaluator per worker goroutine.
type LocalFactory func() LocalEvaluator

// DefaultLocalExactLimit is the largest number of slot fillings of one area
// that RunLocal enumerates in full instead of sampling.
const DefaultLocalExactLimit = 100_000

// LocalBlockSize is the number of areas a worker takes at a time. Draws do
// not depend on it (each area has its own stream); it only sets the grain of
// the work sharing.
const LocalBlockSize = 64

// LocalPlan describes a conditional permutation test of every area's
// statistic. The slots follow the compressed rows of a neighbour graph.
type LocalPlan struct {
	// Offsets: area i has the slots Offsets[i] to Offsets[i+1]−1, so its
	// degree is Offsets[i+1] − Offsets[i]; the number of areas is
	// len(Offsets) − 1.
	Offsets []int32
	// Neighbours is the observed filling of the slots (the real neighbours,
	// distinct and never i itself); the evaluator on them gives the
	// observed statistic.
	Neighbours []int32
	// Weights, aligned with Neighbours, is optional and only decides how
	// exact enumeration counts fillings. When nil every evaluator is taken
	// to be symmetric in its drawn values, so an area's distinct fillings
	// are the C(n−1, d) sets of neighbours. When set, an area whose slot
	// weights are all equal is enumerated the same way; one with unequal
	// weights is enumerated over the (n−1)!/(n−1−d)! ordered fillings.
	Weights []float64
	// Permutations is the number B of Monte Carlo draws per area, at most
	// MaxPermutations.
	Permutations int
	// ExactLimit: an area with at most this many distinct fillings is
	// enumerated in full. 0 means DefaultLocalExactLimit; negative never
	// enumerates. Areas with no neighbour have one filling and are always
	// "exact" unless ExactLimit is negative.
	ExactLimit int
	// Seed fixes the random streams: area i always draws from
	// NewStream(Seed, Purpose, i), whichever worker runs it.
	Seed, Purpose uint64
	// Workers is the number of goroutines; 0 means all cores.
	Workers int
	// Alternative is the direction of every area's test: Folded (the
	// tail the observed value falls in), Greater, Less, or TwoSided
	// (twice the smaller one-sided p-value, capped at 1).
	Alternative Alternative
	// Scale (or Scales, one per area, which wins when set) is the size of
	// a typical value of the statistic: null values within
	// 1e-9·max(|observed|, scale) of the observed one count as ties. 0
	// means 1.
	Scale  float64
	Scales []float64
	// KeepNull lists areas whose null values are kept, in draw (or
	// enumeration) order, in LocalResult.Null.
	KeepNull []int
}

// LocalResult is the outcome of one area's conditional permutation test.
type LocalResult struct {
	Observed float64 `json:"observed"`
	PValue   float64 `json:"p_value"`
	// Permutations is the number of fillings in the null distribution: B
	// for Monte Carlo, every distinct filling when exact.
	Permutations int  `json:"permutations"`
	Exact        bool `json:"exact"`
	// Interval is the 95% Clopper–Pearson interval for the p-value full
	// enumeration would give, from the count the p-value uses; both ends
	// equal the p-value when exact.
	Interval [2]float64 `json:"interval"`
	// AtLeast and AtMost count null values ≥ and ≤ the observed one, ties
	// included.
	AtLeast int `json:"at_least"`
	AtMost  int `json:"at_most"`
	// NullMean and NullSD are the mean and standard deviation of the null
	// values (divisor B − 1 for Monte Carlo draws, the number of fillings
	// for an exact distribution, which is then the whole population).
	NullMean float64 `json:"null_mean"`
	NullSD   float64 `json:"null_sd"`
	// Null holds the null values of the areas in LocalPlan.KeepNull.
	Null []float64 `json:"-"`
}

// RunLocal carries out the conditional permutation test of every area's
// statistic, computed by the evaluators f makes. Areas are independent:
// area i's draws come from its own stream, so its result does not depend on
// the number of workers or on which other areas there are. Memory is linear
// in the number of areas: only the kept null distributions are stored.
func RunLocal(p LocalPlan, f LocalFactory) ([]LocalResult, error) {
	n := len(p.Offsets) - 1
	if n < 2 {
		return nil, errors.New("shuffle: need at least two areas")
	}
	if err := p.check(n); err != nil {
		return nil, err
	}
	limit := p.ExactLimit
	if limit == 0 {
		limit = DefaultLocalExactLimit
	}
	// Decide every area's route before any work, so that a missing B is
	// an error up front, not halfway through.
	counts := make([]int, n) // fillings of area i when enumerated, else 0
	maxDeg, needDraws := 0, false
	for i := 0; i < n; i++ {
		d := int(p.Offsets[i+1] - p.Offsets[i])
		maxDeg = max(maxDeg, d)
		if limit > 0 {
			if c, ok := fillings(n-1, d, !p.interchangeable(i), limit); ok {
				counts[i] = c
				continue
			}
		}
		needDraws = true
	}
	if needDraws && p.Permutations < 1 {
		return nil, errors.New("shuffle: the number of permutations must be at least 1")
	}
	if err := CheckCount("permutations", p.Permutations, MaxPermutations); err != nil {
		return nil, err
	}
	res := make([]LocalResult, n)
	for _, i := range p.KeepNull {
		size := p.Permutations
		if counts[i] > 0 {
			size = counts[i]
		}
		res[i].Null = make([]float64, size)
	}
	errs := make([]error, n)
	blocks := (n + LocalBlockSize - 1) / LocalBlockSize
	parallel.ForBlocks(blocks, p.Workers, func() func(int) {
		w := newLocalWorker(n, maxDeg, f())
		return func(b int) {
			for i := b * LocalBlockSize; i < min((b+1)*LocalBlockSize, n); i++ {
				errs[i] = w.area(&p, i, counts[i], &res[i])
			}
		}
	})
	for _, err := range errs { // the first failing area, so the error is deterministic
		if err != nil {
			return nil, err
		}
	}
	return res, nil
}

// check rejects a plan whose slots do not describe a neighbour graph: the
// observed filling must be one of the fillings the test draws from.
func (p *LocalPlan) check(n int) error {
	if p.Offsets[0] != 0 || int(p.Offsets[n]) != len(p.Neighbours) {
		return fmt.Errorf("shuffle: offsets run from %d to %d for %d neighbours", p.Offsets[0], p.Offsets[n], len(p.Neighbours))
	}
	if p.Weights != nil && len(p.Weights) != len(p.Neighbours) {
		return fmt.Errorf("shuffle: %d weights for %d neighbours", len(p.Weights), len(p.Neighbours))
	}
	if p.Scales != nil && len(p.Scales) != n {
		return fmt.Errorf("shuffle: %d scales for %d areas", len(p.Scales), n)
	}
	seen := make([]int32, n) // stamp i+1 marks the neighbours of area i
	for i := 0; i < n; i++ {
		a, b := p.Offsets[i], p.Offsets[i+1]
		if b < a {
			return fmt.Errorf("shuffle: offsets decrease at area %d", i)
		}
		for _, j := range p.Neighbours[a:b] {
			switch {
			case j < 0 || int(j) >= n:
				return fmt.Errorf("shuffle: area %d has neighbour %d, out of range for %d areas", i, j, n)
			case int(j) == i:
				return fmt.Errorf("shuffle: area %d is its own neighbour", i)
			case seen[j] == int32(i+1):
				return fmt.Errorf("shuffle: area %d has neighbour %d twice", i, j)
			}
			seen[j] = int32(i + 1)
		}
	}
	for _, i := range p.KeepNull {
		if i < 0 || i >= n {
			return fmt.Errorf("shuffle: area %d to keep the null of is out of range for %d areas", i, n)
		}
	}
	return nil
}

// interchangeable reports whether the order of area i's slots cannot change
// a symmetric statistic: no weights given, or all of the row's equal.
func (p *LocalPlan) interchangeable(i int) bool {
	if p.Weights == nil {
		return true
	}
	w := p.Weights[p.Offsets[i]:p.Offsets[i+1]]
	for _, v := range w {
		if v != w[0] {
			return false
		}
	}
	return true
}

// fillings returns the number of ways to fill d slots from m values without
// replacement — C(m, d), or m!/(m−d)! when ordered — and whether it is at
// most limit. It stops as soon as the count passes the limit: for a real
// layer it has hundreds of digits.
func fillings(m, d int, ordered bool, limit int) (int, bool) {
	if d > m {
		return 0, false
	}
	c := uint64(1)
	if ordered {
		for k := 0; k < d; k++ {
			hi, lo := bits.Mul64(c, uint64(m-k))
			if hi != 0 || lo > uint64(limit) {
				return 0, false
			}
			c = lo
		}
		return int(c), true
	}
	k := min(d, m-d)
	// C(m, j+1) = C(m, j)·(m−j)/(j+1) stays an integer at every step, and
	// grows with j up to k ≤ m/2, so the limit can be tested on the way.
	for j := 0; j < k; j++ {
		hi, lo := bits.Mul64(c, uint64(m-j))
		if hi != 0 {
			return 0, false
		}
		c = lo / uint64(j+1)
		if c > uint64(limit) {
			return 0, false
		}
	}
	return int(c), true
}

// localWorker is one goroutine's scratch space.
type localWorker struct {
	eval LocalEvaluator
	// pool holds a permutation of the areas: the identity between areas,
	// with the current area swapped to the end so the first n−1 positions
	// are the values it may draw.
	pool []int32
	// swaps records the positions each draw swapped, to undo them.
	swaps []int32
	// comb and drawn serve exact enumeration.
	comb, drawn []int32
	rng         Stream
}

func newLocalWorker(n, maxDeg int, eval LocalEvaluator) *localWorker {
	w := &localWorker{eval: eval, pool: make([]int32, n), swaps: make([]int32, maxDeg),
		comb: make([]int32, maxDeg), drawn: make([]int32, maxDeg)}
	for i := range w.pool {
		w.pool[i] = int32(i)
	}
	return w
}

// localTally accumulates comparisons and moments of one area's null values.
// The sums are of differences from the observed value, which keeps the
// variance free of the cancellation of two large sums when the null
// distribution sits far from zero.
type localTally struct {
	atLeast, atMost int
	sum, sumSq      float64
}

// area tests area i, by enumerating its count fillings when count > 0,
// else by Monte Carlo.
func (w *localWorker) area(p *LocalPlan, i, count int, r *LocalResult) error {
	a, b := p.Offsets[i], p.Offsets[i+1]
	obs := w.eval(i, p.Neighbours[a:b])
	if math.IsNaN(obs) || math.IsInf(obs, 0) {
		return fmt.Errorf("shuffle: the observed statistic of area %d is %v", i, obs)
	}
	scale := p.Scale
	if p.Scales != nil {
		scale = p.Scales[i]
	}
	if !(scale > 0) {
		scale = 1
	}
	tol := 1e-9 * math.Max(math.Abs(obs), scale)
	d := int(b - a)
	var t localTally
	total := p.Permutations
	if count > 0 {
		total = count
		t = w.enumerate(i, d, !p.interchangeable(i), obs, tol, r.Null)
	} else {
		t = w.sample(p, i, d, obs, tol, r.Null)
	}
	finishLocal(r, p.Alternative, obs, t, total, count > 0)
	return nil
}

// sample draws p.Permutations fillings of area i's d slots from the other
// n−1 areas by a partial Fisher–Yates shuffle of the pool: d swaps give a
// uniform ordered draw without replacement. Undoing the swaps afterwards
// returns the pool to its starting order, so each area starts from the same
// pool whatever ran before it on this worker.
func (w *localWorker) sample(p *LocalPlan, i, d int, obs, tol float64, null []float64) localTally {
	pool, swaps := w.pool, w.swaps[:d]
	last := len(pool) - 1
	pool[i], pool[last] = pool[last], pool[i]
	w.rng.Reset(p.Seed, p.Purpose, i)
	m := uint32(last) // the values area i may draw: positions 0..n−2
	drawn := pool[:d]
	var t localTally
	lo, hi := obs-tol, obs+tol
	for draw := 0; draw < p.Permutations; draw++ {
		for k := range swaps {
			j := uint32(k) + w.rng.intN32(m-uint32(k))
			pool[k], pool[j] = pool[j], pool[k]
			swaps[k] = int32(j)
		}
		v := w.eval(i, drawn)
		for k := d - 1; k >= 0; k-- {
			j := swaps[k]
			pool[k], pool[j] = pool[j], pool[k]
		}
		if v >= lo {
			t.atLeast++
		}
		if v <= hi {
			t.atMost++
		}
		dv := v - obs
		t.sum += dv
		t.sumSq += dv * dv
		if null != nil {
			null[draw] = v
		}
	}
	pool[i], pool[last] = pool[last], pool[i]
	return t
}

// enumerate visits every filling of area i's d slots once: the d-subsets of
// the other areas in lexicographic order and, when the slots are ordered,
// every ordering of each subset.
func (w *localWorker) enumerate(i, d int, ordered bool, obs, tol float64, null []float64) localTally {
	m := len(w.pool) - 1
	comb, drawn := w.comb[:d], w.drawn[:d]
	// Position c of the other areas is area c, or c+1 past i.
	area := func(c int32) int32 {
		if c >= int32(i) {
			return c + 1
		}
		return c
	}
	for k := range comb {
		comb[k] = int32(k)
	}
	var t localTally
	seen := 0
	visit := func() {
		v := w.eval(i, drawn)
		if v >= obs-tol {
			t.atLeast++
		}
		if v <= obs+tol {
			t.atMost++
		}
		dv := v - obs
		t.sum += dv
		t.sumSq += dv * dv
		if null != nil {
			null[seen] = v
		}
		seen++
	}
	for {
		for k, c := range comb {
			drawn[k] = area(c)
		}
		if ordered {
			// drawn is ascending, the first of its orderings.
			for {
				visit()
				if !nextPermutation(drawn) {
					break
				}
			}
		} else {
			visit()
		}
		k := d - 1
		for k >= 0 && int(comb[k]) == m-d+k {
			k--
		}
		if k < 0 {
			break
		}
		comb[k]++
		for j := k + 1; j < d; j++ {
			comb[j] = comb[j-1] + 1
		}
	}
	return t
}

// finishLocal turns an area's tally into its result.
func finishLocal(r *LocalResult, alt Alternative, obs float64, t localTally, total int, exact bool) {
	r.Observed = obs
	r.Permutations = total
	r.Exact = exact
	r.AtLeast, r.AtMost = t.atLeast, t.atMost
	fn := float64(total)
	mean := t.sum / fn
	r.NullMean = obs + mean
	div := fn - 1
	if exact {
		div = fn
	}
	if div > 0 {
		r.NullSD = math.Sqrt(math.Max(0, (t.sumSq-fn*mean*mean)/div))
	}
	// The count the p-value rests on: the observed tail for Folded and the
	// two-sided test, the named tail otherwise.
	k := min(t.atLeast, t.atMost)
	switch alt {
	case Greater:
		k = t.atLeast
	case Less:
		k = t.atMost
	}
	var p float64
	if exact {
		p = float64(k) / fn
	} else {
		p = float64(1+k) / float64(1+total)
	}
	double := alt != Greater && alt != Less && alt != Folded
	if double {
		p = math.Min(1, 2*p)
	}
	r.PValue = p
	if exact {
		r.Interval = [2]float64{p, p}
		return
	}
	lo, hi := ClopperPearson(k, total, 0.95)
	if double {
		lo, hi = math.Min(1, 2*lo), math.Min(1, 2*hi)
	}
	r.Interval = [2]float64{lo, hi}
}
