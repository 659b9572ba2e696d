package shuffle

import (
	"errors"
	"fmt"
	"math"
	"math/big"
	"sort"
	"sync/atomic"
)

// Evaluator computes a statistic for one arrangement of labels. It may keep
// scratch space between calls but must not keep or modify labels.
type Evaluator func(labels []int32) float64

// Factory makes one Evaluator per worker goroutine, so evaluators can own
// scratch space without locks.
type Factory func() Evaluator

// DefaultExactLimit is the largest number of distinct arrangements that Run
// enumerates in full instead of sampling.
const DefaultExactLimit = 1_000_000

// BlockSize is the number of Monte Carlo draws in one block of work. It is
// part of the definition of a seeded result: changing it changes the draws.
const BlockSize = 500

// Plan describes one permutation test.
type Plan struct {
	// Scheme names the null model in reports, e.g. "free" or "within province".
	Scheme string
	// Labels is the observed arrangement: one label per unit. The null model
	// permutes these labels among units (within strata when Strata is set).
	Labels []int32
	// Strata, when not nil, gives each unit a stratum; labels are exchanged
	// only between units of the same stratum.
	Strata []int32
	// Permutations is the number of Monte Carlo arrangements B, at most
	// MaxPermutations.
	Permutations int
	// ExactLimit: enumerate every distinct arrangement when there are at
	// most this many. 0 means DefaultExactLimit; negative never enumerates.
	ExactLimit int
	// Seed fixes the random streams; Purpose separates streams of different
	// tests that share a seed.
	Seed, Purpose uint64
	// Workers is the number of goroutines; 0 means all cores.
	Workers int
	// Alternative is the direction of the test.
	Alternative Alternative
	// Scale is the size of a typical value of the statistic (e.g. the range
	// of the outcome for a difference in its units; 1 for unitless
	// statistics). Null values within 1e-9·max(|observed|, Scale) of the
	// observed value count as ties, so that rounding in a sum does not
	// decide an exact p-value.
	Scale float64
	// KeepNull asks for every null value, in draw order, in Result.Null.
	KeepNull bool
	// Progress, when set, is called after each block of draws with the
	// number of draws done so far and the total. It is called from the
	// worker goroutines and must be safe for concurrent use; it has no
	// effect on the result.
	Progress func(done, total int)
	// Shard, when set, runs one part of the test's blocks or replays all
	// parts' (see Shard); nil runs them all. It cannot keep the null.
	Shard *Shard
}

// Result is the outcome of a permutation test.
type Result struct {
	Scheme      string  `json:"scheme"`
	Alternative string  `json:"alternative"`
	Observed    float64 `json:"observed"`
	PValue      float64 `json:"p_value"`
	// Permutations is the number of arrangements the null distribution
	// holds: B for Monte Carlo, every distinct arrangement when exact.
	Permutations int  `json:"permutations"`
	Exact        bool `json:"exact"`
	// Interval is the 95% Clopper–Pearson interval for the p-value that full
	// enumeration would give, from the Monte Carlo count; for an exact test
	// both ends equal the p-value.
	Interval [2]float64 `json:"interval"`
	// AtLeast and AtMost count null values ≥ and ≤ the observed one (ties
	// included).
	AtLeast  int     `json:"at_least"`
	AtMost   int     `json:"at_most"`
	NullMean float64 `json:"null_mean"`
	NullSD   float64 `json:"null_sd"`
	// Null holds every null value when Plan.KeepNull was set (nil
	// otherwise), never in the JSON. Monte Carlo: one value per draw, in
	// draw order — block by block, so the slice does not depend on
	// Workers. Exact: one value per distinct arrangement, in enumeration
	// order; every arrangement is equally likely under the null, so each
	// value counts once and no weights are needed (len(Null) is
	// Permutations either way). At most MaxPermutations values: 40 MB.
	Null []float64 `json:"-"`
}

// Run carries out the test planned in p on the statistic made by f.
func Run(p Plan, f Factory) (Result, error) {
	many := func() ManyEvaluator {
		eval := f()
		return func(labels []int32, out []float64) { out[0] = eval(labels) }
	}
	res, err := RunMany(p, []Statistic{{Alternative: p.Alternative, Scale: p.Scale}}, many)
	if err != nil {
		return Result{}, err
	}
	return res[0], nil
}

// ManyEvaluator computes several statistics for one arrangement, writing
// them into out (one slot per statistic). Like Evaluator it must not keep or
// modify labels.
type ManyEvaluator func(labels []int32, out []float64)

// ManyFactory makes one ManyEvaluator per worker goroutine.
type ManyFactory func() ManyEvaluator

// Statistic gives the direction and the scale (see Plan.Scale) of one of
// the statistics that RunMany tests together.
type Statistic struct {
	Alternative Alternative
	Scale       float64
}

// RunMany tests several statistics on the same arrangements: every
// statistic sees every draw, so the cost of shuffling is paid once. Each
// statistic gets its own Result, as if tested alone with these draws;
// Plan.Alternative and Plan.Scale are ignored in favour of stats.
func RunMany(p Plan, stats []Statistic, f ManyFactory) ([]Result, error) {
	n := len(p.Labels)
	k := len(stats)
	if n < 2 {
		return nil, errors.New("shuffle: need at least two units")
	}
	if k == 0 {
		return nil, errors.New("shuffle: no statistic to test")
	}
	for _, st := range stats {
		if st.Alternative == Folded {
			return nil, errors.New("shuffle: the folded alternative belongs to per-area conditional tests (RunLocal)")
		}
	}
	if p.Strata != nil && len(p.Strata) != n {
		return nil, fmt.Errorf("shuffle: %d strata for %d units", len(p.Strata), n)
	}
	if err := CheckCount("permutations", p.Permutations, MaxPermutations); err != nil {
		return nil, err
	}
	if err := checkShard(p.Shard, p.KeepNull); err != nil {
		return nil, err
	}
	groups := strataMembers(n, p.Strata)
	observed := make([]float64, k)
	f()(p.Labels, observed)
	c := comparison{observed: observed, tol: make([]float64, k)}
	res := make([]Result, k)
	for s, st := range stats {
		v := observed[s]
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("shuffle: the observed statistic is %v", v)
		}
		scale := st.Scale
		if !(scale > 0) {
			scale = 1
		}
		c.tol[s] = 1e-9 * math.Max(math.Abs(v), scale)
		res[s] = Result{Scheme: p.Scheme, Alternative: st.Alternative.String(), Observed: v}
	}

	limit := p.ExactLimit
	if limit == 0 {
		limit = DefaultExactLimit
	}
	if limit > 0 {
		if count, ok := arrangements(p.Labels, groups, limit); ok {
			// One block: part 1 enumerates, the other parts skip it.
			if err := p.Shard.Stage(p.Purpose, p.Scheme+" (exact)", 1, tallyShape(k)); err != nil {
				return nil, err
			}
			enumerate(p, groups, f, c, count, stats, res)
			return res, nil
		}
	}
	if p.Permutations < 1 {
		return nil, errors.New("shuffle: the number of permutations must be at least 1")
	}
	blocks := (p.Permutations + BlockSize - 1) / BlockSize
	if err := p.Shard.Stage(p.Purpose, p.Scheme, blocks, tallyShape(k)); err != nil {
		return nil, err
	}
	sample(p, groups, f, c, stats, res)
	return res, nil
}

// comparison holds the observed values and their tie tolerances.
type comparison struct {
	observed, tol []float64
}

// add counts one arrangement's values into the tallies (one per statistic).
func (c comparison) add(ts []tally, vals []float64) {
	for s, v := range vals {
		ts[s].add(v, c.observed[s], c.tol[s])
	}
}

// strataMembers lists the units of each stratum, in unit order; with no
// strata all units form one group. Strata with one unit cannot move and are
// left out.
func strataMembers(n int, strata []int32) [][]int32 {
	if strata == nil {
		all := make([]int32, n)
		for i := range all {
			all[i] = int32(i)
		}
		return [][]int32{all}
	}
	byStratum := map[int32][]int32{}
	var keys []int32
	for i, s := range strata {
		if _, ok := byStratum[s]; !ok {
			keys = append(keys, s)
		}
		byStratum[s] = append(byStratum[s], int32(i))
	}
	sort.Slice(keys, func(a, b int) bool { return keys[a] < keys[b] })
	var out [][]int32
	for _, k := range keys {
		if len(byStratum[k]) > 1 {
			out = append(out, byStratum[k])
		}
	}
	return out
}

// Arrangements returns the number of distinct arrangements of labels that the
// strata allow (the product over strata of multinomial coefficients), as an
// exact integer.
func Arrangements(labels []int32, strata []int32) *big.Int {
	total, _ := countArrangements(labels, strataMembers(len(labels), strata), nil)
	return total
}

// countArrangements multiplies the multinomial coefficients of the groups,
// stopping early (ok false) once the count exceeds limit, when given: the
// full count for a large layer has thousands of digits and is never needed.
func countArrangements(labels []int32, groups [][]int32, limit *big.Int) (total *big.Int, ok bool) {
	total = big.NewInt(1)
	for _, g := range groups {
		counts := map[int32]int64{}
		for _, u := range g {
			counts[labels[u]]++
		}
		// m!/(c1!·c2!·…) as a product of binomials C(c1+…+cj, cj).
		var seen int64
		for _, c := range sortedCounts(counts) {
			seen += c
			total.Mul(total, new(big.Int).Binomial(seen, c))
			if limit != nil && total.Cmp(limit) > 0 {
				return total, false
			}
		}
	}
	return total, true
}

func sortedCounts(m map[int32]int64) []int64 {
	keys := make([]int32, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(a, b int) bool { return keys[a] < keys[b] })
	out := make([]int64, len(keys))
	for i, k := range keys {
		out[i] = m[k]
	}
	return out
}

func arrangements(labels []int32, groups [][]int32, limit int) (int, bool) {
	total, ok := countArrangements(labels, groups, big.NewInt(int64(limit)))
	if !ok {
		return 0, false
	}
	return int(total.Int64()), true
}

// tally accumulates the comparison counts and moments of null values.
type tally struct {
	atLeast, atMost int
	sum, sumSq      float64
}

func (t *tally) add(v, observed, tol float64) {
	if v >= observed-tol {
		t.atLeast++
	}
	if v <= observed+tol {
		t.atMost++
	}
	t.sum += v
	t.sumSq += v * v
}

func (t *tally) merge(o tally) {
	t.atLeast += o.atLeast
	t.atMost += o.atMost
	t.sum += o.sum
	t.sumSq += o.sumSq
}

func finishMoments(res *Result, t tally, count int) {
	mean := t.sum / float64(count)
	res.NullMean = mean
	if count > 1 {
		v := (t.sumSq - float64(count)*mean*mean) / float64(count-1)
		res.NullSD = math.Sqrt(math.Max(v, 0))
	}
	res.AtLeast, res.AtMost = t.atLeast, t.atMost
}

// enumerate evaluates every distinct arrangement once, stepping each
// stratum through the lexicographic permutations of its labels like the
// wheels of an odometer.
func enumerate(p Plan, groups [][]int32, f ManyFactory, c comparison, count int, stats []Statistic, res []Result) {
	k := len(stats)
	labels := append([]int32(nil), p.Labels...)
	subs := make([][]int32, len(groups))
	for g, members := range groups {
		sub := make([]int32, len(members))
		for j, u := range members {
			sub[j] = labels[u]
		}
		sort.Slice(sub, func(a, b int) bool { return sub[a] < sub[b] })
		subs[g] = sub
		for j, u := range members {
			labels[u] = sub[j]
		}
	}
	ts := make([]tally, k)
	nulls := make([][]float64, k)
	if p.KeepNull {
		for s := range nulls {
			nulls[s] = make([]float64, 0, count)
		}
	}
	if p.Shard.take(p.Purpose, 0, ts) {
		enumerateAll(groups, subs, labels, f(), c, ts, nulls, p.KeepNull)
		p.Shard.keep(p.Purpose, 0, ts)
	}
	for s := range res {
		r := &res[s]
		r.Exact = true
		r.Permutations = count
		r.Null = nulls[s]
		finishMoments(r, ts[s], count)
		pg := float64(ts[s].atLeast) / float64(count)
		pl := float64(ts[s].atMost) / float64(count)
		r.PValue = combine(stats[s].Alternative, pg, pl)
		r.Interval = [2]float64{r.PValue, r.PValue}
	}
}

// enumerateAll steps through every arrangement from the sorted labels,
// counting each into ts (and nulls when keep).
func enumerateAll(groups [][]int32, subs [][]int32, labels []int32, eval ManyEvaluator, c comparison, ts []tally, nulls [][]float64, keep bool) {
	vals := make([]float64, len(ts))
	for {
		eval(labels, vals)
		c.add(ts, vals)
		if keep {
			for s, v := range vals {
				nulls[s] = append(nulls[s], v)
			}
		}
		g := 0
		for ; g < len(groups); g++ {
			more := nextPermutation(subs[g])
			for j, u := range groups[g] {
				labels[u] = subs[g][j]
			}
			if more {
				break
			}
		}
		if g == len(groups) {
			return
		}
	}
}

// nextPermutation rearranges s into the next lexicographic permutation and
// reports whether there was one; after the last it leaves s sorted ascending.
func nextPermutation(s []int32) bool {
	i := len(s) - 2
	for i >= 0 && s[i] >= s[i+1] {
		i--
	}
	if i < 0 {
		reverse(s)
		return false
	}
	j := len(s) - 1
	for s[j] <= s[i] {
		j--
	}
	s[i], s[j] = s[j], s[i]
	reverse(s[i+1:])
	return true
}

func reverse(s []int32) {
	for a, b := 0, len(s)-1; a < b; a, b = a+1, b-1 {
		s[a], s[b] = s[b], s[a]
	}
}

// sample draws p.Permutations random arrangements in fixed blocks, each block
// with its own stream, spread over the workers; the blocks' tallies are
// folded in block order a window at a time (forBlocksFolded).
func sample(p Plan, groups [][]int32, f ManyFactory, c comparison, stats []Statistic, res []Result) {
	B := p.Permutations
	k := len(stats)
	blocks := (B + BlockSize - 1) / BlockSize
	window := make([]tally, min(blocks, foldWindow)*k) // slot w, statistic s at w*k+s
	totals := make([]tally, k)
	var nulls [][]float64
	if p.KeepNull {
		nulls = make([][]float64, k)
		for s := range nulls {
			nulls[s] = make([]float64, B)
		}
	}
	var done atomic.Int64
	forBlocksFolded(blocks, p.Workers, func() func(int, int) {
		eval := f()
		labels := make([]int32, len(p.Labels))
		vals := make([]float64, k)
		var rng Stream
		return func(b, slot int) {
			// Every block starts from the observed arrangement, so its
			// draws depend only on (seed, block).
			lo, hi := b*BlockSize, min((b+1)*BlockSize, B)
			ts := window[slot*k : (slot+1)*k]
			clear(ts)
			if !p.Shard.take(p.Purpose, b, ts) {
				return
			}
			copy(labels, p.Labels)
			rng.Reset(p.Seed, p.Purpose, b)
			for d := lo; d < hi; d++ {
				shuffleGroups(&rng, labels, groups)
				eval(labels, vals)
				c.add(ts, vals)
				if nulls != nil {
					for s, v := range vals {
						nulls[s][d] = v
					}
				}
			}
			p.Shard.keep(p.Purpose, b, ts)
			if p.Progress != nil {
				p.Progress(int(done.Add(int64(hi-lo))), B)
			}
		}
	}, func(_, slot int) {
		for s := range totals {
			totals[s].merge(window[slot*k+s])
		}
	})
	for s := range res {
		r := &res[s]
		r.Permutations = B
		if nulls != nil {
			r.Null = nulls[s]
		}
		finishSampled(r, totals[s], B, stats[s].Alternative)
	}
}

// shuffleGroups applies a Fisher–Yates shuffle to the labels of each group of
// units. Shuffling the previous arrangement again gives a fresh uniform
// arrangement, so the labels need no reset between draws.
func shuffleGroups(rng *Stream, labels []int32, groups [][]int32) {
	if len(groups) == 1 && len(groups[0]) == len(labels) {
		// Free shuffle: the one group is every unit in order, so the
		// indirection through its member list can go.
		for i := len(labels) - 1; i > 0; i-- {
			j := rng.intN32(uint32(i + 1))
			labels[i], labels[j] = labels[j], labels[i]
		}
		return
	}
	for _, m := range groups {
		for i := len(m) - 1; i > 0; i-- {
			j := rng.intN32(uint32(i + 1))
			a, b := m[i], m[j]
			labels[a], labels[b] = labels[b], labels[a]
		}
	}
}

// combine turns the two one-sided p-values into the p-value of the chosen
// alternative. Two-sided doubles the smaller one-sided value (capped at 1),
// which needs no assumption that the null distribution is symmetric.
func combine(alt Alternative, pGreater, pLess float64) float64 {
	switch alt {
	case Greater:
		return pGreater
	case Less:
		return pLess
	}
	return math.Min(1, 2*math.Min(pGreater, pLess))
}
