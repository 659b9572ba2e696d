package autocorr

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// benchColumn is a smooth surface plus a little high-frequency wiggle on an
// m×m lattice (made-up numbers for timing only), as in
// BenchmarkMoranNull3000x9999.
func benchColumn(m int) []float64 {
	x := make([]float64, m*m)
	for i := range x {
		x[i] = math.Sin(float64(i%m)/9) + math.Cos(float64(i/m)/7) + 0.3*math.Sin(float64(i)*12.9898)
	}
	return x
}

// benchCategories is category 1 where x is above 0.5, 0 elsewhere.
func benchCategories(x []float64) []int32 {
	cat := make([]int32, len(x))
	for i, v := range x {
		if v > 0.5 {
			cat[i] = 1
		}
	}
	return cat
}

func benchRun(b *testing.B, labels []int32, f shuffle.Factory, perms int) {
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		if _, err := shuffle.Run(shuffle.Plan{Labels: labels, Permutations: perms, Seed: 1}, f); err != nil {
			b.Fatal(err)
		}
	}
}

// Target (issue 4): the Geary's C null with 9,999 shuffles on a 55×55 queen
// lattice (3,025 areas, ~7.8 neighbours each), row-standardised, ≤ 200 ms.
func BenchmarkGeary3000x9999(b *testing.B) {
	g := queenLattice(b, 55).RowStandardised()
	labels, f, err := GearyPermutation(benchColumn(55), g)
	if err != nil {
		b.Fatal(err)
	}
	benchRun(b, labels, f, 9999)
}

// General G, bivariate I and the different-category join count on the same
// layer, for comparison.
func BenchmarkGeneralG3000x9999(b *testing.B) {
	g := queenLattice(b, 55)
	x := benchColumn(55)
	for i := range x {
		x[i] += 3
	}
	labels, f, err := GeneralGPermutation(x, g)
	if err != nil {
		b.Fatal(err)
	}
	benchRun(b, labels, f, 9999)
}

func BenchmarkBivariate3000x9999(b *testing.B) {
	g := queenLattice(b, 55).RowStandardised()
	x := benchColumn(55)
	y := make([]float64, len(x))
	for i := range y {
		y[i] = x[len(x)-1-i]
	}
	labels, f, err := BivariatePermutation(x, y, g)
	if err != nil {
		b.Fatal(err)
	}
	benchRun(b, labels, f, 9999)
}

func BenchmarkJoinsDifferent3000x9999(b *testing.B) {
	g := queenLattice(b, 55)
	cat := benchCategories(benchColumn(55))
	benchRun(b, cat, DifferentJoinsFactory(g), 9999)
}

// Target (issue 4): the Moran's I null with 999 shuffles on a 500×500 queen
// lattice (250,000 areas, 996,004 linked pairs), row-standardised, ≤ 10 s
// and ≤ 1 GB beyond the layer.
func BenchmarkMoran250000x999(b *testing.B) {
	g := queenLattice(b, 500).RowStandardised()
	labels, f, err := Permutation(benchColumn(500), g)
	if err != nil {
		b.Fatal(err)
	}
	benchRun(b, labels, f, 999)
}

func BenchmarkJoinsSame3000x9999(b *testing.B) {
	g := queenLattice(b, 55)
	cat := benchCategories(benchColumn(55))
	benchRun(b, cat, SameJoinsFactory(g, 1), 9999)
}
