package autocorr

import (
	"errors"
	"math"
	"sort"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Bounds is the range that Moran's I can take on a graph, over every
// possible variable (de Jong, Sprenger & van Veen 1984, Geogr. Anal.
// 16:17–24).
type Bounds struct {
	Min float64 `json:"min"`
	Max float64 `json:"max"`
	// Method is "dense" (every eigenvalue) or "lanczos" (the two extreme
	// ones by a sparse iteration).
	Method string `json:"method"`
	// Iterations is the number of Lanczos steps; 0 for dense.
	Iterations int `json:"iterations"`
	// Converged is false when the Lanczos iteration stopped at its step
	// limit first: Min and Max are then inside the true range (Ritz values
	// never overshoot), so the range is at least this wide.
	Converged bool `json:"converged"`
}

// DenseBoundsLimit is the largest number of areas for which MoranBounds
// finds every eigenvalue of the dense n×n matrix; above it a Lanczos
// iteration finds the two extreme ones.
const DenseBoundsLimit = 500

// boundsPurpose separates the start vector's stream from the shuffles.
const boundsPurpose = 0xb0d5

// MoranBounds returns the smallest and largest values of Moran's I on g.
// For a centred z, I = (n/S0) zᵀWz / zᵀz, and zᵀWz = zᵀW*z with W* =
// (W + Wᵀ)/2, so only the symmetric part of W matters: a row-standardised
// W is not symmetric, and its bounds are those of W*. Over z ⊥ 1, the
// extremes of the Rayleigh quotient are the extreme eigenvalues of M W* M,
// M = I − 11ᵀ/n, on the subspace orthogonal to 1 (de Jong, Sprenger & van
// Veen 1984), so
//
//	I_min = (n/S0) λ_min,  I_max = (n/S0) λ_max.
//
// Either bound is attained by a variable proportional to its eigenvector.
// Up to DenseBoundsLimit areas every eigenvalue is found (gonum's EigenSym);
// above it, by Lanczos with full reorthogonalisation from a fixed start
// vector, so the result is the same on every run.
func MoranBounds(g *weights.Graph) (Bounds, error) {
	n := g.Len()
	if n < 2 {
		return Bounds{}, errors.New("the bounds of Moran's I need at least two areas")
	}
	s0 := sumWeights(g)
	if s0 == 0 {
		return Bounds{}, errNoLinks
	}
	var b Bounds
	if n <= DenseBoundsLimit {
		lo, hi, err := denseBounds(g)
		if err != nil {
			return Bounds{}, err
		}
		b = Bounds{Min: lo, Max: hi, Method: "dense", Converged: true}
	} else {
		lo, hi, iters, ok := lanczosBounds(g, 1, 1e-11, lanczosStepLimit(n))
		b = Bounds{Min: lo, Max: hi, Method: "lanczos", Iterations: iters, Converged: ok}
	}
	scale := float64(n) / s0
	b.Min *= scale
	b.Max *= scale
	return b, nil
}

// lanczosStepLimit bounds the stored Lanczos vectors at about 256 MB.
func lanczosStepLimit(n int) int {
	return max(2, min(n-1, 2000, 32_000_000/n))
}

// denseBounds returns the extreme eigenvalues of M W* M on the subspace
// orthogonal to 1. On the whole space M W* M has one more eigenvalue, 0,
// with eigenvector 1; one copy of the eigenvalue nearest 0 is dropped.
func denseBounds(g *weights.Graph) (lo, hi float64, err error) {
	n := g.Len()
	a := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			a.SetSym(i, int(j), a.At(i, int(j))+w[k]/2)
		}
	}
	// Double centring: A_ij − rowmean_i − rowmean_j + grand mean.
	row := make([]float64, n)
	var grand float64
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			row[i] += a.At(i, j)
		}
		grand += row[i]
		row[i] /= float64(n)
	}
	grand /= float64(n * n)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			a.SetSym(i, j, a.At(i, j)-row[i]-row[j]+grand)
		}
	}
	var es mat.EigenSym
	if !es.Factorize(a, false) {
		return 0, 0, errors.New("the eigen-decomposition of the weights did not converge")
	}
	vals := es.Values(nil)
	sort.Float64s(vals)
	drop := 0
	for k, v := range vals {
		if math.Abs(v) < math.Abs(vals[drop]) {
			drop = k
		}
	}
	rest := append(append([]float64(nil), vals[:drop]...), vals[drop+1:]...)
	return rest[0], rest[len(rest)-1], nil
}

// centreInPlace subtracts the mean: M v.
func centreInPlace(v []float64) {
	var s float64
	for _, x := range v {
		s += x
	}
	s /= float64(len(v))
	for i := range v {
		v[i] -= s
	}
}

// applySym sets y = W* v, W* = (W + Wᵀ)/2, in one pass over the links.
func applySym(g *weights.Graph, v, y []float64) {
	for i := range y {
		y[i] = 0
	}
	for i := 0; i < g.Len(); i++ {
		nb, w := g.Row(i)
		vi := v[i]
		var acc float64
		for k, j := range nb {
			h := w[k] / 2
			acc += h * v[j]
			y[j] += h * vi
		}
		y[i] += acc
	}
}

// lanczosBounds runs the Lanczos iteration (Lanczos 1950, J. Res. Natl.
// Bur. Stand. 45:255–282) on A = M W* M restricted to the subspace
// orthogonal to 1, applied without forming A: every vector is kept centred,
// so M v = v on the way in and M is one subtraction of the mean on the way
// out. Each new vector is orthogonalised against all earlier ones, twice
// (Kahan's "twice is enough" for Gram–Schmidt; Parlett 1980, The Symmetric
// Eigenvalue Problem, ch. 6), which keeps the basis orthogonal so no
// spurious copies of converged eigenvalues appear. Every few steps the extreme Ritz values of
// the tridiagonal T_k are found by Sturm bisection, and their residual
// norms β_k |s_k| (s the eigenvector of T_k) decide convergence: stop when
// both are below tol · max|θ|. The start vector comes from a seeded stream.
func lanczosBounds(g *weights.Graph, seed uint64, tol float64, maxIter int) (lo, hi float64, iters int, converged bool) {
	n := g.Len()
	maxIter = max(1, min(maxIter, n-1))
	rng := shuffle.NewStream(seed, boundsPurpose, 0)
	q := make([]float64, n)
	for i := range q {
		q[i] = rng.Float64() - 0.5
	}
	centreInPlace(q)
	normalise(q)
	basis := make([]float64, 0, n*min(maxIter, 64))
	var alpha, beta []float64
	w := make([]float64, n)
	var scale float64 // running estimate of ‖A‖ for the breakdown test
	for k := 0; k < maxIter; k++ {
		basis = append(basis, q...)
		applySym(g, q, w)
		centreInPlace(w)
		a := dot(q, w)
		alpha = append(alpha, a)
		for pass := 0; pass < 2; pass++ {
			for j := 0; j <= k; j++ {
				qj := basis[j*n : (j+1)*n]
				axpy(-dot(qj, w), qj, w)
			}
			centreInPlace(w) // keep rounding from drifting back towards 1
		}
		b := math.Sqrt(dot(w, w))
		scale = math.Max(scale, math.Abs(a)+b)
		iters = k + 1
		breakdown := b <= 1e-13*scale
		if breakdown || k == maxIter-1 || (k >= 4 && k%5 == 4) {
			lo, hi, rlo, rhi := extremeRitz(alpha, beta, b)
			if breakdown {
				return lo, hi, iters, true
			}
			top := math.Max(math.Abs(lo), math.Abs(hi))
			if rlo <= tol*top && rhi <= tol*top {
				return lo, hi, iters, true
			}
			if k == maxIter-1 {
				return lo, hi, iters, false
			}
		}
		beta = append(beta, b)
		for i := range q {
			q[i] = w[i] / b
		}
	}
	return lo, hi, iters, false // not reached
}

func dot(a, b []float64) float64 {
	var s float64
	for i, v := range a {
		s += v * b[i]
	}
	return s
}

func axpy(c float64, x, y []float64) {
	for i, v := range x {
		y[i] += c * v
	}
}

// normalise scales v to unit length, dividing by its largest entry first so
// that the huge vectors of inverse iteration cannot overflow the sum.
func normalise(v []float64) {
	var m float64
	for _, x := range v {
		m = math.Max(m, math.Abs(x))
	}
	if m == 0 {
		return
	}
	for i := range v {
		v[i] /= m
	}
	s := 1 / math.Sqrt(dot(v, v))
	for i := range v {
		v[i] *= s
	}
}

// extremeRitz returns the smallest and largest eigenvalues of the
// tridiagonal matrix with diagonal alpha and off-diagonal beta, and the
// residual norms next · |last component of their eigenvectors|.
func extremeRitz(alpha, beta []float64, next float64) (lo, hi, rlo, rhi float64) {
	k := len(alpha)
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
	lo = bisect(alpha, beta, gl, gu, 1)
	hi = bisect(alpha, beta, gl, gu, k)
	rlo = next * math.Abs(lastComponent(alpha, beta, lo))
	rhi = next * math.Abs(lastComponent(alpha, beta, hi))
	return lo, hi, rlo, rhi
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

// lastComponent returns the last component of the unit eigenvector of the
// tridiagonal matrix for its eigenvalue theta, by two steps of inverse
// iteration (a tridiagonal solve with partial pivoting each).
func lastComponent(alpha, beta []float64, theta float64) float64 {
	k := len(alpha)
	if k == 1 {
		return 1
	}
	y := make([]float64, k)
	for i := range y {
		y[i] = 1 / math.Sqrt(float64(k))
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
			shift = theta + 1e-14*math.Max(math.Abs(theta), 1e-300)
			for i := range y {
				y[i] = 1 / math.Sqrt(float64(k))
			}
			continue
		}
		normalise(y)
	}
	return y[k-1]
}
