package autocorr

import (
	"math"

	"github.com/areatest/areatest/internal/vec"
	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
)

// lanczos is the state of the three-term recurrence
//
//	β_k q_{k+1} = A q_k − α_k q_k − β_{k−1} q_{k−1}
//
// with no stored basis: q is the newest vector q_k, qPrev the one before,
// w the unnormalised next one. alpha and beta have k entries each after k
// vectors (beta's last is ‖w‖). lo, hi, rlo and rhi are the extreme
// eigenvalues of T_k and their residual estimates at the last check.
type lanczos struct {
	op               symOperator
	qPrev, q, w      []float64
	alpha, beta      []float64
	scale            float64 // running estimate of ‖A‖ for the breakdown test
	lo, hi, rlo, rhi float64
	breakdown        bool
}

// newLanczos starts the recurrence at the unit vector q0 (not kept).
func newLanczos(op symOperator, q0 []float64) *lanczos {
	n := op.Len()
	l := &lanczos{op: op, qPrev: make([]float64, n), q: append([]float64(nil), q0...), w: make([]float64, n)}
	l.advance(0)
	return l
}

// advance finishes a step from the current q: w = A q − β q_prev, then
// α = qᵀw, w −= α q, β = ‖w‖. The second centring keeps rounding from
// drifting back towards the excluded direction.
func (l *lanczos) advance(prevBeta float64) {
	l.op.Apply(l.q, l.w)
	if prevBeta != 0 {
		vec.Axpy(-prevBeta, l.qPrev, l.w)
	}
	a := vec.Dot(l.q, l.w)
	vec.Axpy(-a, l.q, l.w)
	l.op.Project(l.w)
	b := math.Sqrt(vec.Dot(l.w, l.w))
	l.alpha, l.beta = append(l.alpha, a), append(l.beta, b)
	l.scale = math.Max(l.scale, math.Abs(a)+b)
}

// step moves to the next vector.
func (l *lanczos) step() {
	b := l.beta[len(l.beta)-1]
	l.qPrev, l.q, l.w = l.q, l.w, l.qPrev
	for i := range l.q {
		l.q[i] /= b
	}
	l.advance(b)
}

// until steps until both residual estimates are at most tol·max|θ|, the
// Krylov space is invariant (breakdown), or maxIter steps are done; it
// says whether the estimates passed (a breakdown counts: T_k's eigenvalues
// are then exact).
func (l *lanczos) until(tol float64, maxIter int) bool {
	next := len(l.alpha)
	for {
		k := len(l.alpha)
		l.breakdown = l.beta[k-1] <= 1e-13*l.scale
		if l.breakdown || k >= maxIter || k >= next {
			l.ritz()
			top := math.Max(math.Abs(l.lo), math.Abs(l.hi))
			if l.breakdown || (l.rlo <= tol*top && l.rhi <= tol*top) {
				return true
			}
			if k >= maxIter {
				return false
			}
			// Checks cost O(k) each; spacing them by k/25 keeps their
			// total O(k) per step and overshoots by at most 4%.
			next = k + max(5, k/25)
		}
		l.step()
	}
}

// ritz sets the extreme eigenvalues of T_k and their residual estimates
// β_k |last component of the eigenvector|.
func (l *lanczos) ritz() {
	k := len(l.alpha)
	alpha, beta, next := l.alpha, l.beta[:k-1], l.beta[k-1]
	gl, gu := math.Inf(1), math.Inf(-1)
	for i, a := range alpha {
		r := 0.0
		if i > 0 {
			r += math.Abs(beta[i-1])
		}
		if i < k-1 {
			r += math.Abs(beta[i])
		}
		gl, gu = math.Min(gl, a-r), math.Max(gu, a+r)
	}
	l.lo = bisect(alpha, beta, gl, gu, 1)
	l.hi = bisect(alpha, beta, gl, gu, k)
	slo := tridiagonalVector(alpha, beta, l.lo)
	shi := tridiagonalVector(alpha, beta, l.hi)
	l.rlo = next * math.Abs(slo[k-1])
	l.rhi = next * math.Abs(shi[k-1])
}

// sturm counts the eigenvalues of the tridiagonal matrix below x, from the
// signs of the pivots of T − xI = LDLᵀ (Sturm sequence property).
func sturm(alpha, beta []float64, x float64) int {
	const tiny = 1e-300
	count := 0
	d := alpha[0] - x
	for i := 0; ; i++ {
		if d == 0 {
			d = -tiny
		}
		if d < 0 {
			count++
		}
		if i+1 == len(alpha) {
			return count
		}
		d = alpha[i+1] - x - beta[i]*beta[i]/d
	}
}

// bisect finds the m-th smallest eigenvalue (m from 1) in [lo, hi] to
// rounding accuracy.
func bisect(alpha, beta []float64, lo, hi float64, m int) float64 {
	for it := 0; it < 200; it++ {
		mid := lo + (hi-lo)/2
		if mid <= lo || mid >= hi {
			break
		}
		if sturm(alpha, beta, mid) >= m {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// tridiagonalVector returns the unit eigenvector of the tridiagonal matrix
// (diagonal alpha, off-diagonal beta) for its eigenvalue theta, by three
// steps of inverse iteration (a tridiagonal solve with partial pivoting
// each).
func tridiagonalVector(alpha, beta []float64, theta float64) []float64 {
	k := len(alpha)
	y := make([]float64, k)
	if k == 1 {
		y[0] = 1
		return y
	}
	start := func() {
		for i := range y {
			y[i] = 1 / math.Sqrt(float64(k))
		}
	}
	start()
	norm := 0.0 // the size of T, for a shift that moves off θ in every case
	for i, a := range alpha {
		norm = math.Max(norm, math.Abs(a))
		if i < k-1 {
			norm = math.Max(norm, math.Abs(beta[i]))
		}
	}
	d, dl, du := make([]float64, k), make([]float64, k-1), make([]float64, k-1)
	shift := theta
	for step := 0; step < 3; step++ {
		for i := range d {
			d[i] = alpha[i] - shift
		}
		copy(dl, beta)
		copy(du, beta)
		ok := lapack64.Gtsv(blas.NoTrans, lapack64.Tridiagonal{N: k, DL: dl, D: d, DU: du},
			blas64.General{Rows: k, Cols: 1, Stride: 1, Data: y})
		if !ok {
			// θ is an eigenvalue to the last bit: move off it a little.
			shift += 1e-14 * math.Max(norm, 1e-300)
			start()
			continue
		}
		normalise(y)
	}
	return y
}
