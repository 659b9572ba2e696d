package tests

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
)

// The adjusted p-values of shuffle.Adjust equal statsmodels'
// multipletests (python3-statsmodels 0.13.5, stored in refs.json by
// make_refs.py) to 1e-12, on the 15 p-values of the worked example of
// Benjamini & Hochberg (1995, section 3.1; the p-values recalled from
// memory), and each method rejects the same hypotheses at α = 0.05.
func TestAdjustAgainstStatsmodels(t *testing.T) {
	var refs struct {
		Multitest struct {
			Alpha   float64
			PValues []float64 `json:"pvalues"`
			Methods map[string]struct {
				Adjusted []float64
				Reject   []bool
			}
		}
	}
	testkit.LoadJSON(t, "scipy/refs.json", &refs)
	mt := refs.Multitest
	if len(mt.PValues) != 15 || len(mt.Methods) != 4 {
		t.Fatalf("refs: %d p-values, %d methods", len(mt.PValues), len(mt.Methods))
	}
	ours := map[string]shuffle.Adjustment{
		"bonferroni": shuffle.Bonferroni,
		"holm":       shuffle.Holm,
		"fdr_bh":     shuffle.BenjaminiHochberg,
		"fdr_by":     shuffle.BenjaminiYekutieli,
	}
	for name, want := range mt.Methods {
		m, ok := ours[name]
		if !ok {
			t.Fatalf("no method for %q", name)
		}
		got := shuffle.Adjust(mt.PValues, m)
		for i := range got {
			if math.Abs(got[i]-want.Adjusted[i]) > 1e-12 {
				t.Errorf("%s: p %v adjusted to %v, statsmodels %v", name, mt.PValues[i], got[i], want.Adjusted[i])
			}
			if (got[i] <= mt.Alpha) != want.Reject[i] {
				t.Errorf("%s: p %v: reject %v, statsmodels %v", name, mt.PValues[i], got[i] <= mt.Alpha, want.Reject[i])
			}
		}
	}
	// Benjamini & Hochberg's own reading of the example (as recalled): at
	// q = 0.05 their procedure rejects four hypotheses, Bonferroni three.
	count := func(a []float64) (k int) {
		for _, v := range a {
			if v <= 0.05 {
				k++
			}
		}
		return k
	}
	if c := count(shuffle.Adjust(mt.PValues, shuffle.BenjaminiHochberg)); c != 4 {
		t.Errorf("BH rejects %d, want 4", c)
	}
	if c := count(shuffle.Adjust(mt.PValues, shuffle.Bonferroni)); c != 3 {
		t.Errorf("Bonferroni rejects %d, want 3", c)
	}
}
