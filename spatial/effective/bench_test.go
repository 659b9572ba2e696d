package effective

import (
	"testing"

	"github.com/areatest/areatest/samples/region"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// demo returns the queen-contiguity graph of the demo region at the given
// size, with its rate column (missing values set to the mean) and the
// policy indicator.
func demo(b *testing.B, areas int) (*weights.Graph, []float64, []float64) {
	b.Helper()
	cfg := region.DefaultConfig()
	cfg.Areas = areas
	r, err := region.Build(cfg)
	if err != nil {
		b.Fatal(err)
	}
	g, err := weights.ContiguityGraph(r.Geoms, weights.Queen)
	if err != nil {
		b.Fatal(err)
	}
	y := make([]float64, areas)
	x := make([]float64, areas)
	for i := range y {
		y[i] = r.Income[i]
		if r.Policy[i] == "yes" {
			x[i] = 1
		}
	}
	return g, y, x
}

// The modified t-test on the demo region of 3,000 areas, from the graph:
// finding the orders and their pairs, then the test itself.
func BenchmarkModifiedTTest3000(b *testing.B) { benchTest(b, 3000) }

// benchTest times Test on the demo region of the given size.
func benchTest(b *testing.B, areas int) {
	g, y, x := demo(b, areas)
	var res Result
	b.ResetTimer()
	for b.Loop() {
		var err error
		res, err = Test(y, x, g, Options{})
		if err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(res.EffectiveSampleSize, "n_eff")
	b.ReportMetric(float64(len(res.Orders)), "orders")
}

// The test alone, with the orders prepared once (as for several groups).
func BenchmarkModifiedTTest3000Prepared(b *testing.B) {
	g, y, x := demo(b, 3000)
	l, err := NewLags(g, 0)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		if _, err := l.Test(y, x, shuffle.TwoSided); err != nil {
			b.Fatal(err)
		}
	}
}

// A layer too large for every pair: the orders are cut by PairBudget and
// the pairs are walked, not stored.
func BenchmarkModifiedTTest85000(b *testing.B) { benchTest(b, 85000) }
