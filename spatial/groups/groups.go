package groups

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/spatial/shuffle"
)

// Statistic names a group statistic.
type Statistic int

const (
	// DiffMedians is median(A) − median(B), in the outcome's units.
	DiffMedians Statistic = iota
	// DiffMeans is mean(A) − mean(B), in the outcome's units.
	DiffMeans
	// WelchT is Welch's t for mean(A) − mean(B) with unequal variances.
	WelchT
	// RankSum is the Mann–Whitney U of group A: the number of pairs (a, b)
	// with a > b, ties counting one half.
	RankSum
	// KruskalWallis is the Kruskal–Wallis H with the correction for ties.
	KruskalWallis
	// OneWayF is the one-way analysis-of-variance F ratio.
	OneWayF
)

var statNames = []struct {
	flag, label string
	twoOnly     bool
	unitful     bool
}{
	{"median-diff", "difference in medians", true, true},
	{"mean-diff", "difference in means", true, true},
	{"welch-t", "Welch t", true, false},
	{"rank-sum", "rank sum (Mann–Whitney U)", true, false},
	{"kruskal-wallis", "Kruskal–Wallis H", false, false},
	{"anova-f", "one-way F", false, false},
}

// Flag returns the name used on the command line.
func (s Statistic) Flag() string { return statNames[s].flag }

// String returns the name used in reports.
func (s Statistic) String() string { return statNames[s].label }

// TwoGroupsOnly reports whether the statistic is defined for exactly two
// groups.
func (s Statistic) TwoGroupsOnly() bool { return statNames[s].twoOnly }

// InOutcomeUnits reports whether the statistic is measured in the outcome's
// units (a difference) rather than being unitless.
func (s Statistic) InOutcomeUnits() bool { return statNames[s].unitful }

// Directional reports whether the statistic has a sign that says which group
// is higher; H and F only grow with separation, so their tests are one-sided
// by nature.
func (s Statistic) Directional() bool { return s.TwoGroupsOnly() }

// ParseStatistic reads a statistic's command-line name (case and
// surrounding space ignored).
func ParseStatistic(name string) (Statistic, error) {
	names := make([]choice.Name[Statistic], len(statNames))
	for i, s := range statNames {
		names[i] = choice.Name[Statistic]{Name: s.flag, Value: Statistic(i)}
	}
	return choice.Parse("statistic", name, names...)
}

// Data is an outcome prepared for group tests: values sorted ascending with
// their mid-ranks, and the group label of each sorted position.
type Data struct {
	// Sorted outcome values.
	Y []float64
	// Ranks are mid-ranks (1-based, ties averaged) of Y.
	Ranks []float64
	// Labels[i] is the group of the area at sorted position i (0..K−1).
	Labels []int32
	// Order[i] is the original index of the area at sorted position i.
	Order []int
	// K is the number of groups; Sizes their areas.
	K     int
	Sizes []int
	// tieTerm is Σ(t³ − t) over tied runs, for the Kruskal–Wallis correction.
	tieTerm float64
	// centred values and their total sum of squares, for mean-based
	// statistics (centring keeps the sums well conditioned).
	centred []float64
	ssTotal float64
	mean    float64
	// areaLabels is each area's group in area order, fixed for the life of
	// the Data (Reprepare changes only the outcome).
	areaLabels []int32
}

// Prepare sorts the outcome once. labels[i] in 0..k−1 is the group of area i.
// Every group needs at least two areas.
func Prepare(y []float64, labels []int32, k int) (*Data, error) {
	n := len(y)
	if len(labels) != n {
		return nil, fmt.Errorf("groups: %d labels for %d values", len(labels), n)
	}
	if k < 2 {
		return nil, fmt.Errorf("groups: need at least two groups, have %d", k)
	}
	d := &Data{Y: make([]float64, n), Ranks: make([]float64, n), Labels: make([]int32, n),
		Order: make([]int, n), K: k, Sizes: make([]int, k), centred: make([]float64, n),
		areaLabels: append([]int32(nil), labels...)}
	for _, l := range labels {
		if l < 0 || int(l) >= k {
			return nil, fmt.Errorf("groups: label %d out of range", l)
		}
		d.Sizes[l]++
	}
	for g, s := range d.Sizes {
		if s < 2 {
			return nil, fmt.Errorf("groups: group %d has %d area(s); each group needs at least 2", g, s)
		}
	}
	return d, d.fill(y)
}

// Reprepare replaces the outcome by y, keeping each area's group, and sorts
// it into the same storage. Evaluators made by Factory before the call see
// the new outcome: they read the data when they run. The spatially
// constrained nulls use it to test one grouping on many surrogate outcomes
// without allocating.
func (d *Data) Reprepare(y []float64) error {
	if len(y) != len(d.Y) {
		return fmt.Errorf("groups: %d values for %d areas", len(y), len(d.Y))
	}
	return d.fill(y)
}

// fill sorts y (ties kept in area order) and computes everything the
// statistics read: sorted values and labels, centred values, their total
// sum of squares, mid-ranks and the tie term.
func (d *Data) fill(y []float64) error {
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("groups: value %d is %v", i, v)
		}
		d.Order[i] = i
	}
	// By value, ties by position: the order a stable sort gives, from the
	// faster unstable sort (each surrogate of the checks is sorted anew).
	slices.SortFunc(d.Order, func(a, b int) int {
		if c := cmp.Compare(y[a], y[b]); c != 0 {
			return c
		}
		return cmp.Compare(a, b)
	})
	n := len(y)
	var sum float64
	for i, o := range d.Order {
		d.Y[i] = y[o]
		d.Labels[i] = d.areaLabels[o]
		sum += y[o]
	}
	d.mean = sum / float64(n)
	d.ssTotal, d.tieTerm = 0, 0
	for i, v := range d.Y {
		d.centred[i] = v - d.mean
		d.ssTotal += d.centred[i] * d.centred[i]
	}
	for i := 0; i < n; {
		j := i + 1
		for j < n && d.Y[j] == d.Y[i] {
			j++
		}
		r := float64(i+j+1) / 2 // mean of 1-based ranks i+1..j
		for t := i; t < j; t++ {
			d.Ranks[t] = r
		}
		t := float64(j - i)
		d.tieTerm += t*t*t - t
		i = j
	}
	return nil
}

// Value computes the statistic for an arrangement of labels (in sorted
// order); it allocates, so use Factory in loops.
func (d *Data) Value(s Statistic, labels []int32) float64 {
	return d.Factory(s)()(labels)
}

// Observed computes the statistic for the observed labels.
func (d *Data) Observed(s Statistic) float64 { return d.Value(s, d.Labels) }

// Factory returns evaluators of s for the shuffle machinery. For two-group
// statistics group 0 is A and group 1 is B, so differences read A − B.
func (d *Data) Factory(s Statistic) shuffle.Factory {
	switch s {
	case DiffMedians:
		return d.diffMedians()
	case DiffMeans:
		return d.diffMeans()
	case WelchT:
		return d.welchT()
	case RankSum:
		return d.rankSum()
	case KruskalWallis:
		return d.kruskalWallis()
	case OneWayF:
		return d.oneWayF()
	}
	panic(fmt.Sprintf("groups: unknown statistic %d", s))
}

// OnOutcomes returns an evaluator of s for outcomes that change while each
// area keeps its group (the surrogate nulls, where the outcome moves and
// the labels stay): it re-sorts each outcome into d (Reprepare) and
// evaluates the areas' own labels, so the value is the one Observed gives
// and an evaluation allocates nothing. It changes d; make one Data per
// goroutine. An outcome Reprepare refuses (a non-finite value) gives NaN.
func (d *Data) OnOutcomes(s Statistic) shuffle.OutcomeEvaluator {
	eval := d.Factory(s)()
	return func(y []float64) float64 {
		if d.Reprepare(y) != nil {
			return math.NaN()
		}
		return eval(d.Labels)
	}
}

func (d *Data) diffMedians() shuffle.Factory {
	n := len(d.Y)
	nA, nB := d.Sizes[0], d.Sizes[1]
	a1, a2 := (nA-1)/2, nA/2
	b1, b2 := (nB-1)/2, nB/2
	first := [2]int{a1, b1}
	second := [2]int{a2, b2}
	last := [2]int{a2, b2}
	return func() shuffle.Evaluator {
		return func(lab []int32) float64 {
			// Walk the sorted values, counting each group, until both
			// middle elements of both groups have been passed. The
			// per-group state sits in arrays indexed by the label, so
			// the loop has no branch on the (random) label.
			var count [2]int
			var sum [2]float64
			for i := 0; i < n; i++ {
				l := lab[i] & 1
				c := count[l]
				hits := b2f(c == first[l]) + b2f(c == second[l])
				sum[l] += hits * d.Y[i]
				count[l] = c + 1
				if count[0] > last[0] && count[1] > last[1] {
					break
				}
			}
			return (sum[0] - sum[1]) / 2
		}
	}
}

func (d *Data) diffMeans() shuffle.Factory {
	nA, nB := float64(d.Sizes[0]), float64(d.Sizes[1])
	return func() shuffle.Evaluator {
		return func(lab []int32) float64 {
			// Multiplying by an indicator instead of branching: labels
			// arrive in random order, so a branch would be mispredicted
			// half the time.
			var sa float64
			for i, l := range lab {
				sa += d.centred[i] * inA[l&1]
			}
			// The centred values sum to zero, so group B's sum is −sa.
			return sa/nA + sa/nB
		}
	}
}

func (d *Data) welchT() shuffle.Factory {
	nA, nB := float64(d.Sizes[0]), float64(d.Sizes[1])
	return func() shuffle.Evaluator {
		return func(lab []int32) float64 {
			var sa, qa float64
			for i, l := range lab {
				c := d.centred[i] * inA[l&1]
				sa += c
				qa += c * c
			}
			sb, qb := -sa, d.ssTotal-qa
			ma, mb := sa/nA, sb/nB
			va := (qa - nA*ma*ma) / (nA - 1)
			vb := (qb - nB*mb*mb) / (nB - 1)
			return (ma - mb) / math.Sqrt(va/nA+vb/nB)
		}
	}
}

func (d *Data) rankSum() shuffle.Factory {
	nA := float64(d.Sizes[0])
	return func() shuffle.Evaluator {
		return func(lab []int32) float64 {
			var r float64
			for i, l := range lab {
				r += d.Ranks[i] * inA[l&1]
			}
			return r - nA*(nA+1)/2
		}
	}
}

func (d *Data) kruskalWallis() shuffle.Factory {
	N := float64(len(d.Y))
	return func() shuffle.Evaluator {
		sums := make([]float64, d.K)
		return func(lab []int32) float64 {
			// The tie correction is read here, not when the factory is
			// made, because Reprepare can change the ties.
			correction := 1 - d.tieTerm/(N*N*N-N)
			h := d.betweenGroups(lab, d.Ranks, sums)
			h = 12/(N*(N+1))*h - 3*(N+1)
			if correction <= 0 { // every value tied: no information
				return 0
			}
			return h / correction
		}
	}
}

func (d *Data) oneWayF() shuffle.Factory {
	N, K := float64(len(d.Y)), float64(d.K)
	return func() shuffle.Evaluator {
		sums := make([]float64, d.K)
		return func(lab []int32) float64 {
			between := d.betweenGroups(lab, d.centred, sums)
			within := d.ssTotal - between
			if within <= 0 {
				return math.Inf(1)
			}
			return (between / (K - 1)) / (within / (N - K))
		}
	}
}

// betweenGroups returns Σ_g S_g²/n_g, where S_g sums v over the positions
// labelled g; both H (on ranks) and F (on centred values) are built on it.
// sums is scratch space of length K.
func (d *Data) betweenGroups(lab []int32, v []float64, sums []float64) float64 {
	for g := range sums {
		sums[g] = 0
	}
	for i, l := range lab {
		sums[l] += v[i]
	}
	var b float64
	for g, s := range sums {
		b += s * s / float64(d.Sizes[g])
	}
	return b
}

// b2f is 1 for true and 0 for false; the compiler turns it into a flag
// move rather than a jump.
func b2f(b bool) float64 {
	var f float64
	if b {
		f = 1
	}
	return f
}

// inA maps a two-group label (0 = A, 1 = B) to its indicator of group A.
var inA = [2]float64{1, 0}

// Summary describes one group's outcome values.
type Summary struct {
	Areas  int     `json:"areas"`
	Mean   float64 `json:"mean"`
	Median float64 `json:"median"`
	SD     float64 `json:"sd"`
	Min    float64 `json:"min"`
	Max    float64 `json:"max"`
}

// Summaries returns one Summary per group for the observed labels.
func (d *Data) Summaries() []Summary {
	out := make([]Summary, d.K)
	vals := make([][]float64, d.K)
	for i, l := range d.Labels {
		vals[l] = append(vals[l], d.Y[i]) // already ascending
	}
	for g, v := range vals {
		m := len(v)
		var s float64
		for _, x := range v {
			s += x
		}
		mean := s / float64(m)
		var q float64
		for _, x := range v {
			q += (x - mean) * (x - mean)
		}
		out[g] = Summary{Areas: m, Mean: mean, Median: (v[(m-1)/2] + v[m/2]) / 2,
			SD: math.Sqrt(q / float64(m-1)), Min: v[0], Max: v[m-1]}
	}
	return out
}
