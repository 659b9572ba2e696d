package local

import (
	"testing"

	"github.com/areatest/areatest/samples/region"
	"github.com/areatest/areatest/weights"
)

// Target (issue 5): local Moran with 9,999 conditional permutations per
// area on 3,000 areas of queen-like weights (a 55×55 lattice with its
// diagonals, ~7.8 neighbours each) ≤ 1 s.
func BenchmarkLocalMoran3000x9999(b *testing.B) {
	g := lattice(b, 55, 55, true, 1).RowStandardised()
	benchLocal(b, g, smooth(g.Len(), 55))
}

// Target (issue 5): the same on 85,000 districts of the sample region
// generator with queen contiguity (~6 neighbours each) ≤ 60 s on the 2-core
// development machine, memory linear in n.
func BenchmarkLocalMoran85000x9999(b *testing.B) {
	cfg := region.DefaultConfig()
	cfg.Areas = 85000
	r, err := region.Build(cfg)
	if err != nil {
		b.Fatal(err)
	}
	q, err := weights.ContiguityGraph(r.Geoms, weights.Queen)
	if err != nil {
		b.Fatal(err)
	}
	var keep []int
	for i := 0; i < q.Len(); i++ {
		if q.Degree(i) > 0 {
			keep = append(keep, i)
		}
	}
	g := q.Subset(keep).RowStandardised()
	b.Logf("%d areas, %.2f neighbours each on average", g.Len(), float64(g.Links())/float64(g.Len()))
	benchLocal(b, g, smooth(g.Len(), 292))
}

func benchLocal(b *testing.B, g *weights.Graph, x []float64) {
	opt := DefaultOptions()
	opt.Permutations = 9999
	opt.Seed = 1
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		if _, err := Run(Moran, x, nil, g, opt); err != nil {
			b.Fatal(err)
		}
	}
}
