package autocorr

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// Target (issue 2): the Moran's I null with 9,999 shuffles on 3,000 areas with
// queen-like weights (here a 55×55 rook lattice plus diagonals, ~7.8
// neighbours each) ≤ 200 ms.
func BenchmarkMoranNull3000x9999(b *testing.B) {
	m := 55
	var pairs [][2]int32
	for i := 0; i < m; i++ {
		for j := 0; j < m; j++ {
			k := int32(i*m + j)
			if j+1 < m {
				pairs = append(pairs, [2]int32{k, k + 1})
			}
			if i+1 < m {
				pairs = append(pairs, [2]int32{k, k + int32(m)})
				if j+1 < m {
					pairs = append(pairs, [2]int32{k, k + int32(m) + 1})
				}
				if j > 0 {
					pairs = append(pairs, [2]int32{k, k + int32(m) - 1})
				}
			}
		}
	}
	g := mustGraph(b, m*m, pairs).RowStandardised()
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
