package autocorr

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Target (issue 2): the Moran's I null with 9,999 shuffles on 3,000 areas with
// queen-like weights (here a 55×55 queen lattice, ~7.8 neighbours each) ≤ 200 ms.
func BenchmarkMoranNull3000x9999(b *testing.B) {
	m := 55
	g := weights.Lattice(m, m, weights.Queen).RowStandardised()
	x := make([]float64, m*m)
	for i := range x {
		x[i] = math.Sin(float64(i%m)/9) + math.Cos(float64(i/m)/7) + 0.3*math.Sin(float64(i)*12.9898)
	}
	labels, f, err := Permutation(x, g)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		if _, err := shuffle.Run(shuffle.Plan{Labels: labels, Permutations: 9999, Seed: 1}, f); err != nil {
			b.Fatal(err)
		}
	}
}
