package regress

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// design returns p covariates on a rows×cols lattice: the first the column
// index (a trend across the map), the second the row index plus noise, the
// rest independent normals, drawn from the stream (seed, 1, 0).
func design(rows, cols, p int, seed uint64) [][]float64 {
	n := rows * cols
	rng := shuffle.NewStream(seed, 1, 0)
	x := make([][]float64, p)
	for c := range x {
		x[c] = make([]float64, n)
		rng.Normals(x[c])
	}
	for i := 0; i < n; i++ {
		if p > 0 {
			x[0][i] = float64(i%cols) / float64(cols)
		}
		if p > 1 {
			x[1][i] = float64(i/cols)/float64(rows) + 0.3*x[1][i]
		}
	}
	return x
}

// lattice returns the row-standardised rook graph of a rows×cols grid.
func lattice(rows, cols int) *weights.Graph {
	return weights.Lattice(rows, cols, weights.Rook).RowStandardised()
}

// outcome returns Xβ + u with β = (1, 2, −1, 0.5, …) on the covariates.
func outcome(x [][]float64, u []float64) []float64 {
	y := append([]float64(nil), u...)
	for i := range y {
		y[i]++
		for c, col := range x {
			y[i] += float64(2-c) * col[i] / float64(c+1)
		}
	}
	return y
}

// solveLag returns v with v = b + ρWv, by the fixed-point iteration
// v ← b + ρWv, which converges geometrically for |ρ| < 1 on a
// row-standardised W (‖W‖∞ = 1).
func solveLag(g *weights.Graph, rho float64, b []float64) []float64 {
	v := append([]float64(nil), b...)
	wv := make([]float64, len(b))
	for range int(math.Ceil(40 / -math.Log(math.Abs(rho)+1e-300))) {
		lag(g, v, wv)
		for i := range v {
			v[i] = b[i] + rho*wv[i]
		}
	}
	return v
}

// mustOLS fits or fails the test.
func mustOLS(tb testing.TB, y []float64, x [][]float64) *Fit {
	tb.Helper()
	f, err := OLS(y, x, nil)
	if err != nil {
		tb.Fatal(err)
	}
	return f
}

// residualMoran returns Moran's I of Mε for the fit's design, computed from
// the basis without a refit: I = (n/S0) eᵀWe/eᵀe.
func residualMoran(f *Fit, g *weights.Graph, s0 float64, eps, we, c []float64) float64 {
	f.residualise(eps, c)
	lag(g, eps, we)
	var num, den float64
	for i, e := range eps {
		num += e * we[i]
		den += e * e
	}
	return float64(f.Areas) / s0 * num / den
}

// meanVar returns the sample mean and variance (n − 1 divisor) of x, and
// the standard error of that variance, √((m4 − s⁴)/N) from the sample's
// fourth central moment.
func meanVar(x []float64) (mean, v, seV float64) {
	n := float64(len(x))
	for _, a := range x {
		mean += a
	}
	mean /= n
	var m2, m4 float64
	for _, a := range x {
		d := (a - mean) * (a - mean)
		m2 += d
		m4 += d * d
	}
	v = m2 / (n - 1)
	m2, m4 = m2/n, m4/n
	return mean, v, math.Sqrt((m4 - m2*m2) / n)
}
