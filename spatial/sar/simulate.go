package sar

import (
	"fmt"
	"math"

	"github.com/areatest/areatest/spatial/shuffle"
)

// Tolerance is the relative residual at which Solve stops: ‖b − (I −
// ρS)u‖ ≤ Tolerance·‖b‖ in the symmetrised system.
const Tolerance = 1e-10

// Scratch is one goroutine's working space for Solve and Simulate.
type Scratch struct {
	rhs, u, r, d, q []float64
}

// NewScratch returns working space for draws of m.
func (m *Model) NewScratch() *Scratch {
	n := m.w.n
	return &Scratch{rhs: make([]float64, n), u: make([]float64, n), r: make([]float64, n),
		d: make([]float64, n), q: make([]float64, n)}
}

// Solve sets out = (I − ρW)⁻¹b and returns the number of iterations. Since
// I − ρW = D^{-1/2}(I − ρS)D^{1/2} and I − ρS is symmetric positive
// definite for ρ inside Interval, it solves (I − ρS)u = D^{1/2}b by
// conjugate gradients (Hestenes & Stiefel 1952) and returns D^{-1/2}u. The
// error shrinks at least by (√κ − 1)/(√κ + 1) per step, κ = (1 −
// ρλ_min)/(1 − ρ): about 70 steps for ρ = 0.95. It does not allocate.
func (m *Model) Solve(b, out []float64, s *Scratch) (int, error) {
	p := m.w
	if len(b) != p.n || len(out) != p.n {
		return 0, fmt.Errorf("sar: vectors of %d and %d values for %d areas", len(b), len(out), p.n)
	}
	for i, v := range b {
		s.rhs[i] = p.sq[i] * v
	}
	copy(s.u, s.rhs)
	m.residual(s.u, s.rhs, s.r)
	copy(s.d, s.r)
	rr := sumSquares(s.r)
	stop := Tolerance * Tolerance * sumSquares(s.rhs)
	limit := 10 * (p.n + 100)
	it := 0
	for ; rr > stop && it < limit; it++ {
		step := rr / m.operatorDot(s.d, s.q)
		next := update(step, s.d, s.q, s.u, s.r)
		beta := next / rr
		for i, v := range s.r {
			s.d[i] = v + beta*s.d[i]
		}
		rr = next
	}
	for i := range out {
		out[i] = s.u[i] / p.sq[i]
	}
	if rr > stop {
		return it, fmt.Errorf("sar: the solve did not converge in %d steps (ρ = %v)", it, m.Rho)
	}
	return it, nil
}

// operatorDot sets dst = (I − ρS)x and returns xᵀdst, in one pass.
func (m *Model) operatorDot(x, dst []float64) float64 {
	p := m.w
	var xd float64
	for i := 0; i < p.n; i++ {
		var t float64
		for k := p.off[i]; k < p.off[i+1]; k++ {
			t += p.s[k] * x[p.nb[k]]
		}
		v := x[i] - m.Rho*t
		dst[i] = v
		xd += x[i] * v
	}
	return xd
}

// update takes the conjugate-gradient step u += step·d, r −= step·q and
// returns the new rᵀr, in one pass.
func update(step float64, d, q, u, r []float64) float64 {
	var rr float64
	for i, v := range d {
		u[i] += step * v
		ri := r[i] - step*q[i]
		r[i] = ri
		rr += ri * ri
	}
	return rr
}

// residual sets r = b − (I − ρS)u.
func (m *Model) residual(u, b, r []float64) {
	m.operatorDot(u, r)
	for i := range r {
		r[i] = b[i] - r[i]
	}
}

// Simulate draws one field y = (I − ρW)⁻¹(μ1 + ε), ε ~ N(0, σ²I), into
// out, every normal from rng. It does not allocate.
func (m *Model) Simulate(rng *shuffle.Stream, out []float64, s *Scratch) error {
	rng.Normals(s.q)
	sd := math.Sqrt(m.Sigma2)
	b := s.q
	for i := range b {
		b[i] = m.Intercept + sd*b[i]
	}
	// Solve reads b before it first writes s.q.
	_, err := m.Solve(b, out, s)
	return err
}

// sumSquares returns xᵀx, summed in order (as the block solves sum each
// column, so that ForDraws and Simulate agree).
func sumSquares(x []float64) float64 {
	var s float64
	for _, v := range x {
		s += v * v
	}
	return s
}
