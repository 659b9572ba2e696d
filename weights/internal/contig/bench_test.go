package contig

import (
	"sync"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/samples/region"
)

// benchLayers caches the invented regions the benchmarks time, so
// that building them is neither timed nor repeated.
var benchLayers sync.Map

// benchGeoms returns n districts of the demo generator with about 10
// vertices each (4 lattice cells per district gives 9.5 on average).
func benchGeoms(b *testing.B, n int) []orb.MultiPolygon {
	if g, ok := benchLayers.Load(n); ok {
		return g.([]orb.MultiPolygon)
	}
	cfg := region.DefaultConfig()
	cfg.Areas = n
	cfg.CellsPerArea = 4
	r, err := region.Build(cfg)
	if err != nil {
		b.Fatal(err)
	}
	benchLayers.Store(n, r.Geoms)
	return r.Geoms
}

// benchJittered is benchGeoms with every district moved on its
// own by up to 0.3 of the snap distance, so that no shared vertex coincides.
func benchJittered(b *testing.B, n int) []orb.MultiPolygon {
	if g, ok := benchLayers.Load(-n); ok {
		return g.([]orb.MultiPolygon)
	}
	geoms := benchGeoms(b, n)
	j := jitter(geoms, 0.3*DefaultSnap(geoms), 1)
	benchLayers.Store(-n, j)
	return j
}

func benchRun(b *testing.B, n int, rook bool) {
	benchOn(b, benchGeoms(b, n), rook)
}

func benchOn(b *testing.B, geoms []orb.MultiPolygon, rook bool) {
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		pairs, _, err := Find(geoms, Options{Rook: rook})
		if err != nil {
			b.Fatal(err)
		}
		if len(pairs) == 0 {
			b.Fatal("no neighbours")
		}
	}
}

// Targets (issue 3): queen and rook together ≤ 20 s at 250,000 areas on two
// cores, ≤ 3 GB peak memory, and the 250,000 run ≤ 4.5 × the 62,500 one.
func BenchmarkContiguityQueen62500(b *testing.B)  { benchRun(b, 62500, false) }
func BenchmarkContiguityRook62500(b *testing.B)   { benchRun(b, 62500, true) }
func BenchmarkContiguityQueen250000(b *testing.B) { benchRun(b, 250000, false) }
func BenchmarkContiguityRook250000(b *testing.B)  { benchRun(b, 250000, true) }

// The same with every shared vertex slightly apart, as in independently
// digitised borders.
func BenchmarkContiguityQueenJittered250000(b *testing.B) {
	benchOn(b, benchJittered(b, 250000), false)
}
func BenchmarkContiguityRookJittered250000(b *testing.B) {
	benchOn(b, benchJittered(b, 250000), true)
}
