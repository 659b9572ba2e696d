package shuffle

import (
	"math"
	"testing"
)

// The reach of each adjustment, worked by hand, and checked against Adjust
// on p-values with k tests at the floor.
func TestAdjustedReach(t *testing.T) {
	tests := []struct {
		name    string
		method  Adjustment
		alt     Alternative
		m, b, k int
		best    float64
		needed  int
	}{
		{"bonferroni", Bonferroni, Greater, 20000, 99, 50, 200.0 / 1, 399999}, // 20000/100 capped at 1; B+1 ≥ 400000
		{"holm", Holm, Greater, 1000, 9999, 3, 0.1, 19999},                    // 1000/10000; B+1 ≥ 20000
		{"bh", BenjaminiHochberg, Greater, 20000, 99, 100, 2, 3999},           // 20000/(100·100)=2 → 1; B+1 ≥ 20000/(0.05·100)
		{"bh enough", BenjaminiHochberg, Greater, 1000, 999, 40, 0.025, 499},  // 1000/(1000·40)
		{"bh none at floor", BenjaminiHochberg, Greater, 100, 99, 0, 1, 1999}, // k taken as 1
		{"none", None, Greater, 100, 99, 5, 0.01, 19},
		{"bh two-sided", BenjaminiHochberg, TwoSided, 1000, 999, 40, 0.05, 999}, // floor 2/1000; 1000·2/(0.05·40)
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := AdjustedReach(tc.method, tc.alt, tc.m, tc.b, tc.k, 0.05)
			if want := math.Min(1, tc.best); math.Abs(r.Best-want) > 1e-12 || r.Needed != tc.needed {
				t.Errorf("best %v needed %d, want %v and %d", r.Best, r.Needed, want, tc.needed)
			}
			if sides := map[Alternative]float64{TwoSided: 2}[tc.alt]; r.Floor != max(sides, 1)/float64(tc.b+1) {
				t.Errorf("floor %v", r.Floor)
			}
		})
	}
	// Against Adjust: k tests at the floor, the rest at 0.5; the smallest
	// adjusted value is Best, and with Needed shuffles it reaches 0.05.
	for _, method := range []Adjustment{Bonferroni, Holm, BenjaminiHochberg, BenjaminiYekutieli} {
		m, k, b := 500, 7, 999
		p := make([]float64, m)
		r := AdjustedReach(method, Greater, m, b, k, 0.05)
		for _, shuffles := range []int{b, r.Needed, r.Needed - 1} {
			for i := range p {
				p[i] = 0.5
				if i < k {
					p[i] = 1 / float64(shuffles+1)
				}
			}
			best := 1.0
			for _, a := range Adjust(p, method) {
				best = math.Min(best, a)
			}
			reached := best <= 0.05
			if want := AdjustedReach(method, Greater, m, shuffles, k, 0.05); math.Abs(best-want.Best) > 1e-12 || reached != (shuffles >= r.Needed) {
				t.Errorf("%v with %d shuffles: smallest adjusted %v, reach %v (needed %d)", method, shuffles, best, want.Best, r.Needed)
			}
		}
	}
}
