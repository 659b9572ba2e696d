package figure

import (
	"fmt"
	"math"
	"slices"
	"sort"
)

// Classes is the rule that cuts a numeric variable into the classes of a
// choropleth.
type Classes int

const (
	// Quantile puts about the same number of areas in every class: with n
	// values sorted, class j (1-based) ends at the value of rank ⌈j·n/k⌉.
	// Ties are never split, so heavy ties give fewer, unequal classes.
	Quantile Classes = iota
	// NaturalBreaks chooses the breaks that minimise the total within-class
	// sum of squares (Fisher 1958, "On grouping for maximum homogeneity",
	// JASA 53:789–798; the classification Jenks made popular for maps). It
	// is solved exactly for any number of values, not approximated: see
	// naturalBreaks.
	NaturalBreaks
)

// String returns the plain name used in map legends.
func (c Classes) String() string {
	switch c {
	case Quantile:
		return "quantiles"
	case NaturalBreaks:
		return "natural breaks"
	}
	return fmt.Sprintf("Classes(%d)", int(c))
}

// MaxClasses is the largest number of classes a choropleth accepts; beyond
// it, neighbouring colours of a sequential palette can no longer be told
// apart on a map.
const MaxClasses = 9

// Breaks cuts values into at most k classes by rule c and returns the upper
// end of each class, ascending; the last is the largest value. A value v
// belongs to the first class whose upper end is ≥ v, so class j holds the
// values in (breaks[j−1], breaks[j]]. NaN values are ignored (they are
// missing); infinite values are an error. Fewer than k classes come back
// when there are fewer than k distinct values, or when quantile breaks fall
// on ties.
func Breaks(values []float64, c Classes, k int) ([]float64, error) {
	if k < 2 || k > MaxClasses {
		return nil, fmt.Errorf("plot: number of classes must be between 2 and %d, got %d", MaxClasses, k)
	}
	s := make([]float64, 0, len(values))
	for _, v := range values {
		if math.IsNaN(v) {
			continue
		}
		if math.IsInf(v, 0) {
			return nil, fmt.Errorf("plot: cannot classify an infinite value (%v)", v)
		}
		s = append(s, v)
	}
	if len(s) == 0 {
		return nil, fmt.Errorf("plot: no values to classify")
	}
	slices.Sort(s)
	switch c {
	case Quantile:
		return quantileBreaks(s, k), nil
	case NaturalBreaks:
		return naturalBreaks(s, k), nil
	}
	return nil, fmt.Errorf("plot: unknown classification %d", int(c))
}

// classOf returns the class of v for breaks from Breaks.
func classOf(breaks []float64, v float64) int {
	j := sort.SearchFloat64s(breaks, v)
	return min(j, len(breaks)-1)
}

func quantileBreaks(s []float64, k int) []float64 {
	n := len(s)
	out := make([]float64, 0, k)
	for j := 1; j < k; j++ {
		// ⌈j·n/k⌉ in integers, so no rounding decides a break.
		idx := (j*n+k-1)/k - 1
		b := s[max(idx, 0)]
		if (len(out) == 0 || b > out[len(out)-1]) && b < s[n-1] {
			out = append(out, b)
		}
	}
	return append(out, s[n-1])
}

// naturalBreaks solves Fisher's problem on the sorted values s: split them
// into k consecutive groups with the least total within-group sum of
// squares. Identical values are merged into one weighted point first (an
// optimal split never separates equal values: moving one copy across the
// boundary always lowers the cost), so m distinct values are classified.
//
// The dynamic programme D[j][i] = min over t of D[j−1][t] + SS(t+1..i) is
// evaluated with the divide-and-conquer optimisation: the optimal t is
// non-decreasing in i because the sum-of-squares cost satisfies the
// quadrangle inequality (the property behind the fast exact 1-D k-means of
// Wang & Song 2011, R Journal 3(2):29–33, and Grønlund et al. 2017,
// arXiv:1701.07204 — cited from memory). That costs O(k·m·log m) instead of
// O(k·m²), so 85,000 distinct values take milliseconds and no sampling is
// needed. The tests check it against the plain O(k·m²) programme and
// against brute force over every split.
func naturalBreaks(s []float64, k int) []float64 {
	xs, ws := distinctWeighted(s)
	m := len(xs)
	if m <= k {
		return xs
	}
	cost := newSSCost(xs, ws)
	prev := make([]float64, m) // D[j−1][i] for i = 0..m−1 (first i+1 points)
	for i := range m {
		prev[i] = cost.ss(0, i)
	}
	// from[j][i] is where the last group starts when the first i+1 points
	// form j+1 groups.
	from := make([][]int32, k)
	cur := make([]float64, m)
	for j := 1; j < k; j++ {
		from[j] = make([]int32, m)
		var solve func(lo, hi, optLo, optHi int)
		solve = func(lo, hi, optLo, optHi int) {
			if lo > hi {
				return
			}
			mid := (lo + hi) / 2
			best, bestT := math.Inf(1), -1
			for t := max(optLo, j); t <= min(mid, optHi); t++ {
				// The last group is points t..mid; the first t points form j groups.
				if c := prev[t-1] + cost.ss(t, mid); c < best {
					best, bestT = c, t
				}
			}
			cur[mid] = best
			from[j][mid] = int32(bestT)
			solve(lo, mid-1, optLo, bestT)
			solve(mid+1, hi, bestT, optHi)
		}
		solve(j, m-1, j, m-1)
		prev, cur = cur, prev
	}
	breaks := make([]float64, k)
	end := m - 1
	for j := k - 1; j >= 0; j-- {
		breaks[j] = xs[end]
		if j > 0 {
			end = int(from[j][end]) - 1
		}
	}
	return breaks
}

func distinctWeighted(s []float64) (xs, ws []float64) {
	for i, v := range s {
		if i > 0 && v == s[i-1] {
			ws[len(ws)-1]++
			continue
		}
		xs = append(xs, v)
		ws = append(ws, 1)
	}
	return xs, ws
}

// ssCost gives the weighted within-group sum of squares of any run of the
// sorted points from prefix sums. The values are centred first so that the
// difference of large prefix sums does not eat the digits.
type ssCost struct {
	w, s1, s2 []float64 // prefix sums, length m+1
}

func newSSCost(xs, ws []float64) ssCost {
	var tw, mean float64
	for i, x := range xs {
		tw += ws[i]
		mean += ws[i] * x
	}
	mean /= tw
	m := len(xs)
	c := ssCost{w: make([]float64, m+1), s1: make([]float64, m+1), s2: make([]float64, m+1)}
	for i, x := range xs {
		d := x - mean
		c.w[i+1] = c.w[i] + ws[i]
		c.s1[i+1] = c.s1[i] + ws[i]*d
		c.s2[i+1] = c.s2[i] + ws[i]*d*d
	}
	return c
}

// ss is the sum of squares of points a..b inclusive.
func (c ssCost) ss(a, b int) float64 {
	w := c.w[b+1] - c.w[a]
	s1 := c.s1[b+1] - c.s1[a]
	v := c.s2[b+1] - c.s2[a] - s1*s1/w
	return max(v, 0)
}
