package sar

import (
	"errors"
	"fmt"
	"math"

	"github.com/areatest/areatest/weights"
)

// Model is a simultaneous autoregressive model y = ρWy + μ1 + ε, ε ~ N(0,
// σ²I), fitted by maximum likelihood on prepared weights.
type Model struct {
	// Rho is ρ, Intercept μ and Sigma2 σ², at the maximum.
	Rho, Intercept, Sigma2 float64
	// LogLik is the maximised log-likelihood.
	LogLik float64
	// RhoSE is the asymptotic standard error of ρ, from the curvature of
	// the concentrated log-likelihood at its maximum (the profile
	// information).
	RhoSE float64
	// AtBound is set when the maximum lies at an end of the searched
	// interval, where RhoSE means little.
	AtBound bool
	// LogDetSE is the Monte Carlo error of ln|I − ρW| at Rho (0 when exact).
	LogDetSE float64

	w *Weights
}

// Weights returns the prepared weights the model was fitted on.
func (m *Model) Weights() *Weights { return m.w }

// Model returns the model with the given ρ, intercept μ and σ² on p,
// for drawing fields at chosen parameters (simulation studies) rather than
// fitted ones; the likelihood fields of the result are left zero. ρ must
// lie inside Interval and σ² be positive.
func (p *Weights) Model(rho, mu, sigma2 float64) (*Model, error) {
	if !(rho > p.lo && rho < p.hi) {
		return nil, fmt.Errorf("sar: ρ = %v outside the interval (%v, %v)", rho, p.lo, p.hi)
	}
	if !(sigma2 > 0) || math.IsInf(sigma2, 0) || math.IsNaN(mu) || math.IsInf(mu, 0) {
		return nil, fmt.Errorf("sar: need a finite μ and a positive, finite σ²; have %v and %v", mu, sigma2)
	}
	return &Model{Rho: rho, Intercept: mu, Sigma2: sigma2, w: p}, nil
}

// Fit prepares g with the default Options and fits the model to y.
func Fit(y []float64, g *weights.Graph) (*Model, error) {
	p, err := Prepare(g, Options{})
	if err != nil {
		return nil, err
	}
	return p.Fit(y)
}

// moments are the sufficient statistics of the concentrated likelihood:
// with z0 = y − ȳ and z1 = Wy − mean(Wy), the residual sum of squares at ρ
// is a − 2ρb + ρ²c.
type moments struct {
	n, a, b, c, ybar, wybar float64
}

func (p *Weights) moments(y []float64) (moments, error) {
	if len(y) != p.n {
		return moments{}, fmt.Errorf("sar: %d values for %d areas", len(y), p.n)
	}
	m := moments{n: float64(p.n)}
	wy := make([]float64, p.n)
	for i := 0; i < p.n; i++ {
		if math.IsNaN(y[i]) || math.IsInf(y[i], 0) {
			return moments{}, fmt.Errorf("sar: value %d is %v", i, y[i])
		}
		var t float64
		for k := p.off[i]; k < p.off[i+1]; k++ {
			t += p.w[k] * y[p.nb[k]]
		}
		wy[i] = t
		m.ybar += y[i]
		m.wybar += t
	}
	m.ybar /= m.n
	m.wybar /= m.n
	for i := range y {
		z0, z1 := y[i]-m.ybar, wy[i]-m.wybar
		m.a += z0 * z0
		m.b += z0 * z1
		m.c += z1 * z1
	}
	if !(m.a > 0) {
		return moments{}, errors.New("sar: the outcome is constant")
	}
	return m, nil
}

// rss returns the residual sum of squares at ρ.
func (m moments) rss(rho float64) float64 { return m.a - 2*rho*m.b + rho*rho*m.c }

// logLik is the log-likelihood concentrated in ρ (Ord 1975; Anselin 1988,
// ch. 6): −n/2 (ln 2π + 1) − n/2 ln(RSS(ρ)/n) + ln|I − ρW|.
func (p *Weights) logLik(m moments, rho float64) float64 {
	ld, _ := p.LogDet(rho)
	return -m.n/2*(math.Log(2*math.Pi)+1) - m.n/2*math.Log(m.rss(rho)/m.n) + ld
}

// Fit finds ρ by maximising the concentrated log-likelihood over Interval:
// a grid of 101 points brackets the maximum, a golden-section search
// narrows it to 1e-10, and Newton steps on the analytic score finish it
// (the maximum is flat to rounding over ~1e-7 in ρ, so only the score
// pins it down). μ = mean((I − ρW)y) and σ² = RSS(ρ)/n follow.
func (p *Weights) Fit(y []float64) (*Model, error) {
	m, err := p.moments(y)
	if err != nil {
		return nil, err
	}
	const grid = 101
	width := p.hi - p.lo
	lo, hi := p.lo+1e-9*width, p.hi-1e-9*width
	at := func(k int) float64 { return lo + (hi-lo)*float64(k)/(grid-1) }
	best, bestL := 0, math.Inf(-1)
	for k := 0; k < grid; k++ {
		if l := p.logLik(m, at(k)); l > bestL {
			best, bestL = k, l
		}
	}
	a, b := at(max(best-1, 0)), at(min(best+1, grid-1))
	rho := p.newton(m, p.golden(m, a, b), a, b)
	if l := p.logLik(m, rho); !(l >= bestL) {
		rho = at(best)
	}
	mod := &Model{Rho: rho, Intercept: m.ybar - rho*m.wybar, Sigma2: m.rss(rho) / m.n,
		LogLik: p.logLik(m, rho), w: p}
	mod.AtBound = rho-lo < 1e-6*width || hi-rho < 1e-6*width
	_, mod.LogDetSE = p.LogDet(rho)
	mod.RhoSE = p.rhoSE(m, rho)
	return mod, nil
}

// golden maximises the concentrated log-likelihood on [a, b] by
// golden-section search (Kiefer 1953).
func (p *Weights) golden(m moments, a, b float64) float64 {
	r := (math.Sqrt(5) - 1) / 2
	x1, x2 := b-r*(b-a), a+r*(b-a)
	f1, f2 := p.logLik(m, x1), p.logLik(m, x2)
	for b-a > 1e-10 {
		if f1 >= f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - r*(b-a)
			f1 = p.logLik(m, x1)
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + r*(b-a)
			f2 = p.logLik(m, x2)
		}
	}
	return (a + b) / 2
}

// newton refines ρ by up to 8 Newton steps on the score, keeping it
// inside [a, b].
func (p *Weights) newton(m moments, rho, a, b float64) float64 {
	for range 8 {
		d1, d2 := p.derivatives(m, rho)
		if !(d2 < 0) {
			break
		}
		next := rho - d1/d2
		if !(next >= a && next <= b) {
			break
		}
		done := math.Abs(next-rho) < 1e-15
		rho = next
		if done {
			break
		}
	}
	return rho
}

// derivatives returns the first and second derivatives in ρ of the
// concentrated log-likelihood: with s = RSS/n and L = ln|I − ρW|, they are
// −n/2 s'/s + L₁ and −n/2 (2c/(ns) − (s'/s)²) + L₂, with 2c/n the second
// derivative of s, and L₁, L₂ the first and second derivatives of L.
func (p *Weights) derivatives(m moments, rho float64) (d1, d2 float64) {
	s := m.rss(rho)
	ds := -2*m.b + 2*rho*m.c
	l1, l2 := p.logDetDerivatives(rho)
	return -m.n/2*ds/s + l1, -m.n/2*(2*m.c/s-(ds/s)*(ds/s)) + l2
}

// rhoSE is one over the square root of minus the second derivative: the
// profile-likelihood standard error.
func (p *Weights) rhoSE(m moments, rho float64) float64 {
	_, d2 := p.derivatives(m, rho)
	if !(d2 < 0) {
		return math.NaN()
	}
	return 1 / math.Sqrt(-d2)
}
