package surrogate

import (
	"reflect"
	"testing"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
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
	g := lattice(t, 20, 20).RowStandardised()
	b, err := NewBasis(g, Options{})
	if err != nil {
		t.Fatal(err)
	}
	rng := shuffle.NewStream(31, 0, 0)
	sar := newSAR(g, 0.8)
	yClustered := sar.draw(t, &rng)
	labClustered := medianSplit(sar.draw(t, &rng))
	yIID := make([]float64, g.Len())
	normals(&rng, yIID)
	labIID := medianSplit(func() []float64 { x := make([]float64, g.Len()); normals(&rng, x); return x }())
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
