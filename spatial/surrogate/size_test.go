package surrogate

import (
	"fmt"
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// simulation is a set of simulated layers on one graph: outcome and
// grouping independent simultaneous autoregressive fields (Whittle 1954;
// Cliff & Ord 1981, ch. 6), the grouping the upper half of its field, and
// optionally a group effect added to the outcome.
type simulation struct {
	g          *weights.Graph
	rhoY, rhoX float64
	effect     float64 // in units of the outcome's standard deviation, added to group A
	layers     int
	draws      int // shuffles and surrogates per test
	seed       uint64
	basis      Options
}

// rates are the shares of layers whose test rejected at 0.05.
type rates struct {
	layers            int
	free, spectral    int
	freeLo, freeHi    float64
	specLo, specHi    float64
	meanI             float64
	residualShareMean float64
}

func (r rates) String() string {
	return fmt.Sprintf("free %.3f [%.3f, %.3f], spectral %.3f [%.3f, %.3f] over %d layers (mean Moran's I of the outcome %.2f)",
		float64(r.free)/float64(r.layers), r.freeLo, r.freeHi,
		float64(r.spectral)/float64(r.layers), r.specLo, r.specHi, r.layers, r.meanI)
}

func (s simulation) run(tb testing.TB) rates {
	const alpha = 0.05
	n := s.g.Len()
	fy, fx := newSAR(s.g, s.rhoY), newSAR(s.g, s.rhoX)
	b, err := NewBasis(s.g, s.basis)
	if err != nil {
		tb.Fatal(err)
	}
	r := rates{layers: s.layers}
	for l := 0; l < s.layers; l++ {
		rng := shuffle.NewStream(s.seed, 1000, l)
		y := fy.draw(tb, &rng)
		lab := medianSplit(fx.draw(tb, &rng))
		if s.effect != 0 {
			_, v := meanVar(y)
			for i := range y {
				if lab[i] == 0 {
					y[i] += s.effect * math.Sqrt(v)
				}
			}
		}
		r.meanI += moranLinked(tb, b, s.g, y) / float64(s.layers)
		d, err := groups.Prepare(y, lab, 2)
		if err != nil {
			tb.Fatal(err)
		}
		observed := d.Observed(groups.DiffMedians)
		scale := d.Y[n-1] - d.Y[0]
		free, err := shuffle.Run(shuffle.Plan{Labels: d.Labels, Permutations: s.draws, Seed: s.seed,
			Purpose: uint64(2*l + 1), Scale: scale}, d.Factory(groups.DiffMedians))
		if err != nil {
			tb.Fatal(err)
		}
		o, err := b.Prepare(y)
		if err != nil {
			tb.Fatal(err)
		}
		r.residualShareMean += o.ResidualShare() / float64(s.layers)
		spec := groupTest(tb, o, groups.DiffMedians, lab, observed, shuffle.SurrogatePlan{Draws: s.draws, Seed: s.seed,
			Purpose: uint64(2*l + 2), Scale: scale})
		if free.PValue <= alpha {
			r.free++
		}
		if spec.PValue <= alpha {
			r.spectral++
		}
	}
	r.freeLo, r.freeHi = shuffle.ClopperPearson(r.free, r.layers, 0.95)
	r.specLo, r.specHi = shuffle.ClopperPearson(r.spectral, r.layers, 0.95)
	return r
}

// Size on simulated layers (the setting of Wagner & Dray 2015, §3, and of
// Clifford, Richardson & Hémon 1989): outcome and grouping independent
// SAR fields with ρ = 0.8 on a row-standardised 20×20 rook lattice, the
// grouping the upper half of its field. Both cluster, so the free shuffle
// of the difference in medians rejects far more often than 5%; the spectral
// surrogate test, whose null keeps the outcome's spatial structure, stays
// near 5% — on the dense path and on a sparse basis of 90 of the 399
// vectors with the matched residual. Under independent data (ρ = 0) both
// hold 5%. 200 layers, 199 shuffles and 199 surrogates each, fixed seeds;
// BenchmarkSizeAndPower runs 2,000 layers.
func TestSizeOnSimulatedLayers(t *testing.T) {
	rook := lattice(t, 20, 20).RowStandardised()
	const layers, draws = 200, 199
	clustered := simulation{g: rook, rhoY: 0.8, rhoX: 0.8, layers: layers, draws: draws, seed: 11}.run(t)
	t.Logf("ρ = 0.8, dense: %v", clustered)
	sparse := simulation{g: rook, rhoY: 0.8, rhoX: 0.8, layers: layers, draws: draws, seed: 11,
		basis: Options{Method: Sparse, Top: 60, Bottom: 30}}.run(t)
	t.Logf("ρ = 0.8, sparse 60+30, matched: %v (mean residual share %.2f)", sparse, sparse.residualShareMean)
	iid := simulation{g: rook, layers: layers, draws: draws, seed: 12}.run(t)
	t.Logf("ρ = 0: %v", iid)

	if clustered.freeLo < 0.10 {
		t.Errorf("free shuffle under clustering: %v; expected far above 5%%", clustered)
	}
	for name, r := range map[string]rates{"dense": clustered, "sparse": sparse} {
		if r.specLo > 0.05 || r.specHi < 0.05 {
			t.Errorf("spectral test (%s) under clustering: %v; 5%% outside its interval", name, r)
		}
	}
	if iid.freeLo > 0.05 || iid.freeHi < 0.05 || iid.specLo > 0.05 || iid.specHi < 0.05 {
		t.Errorf("independent data: %v; 5%% outside an interval", iid)
	}
}

// Power with a real group effect (+0.8 and +0.4 outcome standard
// deviations in group A) on clustered and on independent layers: the free
// shuffle rejects more often (under clustering it rejects too often
// anyway), the spectral test a little less; reported, and checked only to
// be well above the test's size.
func TestPowerOnSimulatedLayers(t *testing.T) {
	rook := lattice(t, 20, 20).RowStandardised()
	big := simulation{g: rook, rhoY: 0.8, rhoX: 0.8, effect: 0.8, layers: 100, draws: 199, seed: 13}.run(t)
	t.Logf("ρ = 0.8, effect +0.8 sd: %v", big)
	small := simulation{g: rook, rhoY: 0.8, rhoX: 0.8, effect: 0.4, layers: 100, draws: 199, seed: 15}.run(t)
	t.Logf("ρ = 0.8, effect +0.4 sd: %v", small)
	iid := simulation{g: rook, effect: 0.4, layers: 100, draws: 199, seed: 14}.run(t)
	t.Logf("ρ = 0, effect +0.4 sd: %v", iid)
	if big.spectral < 80 || small.spectral < 20 || iid.spectral < 80 || iid.free < 80 {
		t.Errorf("power too low: %v; %v; independent %v", big, small, iid)
	}
}

// The long version of the two checks above (2,000 layers each), for the
// figures in the README: go test -run X -bench SizeAndPower -benchtime 1x.
func BenchmarkSizeAndPower(b *testing.B) {
	rook := lattice(b, 20, 20).RowStandardised()
	for range b.N {
		for _, c := range []struct {
			name string
			s    simulation
		}{
			{"size ρ=0.8 dense", simulation{rhoY: 0.8, rhoX: 0.8, seed: 21}},
			{"size ρ=0.8 sparse 60+30 matched", simulation{rhoY: 0.8, rhoX: 0.8, seed: 21, basis: Options{Method: Sparse, Top: 60, Bottom: 30}}},
			{"size ρ=0.8 sparse 60+30 white", simulation{rhoY: 0.8, rhoX: 0.8, seed: 21, basis: Options{Method: Sparse, Top: 60, Bottom: 30, Residual: White}}},
			{"size ρ=0", simulation{seed: 22}},
			{"size ρ_y=0.8, ρ_x=0", simulation{rhoY: 0.8, seed: 23}},
			{"power ρ=0.8 +0.8 sd", simulation{rhoY: 0.8, rhoX: 0.8, effect: 0.8, seed: 24}},
			{"power ρ=0 +0.4 sd", simulation{effect: 0.4, seed: 25}},
			{"power ρ=0.8 +0.4 sd", simulation{rhoY: 0.8, rhoX: 0.8, effect: 0.4, seed: 26}},
		} {
			s := c.s
			s.g, s.layers, s.draws = rook, 2000, 199
			b.Logf("%-32s %v", c.name, s.run(b))
		}
	}
}
