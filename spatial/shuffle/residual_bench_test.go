package shuffle_test

import (
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// Freedman–Lane on 3,000 areas with two covariates and two groups: 9,999
// permutations through Run on all cores, including the model fit.
func BenchmarkFreedmanLane3000x9999(b *testing.B) {
	y, cov, lab := flData(3000, 2, 0.1, 1)
	for b.Loop() {
		fl, err := shuffle.NewFreedmanLane(y, cov, lab, 2)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := shuffle.Run(shuffle.Plan{Labels: fl.Labels(), Permutations: 9999, Seed: 1,
			Alternative: shuffle.Greater, Scale: 1}, fl.Factory()); err != nil {
			b.Fatal(err)
		}
	}
}

// One draw on 3,000 areas (shuffle and statistic), on one core.
func BenchmarkFreedmanLaneDraw3000(b *testing.B) {
	y, cov, lab := flData(3000, 2, 0.1, 1)
	fl, err := shuffle.NewFreedmanLane(y, cov, lab, 2)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	if _, err := shuffle.Run(shuffle.Plan{Labels: fl.Labels(), Permutations: b.N, Seed: 1, Workers: 1,
		Alternative: shuffle.Greater, Scale: 1}, fl.Factory()); err != nil {
		b.Fatal(err)
	}
}

// The model fit alone: QR of the 3,000 × 4 design and the residuals.
func BenchmarkFreedmanLaneSetup3000(b *testing.B) {
	y, cov, lab := flData(3000, 2, 0.1, 1)
	for b.Loop() {
		if _, err := shuffle.NewFreedmanLane(y, cov, lab, 2); err != nil {
			b.Fatal(err)
		}
	}
}
