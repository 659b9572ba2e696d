package surrogate

import (
	"math"
	"sync"
	"testing"

	"github.com/areatest/areatest/samples/region"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

var regionOnce sync.Map

// regionGraph is the row-standardised queen graph of the demo generator's
// region at n areas (timing only: the data are invented).
func regionGraph(tb testing.TB, n int) *weights.Graph {
	if g, ok := regionOnce.Load(n); ok {
		return g.(*weights.Graph)
	}
	cfg := region.DefaultConfig()
	cfg.Areas = n
	r, err := region.Build(cfg)
	if err != nil {
		tb.Fatal(err)
	}
	g, err := weights.ContiguityGraph(r.Geoms, weights.Queen)
	if err != nil {
		tb.Fatal(err)
	}
	rs := g.RowStandardised()
	regionOnce.Store(n, rs)
	return rs
}

// Target (issue 6): the eigenvectors for 3,000 areas in at most 5 s.
func BenchmarkBasis3000(b *testing.B) {
	g := regionGraph(b, 3000)
	b.ResetTimer()
	for range b.N {
		bs, err := NewBasis(g, Options{})
		if err != nil {
			b.Fatal(err)
		}
		if b.N == 1 {
			b.Logf("%+v", bs.Info())
		}
	}
}

// benchColumns is a smooth outcome with noise and a split into two groups
// of bands of 300 areas, made up for timing only.
func benchColumns(n int) ([]float64, []int32) {
	y := make([]float64, n)
	lab := make([]int32, n)
	rng := shuffle.NewStream(1, 1, 0)
	for i := range y {
		y[i] = math.Sin(float64(i)/150) + 0.5*rng.Float64()
		lab[i] = int32((i / 300) % 2)
	}
	return y, lab
}

// benchOutcome prepares benchColumns on the dense basis of the 3,000-area
// region.
func benchOutcome(tb testing.TB) (*Basis, *Outcome, []float64, []int32) {
	g := regionGraph(tb, 3000)
	b, err := NewBasis(g, Options{})
	if err != nil {
		tb.Fatal(err)
	}
	n := g.Len()
	y, lab := benchColumns(n)
	o, err := b.Prepare(y)
	if err != nil {
		tb.Fatal(err)
	}
	return b, o, y, lab
}

// Target (issue 6): 999 surrogates of the difference in medians on 3,000
// areas in a few seconds (the basis built beforehand).
func BenchmarkSurrogates3000x999(b *testing.B) {
	_, o, y, lab := benchOutcome(b)
	gs, err := NewGroupStatistic(groups.DiffMedians, lab, 2)
	if err != nil {
		b.Fatal(err)
	}
	observed := gs.Value(y)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		if _, err := GroupTest(o, gs, observed, shuffle.SurrogatePlan{Draws: 999, Seed: 1, Purpose: 3}); err != nil {
			b.Fatal(err)
		}
	}
}

// Target (issue 6): the false-positive estimate, 500 surrogates × 199
// shuffles on 3,000 areas, in about 5 s.
func BenchmarkFalsePositives3000x500x199(b *testing.B) {
	_, o, _, lab := benchOutcome(b)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		r, err := FalsePositives(o, groups.DiffMedians, lab, 2, FPROptions{Seed: 1, Purpose: 4})
		if err != nil {
			b.Fatal(err)
		}
		if b.N == 1 {
			b.Logf("%+v", r)
		}
	}
}

// One draw on 3,000 areas, for the per-surrogate cost.
func BenchmarkDraw3000(b *testing.B) {
	bs, o, _, _ := benchOutcome(b)
	s := bs.NewScratch()
	out := make([]float64, o.Len())
	rng := shuffle.NewStream(1, 1, 1)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		o.Draw(&rng, out, s)
	}
}

// The whole of the budget on 3,000 areas, ≤ 20 s: the eigenbasis,
// the free shuffle with 9,999 draws, 999 spectral surrogates and the
// 500-surrogate false-positive estimate with 199 shuffles each.
func BenchmarkSpectralBudget3000(b *testing.B) {
	g := regionGraph(b, 3000)
	n := g.Len()
	y, lab := benchColumns(n)
	b.ResetTimer()
	for range b.N {
		bs, err := NewBasis(g, Options{})
		if err != nil {
			b.Fatal(err)
		}
		d, err := groups.Prepare(y, lab, 2)
		if err != nil {
			b.Fatal(err)
		}
		observed := d.Observed(groups.DiffMedians)
		scale := d.Y[n-1] - d.Y[0]
		if _, err := shuffle.Run(shuffle.Plan{Labels: d.Labels, Permutations: 9999, Seed: 1, Purpose: 1, Scale: scale}, d.Factory(groups.DiffMedians)); err != nil {
			b.Fatal(err)
		}
		o, err := bs.Prepare(y)
		if err != nil {
			b.Fatal(err)
		}
		gs, err := NewGroupStatistic(groups.DiffMedians, lab, 2)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := GroupTest(o, gs, observed, shuffle.SurrogatePlan{Draws: 999, Seed: 1, Purpose: 3, Scale: scale}); err != nil {
			b.Fatal(err)
		}
		if _, err := FalsePositives(o, groups.DiffMedians, lab, 2, FPROptions{Seed: 1, Purpose: 4}); err != nil {
			b.Fatal(err)
		}
	}
}
