package compare

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/sar"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/weights"
)

// Target (issue 6): the false-positive estimate, 500 surrogates × 199
// shuffles on 3,000 areas, in about 5 s (the basis built beforehand). The
// layer is a 50×60 queen lattice, the outcome a smooth made-up field with
// noise and the grouping blocks of 300 areas: for timing only.
// The whole budget of issue 6 is BenchmarkCompareAllSchemes3000 in
// cmd/areatest.
func BenchmarkFalsePositives3000x500x199(b *testing.B) {
	_, o, lab := checkLayer3000(b)
	benchCheck(b, o, lab, []CheckScheme{{Name: "free"}})
}

// Target (issue 11): the check of the free shuffle and the shuffle within
// automatic zones together, on the same 500 surrogates, within 2× the
// free shuffle's alone (BenchmarkFalsePositives3000x500x199).
func BenchmarkFalsePositivesFreeAndZones3000(b *testing.B) {
	g, o, lab := checkLayer3000(b)
	zones, err := weights.Zones(g, 0)
	if err != nil {
		b.Fatal(err)
	}
	benchCheck(b, o, lab, []CheckScheme{{Name: "free"}, {Name: "zones", Strata: zones}})
}

// checkLayer3000 is the layer of the check's benchmarks, with the outcome
// prepared for surrogates and the grouping.
func checkLayer3000(b *testing.B) (*weights.Graph, *surrogate.Outcome, []int32) {
	g := weights.Lattice(50, 60, weights.Queen)
	basis, err := surrogate.NewBasis(g.RowStandardised(), surrogate.Options{})
	if err != nil {
		b.Fatal(err)
	}
	y := make([]float64, g.Len())
	lab := make([]int32, g.Len())
	for i := range y {
		y[i] = math.Sin(float64(i)/150) + math.Cos(float64(i)*12.9898)
		lab[i] = int32((i / 300) % 2)
	}
	o, err := basis.Prepare(y)
	if err != nil {
		b.Fatal(err)
	}
	return g, o, lab
}

func benchCheck(b *testing.B, o *surrogate.Outcome, lab []int32, schemes []CheckScheme) {
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		r, err := FalsePositivesOf(o, groups.DiffMedians, lab, 2, schemes, FPROptions{Seed: 1, Purpose: 4})
		if err != nil {
			b.Fatal(err)
		}
		if b.N == 1 {
			b.Logf("%+v", r)
		}
	}
}

// Target (issue 11): the SAR check of the spectral surrogates on 3,000
// areas — the fit, then DefaultSARChecks outcomes simulated from it, each
// with DefaultSARCheckSurrogates surrogates — within about the cost of
// BenchmarkFalsePositives3000x500x199 (the basis built beforehand, as
// there).
func BenchmarkSARCheck3000(b *testing.B) {
	g, _, lab := checkLayer3000(b)
	basis, err := surrogate.NewBasis(g.RowStandardised(), surrogate.Options{})
	if err != nil {
		b.Fatal(err)
	}
	// The outcome: one SAR(0.9) field, as a strongly clustered outcome.
	_, y := sarOutcome(b, g.RowStandardised(), 0.9, 3)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		w, err := sar.Prepare(g.RowStandardised(), sar.Options{Seed: 1})
		if err != nil {
			b.Fatal(err)
		}
		m, err := w.Fit(y)
		if err != nil {
			b.Fatal(err)
		}
		p, err := SARNullPValues(m, basis, groups.DiffMedians, lab, 2, SAROptions{Seed: 1, Purpose: 6})
		if err != nil {
			b.Fatal(err)
		}
		if b.N == 1 {
			b.Logf("ρ %.3f, %+v", m.Rho, SARRate(p, 0.05, DefaultSARCheckSurrogates))
		}
	}
}

// The check of the free shuffle adjusted for one covariate (Freedman–Lane:
// each surrogate refitted, then 199 shuffles of the residuals), on the
// layer and counts of BenchmarkFalsePositives3000x500x199, to compare with
// the unadjusted check's cost.
func BenchmarkFalsePositivesAdjusted3000x500x199(b *testing.B) {
	g, o, lab := checkLayer3000(b)
	z := make([]float64, g.Len())
	for i := range z {
		z[i] = math.Cos(float64(i) / 70)
	}
	fl, err := shuffle.NewFreedmanLane(make([]float64, g.Len()), [][]float64{z}, lab, 2)
	if err != nil {
		b.Fatal(err)
	}
	newTest := func() (nullTest, error) { return newAdjustedNull(fl, true, shuffle.TwoSided) }
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		r, err := falsePositives(o, newTest, []CheckScheme{{Name: "free"}}, DefaultFalsePositiveChecks, DefaultCheckShuffles, 0.05,
			FPROptions{Seed: 1, Purpose: 5})
		if err != nil {
			b.Fatal(err)
		}
		if b.N == 1 {
			b.Logf("%+v", r[0])
		}
	}
}
