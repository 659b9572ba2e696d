package effective

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// PairBudget caps the work of the automatic choice of orders: every order
// is used while the pairs of areas within them number at most this many, so
// layers of up to about 7,000 areas always use every order, and larger ones
// the orders up to where the budget runs out (11 on the queen graph of the
// demo region with 85,000 areas). Each test walks these pairs twice.
const PairBudget = 25_000_000

// ErrTooFew is returned (wrapped) when the estimated effective sample size
// leaves too few degrees of freedom for a t-test: the variables are so
// strongly autocorrelated that the layer carries the information of three
// independent areas or fewer.
var ErrTooFew = errors.New("the effective sample size is too small for a t-test")

// ErrConstant is returned (wrapped) for a variable with no variation, whose
// correlation with anything is undefined.
var ErrConstant = errors.New("the variable is constant")

// Lags holds, for one neighbour graph, which areas lie at which contiguity
// order from each other, up to the largest order used. It depends only on
// the graph, so one Lags serves every pair of variables on the same areas;
// its methods only read it, so goroutines may share one.
type Lags struct {
	n      int
	orders int // K: the largest order with at least one pair (≤ the order asked for)
	// Symmetric binary adjacency in compressed rows.
	off, nb []int32
	// pairs[k-1] is the number of unordered pairs at order k.
	pairs []int64
	// For layers whose pairs fit in storedPairs, the pairs themselves, so
	// that a test reads a list instead of searching the graph again: the
	// pairs (s, v) with s < v are v = partner[first[s]:first[s+1]], at
	// orders order[first[s]:first[s+1]].
	first   []int64
	partner []int32
	order   []uint16
}

// storedPairs is the largest number of pairs NewLags keeps (6 bytes each,
// 48 MB at most), enough for every pair of a layer of 4,000 areas.
const storedPairs = 8_000_000

// NewLags prepares the contiguity orders 1..maxOrder of g. Links count in
// either direction and their weights are ignored: only which areas touch
// matters. maxOrder ≤ 0 asks for every order, up to the largest number of
// steps between two connected areas, unless the pairs within them would
// exceed PairBudget; the orders are then cut where the budget runs out,
// judged from breadth-first searches out of 64 areas spread through the
// layer (deterministic: the same graph always gets the same orders). The
// pairs of small layers (up to storedPairs of them) are kept, so that each
// test reads a list; larger layers are searched again for every test. Orders
// beyond the largest with a pair are dropped, so Orders may be smaller than
// maxOrder; a graph with no link at all is an error.
//
// Why every order by default: Dutilleul's estimate sums over all distance
// classes, and cutting them short sets the correlations of farther pairs to
// zero, which on strongly autocorrelated fields underestimates the variance
// of r and makes the test too lenient (on 20×20 lattices with SAR fields of
// ρ = 0.95, ten orders gave a size of 8.7% at the 5% level, every order
// 5.2%; 2,000 layers each).
func NewLags(g *weights.Graph, maxOrder int) (*Lags, error) {
	if g == nil || g.Len() == 0 {
		return nil, errors.New("effective: the neighbour graph has no areas")
	}
	if g.Asymmetric() > 0 {
		g = g.Symmetrised()
	}
	n := g.Len()
	l := &Lags{n: n, off: g.Offsets, nb: g.Neighbours}
	all := int64(n) * int64(n-1) / 2 // pairs of areas, linked or not
	// 64 searches cost less than 1% of a walk over every pair of a layer
	// of 6,400 areas or more, and tell how many pairs to expect.
	estimate := l.estimatePairs()
	if maxOrder <= 0 {
		maxOrder = n - 1
		if all > PairBudget {
			maxOrder = affordable(estimate, PairBudget)
		}
	}
	l.orders = max(min(maxOrder, n-1), 1)
	// One walk counts the pairs of each order and keeps them when they are
	// expected to fit; should the estimate fall short, keeping stops at
	// storedPairs and the pairs are walked instead.
	expect := min(all, int64(1.1*estimate[min(l.orders, len(estimate))-1])+1024)
	keep := l.orders <= math.MaxUint16 && expect <= storedPairs
	pairs := make([]int64, l.orders)
	var first []int64
	var partner []int32
	var order []uint16
	if keep {
		first = make([]int64, n+1)
		partner = make([]int32, 0, expect)
		order = make([]uint16, 0, expect)
	}
	l.walk(func(s, v int32, d int) {
		pairs[d-1]++
		if !keep {
			return
		}
		if len(partner) == storedPairs {
			keep, partner, order, first = false, nil, nil, nil
			return
		}
		partner = append(partner, v)
		order = append(order, uint16(d))
		first[s+1] = int64(len(partner))
	})
	k := l.orders
	for k > 0 && pairs[k-1] == 0 {
		k--
	}
	if k == 0 {
		return nil, errors.New("effective: the neighbour graph has no links, so the autocorrelation of the variables cannot be estimated")
	}
	// No order below the last one with pairs can be empty (a pair at order
	// k+1 has a path through an area at order k), so trimming the tail is
	// all that is needed.
	l.orders = k
	l.pairs = pairs[:k]
	if keep {
		// Areas with no pair after them keep the end of the one before.
		for i := 1; i <= n; i++ {
			first[i] = max(first[i], first[i-1])
		}
		l.first, l.partner, l.order = first, slices.Clip(partner), slices.Clip(order)
	}
	return l, nil
}

// estimatePairs estimates, for each number of steps d ≥ 1, the number of
// pairs of areas at most d steps apart: n/2 times the mean number of areas
// within d steps of an area, averaged over full breadth-first searches from
// 64 areas at evenly spaced indices. The last entry is the farthest any of
// those searches reached.
func (l *Lags) estimatePairs() []float64 {
	n := l.n
	const samples = 64
	var at []float64 // at[d-1]: areas at exactly d steps, summed over the samples
	dist := make([]int32, n)
	for i := range dist {
		dist[i] = -1
	}
	var frontier, next, touched []int32
	for k := 0; k < samples; k++ {
		s := int32(int64(k) * int64(n) / samples)
		dist[s] = 0
		touched = append(touched[:0], s)
		frontier = append(frontier[:0], s)
		for step := 1; len(frontier) > 0; step++ {
			next = next[:0]
			for _, u := range frontier {
				for _, v := range l.nb[l.off[u]:l.off[u+1]] {
					if dist[v] < 0 {
						dist[v] = int32(step)
						next = append(next, v)
						touched = append(touched, v)
					}
				}
			}
			if len(next) > 0 {
				if len(at) < step {
					at = append(at, 0)
				}
				at[step-1] += float64(len(next))
			}
			frontier, next = next, frontier
		}
		for _, v := range touched {
			dist[v] = -1
		}
	}
	if len(at) == 0 {
		return []float64{0}
	}
	within := make([]float64, len(at))
	var cum float64
	for d, c := range at {
		cum += c / samples
		within[d] = float64(n) * cum / 2
	}
	return within
}

// affordable returns the largest number of orders whose estimated pairs
// fit in budget, at least 1.
func affordable(within []float64, budget int64) int {
	for d, c := range within {
		if c > float64(budget) {
			return max(d, 1)
		}
	}
	return max(len(within), 1)
}

// Len returns the number of areas.
func (l *Lags) Len() int { return l.n }

// Orders returns K, the number of contiguity orders used.
func (l *Lags) Orders() int { return l.orders }

// Pairs returns the number of unordered pairs of areas at order k (1..K).
func (l *Lags) Pairs(k int) int64 { return l.pairs[k-1] }

// walk calls visit once for every unordered pair of areas s < v that are
// d ≤ orders steps apart, with d their order, in order of s. Unless the
// pairs are stored, it runs one breadth-first search per area, cut off at
// depth orders: each pair's order is its shortest-path length, so one
// search finds every order at once, and a large layer need not hold its
// pairs (the graphs of HigherOrder for fifteen orders of 85,000 areas would
// hold tens of millions of links, in memory, for each order).
func (l *Lags) walk(visit func(s, v int32, d int)) {
	if l.partner != nil {
		for s := 0; s < l.n; s++ {
			a, b := l.first[s], l.first[s+1]
			for k := a; k < b; k++ {
				visit(int32(s), l.partner[k], int(l.order[k]))
			}
		}
		return
	}
	n := l.n
	dist := make([]int32, n)
	for i := range dist {
		dist[i] = -1
	}
	var frontier, next, touched []int32
	for s := int32(0); int(s) < n; s++ {
		dist[s] = 0
		touched = append(touched[:0], s)
		frontier = append(frontier[:0], s)
		for step := 1; step <= l.orders && len(frontier) > 0; step++ {
			next = next[:0]
			for _, u := range frontier {
				for _, v := range l.nb[l.off[u]:l.off[u+1]] {
					if dist[v] >= 0 {
						continue
					}
					dist[v] = int32(step)
					next = append(next, v)
					touched = append(touched, v)
					if v > s {
						visit(s, v, step)
					}
				}
			}
			frontier, next = next, frontier
		}
		for _, v := range touched {
			dist[v] = -1
		}
	}
}

// Order is the estimated autocorrelation of the two variables at one
// contiguity order.
type Order struct {
	// Order is the number of steps between the paired areas.
	Order int `json:"order"`
	// Pairs is the number of pairs of areas at this order, each once.
	Pairs int64 `json:"pairs"`
	// Outcome and Group are Moran's I of the outcome and of the group
	// indicator on the binary graph of this order.
	Outcome float64 `json:"outcome"`
	Group   float64 `json:"group"`
}

// Result is the modified t-test of the association between an outcome and a
// group indicator.
type Result struct {
	// EffectiveSampleSize is n_eff = 1 + 1/σ²_r, at most Areas.
	EffectiveSampleSize float64 `json:"effective_sample_size"`
	// Areas is n, the number of areas tested.
	Areas int `json:"areas"`
	// Correlation is Pearson's r between outcome and indicator (the
	// point-biserial correlation): positive when the group's mean is higher.
	Correlation float64 `json:"correlation"`
	// CorrelationVariance is the estimated null variance σ²_r of r that the
	// test used, 1/(n_eff − 1): 1/(n − 1) for independent areas and when
	// Capped.
	CorrelationVariance float64 `json:"correlation_variance"`
	// T is r·√((n_eff − 2)/(1 − r²)), judged against Student's t with DF
	// degrees of freedom (n_eff − 2, not a whole number in general).
	T           float64 `json:"t"`
	DF          float64 `json:"df"`
	Alternative string  `json:"alternative"`
	PValue      float64 `json:"p_value"`
	// Capped is true when the estimate of n_eff came out at or above n, or
	// σ²_r at or below zero (the two variables' estimated autocorrelations
	// have opposite signs, or are noise around zero); n_eff is then taken
	// as n, so the modified test is never more lenient than the ordinary
	// one.
	Capped bool `json:"capped"`
	// OrdinaryT and OrdinaryPValue are the same test with n in place of
	// n_eff, which treats the areas as independent; for a 0/1 indicator it
	// is Student's pooled two-sample t-test.
	OrdinaryT      float64 `json:"ordinary_t"`
	OrdinaryPValue float64 `json:"ordinary_p_value"`
	// Orders lists the estimated autocorrelations the test used.
	Orders []Order `json:"orders"`
}

// Options tune a modified t-test.
type Options struct {
	// MaxOrder is the largest contiguity order used (NewLags); 0 means
	// every order, within PairBudget.
	MaxOrder    int
	Alternative shuffle.Alternative
}

// Test runs the modified t-test of the association between y and x on the
// neighbour graph g (one entry per area, in graph order). x is usually a 0/1
// group indicator, but any numeric variable will do. To test several
// variables on one graph, build the Lags once and use Lags.Test.
func Test(y, x []float64, g *weights.Graph, opt Options) (Result, error) {
	l, err := NewLags(g, opt.MaxOrder)
	if err != nil {
		return Result{}, err
	}
	return l.Test(y, x, opt.Alternative)
}

// Test runs the modified t-test of the association between y and x, both
// with one entry per area of the Lags' graph. With the alternative Greater
// the test asks whether r > 0 (for a group indicator: whether the group's
// mean is higher than the others').
func (l *Lags) Test(y, x []float64, alt shuffle.Alternative) (Result, error) {
	res, err := l.tests(y, [][]float64{x}, alt, func(int) string { return "second variable" })
	if err != nil {
		return Result{}, err
	}
	return res[0], nil
}

// Groups runs the modified t-test for a grouping: labels[i] in 0..k−1 is the
// group of area i. With two groups there is one result, for the indicator of
// group 0 (so a positive correlation reads "group 0 higher", the A − B
// convention of the group statistics); the indicator of group 1 would give
// the same test with the sign of r reversed. With k > 2 groups there are k
// results, result g testing group g against all the others pooled — a family
// of k tests that calls for a multiple-testing adjustment (shuffle.Adjust)
// when read together. Each group needs at least one area, and at least one
// area outside it.
func (l *Lags) Groups(y []float64, labels []int32, k int, alt shuffle.Alternative) ([]Result, error) {
	if len(labels) != l.n {
		return nil, fmt.Errorf("effective: %d labels for %d areas", len(labels), l.n)
	}
	if k < 2 {
		return nil, fmt.Errorf("effective: need at least two groups, have %d", k)
	}
	m := k
	if k == 2 {
		m = 1
	}
	xs := make([][]float64, m)
	for g := range xs {
		xs[g] = make([]float64, l.n)
	}
	for i, lab := range labels {
		if lab < 0 || int(lab) >= k {
			return nil, fmt.Errorf("effective: label %d of area %d is out of range 0..%d", lab, i, k-1)
		}
		if int(lab) < m {
			xs[lab][i] = 1
		}
	}
	return l.tests(y, xs, alt, func(g int) string { return fmt.Sprintf("indicator of group %d", g) })
}

// tests runs the modified t-test of y against each of xs, sharing one walk
// over the pairs of areas; name(v) names xs[v] in errors.
func (l *Lags) tests(y []float64, xs [][]float64, alt shuffle.Alternative, name func(int) string) ([]Result, error) {
	n := l.n
	if n < 4 {
		return nil, fmt.Errorf("effective: %d areas; the modified t-test needs at least four", n)
	}
	vars := append([][]float64{y}, xs...)
	z := make([][]float64, len(vars))
	ss := make([]float64, len(vars))
	for v, col := range vars {
		if len(col) != n {
			return nil, fmt.Errorf("effective: %d values for %d areas", len(col), n)
		}
		var err error
		if z[v], ss[v], err = centre(col); err != nil {
			if v == 0 {
				return nil, fmt.Errorf("effective: the outcome: %w", err)
			}
			return nil, fmt.Errorf("effective: the %s: %w", name(v-1), err)
		}
	}
	moran := l.correlograms(z, ss)
	rows := l.rowSums(moran)
	out := make([]Result, len(xs))
	for v := range xs {
		var cross float64
		for i, a := range z[0] {
			cross += a * z[v+1][i]
		}
		r := cross / math.Sqrt(ss[0]*ss[v+1])
		r = math.Max(-1, math.Min(1, r))
		res, err := l.finish(r, moran[0], moran[v+1], rows[0], rows[v+1], alt)
		if err != nil {
			if len(xs) > 1 {
				return nil, fmt.Errorf("the %s: %w", name(v), err)
			}
			return nil, err
		}
		out[v] = res
	}
	return out, nil
}

// centre returns x − mean(x) and its sum of squares (autocorr.Centre),
// rejecting non-finite and constant columns.
func centre(x []float64) ([]float64, float64, error) {
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, 0, fmt.Errorf("value %d is %v, not a finite number", i, v)
		}
	}
	z, ss, err := autocorr.Centre(x)
	if errors.Is(err, autocorr.ErrConstant) {
		return nil, 0, ErrConstant
	}
	return z, ss, err
}

// correlograms returns, for each centred variable, Moran's I at orders
// 1..K on the binary graphs of those orders.
func (l *Lags) correlograms(z [][]float64, ss []float64) [][]float64 {
	K := l.orders
	cross := make([]float64, len(z)*K)
	nv := len(z)
	l.walk(func(s, u int32, d int) {
		for v := 0; v < nv; v++ {
			cross[v*K+d-1] += z[v][s] * z[v][u]
		}
	})
	out := make([][]float64, nv)
	for v := range out {
		out[v] = make([]float64, K)
		for k := 0; k < K; k++ {
			// Each unordered pair was counted once, so both the sum over
			// ordered pairs and their number are twice what is held here.
			out[v][k] = float64(l.n) * cross[v*K+k] / (float64(l.pairs[k]) * ss[v])
		}
	}
	return out
}

// rowSums returns, for each correlogram a, the row sums of
// R = I + Σ_k a_k W_k, where W_k is the binary graph of order k. They take a
// second walk over the pairs rather than a table of each area's number of
// pairs at each order, which on a long, thin layer would hold n × K entries.
func (l *Lags) rowSums(a [][]float64) [][]float64 {
	out := make([][]float64, len(a))
	for v := range out {
		out[v] = make([]float64, l.n)
		for i := range out[v] {
			out[v][i] = 1
		}
	}
	l.walk(func(s, u int32, d int) {
		for v, c := range a {
			out[v][s] += c[d-1]
			out[v][u] += c[d-1]
		}
	})
	return out
}

// finish computes σ²_r, n_eff and the two t-tests from the correlograms
// a (outcome) and b (indicator) and the row sums of their matrices.
//
// With R_a = I + Σ_k a_k W_k, row sums ρ_i and total T_a (likewise R_b), and
// J = 11ᵀ/n, the traces expand without forming any n×n matrix:
//
//	tr(B R_a)       = n − T_a/n
//	tr(B R_a B R_b) = tr(R_a R_b) − 2 tr(J R_a R_b) + tr(J R_a J R_b)
//	                = (n + Σ_k a_k b_k N_k) − (2/n) Σ_i ρ_a,i ρ_b,i + T_a T_b/n²
//
// using that the order-k graphs do not overlap (so tr(W_k W_m) = N_k when
// k = m and 0 otherwise) and that R is symmetric.
func (l *Lags) finish(r float64, a, b, ra, rb []float64, alt shuffle.Alternative) (Result, error) {
	n := float64(l.n)
	ta, tb, ab := n, n, n
	orders := make([]Order, l.orders)
	for k := range a {
		pairs := 2 * float64(l.pairs[k]) // ordered pairs N_k
		ta += a[k] * pairs
		tb += b[k] * pairs
		ab += a[k] * b[k] * pairs
		orders[k] = Order{Order: k + 1, Pairs: l.pairs[k], Outcome: a[k], Group: b[k]}
	}
	var rr float64
	for i := range ra {
		rr += ra[i] * rb[i]
	}
	trA := n - ta/n
	trB := n - tb/n
	trAB := ab - 2*rr/n + ta*tb/(n*n)
	res := Result{Areas: l.n, Correlation: r, Alternative: alt.String(), Orders: orders}
	res.OrdinaryT, res.OrdinaryPValue = tTest(r, n-2, alt)
	if !(trA > 0 && trB > 0) {
		// The estimated correlations of one variable add up to a matrix
		// whose entries average one or more (every pair correlated at
		// nearly one): no independent information is left to estimate the
		// variance of r from.
		return res, fmt.Errorf("effective: %w: the estimated autocorrelations leave no independent information (tr(B·R) = %.3g and %.3g)", ErrTooFew, trA, trB)
	}
	// A numerator of zero or less (the two variables' estimated
	// correlations of opposite sign) or n_eff above n both mean the
	// estimate says r varies no more than for independent areas; the test
	// then falls back to the ordinary one instead of claiming more
	// information than the layer has.
	neff := n
	if trAB > 0 {
		neff = 1 + trA*trB/trAB
	}
	if neff >= n {
		neff, res.Capped = n, true
	}
	res.CorrelationVariance = 1 / (neff - 1)
	res.EffectiveSampleSize = neff
	if neff <= 3 {
		return res, fmt.Errorf("effective: %w: about %.2f independent areas, at least 3 are needed", ErrTooFew, neff)
	}
	res.DF = neff - 2
	res.T, res.PValue = tTest(r, res.DF, alt)
	return res, nil
}

// tTest returns t = r·√(df/(1 − r²)) and its p-value on df degrees of
// freedom. |r| = 1 leaves no residual variation: the p-value is then 0 in
// the direction of r, and t is reported as the largest finite number (JSON
// has no infinity).
func tTest(r, df float64, alt shuffle.Alternative) (t, p float64) {
	if 1-r*r <= 0 {
		t = math.Copysign(math.MaxFloat64, r)
	} else {
		t = r * math.Sqrt(df/(1-r*r))
	}
	dist := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}
	switch alt {
	case shuffle.Greater:
		p = dist.Survival(t)
	case shuffle.Less:
		p = dist.CDF(t)
	default:
		p = math.Min(1, 2*dist.Survival(math.Abs(t)))
	}
	return t, p
}
