package shuffle

import (
	"math"
	"sort"

	"github.com/areatest/areatest/internal/choice"
)

// Adjustment is a way of adjusting a family of p-values for multiple testing.
type Adjustment int

const (
	// None leaves the p-values as they are.
	None Adjustment = iota
	// Bonferroni multiplies each p-value by the number of tests, which
	// controls the family-wise error rate under any dependence.
	Bonferroni
	// Holm is the step-down form of Bonferroni (Holm 1979, Scand. J. Stat.
	// 6:65–70): the same guarantee, never less powerful.
	Holm
	// BenjaminiHochberg controls the false discovery rate for independent or
	// positively dependent tests (Benjamini & Hochberg 1995, JRSS B
	// 57:289–300).
	BenjaminiHochberg
	// BenjaminiYekutieli controls the false discovery rate under any
	// dependence, at the price of the factor Σ_{i≤m} 1/i (Benjamini &
	// Yekutieli 2001, Ann. Stat. 29:1165–1188, Theorem 1.3).
	BenjaminiYekutieli
)

// String returns the name ParseAdjustment reads back.
func (m Adjustment) String() string {
	switch m {
	case Bonferroni:
		return "bonferroni"
	case Holm:
		return "holm"
	case BenjaminiHochberg:
		return "benjamini-hochberg"
	case BenjaminiYekutieli:
		return "benjamini-yekutieli"
	}
	return "none"
}

// ParseAdjustment reads a method name: none, bonferroni, holm,
// benjamini-hochberg (or bh) and benjamini-yekutieli (or by), in any case.
func ParseAdjustment(s string) (Adjustment, error) {
	return choice.Parse("adjustment", s,
		choice.Name[Adjustment]{Name: "none", Value: None}, choice.Name[Adjustment]{Name: "bonferroni", Value: Bonferroni},
		choice.Name[Adjustment]{Name: "holm", Value: Holm},
		choice.Name[Adjustment]{Name: "benjamini-hochberg", Value: BenjaminiHochberg}, choice.Name[Adjustment]{Name: "bh", Value: BenjaminiHochberg},
		choice.Name[Adjustment]{Name: "benjamini-yekutieli", Value: BenjaminiYekutieli}, choice.Name[Adjustment]{Name: "by", Value: BenjaminiYekutieli})
}

// Adjust returns the adjusted p-values of p under method, in the order of p.
// Adjusted values are capped at 1 and keep the order of the raw values (a
// smaller raw p never gets a larger adjusted p), so "adjusted p ≤ α" is the
// method's rejection rule at level α. NaN entries stay NaN and do not count
// as tests; the caller is expected to pass values in [0, 1].
func Adjust(p []float64, method Adjustment) []float64 {
	out := make([]float64, len(p))
	idx := make([]int, 0, len(p))
	for i, v := range p {
		out[i] = v
		if !math.IsNaN(v) {
			idx = append(idx, i)
		}
	}
	m := len(idx)
	if m == 0 || method == None {
		return out
	}
	// Ascending raw p; a stable sort keeps ties in input order, and the
	// running max/min below gives tied p-values the same adjusted value.
	sort.SliceStable(idx, func(a, b int) bool { return p[idx[a]] < p[idx[b]] })
	fm := float64(m)
	switch method {
	case Bonferroni:
		for _, i := range idx {
			out[i] = math.Min(1, fm*p[i])
		}
	case Holm:
		// Step-down: p_(k) is compared with α/(m−k+1); the adjusted value
		// is the running maximum of (m−k+1)·p_(k) from the smallest p up.
		run := 0.0
		for k, i := range idx {
			run = math.Max(run, math.Min(1, float64(m-k)*p[i]))
			out[i] = run
		}
	case BenjaminiHochberg, BenjaminiYekutieli:
		c := 1.0
		if method == BenjaminiYekutieli {
			c = 0
			for j := 1; j <= m; j++ {
				c += 1 / float64(j)
			}
		}
		// Step-up: the adjusted value of p_(k) is min over j ≥ k of
		// c·m·p_(j)/j, a running minimum from the largest p down.
		run := 1.0
		for k := m - 1; k >= 0; k-- {
			i := idx[k]
			run = math.Min(run, c*fm*p[i]/float64(k+1))
			out[i] = run
		}
	}
	return out
}
