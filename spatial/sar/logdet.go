package sar

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/internal/parallel"
	"github.com/areatest/areatest/spatial/shuffle"
)

// probePurpose separates the quadrature's probe vectors from every other
// use of a seed.
const probePurpose = 0x5a52_6c64_7072_6f62

// LogDet returns ln|I − ρW| for ρ inside Interval, and the standard error
// of the value: 0 when exact, the Monte Carlo error of the probes' mean
// with the quadrature.
func (p *Weights) LogDet(rho float64) (value, se float64) {
	if p.method == Eigenvalues {
		for _, l := range p.values {
			value += math.Log1p(-rho * l)
		}
		return value, 0
	}
	return p.quad.logDet(rho)
}

// logDetDerivatives returns the first and second derivatives of
// ln|I − ρW| in ρ.
func (p *Weights) logDetDerivatives(rho float64) (d1, d2 float64) {
	if p.method == Quadrature {
		return p.quad.derivatives(rho)
	}
	for _, l := range p.values {
		t := l / (1 - rho*l)
		d1 -= t
		d2 -= t * t
	}
	return d1, d2
}

// exact finds every eigenvalue of S with a dense symmetric solver: W is
// D^{-1/2} S D^{1/2}, so they are W's, and ln|I − ρW| = Σ ln(1 − ρλ_i)
// (Ord 1975).
func (p *Weights) exact() error {
	sym := mat.NewSymDense(p.n, nil)
	for i := 0; i < p.n; i++ {
		for k := p.off[i]; k < p.off[i+1]; k++ {
			if j := int(p.nb[k]); j >= i {
				sym.SetSym(i, j, p.s[k])
			}
		}
	}
	var es mat.EigenSym
	if !es.Factorize(sym, false) {
		return errors.New("sar: the eigenvalues of the weights did not converge")
	}
	p.values = es.Values(nil)
	p.method = Eigenvalues
	// λ_max is 1 exactly (W1 = 1 on every linked component); the solver's
	// value differs from it by rounding.
	p.lo, p.hi = 1/p.values[0], 1
	return nil
}

// quadrature holds the Gauss nodes and weights of one Lanczos run per probe
// on S, deflated of its eigenvalue 1. With the remainder r(θ) = ln(1 − ρθ)
// + ρθ + ρ²θ²/2,
//
//	ln|I − ρW| = c ln(1 − ρ) + cρ − ρ²(tr S² − c)/2 + Σ_{λ ≠ the c ones} r(λ),
//
// c the number of linked components; tr S = 0 and tr S² = Σ s_ij² are
// exact, and only the last sum, whose terms are O(θ³), is estimated.
type quadrature struct {
	nodes, weights []float64 // probe k's are [k*steps, k*steps+count[k])
	count          []int
	steps          int
	ncomp          float64
	t2             float64 // tr S² − c
}

// sparse estimates the trace of r(S) on the deflated space by Hutchinson's
// estimator with Rademacher probes (Hutchinson 1989) and each quadratic
// form zᵀr(S)z by the Gauss quadrature of Lanczos (Golub & Meurant 2010;
// Ubaru, Chen & Saad 2017).
func (p *Weights) sparse(opt Options) error {
	probes, steps := opt.Probes, opt.Steps
	if probes <= 0 {
		probes = DefaultProbes
	}
	if steps <= 0 {
		steps = DefaultSteps
	}
	steps = min(steps, p.n-p.ncomp)
	q := &quadrature{steps: steps, ncomp: float64(p.ncomp),
		nodes: make([]float64, probes*steps), weights: make([]float64, probes*steps), count: make([]int, probes)}
	for _, s := range p.s {
		q.t2 += s * s
	}
	q.t2 -= q.ncomp
	parallel.ForBlocks(probes, opt.Workers, func() func(int) {
		l := newLanczos(p, steps)
		return func(k int) {
			rng := shuffle.NewStream(opt.Seed, probePurpose, k)
			at := k * steps
			q.count[k] = l.run(&rng, q.nodes[at:at+steps], q.weights[at:at+steps])
		}
	})
	p.quad, p.method = q, Quadrature
	p.lo, p.hi = -1, 1
	return nil
}

func remainder(rho, t float64) float64 {
	x := rho * t
	return math.Log1p(-x) + x + x*x/2
}

func (q *quadrature) logDet(rho float64) (value, se float64) {
	probes := len(q.count)
	var sum, sum2 float64
	for k := 0; k < probes; k++ {
		var e float64
		at := k * q.steps
		for j := at; j < at+q.count[k]; j++ {
			e += q.weights[j] * remainder(rho, q.nodes[j])
		}
		sum += e
		sum2 += e * e
	}
	mean := sum / float64(probes)
	if probes > 1 {
		v := (sum2 - mean*sum) / float64(probes-1)
		se = math.Sqrt(math.Max(v, 0) / float64(probes))
	}
	exact := q.ncomp*math.Log1p(-rho) + q.ncomp*rho - rho*rho*q.t2/2
	return exact + mean, se
}

// derivatives differentiates the quadrature's log-determinant in ρ, with
// dr/dρ = θ + ρθ² − θ/(1 − ρθ) and d²r/dρ² = θ² − θ²/(1 − ρθ)².
func (q *quadrature) derivatives(rho float64) (d1, d2 float64) {
	for k := range q.count {
		at := k * q.steps
		for j := at; j < at+q.count[k]; j++ {
			t := q.nodes[j]
			u := t / (1 - rho*t)
			d1 += q.weights[j] * (t + rho*t*t - u)
			d2 += q.weights[j] * (t*t - u*u)
		}
	}
	probes := float64(len(q.count))
	d1 = -q.ncomp/(1-rho) + q.ncomp - rho*q.t2 + d1/probes
	d2 = -q.ncomp/((1-rho)*(1-rho)) - q.t2 + d2/probes
	return d1, d2
}

// lanczos is one worker's scratch for Lanczos runs on the deflated S.
type lanczos struct {
	p                *Weights
	basis            []float64 // steps × n, row per Lanczos vector
	w, tmp           []float64
	alpha, beta, tri []float64
	values, work     []float64
}

func newLanczos(p *Weights, steps int) *lanczos {
	l := &lanczos{p: p, basis: make([]float64, steps*p.n), w: make([]float64, p.n),
		tmp: make([]float64, p.ncomp), alpha: make([]float64, steps), beta: make([]float64, steps),
		tri: make([]float64, steps*steps), values: make([]float64, steps)}
	t := blas64.Symmetric{N: steps, Stride: steps, Data: l.tri, Uplo: blas.Upper}
	work := []float64{0}
	lapack64.Syev(lapack.EVCompute, t, l.values, work, -1)
	l.work = make([]float64, int(work[0]))
	return l
}

// run draws a Rademacher probe z, deflates it, and runs Lanczos from z/‖z‖,
// each new vector reorthogonalised once against all the earlier ones (and
// deflated again, against rounding). It writes the Gauss nodes (the Ritz
// values) and weights ‖z‖²·(first entry of each Ritz vector)² and returns
// how many there are (fewer than steps when the Krylov space closes early).
func (l *lanczos) run(rng *shuffle.Stream, nodes, weights []float64) int {
	n, p := l.p.n, l.p
	q := l.basis[:n]
	for i := range q {
		q[i] = 1
		if rng.Uint64()&1 == 0 {
			q[i] = -1
		}
	}
	p.deflate(q, l.tmp)
	norm2 := floats.Dot(q, q)
	floats.Scale(1/math.Sqrt(norm2), q)
	k := 0
	for k < len(l.alpha) {
		q = l.basis[k*n : (k+1)*n]
		p.applyS(q, l.w)
		l.alpha[k] = floats.Dot(q, l.w)
		for j := 0; j <= k; j++ {
			qj := l.basis[j*n : (j+1)*n]
			floats.AddScaled(l.w, -floats.Dot(qj, l.w), qj)
		}
		p.deflate(l.w, l.tmp)
		b := floats.Norm(l.w, 2)
		l.beta[k] = b
		k++
		if b <= 1e-10 || k == len(l.alpha) {
			break
		}
		next := l.basis[k*n : (k+1)*n]
		copy(next, l.w)
		floats.Scale(1/b, next)
	}
	return l.gauss(k, norm2, nodes, weights)
}

// gauss diagonalises the k×k Lanczos tridiagonal matrix into nodes and
// weights.
func (l *lanczos) gauss(k int, norm2 float64, nodes, weights []float64) int {
	clear(l.tri[:k*k])
	for i := 0; i < k; i++ {
		l.tri[i*k+i] = l.alpha[i]
		if i+1 < k {
			l.tri[i*k+i+1] = l.beta[i]
		}
	}
	t := blas64.Symmetric{N: k, Stride: k, Data: l.tri[:k*k], Uplo: blas.Upper}
	if !lapack64.Syev(lapack.EVCompute, t, l.values[:k], l.work, len(l.work)) {
		return 0
	}
	for j := 0; j < k; j++ {
		nodes[j] = l.values[j]
		v := l.tri[j] // row 0, column j: first entry of the j-th eigenvector
		weights[j] = norm2 * v * v
	}
	return k
}
