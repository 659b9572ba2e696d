package shuffle

import (
	"math"
	"reflect"
	"testing"
)

// pFromNull recomputes a p-value from kept null values by the package's
// rules: ties within 1e-9·max(|observed|, scale), (1 + b)/(1 + B) for Monte
// Carlo draws (Phipson & Smyth 2010), b/B over every arrangement when exact,
// the tails combined as the package combines them.
func pFromNull(null []float64, observed, scale float64, alt Alternative, exact bool) float64 {
	tol := 1e-9 * math.Max(math.Abs(observed), scale)
	var ge, le int
	for _, v := range null {
		if v >= observed-tol {
			ge++
		}
		if v <= observed+tol {
			le++
		}
	}
	pg := float64(1+ge) / float64(1+len(null))
	pl := float64(1+le) / float64(1+len(null))
	if exact {
		pg, pl = float64(ge)/float64(len(null)), float64(le)/float64(len(null))
	}
	return combine(alt, pg, pl)
}

// The kept null values are the very values the p-value counts: recounting
// them gives Result.PValue exactly, for sampled and enumerated label
// shuffles and for surrogate draws, and they come out the same for any
// number of workers.
func TestKeptNullGivesThePValue(t *testing.T) {
	labels := make([]int32, 40)
	y := make([]float64, 40)
	for i := range labels {
		labels[i] = int32(i % 2)
		y[i] = math.Round(10 * math.Cos(float64(i)*0.7)) // ties in the sums
	}
	small := []int32{0, 1, 0, 1, 1, 0, 0, 1, 0, 1}
	cases := []struct {
		name   string
		labels []int32
		strata []int32
		alt    Alternative
		exact  bool
	}{
		{"free, two-sided", labels, nil, TwoSided, false},
		{"free, greater", labels, nil, Greater, false},
		{"within strata, less", labels, stripes(40, 4), Less, false},
		{"exact C(10,5), two-sided", small, nil, TwoSided, true},
		{"exact within strata, greater", small, stripes(10, 2), Greater, true},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var ref Result
			for _, w := range []int{1, 4} {
				p := Plan{Labels: c.labels, Strata: c.strata, Permutations: 1234, Seed: 9, Workers: w,
					Alternative: c.alt, Scale: 20, KeepNull: true}
				if !c.exact {
					p.ExactLimit = -1
				}
				res, err := Run(p, func() Evaluator { return groupASum(y) })
				if err != nil {
					t.Fatal(err)
				}
				if res.Exact != c.exact || len(res.Null) != res.Permutations {
					t.Fatalf("exact %v, %d null values for %d draws", res.Exact, len(res.Null), res.Permutations)
				}
				if got := pFromNull(res.Null, res.Observed, 20, c.alt, c.exact); got != res.PValue {
					t.Fatalf("p from the kept null %v, result %v", got, res.PValue)
				}
				if w == 1 {
					ref = res
				} else if !reflect.DeepEqual(res.Null, ref.Null) {
					t.Fatal("4 workers kept other null values than 1")
				}
			}
		})
	}
	for _, w := range []int{1, 4} {
		res, err := RunSurrogates(SurrogatePlan{Draws: 1501, Seed: 2, Workers: w, Alternative: TwoSided, KeepNull: true},
			0.8, uniformDraw, firstValue, 2)
		if err != nil {
			t.Fatal(err)
		}
		if got := pFromNull(res.Null, 0.8, 1, TwoSided, false); got != res.PValue || len(res.Null) != 1501 {
			t.Fatalf("surrogates, %d workers: p from the kept null %v, result %v", w, got, res.PValue)
		}
	}
}

// Without KeepNull nothing is kept, and the result is otherwise the same.
func TestNullKeptOnlyWhenAsked(t *testing.T) {
	labels := []int32{0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1}
	y := make([]float64, len(labels))
	for i := range y {
		y[i] = float64(i * i % 7)
	}
	f := func() Evaluator { return groupASum(y) }
	for _, limit := range []int{-1, 0} { // sampled, then exact
		kept, _ := Run(Plan{Labels: labels, Permutations: 999, ExactLimit: limit, KeepNull: true}, f)
		plain, _ := Run(Plan{Labels: labels, Permutations: 999, ExactLimit: limit}, f)
		if plain.Null != nil || kept.Null == nil {
			t.Fatalf("limit %d: null kept without asking (%d) or not when asked (%d)", limit, len(plain.Null), len(kept.Null))
		}
		kept.Null = nil
		if !reflect.DeepEqual(kept, plain) {
			t.Fatalf("limit %d: keeping the null changed the result", limit)
		}
	}
	s, _ := RunSurrogates(SurrogatePlan{Draws: 99}, 0.5, uniformDraw, firstValue, 2)
	if s.Null != nil {
		t.Fatal("surrogate null kept without asking")
	}
}
