package compare

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/areatest/areatest/samples/region"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/weights"
)

// BenchmarkZonesSound measures how often the shuffle within automatic
// zones is sound, as the check sees it, on the generated region at 3,000
// areas (queen) and on a 50×60 queen lattice, with independent SAR(ρ)
// outcome and grouping (the grouping split at its median) at ρ = 0.8 and
// 0.95: per replicate the check of the free and the within-zones shuffles
// (100 surrogates × 199 shuffles) and each row's own test (199 shuffles).
// Run with
//
//	go test ./spatial/compare -run '^$' -bench ZonesSound -benchtime 1x -v
func BenchmarkZonesSound(b *testing.B) {
	cfg := region.DefaultConfig()
	cfg.Areas = 3000
	r, err := region.Build(cfg)
	if err != nil {
		b.Fatal(err)
	}
	reg, err := weights.ContiguityGraph(r.Geoms, weights.Queen)
	if err != nil {
		b.Fatal(err)
	}
	layers := []struct {
		name string
		g    *weights.Graph
	}{{"region 3000", reg}, {"lattice 50×60", weights.Lattice(50, 60, weights.Queen)}}
	for range b.N {
		for _, l := range layers {
			for _, rho := range []float64{0.8, 0.95} {
				zonesSound(b, l.name, l.g, rho, 20)
			}
		}
	}
}

// zonesSound runs reps replicates on g and logs the tally.
func zonesSound(b *testing.B, name string, g *weights.Graph, rho float64, reps int) {
	w := g.RowStandardised()
	basis, err := surrogate.NewBasis(w, surrogate.Options{})
	if err != nil {
		b.Fatal(err)
	}
	zones, err := weights.Zones(g, 0)
	if err != nil {
		b.Fatal(err)
	}
	schemes := []CheckScheme{{Name: "free"}, {Name: "zones", Strata: zones}}
	rng := rand.New(rand.NewPCG(17, uint64(100*rho)))
	var sound, rejected [2]int
	var rateSum [2]float64
	buf := make([]int32, g.Len())
	for rep := range reps {
		y, lab := sarField(w, rho, rng), aboveMedian(sarField(w, rho, rng))
		o, err := basis.Prepare(y)
		if err != nil {
			b.Fatal(err)
		}
		rates, err := FalsePositivesOf(o, groups.DiffMedians, lab, 2, schemes, FPROptions{Surrogates: 100, Seed: uint64(rep), Purpose: 5})
		if err != nil {
			b.Fatal(err)
		}
		d, err := groups.Prepare(y, lab, 2)
		if err != nil {
			b.Fatal(err)
		}
		for j, sc := range schemes {
			p, err := shuffleSorted(d, sc.Strata, buf, groups.DiffMedians, shuffle.TwoSided, 199, uint64(rep), 1+uint64(j))
			if err != nil {
				b.Fatal(err)
			}
			if p <= 0.05 {
				rejected[j]++
			}
			rateSum[j] += rates[j].Rate
			if rates[j].Interval[0] <= rates[j].Alpha {
				sound[j]++
			}
		}
	}
	for j, sc := range schemes {
		b.Logf("%s (%d zones), ρ %.2f, %s: rejected %d of %d, reported %.1f%% on average, sound in %d of %d",
			name, len(weights.ZoneSizes(zones)), rho, sc.Name, rejected[j], reps, 100*rateSum[j]/float64(reps), sound[j], reps)
	}
}

// sarField draws (I − ρW)⁻¹ε, ε standard normal, by the fixed-point
// iteration y ← ε + ρWy (W row-standardised, so it converges as ρ^k), to
// 1e-12.
func sarField(w *weights.Graph, rho float64, rng *rand.Rand) []float64 {
	n := w.Len()
	eps, y, next := make([]float64, n), make([]float64, n), make([]float64, n)
	for i := range eps {
		eps[i] = rng.NormFloat64()
		y[i] = eps[i]
	}
	for it := 0; it < 5000; it++ {
		change := 0.0
		for i := range n {
			s := 0.0
			for k := w.Offsets[i]; k < w.Offsets[i+1]; k++ {
				s += w.Weights[k] * y[w.Neighbours[k]]
			}
			next[i] = eps[i] + rho*s
			change = math.Max(change, math.Abs(next[i]-y[i]))
		}
		y, next = next, y
		if change < 1e-12 {
			break
		}
	}
	return y
}
