package shuffle

import (
	"math"
	"math/big"
	"reflect"
	"testing"
)

// firstKFactory evaluates the number of units labelled 1 among the first k
// units: with k units "called" by a taster, it counts the correct calls.
func firstKFactory(k int) Factory {
	return func() Evaluator {
		return func(lab []int32) float64 {
			var s float64
			for _, l := range lab[:k] {
				s += float64(l)
			}
			return s
		}
	}
}

// groupASum evaluates the sum of y over the units labelled 0 (group A).
func groupASum(y []float64) Evaluator {
	return func(lab []int32) float64 {
		var s float64
		for i, l := range lab {
			if l == 0 {
				s += y[i]
			}
		}
		return s
	}
}

// Fisher (1935, The Design of Experiments, ch. II): eight cups, four with the
// milk poured first; the taster names all four correctly. Under the null every
// choice of four cups is equally likely, so p = 1/C(8,4) = 1/70.
func TestFisherTeaTastingExact(t *testing.T) {
	labels := []int32{1, 1, 1, 1, 0, 0, 0, 0} // the cups called "milk first" come first
	res, err := Run(Plan{Scheme: "free", Labels: labels, Permutations: 999, Alternative: Greater}, firstKFactory(4))
	if err != nil {
		t.Fatal(err)
	}
	if !res.Exact || res.Permutations != 70 {
		t.Fatalf("want exact enumeration of 70 arrangements, got exact=%v n=%d", res.Exact, res.Permutations)
	}
	if math.Abs(res.PValue-1.0/70) > 1e-15 {
		t.Fatalf("p = %v, want 1/70", res.PValue)
	}
	if res.Interval != [2]float64{res.PValue, res.PValue} {
		t.Fatalf("exact interval %v", res.Interval)
	}
	// Mean of the hypergeometric count: k·K/N = 4·4/8 = 2 (textbook formula).
	if math.Abs(res.NullMean-2) > 1e-12 {
		t.Fatalf("null mean %v, want 2", res.NullMean)
	}
}

// Every distinct arrangement is visited exactly once, and their number is
// the multinomial coefficient (common knowledge: 9!/(2!3!4!) = 1260).
func TestEnumerationVisitsEachArrangementOnce(t *testing.T) {
	cases := []struct {
		name   string
		labels []int32
		strata []int32
		want   int64
	}{
		{"multinomial 9!/(2!3!4!)", []int32{0, 0, 1, 1, 1, 2, 2, 2, 2}, nil, 1260},
		{"binomial C(10,3)", []int32{1, 0, 1, 0, 0, 0, 1, 0, 0, 0}, nil, 120},
		{"within strata C(4,2)·C(5,2)", []int32{0, 1, 0, 1, 1, 0, 0, 1, 0}, []int32{0, 0, 0, 0, 1, 1, 1, 1, 1}, 6 * 10},
		{"singleton stratum does not move", []int32{0, 1, 0, 1, 1}, []int32{0, 0, 0, 0, 7}, 6},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := Arrangements(c.labels, c.strata); got.Cmp(big.NewInt(c.want)) != 0 {
				t.Fatalf("Arrangements = %v, want %d", got, c.want)
			}
			seen := map[string]int{}
			f := func() Evaluator {
				return func(lab []int32) float64 {
					key := make([]byte, len(lab))
					for i, l := range lab {
						key[i] = byte('0' + l)
					}
					seen[string(key)]++
					// Labels must stay inside their strata.
					if c.strata != nil {
						for s := range 8 {
							var orig, now [3]int
							for i := range lab {
								if c.strata[i] == int32(s) {
									orig[c.labels[i]]++
									now[lab[i]]++
								}
							}
							if orig != now {
								t.Fatalf("arrangement %s moves a label across strata", key)
							}
						}
					}
					return 0
				}
			}
			res, err := Run(Plan{Labels: c.labels, Strata: c.strata, Permutations: 10}, f)
			if err != nil {
				t.Fatal(err)
			}
			// The factory was called once for the observed value too.
			if !res.Exact || int64(res.Permutations) != c.want {
				t.Fatalf("exact=%v permutations=%d, want %d", res.Exact, res.Permutations, c.want)
			}
			if int64(len(seen)) != c.want {
				t.Fatalf("saw %d distinct arrangements, want %d", len(seen), c.want)
			}
			orig := make([]byte, len(c.labels))
			for i, l := range c.labels {
				orig[i] = byte('0' + l)
			}
			for k, v := range seen {
				want := 1
				if k == string(orig) {
					want = 2 // the observed arrangement is evaluated once more on its own
				}
				if v != want {
					t.Fatalf("arrangement %s visited %d times", k, v)
				}
			}
		})
	}
}

// The same seed gives the same result, bit for bit, whatever the number of
// workers, because blocks and not workers own the random streams.
func TestDeterministicAcrossWorkers(t *testing.T) {
	labels := make([]int32, 60)
	for i := range labels {
		labels[i] = int32(i % 3)
	}
	y := make([]float64, 60)
	for i := range y {
		y[i] = math.Sin(float64(i)) * float64(i)
	}
	f := func() Evaluator { return groupASum(y) }
	var first Result
	for _, w := range []int{1, 2, 3, 8} {
		for _, strata := range [][]int32{nil, stripes(60, 4)} {
			res, err := Run(Plan{Labels: labels, Strata: strata, Permutations: 2345, ExactLimit: -1, Seed: 42, Workers: w, KeepNull: true}, f)
			if err != nil {
				t.Fatal(err)
			}
			if strata != nil {
				continue
			}
			if w == 1 {
				first = res
				continue
			}
			if !reflect.DeepEqual(first, res) {
				t.Fatalf("workers=%d differs from workers=1", w)
			}
		}
	}
	other, _ := Run(Plan{Labels: labels, Permutations: 2345, ExactLimit: -1, Seed: 43, Workers: 2}, f)
	if other.NullMean == first.NullMean {
		t.Fatal("a different seed gave the same null distribution")
	}
}

func stripes(n, k int) []int32 {
	s := make([]int32, n)
	for i := range s {
		s[i] = int32(i * k / n)
	}
	return s
}

// The Monte Carlo p-value's interval covers the exact p-value found by full
// enumeration of the same test (16 units, C(16,8) = 12,870 arrangements).
func TestMonteCarloIntervalCoversExact(t *testing.T) {
	labels := []int32{0, 0, 0, 0, 0, 0, 0, 0, 1, 1, 1, 1, 1, 1, 1, 1}
	y := []float64{3.1, 4.7, 2.2, 5.9, 4.4, 6.1, 3.3, 5.0, 2.0, 3.9, 1.7, 2.8, 4.1, 2.5, 3.0, 1.2}
	f := func() Evaluator { return groupASum(y) }
	for _, alt := range []Alternative{Greater, Less, TwoSided} {
		exact, err := Run(Plan{Labels: labels, Alternative: alt}, f)
		if err != nil || !exact.Exact || exact.Permutations != 12870 {
			t.Fatalf("exact run: %v %+v", err, exact)
		}
		for seed := uint64(1); seed <= 5; seed++ {
			mc, err := Run(Plan{Labels: labels, Alternative: alt, Permutations: 9999, ExactLimit: -1, Seed: seed}, f)
			if err != nil || mc.Exact {
				t.Fatalf("monte carlo run: %v exact=%v", err, mc.Exact)
			}
			if exact.PValue < mc.Interval[0] || exact.PValue > mc.Interval[1] {
				t.Errorf("%v seed %d: exact p %.5f outside the interval %v (MC p %.5f)", alt, seed, exact.PValue, mc.Interval, mc.PValue)
			}
			// p = (1+b)/(1+B) is never zero (Phipson & Smyth 2010).
			if mc.PValue < 1.0/10000 {
				t.Errorf("p %v below 1/(1+B)", mc.PValue)
			}
		}
	}
}

// Fisher–Yates draws every ordering of three distinct labels about equally
// often: 60,000 draws, each of the 3! = 6 orderings within 4% of 10,000
// (binomial sd ≈ 91, so 4% is more than 4 sd).
func TestShuffleIsUniform(t *testing.T) {
	counts := map[[3]int32]int{}
	f := func() Evaluator {
		return func(lab []int32) float64 {
			counts[[3]int32(lab)]++
			return 0
		}
	}
	if _, err := Run(Plan{Labels: []int32{0, 1, 2}, Permutations: 60000, ExactLimit: -1, Seed: 7, Workers: 1}, f); err != nil {
		t.Fatal(err)
	}
	counts[[3]int32{0, 1, 2}]-- // the evaluation of the observed arrangement
	if len(counts) != 6 {
		t.Fatalf("saw %d orderings", len(counts))
	}
	for k, v := range counts {
		if math.Abs(float64(v)-10000) > 400 {
			t.Errorf("ordering %v drawn %d times", k, v)
		}
	}
}

func TestIntNInRange(t *testing.T) {
	s := NewStream(1, 0, 0)
	for _, n := range []int{1, 2, 3, 7, 1000, 1 << 40} {
		for range 1000 {
			if v := s.IntN(n); v < 0 || v >= n {
				t.Fatalf("IntN(%d) = %d", n, v)
			}
		}
	}
}

func TestRunRejectsBadPlans(t *testing.T) {
	f := firstKFactory(1)
	if _, err := Run(Plan{Labels: []int32{1}}, f); err == nil {
		t.Error("one unit accepted")
	}
	if _, err := Run(Plan{Labels: []int32{1, 0}, Strata: []int32{0}}, f); err == nil {
		t.Error("strata of the wrong length accepted")
	}
	if _, err := Run(Plan{Labels: []int32{1, 0, 1}, ExactLimit: -1}, f); err == nil {
		t.Error("zero permutations accepted")
	}
}

// RunMany gives each statistic exactly the result Run gives it alone with the
// same plan: the draws are shared, not changed.
func TestRunManyMatchesRun(t *testing.T) {
	labels := make([]int32, 40)
	y := make([]float64, 40)
	for i := range labels {
		labels[i] = int32(i % 2)
		y[i] = math.Cos(float64(i) * 1.7)
	}
	sumA := groupASum(y)
	firstHalf := func(lab []int32) float64 {
		var s float64
		for _, l := range lab[:20] {
			s += float64(l)
		}
		return s
	}
	plan := Plan{Labels: labels, Permutations: 1777, ExactLimit: -1, Seed: 9, Workers: 3, KeepNull: true}
	many, err := RunMany(plan, []Statistic{{Alternative: Greater}, {Alternative: TwoSided, Scale: 1}},
		func() ManyEvaluator {
			return func(lab []int32, out []float64) { out[0], out[1] = sumA(lab), firstHalf(lab) }
		})
	if err != nil {
		t.Fatal(err)
	}
	for k, f := range []func([]int32) float64{sumA, firstHalf} {
		p := plan
		p.Alternative = []Alternative{Greater, TwoSided}[k]
		single, err := Run(p, func() Evaluator { return f })
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(single, many[k]) {
			t.Errorf("statistic %d: RunMany %+v, Run %+v", k, many[k].PValue, single.PValue)
		}
	}
}
