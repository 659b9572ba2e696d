package shuffle

import (
	"encoding/json"
	"math"
	"reflect"
	"strings"
	"testing"
)

// shardedRun runs plan in n parts (each part's ledger through JSON, as a
// partial-result file carries it), combines them and replays: run is the
// test with p.Shard set.
func shardedRun[R any](t *testing.T, n int, run func(s *Shard) (R, error)) R {
	t.Helper()
	parts := make([]*Ledger, n)
	for k := 1; k <= n; k++ {
		s, err := NewPart(k, n)
		if err != nil {
			t.Fatal(err)
		}
		if _, err := run(s); err != nil {
			t.Fatalf("part %d of %d: %v", k, n, err)
		}
		b, err := json.Marshal(s.Ledger())
		if err != nil {
			t.Fatal(err)
		}
		parts[k-1] = NewLedger()
		if err := json.Unmarshal(b, parts[k-1]); err != nil {
			t.Fatal(err)
		}
	}
	all, err := Combine(parts)
	if err != nil {
		t.Fatal(err)
	}
	r, err := run(NewReplay(all))
	if err != nil {
		t.Fatalf("replay of %d parts: %v", n, err)
	}
	return r
}

// Parts replayed give the whole run's result bit for bit: label shuffles
// (Monte Carlo over several blocks, and exact), and surrogates; with more
// parts than blocks some parts own none.
func TestShardsReplayTheWholeRun(t *testing.T) {
	y := []float64{3.1, 0.2, 7.7, 1.9, 4.4, 2.5, 9.3, 0.8, 5.6, 6.1, 2.2, 8.4}
	labels := stripes(len(y), 2)
	cases := []struct {
		name string
		plan Plan
	}{
		{"sampled", Plan{Scheme: "free", Labels: labels, Permutations: 2*BlockSize + 77, ExactLimit: -1, Seed: 7, Purpose: 3, Workers: 3}},
		{"exact", Plan{Scheme: "free", Labels: labels, Permutations: 99, Seed: 7, Purpose: 3, Workers: 2}},
	}
	for _, c := range cases {
		whole, err := Run(c.plan, func() Evaluator { return groupASum(y) })
		if err != nil {
			t.Fatal(err)
		}
		for _, n := range []int{1, 2, 3, 7} {
			got := shardedRun(t, n, func(s *Shard) (Result, error) {
				p := c.plan
				p.Shard = s
				return Run(p, func() Evaluator { return groupASum(y) })
			})
			if !reflect.DeepEqual(got, whole) {
				t.Errorf("%s, %d parts: %+v, whole run %+v", c.name, n, got, whole)
			}
		}
	}
	sp := SurrogatePlan{Scheme: "uniform", Draws: 3*BlockSize + 1, Seed: 5, Purpose: 9, Workers: 2}
	whole, err := RunSurrogates(sp, 0.5, uniformDraw, firstValue, 4)
	if err != nil {
		t.Fatal(err)
	}
	for _, n := range []int{2, 5} {
		got := shardedRun(t, n, func(s *Shard) (Result, error) {
			p := sp
			p.Shard = s
			return RunSurrogates(p, 0.5, uniformDraw, firstValue, 4)
		})
		if !reflect.DeepEqual(got, whole) {
			t.Errorf("surrogates, %d parts: %+v, whole run %+v", n, got, whole)
		}
	}
}

// Parts that do not belong together, and replays of another run, are
// refused with the stage and block named.
func TestShardCombineRefuses(t *testing.T) {
	labels := stripes(12, 2)
	plan := Plan{Scheme: "free", Labels: labels, Permutations: 3 * BlockSize, ExactLimit: -1, Seed: 1, Purpose: 1, Workers: 1}
	eval := func() Evaluator { return firstKFactory(3)() }
	part := func(k, n int, p Plan) *Ledger {
		s, _ := NewPart(k, n)
		p.Shard = s
		if _, err := Run(p, eval); err != nil {
			t.Fatal(err)
		}
		return s.Ledger()
	}
	other := plan
	other.Permutations = 5 * BlockSize
	for _, c := range []struct {
		name  string
		parts []*Ledger
		want  string
	}{
		{"a part twice", []*Ledger{part(1, 2, plan), part(1, 2, plan)}, "not its own"},
		{"another count", []*Ledger{part(1, 2, plan), part(2, 2, other)}, "blocks in part 2"},
		{"a part short", []*Ledger{part(1, 3, plan), part(2, 3, plan)}, "missing"},
	} {
		if _, err := Combine(c.parts); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want %q", c.name, err, c.want)
		}
	}
	all, err := Combine([]*Ledger{part(1, 2, plan), part(2, 2, plan)})
	if err != nil {
		t.Fatal(err)
	}
	other.Shard = NewReplay(all)
	if _, err := Run(other, eval); err == nil || !strings.Contains(err.Error(), "blocks in the parts") {
		t.Errorf("replay of another count: %v", err)
	}
	keep := plan
	keep.Shard, keep.KeepNull = NewReplay(all), true
	if _, err := Run(keep, eval); err == nil {
		t.Error("a shard that keeps the null ran")
	}
	if _, err := NewPart(3, 2); err == nil {
		t.Error("part 3 of 2 accepted")
	}
}

// Floats cross JSON bit for bit, the non-finite ones too.
func TestExactFloatsRoundTrip(t *testing.T) {
	in := ExactFloats{0.1 + 0.2, -0.0, math.SmallestNonzeroFloat64, math.MaxFloat64, math.Inf(1), math.Inf(-1), 1e21, 1 / 3.0}
	b, err := json.Marshal(in)
	if err != nil {
		t.Fatal(err)
	}
	var out ExactFloats
	if err := json.Unmarshal(b, &out); err != nil {
		t.Fatal(err)
	}
	for i := range in {
		if math.Float64bits(in[i]) != math.Float64bits(out[i]) {
			t.Errorf("value %d: %v came back as %v (%s)", i, in[i], out[i], b)
		}
	}
	var nan ExactFloats
	if err := json.Unmarshal([]byte(`["NaN"]`), &nan); err != nil || !math.IsNaN(nan[0]) {
		t.Errorf("NaN: %v %v", nan, err)
	}
}
