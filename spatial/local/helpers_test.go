package local

import (
	"math"
	"testing"

	"github.com/areatest/areatest/weights"
)

// lattice returns the binary graph of an r×c grid with rook links, plus the
// diagonals of every cell when diagonals is true (queen links) or of every
// every-th cell when every > 1.
func lattice(t testing.TB, r, c int, diagonals bool, every int) *weights.Graph {
	t.Helper()
	var pairs [][2]int32
	for i := 0; i < r; i++ {
		for j := 0; j < c; j++ {
			k := int32(i*c + j)
			if j+1 < c {
				pairs = append(pairs, [2]int32{k, k + 1})
			}
			if i+1 < r {
				pairs = append(pairs, [2]int32{k, k + int32(c)})
				if diagonals && (every <= 1 || int(k)%every == 0) {
					if j+1 < c {
						pairs = append(pairs, [2]int32{k, k + int32(c) + 1})
					}
					if j > 0 {
						pairs = append(pairs, [2]int32{k, k + int32(c) - 1})
					}
				}
			}
		}
	}
	g, err := weights.FromLinks(r*c, pairs, "lattice")
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// smooth is a deterministic field with broad structure and some noise.
func smooth(n, width int) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(float64(i%width)/9) + math.Cos(float64(i/width)/7) + 0.3*math.Sin(float64(i)*12.9898)
	}
	return x
}

// binomialQuantile is the smallest k with P(Binomial(n, p) ≤ k) ≥ q.
func binomialQuantile(n int, p, q float64) int {
	lg := func(k int) float64 { v, _ := math.Lgamma(float64(k + 1)); return v }
	var cum float64
	for k := 0; k <= n; k++ {
		cum += math.Exp(lg(n) - lg(k) - lg(n-k) + float64(k)*math.Log(p) + float64(n-k)*math.Log1p(-p))
		if cum >= q {
			return k
		}
	}
	return n
}
