package shuffle

import (
	"math"
	"testing"
)

// Small cases worked by hand from the definitions: Bonferroni m·p; Holm
// (1979) the running maximum of (m−k+1)·p_(k); Benjamini & Hochberg (1995)
// the running minimum from the top of m·p_(k)/k; Benjamini & Yekutieli
// (2001) that times Σ_{i≤m} 1/i (25/12 for m = 4).
func TestAdjustByHand(t *testing.T) {
	p := []float64{0.01, 0.04, 0.03, 0.005}
	cases := []struct {
		m    Adjustment
		want []float64
	}{
		{None, []float64{0.01, 0.04, 0.03, 0.005}},
		{Bonferroni, []float64{0.04, 0.16, 0.12, 0.02}},
		// sorted 0.005·4 = 0.02, 0.01·3 = 0.03, 0.03·2 = 0.06, 0.04·1 → 0.06
		{Holm, []float64{0.03, 0.06, 0.06, 0.02}},
		// sorted 0.005·4/1, 0.01·4/2, 0.03·4/3, 0.04·4/4 = 0.02, 0.02, 0.04, 0.04
		{BenjaminiHochberg, []float64{0.02, 0.04, 0.04, 0.02}},
		{BenjaminiYekutieli, []float64{0.02 * 25 / 12, 0.04 * 25 / 12, 0.04 * 25 / 12, 0.02 * 25 / 12}},
	}
	for _, c := range cases {
		got := Adjust(p, c.m)
		for i := range got {
			if math.Abs(got[i]-c.want[i]) > 1e-15 {
				t.Errorf("%v: %v, want %v", c.m, got, c.want)
				break
			}
		}
	}
	if p[0] != 0.01 || p[3] != 0.005 {
		t.Fatal("Adjust changed its input")
	}
}

func TestAdjustCapsTiesAndMissing(t *testing.T) {
	check := func(name string, got, want []float64) {
		t.Helper()
		for i := range want {
			if math.IsNaN(want[i]) != math.IsNaN(got[i]) || (!math.IsNaN(want[i]) && math.Abs(got[i]-want[i]) > 1e-15) {
				t.Errorf("%s: %v, want %v", name, got, want)
				return
			}
		}
	}
	check("bonferroni cap", Adjust([]float64{0.5, 0.9}, Bonferroni), []float64{1, 1})
	check("holm cap", Adjust([]float64{0.5, 0.9}, Holm), []float64{1, 1})
	// 0.9·2/2 = 0.9 caps 0.5·2/1 = 1 from above.
	check("bh step-up", Adjust([]float64{0.5, 0.9}, BenjaminiHochberg), []float64{0.9, 0.9})
	// Tied raw p-values get the same adjusted value.
	check("bh ties", Adjust([]float64{0.02, 0.02, 0.5}, BenjaminiHochberg), []float64{0.03, 0.03, 0.5})
	check("holm ties", Adjust([]float64{0.02, 0.02, 0.5}, Holm), []float64{0.06, 0.06, 0.5})
	// A missing value is not a test: m = 2 here.
	nan := math.NaN()
	check("missing", Adjust([]float64{nan, 0.01, 0.02}, Bonferroni), []float64{nan, 0.02, 0.04})
	check("empty", Adjust(nil, Holm), nil)
	check("one test", Adjust([]float64{0.3}, BenjaminiYekutieli), []float64{0.3})
}

// On many random families: every adjusted value lies in [p, 1], the order
// of the raw values is kept, and the methods nest as theory says —
// BH ≤ Hochberg ≤ Holm ≤ Bonferroni (since m/k ≤ m−k+1 for 1 ≤ k ≤ m) and
// BH ≤ BY.
func TestAdjustMonotoneAndNested(t *testing.T) {
	s := NewStream(11, 0, 0)
	for trial := 0; trial < 200; trial++ {
		m := 1 + s.IntN(40)
		p := make([]float64, m)
		for i := range p {
			p[i] = s.Float64() * s.Float64()
			if s.IntN(5) == 0 && i > 0 {
				p[i] = p[s.IntN(i)] // ties
			}
		}
		adj := map[Adjustment][]float64{}
		for _, meth := range []Adjustment{Bonferroni, Holm, BenjaminiHochberg, BenjaminiYekutieli} {
			a := Adjust(p, meth)
			adj[meth] = a
			for i := range p {
				if a[i] < p[i]-1e-15 || a[i] > 1 {
					t.Fatalf("%v: adjusted %v outside [p=%v, 1]", meth, a[i], p[i])
				}
				for j := range p {
					if p[i] < p[j] && a[i] > a[j]+1e-15 {
						t.Fatalf("%v: order not kept: p %v→%v, p %v→%v", meth, p[i], a[i], p[j], a[j])
					}
					if p[i] == p[j] && a[i] != a[j] {
						t.Fatalf("%v: tied p %v adjusted to %v and %v", meth, p[i], a[i], a[j])
					}
				}
			}
		}
		for i := range p {
			bh, holm, bonf, by := adj[BenjaminiHochberg][i], adj[Holm][i], adj[Bonferroni][i], adj[BenjaminiYekutieli][i]
			if bh > holm+1e-15 || holm > bonf+1e-15 || bh > by+1e-15 {
				t.Fatalf("nesting broken at %v: bh %v holm %v bonferroni %v by %v", p[i], bh, holm, bonf, by)
			}
		}
	}
}

func TestParseAdjustmentNames(t *testing.T) {
	for _, m := range []Adjustment{None, Bonferroni, Holm, BenjaminiHochberg, BenjaminiYekutieli} {
		got, err := ParseAdjustment(m.String())
		if err != nil || got != m {
			t.Errorf("ParseAdjustment(%q) = %v, %v", m.String(), got, err)
		}
	}
	for s, want := range map[string]Adjustment{"BH": BenjaminiHochberg, " by ": BenjaminiYekutieli, "Holm": Holm} {
		if got, err := ParseAdjustment(s); err != nil || got != want {
			t.Errorf("ParseAdjustment(%q) = %v, %v", s, got, err)
		}
	}
	if _, err := ParseAdjustment("sidak"); err == nil {
		t.Error("unknown method accepted")
	}
}
