package autocorr

import (
	"testing"

	"github.com/areatest/areatest/samples/region"
	"github.com/areatest/areatest/weights"
)

// The range of Moran's I on row-standardised queen weights (the tool's
// defaults). Square lattices are the hard case: their extreme eigenvalues
// crowd together fastest as they grow, so the Lanczos steps grow as about
// 3.5√n. Targets (issue 17): linear cost per step, and a range cheap enough
// to compute unasked up to clustering.AutoRangeAreas areas. Run the large
// ones once: go test ./spatial/autocorr -run - -bench Bounds -benchtime 1x.

// Target (issue 4): 3,025 areas ≤ ~1 s (now about 20 ms).
func BenchmarkBounds3000(b *testing.B)       { benchBounds(b, queenRows(55)) }
func BenchmarkBoundsQueen3136(b *testing.B)  { benchBounds(b, queenRows(56)) }
func BenchmarkBoundsQueen10000(b *testing.B) { benchBounds(b, queenRows(100)) }
func BenchmarkBoundsQueen19881(b *testing.B) { benchBounds(b, queenRows(141)) }
func BenchmarkBoundsQueen40000(b *testing.B) { benchBounds(b, queenRows(200)) }

// 292² = 85,264 cells, the square nearest 85,000.
func BenchmarkBoundsQueen85000(b *testing.B) { benchBounds(b, queenRows(292)) }

// The generated region (samples/region), irregular districts with islands.
func BenchmarkBoundsRegion20000(b *testing.B) { benchBounds(b, regionRows(b, 20_000)) }
func BenchmarkBoundsRegion85000(b *testing.B) { benchBounds(b, regionRows(b, 85_000)) }

func queenRows(m int) *weights.Graph { return weights.Lattice(m, m, weights.Queen).RowStandardised() }

// regionRows is the row-standardised queen graph of the generated region
// of n districts, its islands dropped (as autocorr leaves them out).
func regionRows(tb testing.TB, n int) *weights.Graph {
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
	var linked []int
	for i := 0; i < g.Len(); i++ {
		if g.Degree(i) > 0 {
			linked = append(linked, i)
		}
	}
	return g.Subset(linked).RowStandardised()
}

func benchBounds(b *testing.B, g *weights.Graph) {
	b.ReportAllocs()
	b.ResetTimer()
	var r Bounds
	for range b.N {
		var err error
		if r, err = MoranBounds(g); err != nil || !r.Converged {
			b.Fatal(err, r)
		}
	}
	b.ReportMetric(float64(r.Iterations), "steps")
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(g.Len()), "ns/area")
}
