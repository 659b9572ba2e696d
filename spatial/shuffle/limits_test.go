package shuffle

import (
	"errors"
	"math"
	"reflect"
	"runtime"
	"testing"
)

// Every entry point refuses more draws than MaxPermutations with a
// *CountError that gives the count and the maximum, before any work.
func TestCountsAboveTheMaximumAreRefused(t *testing.T) {
	labels := []int32{0, 0, 0, 1, 1, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1}
	y := make([]float64, len(labels))
	for i := range y {
		y[i] = float64(i)
	}
	over := MaxPermutations + 1
	ring := ringPlan(30, 2)
	ring.Permutations = over
	ring.ExactLimit = -1
	cases := []struct {
		name string
		run  func() error
	}{
		{"Run", func() error {
			_, err := Run(Plan{Labels: labels, Permutations: over, ExactLimit: -1}, func() Evaluator { return groupASum(y) })
			return err
		}},
		{"Run, exact", func() error {
			// Enumeration ignores the count, but a count above the
			// maximum is a mistake whatever the route.
			_, err := Run(Plan{Labels: []int32{0, 1, 0, 1}, Permutations: 1e12}, func() Evaluator { return groupASum(y) })
			return err
		}},
		{"RunSurrogates", func() error {
			_, err := RunSurrogates(SurrogatePlan{Draws: over}, 0.5, uniformDraw, firstValue, 2)
			return err
		}},
		{"RunLocal", func() error {
			_, err := RunLocal(ring, sumFactory(y, nil))
			return err
		}},
	}
	for _, c := range cases {
		var ce *CountError
		if err := c.run(); !errors.As(err, &ce) || ce.Max != MaxPermutations || ce.Count < over {
			t.Errorf("%s: %v, want a *CountError with the maximum", c.name, err)
		}
	}
	if err := CheckCount("draws", MaxPermutations, MaxPermutations); err != nil {
		t.Errorf("the maximum itself refused: %v", err)
	}
	if got, want := CheckCount("draws", 7, 5).Error(), "7 draws are more than the maximum of 5"; got != want {
		t.Errorf("message %q, want %q", got, want)
	}
}

// Folding the tallies a window at a time gives, bit for bit, what tallying
// every block and summing the blocks in block order gives (the definition
// of a seeded result), over several windows and for any number of
// workers; the reference below replays each block's stream by hand.
func TestFoldedWindowsMatchBlockOrder(t *testing.T) {
	n := 12
	labels := make([]int32, n)
	y := make([]float64, n)
	for i := range labels {
		labels[i] = int32(i % 2)
		y[i] = math.Sin(float64(i)*1.7) * 1e3
	}
	B := (2*foldWindow+3)*BlockSize + 17 // three windows, the last block short
	groups := strataMembers(n, nil)
	eval := groupASum(y)
	obs := eval(labels)
	tol := 1e-9 * math.Max(math.Abs(obs), 1)
	var want tally
	lab := make([]int32, n)
	for b := 0; b*BlockSize < B; b++ {
		copy(lab, labels)
		rng := NewStream(9, 2, b)
		var bt tally
		for d := b * BlockSize; d < min((b+1)*BlockSize, B); d++ {
			shuffleGroups(&rng, lab, groups)
			bt.add(eval(lab), obs, tol)
		}
		want.merge(bt)
	}
	var first Result
	for _, w := range []int{1, 3} {
		res, err := Run(Plan{Labels: labels, Permutations: B, ExactLimit: -1, Seed: 9, Purpose: 2, Workers: w, Alternative: Greater},
			func() Evaluator { return groupASum(y) })
		if err != nil {
			t.Fatal(err)
		}
		var ref Result
		finishSampled(&ref, want, B, Greater)
		if res.AtLeast != ref.AtLeast || res.AtMost != ref.AtMost || res.NullMean != ref.NullMean || res.NullSD != ref.NullSD || res.PValue != ref.PValue {
			t.Fatalf("workers %d: %+v, want %+v", w, res, ref)
		}
		if w == 1 {
			first = res
		} else if !reflect.DeepEqual(res, first) {
			t.Fatalf("workers %d differ from one worker", w)
		}
	}
}

// Memory does not grow with the number of draws: a hundred times more
// shuffles (or surrogate draws) allocate about the same.
func TestCountingStreams(t *testing.T) {
	labels := []int32{0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1, 0, 1}
	y := make([]float64, len(labels))
	allocated := func(run func()) uint64 {
		var before, after runtime.MemStats
		runtime.GC()
		runtime.ReadMemStats(&before)
		run()
		runtime.ReadMemStats(&after)
		return after.TotalAlloc - before.TotalAlloc
	}
	for name, run := range map[string]func(B int){
		"Run": func(B int) {
			_, _ = Run(Plan{Labels: labels, Permutations: B, ExactLimit: -1, Workers: 2}, func() Evaluator { return groupASum(y) })
		},
		"RunSurrogates": func(B int) {
			_, _ = RunSurrogates(SurrogatePlan{Draws: B, Workers: 2}, 0.5, uniformDraw, firstValue, 2)
		},
	} {
		small := allocated(func() { run(20_000) })
		large := allocated(func() { run(2_000_000) })
		// The old per-block tallies alone took 4,000 × 32 bytes for the
		// larger count; a window's goroutines take a few hundred bytes.
		t.Logf("%s: %d then %d bytes", name, small, large)
		if large > small+32<<10 {
			t.Errorf("%s: %d bytes for 2,000,000 draws, %d for 20,000", name, large, small)
		}
	}
}
