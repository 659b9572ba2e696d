package shuffle

import (
	"math"
	"math/big"
	"reflect"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// ringPlan is a plan whose area i has the d areas after it (mod n) as
// neighbours.
func ringPlan(n, d int) LocalPlan {
	p := LocalPlan{Offsets: make([]int32, n+1)}
	for i := 0; i < n; i++ {
		for k := 1; k <= d; k++ {
			p.Neighbours = append(p.Neighbours, int32((i+k)%n))
		}
		p.Offsets[i+1] = int32(len(p.Neighbours))
	}
	return p
}

// sumFactory evaluates the sum of vals over the drawn areas, weighted by
// weights[k] per slot when given.
func sumFactory(vals []float64, weights []float64) LocalFactory {
	return func() LocalEvaluator {
		return func(i int, drawn []int32) float64 {
			var s float64
			for k, j := range drawn {
				w := 1.0
				if weights != nil {
					w = weights[k]
				}
				s += w * vals[j]
			}
			return s
		}
	}
}

// The number of fillings is the binomial coefficient C(m, d) for
// interchangeable slots and the falling factorial m!/(m−d)! for ordered
// ones (counting, common knowledge), checked against math/big; the count
// stops at the limit without overflowing.
func TestFillings(t *testing.T) {
	for _, c := range []struct{ m, d int }{{7, 0}, {7, 3}, {7, 7}, {30, 4}, {84999, 1}, {60, 30}, {1000, 3}} {
		want := new(big.Int).Binomial(int64(c.m), int64(c.d))
		got, ok := fillings(c.m, c.d, false, math.MaxInt)
		if want.IsInt64() && want.Int64() < math.MaxInt64/int64(c.m+1) {
			if !ok || int64(got) != want.Int64() {
				t.Errorf("C(%d,%d): got %d %v, want %v", c.m, c.d, got, ok, want)
			}
		} else if ok {
			t.Errorf("C(%d,%d) = %v should pass any int limit, got %d", c.m, c.d, want, got)
		}
		ord := big.NewInt(1)
		for k := 0; k < c.d; k++ {
			ord.Mul(ord, big.NewInt(int64(c.m-k)))
		}
		got, ok = fillings(c.m, c.d, true, math.MaxInt)
		if ord.IsInt64() && ord.Int64() < math.MaxInt64/int64(c.m+1) {
			if !ok || int64(got) != ord.Int64() {
				t.Errorf("%d!/(%d−%d)!: got %d %v, want %v", c.m, c.m, c.d, got, ok, ord)
			}
		} else if ok {
			t.Errorf("%d!/(%d−%d)! = %v should pass any int limit, got %d", c.m, c.m, c.d, ord, got)
		}
	}
	if _, ok := fillings(7, 3, false, 34); ok {
		t.Error("C(7,3) = 35 passed a limit of 34")
	}
	if c, ok := fillings(7, 3, false, 35); !ok || c != 35 {
		t.Errorf("C(7,3) at limit 35: %d %v", c, ok)
	}
	if _, ok := fillings(3, 4, false, 100); ok {
		t.Error("four slots filled from three values")
	}
}

// Exact enumeration visits every set of d other areas exactly once, never
// the area itself; with unequal weights it visits every ordered choice
// once.
func TestLocalEnumeration(t *testing.T) {
	for _, ordered := range []bool{false, true} {
		n, d := 7, 3
		p := ringPlan(n, d)
		if ordered {
			p.Weights = make([]float64, len(p.Neighbours))
			for k := range p.Weights {
				p.Weights[k] = float64(1 + k%d)
			}
		}
		seen := make([]map[[3]int32]int, n)
		for i := range seen {
			seen[i] = map[[3]int32]int{}
		}
		f := func() LocalEvaluator {
			return func(i int, drawn []int32) float64 {
				var key [3]int32
				copy(key[:], drawn)
				if !ordered {
					// order must not matter: count the set
					for a := 0; a < 3; a++ {
						for b := a + 1; b < 3; b++ {
							if key[b] < key[a] {
								key[a], key[b] = key[b], key[a]
							}
						}
					}
				}
				for _, j := range drawn {
					if int(j) == i {
						t.Fatalf("area %d drew itself", i)
					}
				}
				seen[i][key]++
				return float64(drawn[0])
			}
		}
		res, err := RunLocal(p, f)
		if err != nil {
			t.Fatal(err)
		}
		want := 20 // C(6,3)
		if ordered {
			want = 120 // 6·5·4
		}
		for i := 0; i < n; i++ {
			if !res[i].Exact || res[i].Permutations != want {
				t.Errorf("ordered=%v area %d: exact %v over %d, want %d", ordered, i, res[i].Exact, res[i].Permutations, want)
			}
			// The observed filling is seen once by RunLocal's own call
			// and once in the enumeration.
			if len(seen[i]) != want {
				t.Errorf("ordered=%v area %d: %d distinct fillings, want %d", ordered, i, len(seen[i]), want)
			}
			for key, c := range seen[i] {
				if c != 1 && c != 2 {
					t.Errorf("ordered=%v area %d: filling %v visited %d times", ordered, i, key, c)
				}
			}
		}
	}
}

// A per-area null is the distribution of "sum of the drawn values", whose
// exact counts are known by hand: area 0 of five, one neighbour (area 4,
// value 4) out of values 1, 2, 3, 4 → at least: 1 of 4, at most: 4 of 4.
func TestLocalExactCounts(t *testing.T) {
	vals := []float64{0, 1, 2, 3, 4}
	p := LocalPlan{Offsets: []int32{0, 1, 2, 3, 4, 5}, Neighbours: []int32{4, 0, 0, 0, 0}}
	for _, c := range []struct {
		alt  Alternative
		want float64
	}{{Folded, 0.25}, {Greater, 0.25}, {Less, 1}, {TwoSided, 0.5}} {
		p.Alternative = c.alt
		res, err := RunLocal(p, sumFactory(vals, nil))
		if err != nil {
			t.Fatal(err)
		}
		r := res[0]
		if !r.Exact || r.Permutations != 4 || r.AtLeast != 1 || r.AtMost != 4 || r.PValue != c.want {
			t.Errorf("%s: %+v, want p %v", c.alt.String(), r, c.want)
		}
		// Mean and population sd of 1, 2, 3, 4: 2.5 and √1.25.
		if math.Abs(r.NullMean-2.5) > 1e-15 || math.Abs(r.NullSD-math.Sqrt(1.25)) > 1e-15 {
			t.Errorf("moments %v %v", r.NullMean, r.NullSD)
		}
		if r.Interval != [2]float64{r.PValue, r.PValue} {
			t.Errorf("exact interval %v", r.Interval)
		}
	}
}

// Monte Carlo draws are uniform over the fillings: 60,000 draws of two
// slots from five other areas hit each of the 20 ordered pairs (and so
// each of the 10 sets) about equally often, by Pearson's chi-square test
// at the 0.1% level (a fixed seed, so a fixed outcome).
func TestLocalDrawsUniform(t *testing.T) {
	n, d, B := 6, 2, 60000
	p := ringPlan(n, d)
	// One worker: the evaluator below writes to shared maps.
	p.Permutations, p.ExactLimit, p.Seed, p.Workers = B, -1, 9, 1
	counts := make([]map[[2]int32]int, n)
	for i := range counts {
		counts[i] = map[[2]int32]int{}
	}
	f := func() LocalEvaluator {
		return func(i int, drawn []int32) float64 {
			counts[i][[2]int32{drawn[0], drawn[1]}]++
			return 0
		}
	}
	if _, err := RunLocal(p, f); err != nil {
		t.Fatal(err)
	}
	crit := distuv.ChiSquared{K: 19}.Quantile(0.999)
	for i := 0; i < n; i++ {
		c := counts[i]
		if len(c) != 20 {
			t.Fatalf("area %d: %d ordered pairs seen, want 20", i, len(c))
		}
		var chi float64
		e := float64(B+1) / 20 // the observed filling is evaluated once too
		for key, k := range c {
			if key[0] == key[1] || int(key[0]) == i || int(key[1]) == i {
				t.Fatalf("area %d drew %v", i, key)
			}
			chi += (float64(k) - e) * (float64(k) - e) / e
		}
		if chi > crit {
			t.Errorf("area %d: chi-square %.1f > %.1f", i, chi, crit)
		}
	}
}

// A Monte Carlo p-value is (1 + count)/(1 + B) and its interval is the
// Clopper–Pearson interval of count/B; kept nulls agree with the counts and
// moments.
func TestLocalMonteCarlo(t *testing.T) {
	n := 40
	p := ringPlan(n, 4)
	vals := make([]float64, n)
	for i := range vals {
		vals[i] = math.Sin(float64(i) * 1.7)
	}
	// C(39, 4) = 82,251 fillings would be enumerated; sample instead.
	p.Permutations, p.Seed, p.KeepNull, p.ExactLimit = 999, 3, []int{5}, -1
	for _, alt := range []Alternative{Folded, Greater, Less, TwoSided} {
		p.Alternative = alt
		res, err := RunLocal(p, sumFactory(vals, nil))
		if err != nil {
			t.Fatal(err)
		}
		r := res[5]
		if r.Exact || r.Permutations != 999 || len(r.Null) != 999 {
			t.Fatalf("exact %v, %d permutations, %d null values kept", r.Exact, r.Permutations, len(r.Null))
		}
		var ge, le int
		var s float64
		for _, v := range r.Null {
			if v >= r.Observed-1e-9 {
				ge++
			}
			if v <= r.Observed+1e-9 {
				le++
			}
			s += v
		}
		if ge != r.AtLeast || le != r.AtMost || math.Abs(s/999-r.NullMean) > 1e-12 {
			t.Errorf("kept null: %d %d %v, result %d %d %v", ge, le, s/999, r.AtLeast, r.AtMost, r.NullMean)
		}
		k := map[Alternative]int{Folded: min(ge, le), Greater: ge, Less: le, TwoSided: min(ge, le)}[alt]
		want := float64(1+k) / 1000
		lo, hi := ClopperPearson(k, 999, 0.95)
		if alt == TwoSided {
			want, lo, hi = math.Min(1, 2*want), math.Min(1, 2*lo), math.Min(1, 2*hi)
		}
		if r.PValue != want || r.Interval != [2]float64{lo, hi} {
			t.Errorf("%s: p %v %v, want %v %v", alt.String(), r.PValue, r.Interval, want, [2]float64{lo, hi})
		}
		if res[4].Null != nil {
			t.Error("a null kept that was not asked for")
		}
	}
}

// Area i's result depends only on (seed, purpose, i) and its own slots: the
// same with 1, 2 or 7 workers, and the same when the areas after it are
// cut off (other areas are not in its stream, though they are in its pool).
func TestLocalDeterminism(t *testing.T) {
	n := 300
	p := ringPlan(n, 5)
	vals := make([]float64, n)
	for i := range vals {
		vals[i] = math.Cos(float64(i) * 0.37)
	}
	p.Permutations, p.Seed, p.Purpose = 499, 11, 2
	var first []LocalResult
	for _, w := range []int{1, 2, 7} {
		p.Workers = w
		res, err := RunLocal(p, sumFactory(vals, nil))
		if err != nil {
			t.Fatal(err)
		}
		if first == nil {
			first = res
		} else if !reflect.DeepEqual(res, first) {
			t.Errorf("%d workers differ from 1", w)
		}
	}
	p.Purpose = 3
	other, err := RunLocal(p, sumFactory(vals, nil))
	if err != nil {
		t.Fatal(err)
	}
	if reflect.DeepEqual(other, first) {
		t.Error("a different purpose gave the same draws")
	}
}

// The draw loop and RunLocal's bookkeeping allocate nothing per draw: one
// area's 1,000 draws allocate nothing, and RunLocal allocates the same
// with 10 draws per area as with 2,000.
func TestLocalDrawsDoNotAllocate(t *testing.T) {
	n := 50
	p := ringPlan(n, 6)
	vals := make([]float64, n)
	for i := range vals {
		vals[i] = float64(i % 7)
	}
	p.Permutations = 1000
	w := newLocalWorker(n, 6, sumFactory(vals, nil)())
	if a := testing.AllocsPerRun(20, func() { w.sample(&p, 7, 6, 3, 1e-9, nil) }); a != 0 {
		t.Errorf("%v allocations per 1,000 draws", a)
	}
	for i, v := range w.pool {
		if v != int32(i) {
			t.Fatalf("pool not restored: position %d holds %d", i, v)
		}
	}
	p.Workers = 1
	count := func(B int) float64 {
		p.Permutations = B
		return testing.AllocsPerRun(5, func() {
			if _, err := RunLocal(p, sumFactory(vals, nil)); err != nil {
				t.Fatal(err)
			}
		})
	}
	if a, b := count(10), count(2000); a != b {
		t.Errorf("RunLocal allocates %v with 10 draws per area, %v with 2,000", a, b)
	}
}

func TestLocalErrors(t *testing.T) {
	good := ringPlan(5, 2)
	good.Permutations = 9
	f := sumFactory([]float64{1, 2, 3, 4, 5}, nil)
	for _, c := range []struct {
		name string
		edit func(p *LocalPlan)
		want string
	}{
		{"one area", func(p *LocalPlan) { p.Offsets, p.Neighbours = []int32{0, 0}, nil }, "at least two"},
		{"self", func(p *LocalPlan) { p.Neighbours = append([]int32{0}, p.Neighbours[1:]...) }, "its own neighbour"},
		{"twice", func(p *LocalPlan) { p.Neighbours = append([]int32{1, 1}, p.Neighbours[2:]...) }, "twice"},
		{"range", func(p *LocalPlan) { p.Neighbours = append([]int32{9}, p.Neighbours[1:]...) }, "out of range"},
		{"offsets", func(p *LocalPlan) { p.Offsets = []int32{0, 2, 4, 6, 8, 9} }, "offsets"},
		{"weights", func(p *LocalPlan) { p.Weights = []float64{1} }, "weights"},
		{"scales", func(p *LocalPlan) { p.Scales = []float64{1} }, "scales"},
		{"keep", func(p *LocalPlan) { p.KeepNull = []int{5} }, "out of range"},
		{"no draws", func(p *LocalPlan) { p.Permutations, p.ExactLimit = 0, -1 }, "at least 1"},
	} {
		p := good
		p.Neighbours = append([]int32(nil), good.Neighbours...)
		c.edit(&p)
		if _, err := RunLocal(p, f); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want %q", c.name, err, c.want)
		}
	}
	nan := func() LocalEvaluator { return func(int, []int32) float64 { return math.NaN() } }
	if _, err := RunLocal(good, nan); err == nil || !strings.Contains(err.Error(), "area 0") {
		t.Errorf("NaN statistic: %v", err)
	}
	// Every area exact: no draws needed, B may be 0.
	p := good
	p.Permutations = 0
	if _, err := RunLocal(p, f); err != nil {
		t.Errorf("all exact with B = 0: %v", err)
	}
	for _, s := range []string{"folded", "greater", "less", "two-sided"} {
		a, err := ParseLocalAlternative(s)
		if err != nil || a.String() != s {
			t.Errorf("%s: %v %v", s, a.String(), err)
		}
	}
	if _, err := ParseLocalAlternative("sideways"); err == nil {
		t.Error("sideways accepted")
	}
}
