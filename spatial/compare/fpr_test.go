package compare

import (
	"math/rand/v2"
	"reflect"
	"sort"
	"testing"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// The measured false-positive rate of the free shuffle: on surrogates of a
// clustered outcome (SAR, ρ = 0.8, 20×20 rook lattice) with a clustered
// grouping, the free shuffle of the difference in medians rejects far more
// than 5% of true nulls; with either the outcome or the grouping
// unclustered it holds 5% (the free shuffle is then a valid test: Clifford,
// Richardson & Hémon 1989 — it is the pair of autocorrelations that
// inflates the variance). 200 surrogates × 199 shuffles; the result does
// not depend on the number of workers.
func TestFalsePositivesOfTheFreeShuffle(t *testing.T) {
	g := weights.Lattice(20, 20, weights.Rook).RowStandardised()
	b, err := surrogate.NewBasis(g, surrogate.Options{})
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(31, 0))
	yClustered := autoregressive(t, g, 0.8, rng)
	labClustered := aboveMedian(autoregressive(t, g, 0.8, rng))
	yIID := autoregressive(t, g, 0, rng)
	labIID := aboveMedian(autoregressive(t, g, 0, rng))
	opt := FPROptions{Surrogates: 200, Permutations: 199, Seed: 5, Purpose: 4}
	run := func(y []float64, lab []int32, workers int) FalsePositiveRate {
		o, err := b.Prepare(y)
		if err != nil {
			t.Fatal(err)
		}
		o2 := opt
		o2.Workers = workers
		r, err := FalsePositives(o, groups.DiffMedians, lab, 2, o2)
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	both := run(yClustered, labClustered, 0)
	t.Logf("outcome and grouping clustered: %+v", both)
	if both.Interval[0] <= 0.10 {
		t.Errorf("clustered: rate %v, interval %v; expected far above 5%%", both.Rate, both.Interval)
	}
	if one := run(yClustered, labClustered, 1); !reflect.DeepEqual(one, both) {
		t.Errorf("one worker %+v, all %+v", one, both)
	}
	for name, c := range map[string]struct {
		y   []float64
		lab []int32
	}{"independent outcome, clustered grouping": {yIID, labClustered}, "clustered outcome, independent grouping": {yClustered, labIID}} {
		r := run(c.y, c.lab, 0)
		t.Logf("%s: %+v", name, r)
		if r.Interval[0] > 0.05 || r.Interval[1] < 0.05 {
			t.Errorf("%s: rate %v, interval %v; 5%% outside", name, r.Rate, r.Interval)
		}
	}
	o, _ := b.Prepare(yClustered)
	if _, err := FalsePositives(o, groups.DiffMedians, labClustered[:5], 2, opt); err == nil {
		t.Error("short labels accepted")
	}
	if _, err := FalsePositives(o, groups.DiffMedians, labClustered, 2, FPROptions{Alpha: 2}); err == nil {
		t.Error("alpha 2 accepted")
	}
}

// autoregressive draws a field (I − ρW)⁻¹ε on g, ε standard normal from
// rng.
func autoregressive(t *testing.T, g *weights.Graph, rho float64, rng *rand.Rand) []float64 {
	eps := make([]float64, g.Len())
	for i := range eps {
		eps[i] = rng.NormFloat64()
	}
	return testkit.NewSAR(testkit.Dense(g.Offsets, g.Neighbours, g.Weights), rho).Field(t, eps)
}

// aboveMedian puts the areas at or above the median of x in group 0 (A).
func aboveMedian(x []float64) []int32 {
	s := append([]float64(nil), x...)
	sort.Float64s(s)
	lab := make([]int32, len(x))
	for i, v := range x {
		if v < s[len(s)/2] {
			lab[i] = 1
		}
	}
	return lab
}

// The check of several schemes at once: the first scheme's rate is the one
// the free shuffle alone gets (same surrogates, same streams); a shuffle
// within strata of one area each cannot move a label, so its p-value is 1
// and it never rejects; a shuffle within two halves gets its own rate; and
// none of it depends on the number of workers.
func TestFalsePositivesOfSeveralSchemes(t *testing.T) {
	g := weights.Lattice(12, 12, weights.Rook).RowStandardised()
	b, err := surrogate.NewBasis(g, surrogate.Options{})
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(3, 0))
	y := autoregressive(t, g, 0.8, rng)
	lab := aboveMedian(autoregressive(t, g, 0.8, rng))
	o, err := b.Prepare(y)
	if err != nil {
		t.Fatal(err)
	}
	singles, halves := make([]int32, g.Len()), make([]int32, g.Len())
	for i := range singles {
		singles[i], halves[i] = int32(i), int32(i%12/6)
	}
	schemes := []CheckScheme{{Name: "free"}, {Name: "singles", Strata: singles}, {Name: "halves", Strata: halves}}
	opt := FPROptions{Surrogates: 60, Permutations: 39, Seed: 9, Purpose: 5}
	all, err := FalsePositivesOf(o, groups.DiffMedians, lab, 2, schemes, opt)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%+v", all)
	free, err := FalsePositives(o, groups.DiffMedians, lab, 2, opt)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(all[0], free) {
		t.Errorf("free with others %+v, alone %+v", all[0], free)
	}
	if all[1].Rejected != 0 || all[1].Scheme != "singles" {
		t.Errorf("strata of one area rejected: %+v", all[1])
	}
	one := opt
	one.Workers = 1
	if again, err := FalsePositivesOf(o, groups.DiffMedians, lab, 2, schemes, one); err != nil || !reflect.DeepEqual(again, all) {
		t.Errorf("one worker %+v (%v), all %+v", again, err, all)
	}
	if _, err := FalsePositivesOf(o, groups.DiffMedians, lab, 2, []CheckScheme{{Name: "short", Strata: halves[:3]}}, opt); err == nil {
		t.Error("short strata accepted")
	}
	if _, err := FalsePositivesOf(o, groups.DiffMedians, lab, 2, nil, opt); err == nil {
		t.Error("no scheme accepted")
	}
}
