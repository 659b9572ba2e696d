package compare

import (
	"math"
	"slices"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/sar"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/weights"
)

// Calibrate against counts by hand. p-values 0.02 ×2, 0.05, 0.1, 0.2 ×3,
// 0.5 ×3 (S = 10): at observed p = 0.05, 3 of them are ≤ it, so the
// calibrated p is (1 + 3) / 11; α′ at α = 0.2 is 0.02 (2 of 10 ≤ 0.02,
// while 3 of 10 ≤ 0.05 would be above 2), at α = 0.3 it is 0.05 (3 ≤ 3,
// 4 > 3), at α = 0.1 it is 0 (the two tied 0.02 already exceed 1), at
// α = 0.5 it is 0.1 (4 ≤ 5, 7 > 5).
func TestCalibrate(t *testing.T) {
	p := []float64{0.5, 0.02, 0.2, 0.05, 0.5, 0.2, 0.1, 0.02, 0.2, 0.5}
	for _, c := range []struct{ obs, alpha, want, level float64 }{
		{0.05, 0.2, 4.0 / 11, 0.02},
		{0.05, 0.3, 4.0 / 11, 0.05},
		{0.05, 0.1, 4.0 / 11, 0},
		{0.01, 0.05, 1.0 / 11, 0},
		{0.5, 0.5, 11.0 / 11, 0.1},
	} {
		got := Calibrate(c.obs, p, c.alpha)
		if math.Abs(got.PValue-c.want) > 1e-15 || got.Level != c.level {
			t.Errorf("observed %v, α %v: %+v, want p %v, level %v", c.obs, c.alpha, got, c.want, c.level)
		}
	}
	r := SARRate(p, 0.05, 39)
	if lo, hi := shuffle.ClopperPearson(3, 10, 0.95); r.Rejected != 3 || r.Rate != 0.3 || r.Interval != [2]float64{lo, hi} {
		t.Errorf("rate %+v", r)
	}
}

// sarCheckLayer is a 12×12 queen lattice with an SAR(0.8) outcome drawn by
// the model itself, the model fitted to it, the basis of its surrogates
// and a grouping of two blocks.
func sarCheckLayer(t *testing.T) (*sar.Model, *surrogate.Basis, []int32) {
	g := weights.Lattice(12, 12, weights.Queen).RowStandardised()
	w, y := sarOutcome(t, g, 0.8, 9)
	m, err := w.Fit(y)
	if err != nil {
		t.Fatal(err)
	}
	basis, err := surrogate.NewBasis(g, surrogate.Options{})
	if err != nil {
		t.Fatal(err)
	}
	lab := make([]int32, g.Len())
	for i := range lab {
		lab[i] = int32(i % 12 / 6)
	}
	return m, basis, lab
}

// The simulated nulls' p-values are fixed by the seed, whatever the
// number of workers, and each is a Monte Carlo p-value of 39 surrogates.
func TestSARNullPValuesIndependentOfWorkers(t *testing.T) {
	m, basis, lab := sarCheckLayer(t)
	var first []float64
	for _, workers := range []int{1, 2, 3} {
		p, err := SARNullPValues(m, basis, groups.DiffMeans, lab, 2, SAROptions{Simulations: 22, Seed: 5, Purpose: 6, Workers: workers})
		if err != nil {
			t.Fatal(err)
		}
		if first == nil {
			first = p
			for _, v := range p {
				if k := v * 40 / 2; math.Abs(k-math.Round(k)) > 1e-9 || v > 1 {
					t.Fatalf("p-value %v is not 2k/40", v)
				}
			}
			continue
		}
		if !slices.Equal(p, first) {
			t.Fatalf("workers %d: %v, workers 1: %v", workers, p, first)
		}
	}
}

// Weights the SAR model cannot take (k nearest neighbours, not
// symmetric) skip the check with a warning, not an error.
func TestSARCheckSkippedOnAsymmetricWeights(t *testing.T) {
	g := weights.Lattice(8, 8, weights.Queen)
	xy := make([]orb.Point, g.Len())
	for i := range xy {
		xy[i] = orb.Point{float64(i % 8), float64(i/8) + 0.01*float64(i%3)}
	}
	knn, err := weights.KNearest(xy, 3, weights.Planar, false)
	if err != nil {
		t.Fatal(err)
	}
	n := knn.Len()
	ids, group := make([]string, n), make([]string, n)
	y := make([]float64, n)
	for i := range ids {
		ids[i] = string(rune('a'+i%26)) + string(rune('a'+i/26))
		group[i] = []string{"A", "B"}[i%2]
		y[i] = float64(i % 8)
	}
	in := Input{IDs: ids, OutcomeName: "y", Outcome: y, OutcomeMissing: make([]bool, n),
		GroupName: "g", Group: group, GroupMissing: make([]bool, n), Graph: knn}
	res, err := Run(in, Options{Permutations: 99, Surrogates: 99, FalsePositives: 20, FalsePositiveShuffles: 39, Alpha: 0.05, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if res.SARCheck == nil || res.SARCheck.Skipped == "" {
		t.Fatalf("SAR check %+v on k nearest neighbours", res.SARCheck)
	}
	if k := findRow(res, SpectralScheme); k < 0 || res.Tests[k].FalsePositives != nil {
		t.Fatalf("spectral row %d measured on skipped check", k)
	}
}

// The whole comparison with the SAR check gives the same spectral rate,
// calibrated p-value and fitted ρ for 1 and 3 workers.
// sarRunInput is a comparison on the lattice of sarCheckLayer, its
// outcome simulated from the SAR model: one on which the SAR check runs.
func sarRunInput(t *testing.T) Input {
	m, _, lab := sarCheckLayer(t)
	n := len(lab)
	y := make([]float64, n)
	rng := shuffle.NewStream(2, 0, 0)
	if err := m.Simulate(&rng, y, m.NewScratch()); err != nil {
		t.Fatal(err)
	}
	ids, group := make([]string, n), make([]string, n)
	for i := range ids {
		ids[i] = string(rune('a'+i%26)) + string(rune('a'+i/26))
		group[i] = []string{"A", "B"}[lab[i]]
	}
	return Input{IDs: ids, OutcomeName: "y", Outcome: y, OutcomeMissing: make([]bool, n),
		GroupName: "g", Group: group, GroupMissing: make([]bool, n), Graph: weights.Lattice(12, 12, weights.Queen)}
}

func TestSARCheckInRunIndependentOfWorkers(t *testing.T) {
	in := sarRunInput(t)
	var first *Result
	for _, workers := range []int{1, 3} {
		res, err := Run(in, Options{Permutations: 99, Surrogates: 99, FalsePositives: 20, FalsePositiveShuffles: 39,
			SARChecks: 12, Alpha: 0.05, Seed: 4, Workers: workers})
		if err != nil {
			t.Fatal(err)
		}
		k := findRow(res, SpectralScheme)
		if k < 0 || res.Tests[k].FalsePositives == nil || res.Tests[k].Calibrated == nil || res.SARCheck == nil || res.SARCheck.Skipped != "" {
			t.Fatalf("workers %d: no SAR check in %+v", workers, res.Tests)
		}
		if first == nil {
			first = res
			continue
		}
		a, b := *first.Tests[k].FalsePositives, *res.Tests[k].FalsePositives
		if a != b || *first.Tests[k].Calibrated != *res.Tests[k].Calibrated || *first.SARCheck != *res.SARCheck {
			t.Fatalf("workers 1: %+v %+v %+v; workers %d: %+v %+v %+v", a, *first.Tests[k].Calibrated, *first.SARCheck,
				workers, b, *res.Tests[k].Calibrated, *res.SARCheck)
		}
	}
}

// sarOutcome prepares g for SAR models and draws one SAR(ρ) field on it
// (μ 1, σ² 2) from the stream of seed.
func sarOutcome(tb testing.TB, g *weights.Graph, rho float64, seed uint64) (*sar.Weights, []float64) {
	w, err := sar.Prepare(g, sar.Options{Seed: 1})
	if err != nil {
		tb.Fatal(err)
	}
	gen, err := w.Model(rho, 1, 2)
	if err != nil {
		tb.Fatal(err)
	}
	y := make([]float64, g.Len())
	rng := shuffle.NewStream(seed, 0, 0)
	if err := gen.Simulate(&rng, y, gen.NewScratch()); err != nil {
		tb.Fatal(err)
	}
	return w, y
}
