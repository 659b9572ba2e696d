package regress

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/lapack64"

	"github.com/areatest/areatest/weights"
)

// exactUpper returns P(εᵀMWMε / εᵀMε ≥ c) for ε ~ N(0, I): the upper tail
// of the residual Moran's I at I = c·n/S0 under normal errors (Tiefelsdorf
// 2000, Modelling Spatial Processes, ch. 7, from memory).
//
// εᵀMWMε = εᵀMW̃Mε with the symmetric W̃ = (W + Wᵀ)/2. Let P = [Q₁ Q₂] be an
// orthogonal n×n matrix whose first k columns span the design; then
// M = Q₂Q₂ᵀ and, with z = Q₂ᵀε ~ N(0, I_{n−k}) and λ_j the eigenvalues of
// Q₂ᵀW̃Q₂,
//
//	P(εᵀMW̃Mε − c εᵀMε ≥ 0) = P(Σ_j (λ_j − c) z_j² ≥ 0),
//
// a quadratic form in independent normals whose distribution Imhof's
// formula gives (imhofUpper). P is the product of the k Householder
// reflectors of the QR of the basis, applied to the dense W̃ from both
// sides (LAPACK's dormqr) in O(k n²); the eigenvalues of the trailing
// (n − k)×(n − k) block, by dsyev, cost O(n³). They do not depend on c.
func (f *Fit) exactUpper(g *weights.Graph, c float64) (float64, error) {
	lambda, err := f.projectedEigenvalues(g)
	if err != nil {
		return 0, err
	}
	for j := range lambda {
		lambda[j] -= c
	}
	return imhofUpper(lambda), nil
}

// projectedEigenvalues returns the n − k eigenvalues of Q₂ᵀW̃Q₂, ascending.
func (f *Fit) projectedEigenvalues(g *weights.Graph) ([]float64, error) {
	n, k := f.Areas, f.k
	a := blas64.General{Rows: n, Cols: n, Stride: n, Data: make([]float64, n*n)}
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for t, j := range nb {
			a.Data[i*n+int(j)] += w[t] / 2
			a.Data[int(j)*n+i] += w[t] / 2
		}
	}
	qr := blas64.General{Rows: n, Cols: k, Stride: k, Data: append([]float64(nil), f.basis...)}
	tau := make([]float64, k)
	work := []float64{0}
	lapack64.Geqrf(qr, tau, work, -1)
	work = make([]float64, int(work[0]))
	lapack64.Geqrf(qr, tau, work, len(work))
	for _, side := range []struct {
		s blas.Side
		t blas.Transpose
	}{{blas.Left, blas.Trans}, {blas.Right, blas.NoTrans}} {
		work = []float64{0}
		lapack64.Ormqr(side.s, side.t, qr, tau, a, work, -1)
		work = make([]float64, int(work[0]))
		lapack64.Ormqr(side.s, side.t, qr, tau, a, work, len(work))
	}
	m := n - k
	block := blas64.Symmetric{N: m, Stride: n, Uplo: blas.Upper, Data: a.Data[k*n+k:]}
	lambda := make([]float64, m)
	work = []float64{0}
	lapack64.Syev(lapack.EVNone, block, lambda, work, -1)
	work = make([]float64, int(work[0]))
	if !lapack64.Syev(lapack.EVNone, block, lambda, work, len(work)) {
		return nil, errors.New("regress: the eigenvalues for the exact p-value did not converge")
	}
	return lambda, nil
}

// imhofUpper returns P(Σ_j λ_j z_j² > 0) for independent standard normal
// z_j, by Imhof's (1961, Biometrika 48:419–426, eq. 3.2, from memory)
// inversion of the characteristic function at 0:
//
//	P(Q > 0) = 1/2 + (1/π) ∫₀^∞ sin θ(u) / (u ρ(u)) du,
//	θ(u) = ½ Σ arctan(λ_j u),   ρ(u) = Π (1 + λ_j² u²)^{1/4}.
//
// (At a point x ≠ 0, θ gains −xu/2 and the integrand oscillates without
// end; the residual Moran's I needs only 0, its threshold being moved into
// the λ_j.) The λ_j are first divided by max|λ_j| (the probability does not
// change), so that the integrand's scale is 1. The integral is truncated
// at U where Imhof's bound on the remainder,
//
//	∫_U^∞ ≤ 2 / (π m U^{m/2} Π_{j≤m} |λ_j|^{1/2}),
//
// (m the λ_j with |λ_j| > 1e-9; the others' factors are at least 1) is
// below 1e-12, and computed by adaptive Gauss–Kronrod quadrature (adapt)
// on [0, 1] and, in s = ln u, on [0, ln U], where the integrand decays
// like a power of u. The absolute error of the probability, measured on
// closed forms, is at most about 1e-12 (TestImhofClosedForms allows
// 1e-10); the result is clamped to [0, 1].
func imhofUpper(lambda []float64) float64 {
	var top float64
	for _, l := range lambda {
		top = math.Max(top, math.Abs(l))
	}
	if top == 0 {
		return 0
	}
	ls := make([]float64, 0, len(lambda))
	var m, logSum float64
	for _, l := range lambda {
		l /= top
		if math.Abs(l) > 1e-9 {
			ls = append(ls, l)
			m++
			logSum += math.Log(math.Abs(l))
		}
	}
	integrand := func(u float64) float64 {
		var theta, logRho float64
		for _, l := range ls {
			theta += math.Atan(l * u)
			logRho += math.Log1p(l * l * u * u)
		}
		return math.Sin(theta/2) / (u * math.Exp(logRho/4))
	}
	const tol = 1e-12
	logU := 2 / m * (math.Log(2/(math.Pi*m)) - logSum/2 - math.Log(tol))
	total := adapt(integrand, 0, 1, tol)
	if logU > 0 {
		total += adapt(func(s float64) float64 {
			u := math.Exp(s)
			return integrand(u) * u
		}, 0, logU, tol)
	}
	p := 0.5 + total/math.Pi
	return math.Min(1, math.Max(0, p))
}
