package local

import (
	"fmt"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Categories of an area, in plain words. An area whose p-value is above
// alpha is NotSignificant; an area with no neighbour is NoNeighbours
// whatever its p-value (its statistic cannot vary).
const (
	NotSignificant = "not significant"
	NoNeighbours   = "no neighbours"

	// Local Moran (and its cross form): the sign of the area's
	// standardised value, then of the lag of its neighbours' standardised
	// values (of y for the cross form). "high" means above the mean;
	// a value exactly at the mean counts as low.
	HighHigh = "high-high"
	LowLow   = "low-low"
	HighLow  = "high-low"
	LowHigh  = "low-high"

	// Local Geary: a significant c_i below its permutation mean means the
	// area resembles its neighbours (positive association), split by the
	// signs of the value and of the lag as for local Moran; above it, the
	// area differs from them (negative association).
	SimilarHigh  = "similar, high"
	SimilarLow   = "similar, low"
	SimilarMixed = "similar, mixed"
	Dissimilar   = "dissimilar"

	// Gi and Gi*: a significant statistic above its permutation mean
	// means the neighbourhood holds higher values than chance would put
	// there; below it, lower.
	HighCluster = "high cluster"
	LowCluster  = "low cluster"
)

// DefaultPermutations is the number of draws per area when Options leaves
// it at 0.
const DefaultPermutations = 999

// Options tune the conditional permutation tests.
type Options struct {
	// Permutations per area (0: DefaultPermutations) and the exact
	// enumeration limit per area (see shuffle.LocalPlan.ExactLimit).
	Permutations int
	ExactLimit   int
	Seed         uint64
	// Purpose separates the draws of different variables run on one seed;
	// each kind adds its own, so two kinds never share draws either.
	Purpose uint64
	Workers int
	// Alternative is the direction of every area's test. The zero value is
	// two-sided (doubled) as everywhere in the tool; shuffle.Folded, the
	// tail the observed value falls in, is the conditional approach of
	// Anselin 1995 and what DefaultOptions sets. A folded p-value is
	// one-sided in the direction the data chose: at alpha it flags about
	// 2·alpha of the areas of a map without any spatial structure.
	Alternative shuffle.Alternative
	// Alpha is the level at which an area counts as significant (0: 0.05).
	Alpha float64
	// Adjustment is applied to the n p-values; categories are read from
	// the adjusted ones unless RawCategories is set. With shuffle.None the
	// adjusted p-values equal the raw ones.
	Adjustment    shuffle.Adjustment
	RawCategories bool
	// KeepNull lists areas whose null values are kept in AreaResult.Null.
	KeepNull []int
}

// DefaultOptions returns 999 folded conditional permutations per area and
// alpha 0.05, without adjustment.
func DefaultOptions() Options {
	return Options{Permutations: DefaultPermutations, Alternative: shuffle.Folded, Alpha: 0.05}
}

func (o Options) withDefaults() Options {
	if o.Permutations == 0 {
		o.Permutations = DefaultPermutations
	}
	if o.Alpha == 0 {
		o.Alpha = 0.05
	}
	return o
}

// AreaResult is one area's statistic with its conditional permutation test.
type AreaResult struct {
	// Index is the area's row in the graph; the caller maps it to an id.
	Index int `json:"index"`
	// Value is the area's own value of x; Lag is Σ_j w_ij v_j over its
	// neighbours (never the area itself, even for Gi*) of the values v
	// that fill the neighbour slots (x, or y for the cross local
	// Moran), in their own units.
	Value float64 `json:"value"`
	Lag   float64 `json:"lag"`
	// Standardised is (x_i − x̄)/s and StandardisedLag the lag of the
	// standardised moving values: the two axes of a Moran scatter plot,
	// whose signs give the categories.
	Standardised    float64 `json:"standardised"`
	StandardisedLag float64 `json:"standardised_lag"`
	Neighbours      int     `json:"neighbours"`
	Statistic       float64 `json:"statistic"`
	// Expected and SD are the mean and standard deviation of the
	// statistic under conditional permutation; Z = (Statistic −
	// Expected)/SD, 0 when SD is 0.
	Expected float64 `json:"expected"`
	SD       float64 `json:"sd"`
	Z        float64 `json:"z"`
	// P is the permutation p-value, AdjustedP the value after the run's
	// adjustment for multiple testing (equal to P without one).
	P         float64 `json:"p"`
	AdjustedP float64 `json:"adjusted_p"`
	// PInterval is the 95% Clopper–Pearson interval of the Monte Carlo P.
	PInterval    [2]float64 `json:"p_interval"`
	Permutations int        `json:"permutations"`
	Exact        bool       `json:"exact"`
	Category     string     `json:"category"`
	// Null holds the null values of areas listed in Options.KeepNull.
	Null []float64 `json:"-"`
}

// Run computes kind for every area of g and tests each by conditional
// permutation. y is the second variable of CrossMoran (its values are
// the ones drawn into the neighbour slots) and nil for the other kinds.
// The p-values are adjusted and the areas classified as opt says.
func Run(kind Kind, x, y []float64, g *weights.Graph, opt Options) ([]AreaResult, error) {
	opt = opt.withDefaults()
	if !(opt.Alpha > 0 && opt.Alpha < 1) {
		return nil, fmt.Errorf("alpha must be between 0 and 1, not %v", opt.Alpha)
	}
	p, err := prepare(kind, x, y, g)
	if err != nil {
		return nil, err
	}
	plan := shuffle.LocalPlan{
		Offsets:      g.Offsets,
		Neighbours:   g.Neighbours,
		Weights:      g.Weights,
		Permutations: opt.Permutations,
		ExactLimit:   opt.ExactLimit,
		Seed:         opt.Seed,
		// Each kind its own streams: 0x10ca1 marks local statistics.
		Purpose:     opt.Purpose ^ (0x10ca1<<8 | uint64(kind)),
		Workers:     opt.Workers,
		Alternative: opt.Alternative,
		KeepNull:    opt.KeepNull,
	}
	tests, err := shuffle.RunLocal(plan, p.factory())
	if err != nil {
		return nil, fmt.Errorf("%s: %w", kind, err)
	}
	slotValues := x
	if kind == CrossMoran {
		slotValues = y
	}
	res := make([]AreaResult, len(x))
	for i := range res {
		t := tests[i]
		nb, w := g.Row(i)
		var lag float64
		for k, j := range nb {
			lag += w[k] * slotValues[j]
		}
		res[i] = AreaResult{
			Index: i, Value: x[i], Lag: lag,
			Standardised: p.std[i], StandardisedLag: p.lag[i],
			Neighbours: len(nb), Statistic: t.Observed,
			Expected: t.NullMean, SD: t.NullSD, Z: zScore(t.Observed, t.NullMean, t.NullSD),
			P: t.PValue, PInterval: t.Interval,
			Permutations: t.Permutations, Exact: t.Exact, Null: t.Null,
		}
	}
	Adjust(res, opt.Adjustment)
	Classify(kind, res, opt.Alpha, !opt.RawCategories)
	return res, nil
}

// zScore is 0 where the null distribution has no spread: the statistic
// cannot depart from anything, and JSON has no NaN.
func zScore(v, mean, sd float64) float64 {
	if !(sd > 0) {
		return 0
	}
	return (v - mean) / sd
}

// Adjust fills AdjustedP from P by method (shuffle.Adjust): the n areas
// of one map are n tests.
func Adjust(res []AreaResult, method shuffle.Adjustment) {
	p := make([]float64, len(res))
	for i, r := range res {
		p[i] = r.P
	}
	adj := shuffle.Adjust(p, method)
	for i := range res {
		res[i].AdjustedP = adj[i]
	}
}

// Classify sets every area's category at level alpha, on AdjustedP when
// adjusted is true and on P otherwise.
func Classify(kind Kind, res []AreaResult, alpha float64, adjusted bool) {
	for i := range res {
		r := &res[i]
		p := r.P
		if adjusted {
			p = r.AdjustedP
		}
		r.Category = category(kind, r, p <= alpha)
	}
}

func category(kind Kind, r *AreaResult, significant bool) string {
	switch {
	case r.Neighbours == 0:
		return NoNeighbours
	case !significant:
		return NotSignificant
	}
	high, lagHigh := r.Standardised > 0, r.StandardisedLag > 0
	switch kind {
	case Geary:
		switch {
		case r.Statistic > r.Expected:
			return Dissimilar
		case high && lagHigh:
			return SimilarHigh
		case !high && !lagHigh:
			return SimilarLow
		}
		return SimilarMixed
	case Gi, GiStar:
		if r.Statistic > r.Expected {
			return HighCluster
		}
		return LowCluster
	}
	switch {
	case high && lagHigh:
		return HighHigh
	case !high && !lagHigh:
		return LowLow
	case high:
		return HighLow
	}
	return LowHigh
}

// Summary describes one run over a map: what was tested, how, and how many
// areas fell in each category.
type Summary struct {
	Statistic    string  `json:"statistic"`
	Areas        int     `json:"areas"`
	Permutations int     `json:"permutations"`
	ExactAreas   int     `json:"exact_areas"`
	Alternative  string  `json:"alternative"`
	Adjustment   string  `json:"adjustment"`
	Alpha        float64 `json:"alpha"`
	// CategoriesFrom says which p-values the categories read: "raw" or
	// "adjusted".
	CategoriesFrom string `json:"categories_from"`
	Seed           uint64 `json:"seed"`
	// Total is Σ_i of the statistic: S0 · I for local Moran.
	Total       float64         `json:"total"`
	Significant int             `json:"significant"`
	Categories  []CategoryCount `json:"categories"`
}

// CategoryCount is the number of areas in one category.
type CategoryCount struct {
	Category string `json:"category"`
	Areas    int    `json:"areas"`
}

// Categories lists the categories kind can give, in report order.
func Categories(kind Kind) []string {
	switch kind {
	case Geary:
		return []string{SimilarHigh, SimilarLow, SimilarMixed, Dissimilar, NotSignificant, NoNeighbours}
	case Gi, GiStar:
		return []string{HighCluster, LowCluster, NotSignificant, NoNeighbours}
	}
	return []string{HighHigh, LowLow, HighLow, LowHigh, NotSignificant, NoNeighbours}
}

// legends gives the significant categories their legend line: the name
// and what it means in words.
var legends = map[string]string{
	HighHigh:     HighHigh + ": high, neighbours high",
	LowLow:       LowLow + ": low, neighbours low",
	HighLow:      HighLow + ": high, neighbours low",
	LowHigh:      LowHigh + ": low, neighbours high",
	SimilarHigh:  SimilarHigh + " (like neighbours, high)",
	SimilarLow:   SimilarLow + " (like neighbours, low)",
	SimilarMixed: SimilarMixed + " (like neighbours, mixed)",
	Dissimilar:   Dissimilar + " (unlike neighbours)",
	HighCluster:  HighCluster + ": high values around",
	LowCluster:   LowCluster + ": low values around",
}

// Legend returns the line of a category in a map legend: for a pattern its
// name and what it means ("high-high: high, neighbours high"), otherwise
// the name alone.
func Legend(category string) string {
	if l, ok := legends[category]; ok {
		return l
	}
	return category
}

// Summarise gathers the run-level figures of res, the result of Run with
// opt.
func Summarise(kind Kind, res []AreaResult, opt Options) Summary {
	opt = opt.withDefaults()
	s := Summary{
		Statistic: kind.String(), Areas: len(res), Permutations: opt.Permutations,
		Alternative: opt.Alternative.String(), Adjustment: opt.Adjustment.String(),
		Alpha: opt.Alpha, CategoriesFrom: "adjusted", Seed: opt.Seed,
	}
	if opt.RawCategories || opt.Adjustment == shuffle.None {
		s.CategoriesFrom = "raw"
	}
	count := map[string]int{}
	var total float64
	for _, r := range res {
		count[r.Category]++
		total += r.Statistic
		if r.Exact {
			s.ExactAreas++
		}
		if r.Category != NotSignificant && r.Category != NoNeighbours {
			s.Significant++
		}
	}
	s.Total = total
	for _, c := range Categories(kind) {
		s.Categories = append(s.Categories, CategoryCount{Category: c, Areas: count[c]})
	}
	return s
}
