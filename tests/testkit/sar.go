package testkit

import (
	"testing"

	"gonum.org/v1/gonum/mat"
)

// SAR draws simultaneous autoregressive fields y = (I − ρW)⁻¹ε (Whittle
// 1954; Cliff & Ord 1981, ch. 6) on one weights matrix W: I − ρW is
// factorised once and every field is one solve, exact to rounding whatever
// ρ. The caller draws ε, so each test keeps its own random stream.
type SAR struct {
	lu mat.LU
	n  int
}

// NewSAR prepares fields on the n×n weights matrix w (from Dense) with
// autoregression ρ; |ρ| below one over W's largest eigenvalue modulus (1
// for row-standardised weights) keeps I − ρW invertible.
func NewSAR(w mat.Matrix, rho float64) *SAR {
	n, _ := w.Dims()
	a := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			var id float64
			if i == j {
				id = 1
			}
			a.Set(i, j, id-rho*w.At(i, j))
		}
	}
	s := &SAR{n: n}
	s.lu.Factorize(a)
	return s
}

// Field returns (I − ρW)⁻¹eps, a new slice; eps is left as it is. A matrix
// too close to singular fails the test.
func (s *SAR) Field(tb testing.TB, eps []float64) []float64 {
	tb.Helper()
	var y mat.VecDense
	if err := s.lu.SolveVecTo(&y, false, mat.NewVecDense(s.n, eps)); err != nil {
		tb.Fatal(err)
	}
	return append([]float64(nil), y.RawVector().Data...)
}
