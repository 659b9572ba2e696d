package weights

import (
	"sync"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/samples/region"
)

// contigBenchLayers caches the invented regions the benchmarks time, so
// that building them is neither timed nor repeated.
var contigBenchLayers sync.Map

// contigBenchGeoms returns n districts of the demo generator with about 10
// vertices each (4 lattice cells per district gives 9.5 on average).
func contigBenchGeoms(b *testing.B, n int) []orb.MultiPolygon {
	if g, ok := contigBenchLayers.Load(n); ok {
		return g.([]orb.MultiPolygon)
	}
	cfg := region.DefaultConfig()
	cfg.Areas = n
	cfg.CellsPerArea = 4
	r, err := region.Build(cfg)
	if err != nil {
		b.Fatal(err)
	}
	contigBenchLayers.Store(n, r.Geoms)
	return r.Geoms
}

// contigBenchJittered is contigBenchGeoms with every district moved on its
// own by up to 0.3 of the snap distance, so that no shared vertex coincides.
func contigBenchJittered(b *testing.B, n int) []orb.MultiPolygon {
	if g, ok := contigBenchLayers.Load(-n); ok {
		return g.([]orb.MultiPolygon)
	}
	geoms := contigBenchGeoms(b, n)
	j := contigJitter(geoms, 0.3*DefaultSnap(geoms), 1)
	contigBenchLayers.Store(-n, j)
	return j
}

func contigBenchRun(b *testing.B, n int, rule Contiguity) {
	contigBenchOn(b, contigBenchGeoms(b, n), rule)
}

func contigBenchOn(b *testing.B, geoms []orb.MultiPolygon, rule Contiguity) {
	n := len(geoms)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		g, _, err := BuildContiguity(geoms, ContiguityOptions{Rule: rule})
		if err != nil {
			b.Fatal(err)
		}
		if g.Len() != n {
			b.Fatalf("%d areas, want %d", g.Len(), n)
		}
	}
}

// Targets (issue 3): queen and rook together ≤ 20 s at 250,000 areas on two
// cores, ≤ 3 GB peak memory, and the 250,000 run ≤ 4.5 × the 62,500 one.
func BenchmarkContiguityQueen62500(b *testing.B)  { contigBenchRun(b, 62500, Queen) }
func BenchmarkContiguityRook62500(b *testing.B)   { contigBenchRun(b, 62500, Rook) }
func BenchmarkContiguityQueen250000(b *testing.B) { contigBenchRun(b, 250000, Queen) }
func BenchmarkContiguityRook250000(b *testing.B)  { contigBenchRun(b, 250000, Rook) }

// The same with every shared vertex slightly apart, as in independently
// digitised borders.
func BenchmarkContiguityQueenJittered250000(b *testing.B) {
	contigBenchOn(b, contigBenchJittered(b, 250000), Queen)
}
func BenchmarkContiguityRookJittered250000(b *testing.B) {
	contigBenchOn(b, contigBenchJittered(b, 250000), Rook)
}
