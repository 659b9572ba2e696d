package shuffle

import (
	"math"
	"reflect"
	"testing"
)

// A toy surrogate draw: each draw writes a fresh uniform value in the first
// slot, and the statistic reads it. The null distribution is then U(0, 1),
// so with B draws the count at or above the observed value 0.9 is about
// 0.1·B and p = (1 + b)/(1 + B) (Phipson & Smyth 2010), the interval the
// Clopper–Pearson one for b of B.
func uniformDraw() OutcomeDraw {
	return func(rng *Stream, out []float64) { out[0] = rng.Float64() }
}

func firstValue() OutcomeEvaluator { return func(y []float64) float64 { return y[0] } }

func TestRunSurrogatesConventions(t *testing.T) {
	p := SurrogatePlan{Scheme: "toy", Draws: 1999, Seed: 5, Purpose: 3, Alternative: Greater, KeepNull: true}
	res, err := RunSurrogates(p, 0.9, uniformDraw, firstValue, 2)
	if err != nil {
		t.Fatal(err)
	}
	b := 0
	for _, v := range res.Null {
		if v >= 0.9-1e-9 {
			b++
		}
	}
	if res.AtLeast != b || res.PValue != float64(1+b)/2000 || res.Permutations != 1999 || res.Exact {
		t.Fatalf("result %+v, counted %d", res, b)
	}
	lo, hi := ClopperPearson(b, 1999, 0.95)
	if res.Interval != [2]float64{lo, hi} {
		t.Fatalf("interval %v, want [%v, %v]", res.Interval, lo, hi)
	}
	if math.Abs(res.PValue-0.1) > 0.02 || math.Abs(res.NullMean-0.5) > 0.02 || math.Abs(res.NullSD-math.Sqrt(1.0/12)) > 0.01 {
		t.Fatalf("p %v, null mean %v, sd %v: not U(0, 1)", res.PValue, res.NullMean, res.NullSD)
	}
	// Block k of the draws comes from NewStream(seed, purpose, k).
	rng := NewStream(5, 3, 1)
	if res.Null[BlockSize] != rng.Float64() {
		t.Fatal("draw 500 is not the first of block 1's stream")
	}
	// Two-sided doubles the smaller tail; less counts ≤.
	two, _ := RunSurrogates(SurrogatePlan{Draws: 1999, Seed: 5, Purpose: 3}, 0.9, uniformDraw, firstValue, 2)
	if two.PValue != math.Min(1, 2*res.PValue) {
		t.Fatalf("two-sided p %v, one-sided %v", two.PValue, res.PValue)
	}
	less, _ := RunSurrogates(SurrogatePlan{Draws: 1999, Seed: 5, Purpose: 3, Alternative: Less}, 0.9, uniformDraw, firstValue, 2)
	if less.PValue != float64(1+res.AtMost)/2000 {
		t.Fatalf("less: p %v, at most %d", less.PValue, res.AtMost)
	}
}

// The result does not depend on the number of workers.
func TestRunSurrogatesWorkersDoNotMatter(t *testing.T) {
	var ref Result
	for _, w := range []int{1, 2, 3, 8} {
		res, err := RunSurrogates(SurrogatePlan{Draws: 2345, Seed: 1, Purpose: 2, Workers: w, KeepNull: true},
			0.3, uniformDraw, firstValue, 2)
		if err != nil {
			t.Fatal(err)
		}
		if w == 1 {
			ref = res
			continue
		}
		if !reflect.DeepEqual(res, ref) {
			t.Fatalf("workers %d: %+v differs from one worker's", w, res)
		}
	}
}

func TestRunSurrogatesErrors(t *testing.T) {
	if _, err := RunSurrogates(SurrogatePlan{Draws: 0}, 0, uniformDraw, firstValue, 2); err == nil {
		t.Error("no draws accepted")
	}
	if _, err := RunSurrogates(SurrogatePlan{Draws: 9}, math.NaN(), uniformDraw, firstValue, 2); err == nil {
		t.Error("NaN observed accepted")
	}
	if _, err := RunSurrogates(SurrogatePlan{Draws: 9}, 0, nil, firstValue, 2); err == nil {
		t.Error("nil draw accepted")
	}
	if _, err := RunSurrogates(SurrogatePlan{Draws: 9}, 0, uniformDraw, firstValue, 1); err == nil {
		t.Error("one unit accepted")
	}
}
