package local

import (
	"fmt"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/shuffle"
)

// reachWarning explains a run where areas pass before the adjustment across
// areas and none after it, when the number of shuffles is what stands in
// the way: with B shuffles no p-value is below 1/(B+1), and across m areas
// the adjustment may need a smaller one than that (see
// shuffle.AdjustedReach for the derivation). It says how small an adjusted
// p-value could get and how many shuffles the areas at the floor would
// need; "" when the warning does not apply (no adjustment, something
// survived, nothing passed before, or only exact p-values, which have no
// floor).
func reachWarning(res *Result, results []AreaResult, opt Options) string {
	if opt.Adjustment == shuffle.None || res.RawSignificant == 0 || res.AdjustedSignificant > 0 || len(results) == 0 {
		return ""
	}
	// Areas with exact p-values (few enough arrangements to enumerate)
	// count among the m tests but have no floor.
	b, m, atFloor := 0, 0, 0
	for _, a := range results {
		if a.P == a.P { // not NaN
			m++
			if !a.Exact {
				b = max(b, a.Permutations)
			}
		}
	}
	if b == 0 {
		return ""
	}
	floor := shuffle.AdjustedReach(shuffle.None, opt.Alternative, 1, b, 1, opt.Alpha).Floor
	for _, a := range results {
		if !a.Exact && a.P <= floor*(1+1e-9) {
			atFloor++
		}
	}
	r := shuffle.AdjustedReach(opt.Adjustment, opt.Alternative, m, b, atFloor, opt.Alpha)
	var how string
	switch opt.Adjustment {
	case shuffle.Bonferroni, shuffle.Holm:
		how = fmt.Sprintf("the adjustment multiplies the smallest p-value by the %s areas", numtext.Count(m))
	case shuffle.BenjaminiHochberg:
		how = fmt.Sprintf("the adjustment multiplies their p-value by %s/%s at best", numtext.Count(m), numtext.Count(atFloor))
	case shuffle.BenjaminiYekutieli:
		how = fmt.Sprintf("the adjustment multiplies their p-value by %s·c/%s at best, c = Σ1/i = %.3g",
			numtext.Count(m), numtext.Count(atFloor), r.Factor*float64(atFloor)/float64(m))
	}
	var b2 strings.Builder
	fmt.Fprintf(&b2, "No area survives the %s adjustment across %s areas, though %s pass at %g before it. With %s shuffles no %s p-value is below %.3g, ",
		opt.Adjustment, numtext.Count(m), numtext.Count(res.RawSignificant), opt.Alpha, numtext.Count(b), opt.Alternative, r.Floor)
	if atFloor == 0 {
		fmt.Fprintf(&b2, "and no area is at that smallest value: more shuffles would sharpen the p-values but not lift any area past the adjustment by themselves.")
		return b2.String()
	}
	fmt.Fprintf(&b2, "and %s area(s) are at that value; %s, so the smallest adjusted p-value any area can reach is %.3g, above %g. For those areas to survive, the floor times %.4g must come to %g or less: at least %s shuffles, if their p-values stay at the floor.",
		numtext.Count(atFloor), how, r.Best, opt.Alpha, r.Factor, opt.Alpha, numtext.Count(r.Needed))
	return b2.String()
}
