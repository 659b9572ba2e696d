package shuffle

import "math"

// Reach is what an adjustment across many tests can give permutation
// p-values drawn with a given number of shuffles.
type Reach struct {
	// Floor is the smallest permutation p-value B shuffles give: 1/(B+1),
	// or 2/(B+1) for a two-sided test, which doubles the smaller tail.
	Floor float64
	// Best is the smallest adjusted p-value any test can get when AtFloor
	// of the m tests are at the floor (capped at 1).
	Best float64
	// Needed is the fewest shuffles at which those tests' adjusted
	// p-values would reach alpha, assuming they stay at the floor.
	Needed int
	// Factor is what the floor is multiplied by to give Best: m for
	// Bonferroni and Holm, m/k for Benjamini–Hochberg, m·c(m)/k for
	// Benjamini–Yekutieli (c(m) = Σ_{i≤m} 1/i), 1 for None.
	Factor float64
}

// AdjustedReach works out how small an adjusted p-value can get with B
// shuffles over m tests of the alternative alt, k of them at the floor
// (see Reach.Floor), and how many shuffles those k would need to reach alpha.
//
// The derivation, from the adjusted values Adjust computes on sorted
// p-values p(1) ≤ … ≤ p(m):
//   - Bonferroni multiplies each p by m, and Holm's first (smallest)
//     adjusted value is m·p(1), which bounds the others from below: the
//     best is m·p(1) ≥ m/(B+1), whatever k.
//   - Benjamini–Hochberg's adjusted p(j) is min over i ≥ j of m·p(i)/i. For
//     the k tests at the floor it is at most m/((B+1)·k), reached when
//     they are the k smallest; a test above the floor cannot do better
//     than its own p times m/i with i at most the number of tests at or
//     below it, so the floor tests set the best value.
//   - Benjamini–Yekutieli is Benjamini–Hochberg times c(m) = Σ_{i≤m} 1/i.
//
// So Best = Factor·Floor and the k tests reach alpha once
// B + 1 ≥ Factor·s/alpha, s = 2 for a two-sided test and 1 otherwise. Needed rests on the assumption that tests at the
// floor are there because the shuffles cannot show a smaller p-value (their
// observed statistic beat every shuffle), so more shuffles move them down;
// it is the least that could do, not a promise. k = 0 (no test at the
// floor) is taken as 1 for the Benjamini methods.
func AdjustedReach(method Adjustment, alt Alternative, m, b, k int, alpha float64) Reach {
	k = max(k, 1)
	var factor float64
	switch method {
	case Bonferroni, Holm:
		factor = float64(m)
	case BenjaminiHochberg:
		factor = float64(m) / float64(k)
	case BenjaminiYekutieli:
		var c float64
		for i := 1; i <= m; i++ {
			c += 1 / float64(i)
		}
		factor = float64(m) * c / float64(k)
	default:
		factor = 1
	}
	sides := 1.0
	if alt == TwoSided {
		sides = 2
	}
	floor := math.Min(1, sides/float64(b+1))
	// The fewest B with factor·sides/(B+1) ≤ alpha; the small slack keeps an
	// exact quotient (m/α a whole number) from rounding one step up.
	needed := int(math.Ceil(factor*sides/alpha*(1-1e-12))) - 1
	return Reach{Floor: floor, Best: math.Min(1, factor*floor), Needed: max(needed, 1), Factor: factor}
}
