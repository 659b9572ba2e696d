package sar

import (
	"math"
	"testing"

	"github.com/areatest/areatest/weights"
)

// On a 20×20 rook lattice, fields drawn by the independent dense generator
// at a known ρ, μ, σ² are fitted 60 times: the mean fitted ρ lies within
// half the standard error of one fit from the truth, the reported standard
// error matches the spread of the estimates within 25%, the mean intercept
// lies within half its spread of μ, and the mean σ̂² within 3% of σ². The
// ML estimate of ρ is biased downwards by O(1/n) (Bao & Ullah 2007, J.
// Stat. Plan. Inference 137:396–413); measured here at ρ = 0.9 over 200
// fields: −0.037 at 100 areas, −0.006 at 400, −0.002 at 1,225, a few
// tenths of a standard error at 400, so the mean is not held to its own
// Monte Carlo error.
func TestFitRecoversKnownRho(t *testing.T) {
	g := weights.Lattice(20, 20, weights.Rook)
	p := prepare(t, g, Options{})
	w := denseW(g)
	const reps = 60
	for _, c := range []struct{ rho, mu, sigma2 float64 }{{0.5, 2, 1.5}, {0.9, -1, 0.5}, {-0.4, 0, 1}} {
		rhos, ses, mus, s2s := make([]float64, reps), make([]float64, reps), make([]float64, reps), make([]float64, reps)
		for k, y := range sarFields(t, w, c.rho, c.mu, c.sigma2, reps, uint64(100*c.rho+7)) {
			m, err := p.Fit(y)
			if err != nil {
				t.Fatal(err)
			}
			if m.AtBound {
				t.Fatalf("ρ=%v: fit %d at a bound", c.rho, k)
			}
			rhos[k], ses[k], mus[k], s2s[k] = m.Rho, m.RhoSE, m.Intercept, m.Sigma2
		}
		mr, sr := meanSD(rhos)
		mse, _ := meanSD(ses)
		mm, sm := meanSD(mus)
		ms2, _ := meanSD(s2s)
		t.Logf("ρ=%v: mean ρ̂ %.4f, sd %.4f, mean SE %.4f; μ̂ %.3f ± %.3f; σ̂² %.3f", c.rho, mr, sr, mse, mm, sm, ms2)
		if math.Abs(mr-c.rho) > 0.5*mse {
			t.Errorf("ρ=%v: mean estimate %v ± %v", c.rho, mr, sr/math.Sqrt(reps))
		}
		if math.Abs(mse/sr-1) > 0.25 {
			t.Errorf("ρ=%v: standard error %v, spread %v", c.rho, mse, sr)
		}
		if math.Abs(mm-c.mu) > 0.5*sm {
			t.Errorf("ρ=%v: mean intercept %v ± %v, want %v", c.rho, mm, sm/math.Sqrt(reps), c.mu)
		}
		if math.Abs(ms2/c.sigma2-1) > 0.03 {
			t.Errorf("ρ=%v: mean σ̂² %v, want %v", c.rho, ms2, c.sigma2)
		}
	}
}

// The fitted ρ maximises the concentrated log-likelihood: moving it either
// way by 1e-4 lowers the value, and the reported maximum is that value.
func TestFitIsTheMaximum(t *testing.T) {
	g := regionGraph(t, 200)
	p := prepare(t, g, Options{})
	y := sarFields(t, denseW(g), 0.7, 1, 1, 1, 3)[0]
	m, err := p.Fit(y)
	if err != nil {
		t.Fatal(err)
	}
	mo, _ := p.moments(y)
	at := p.logLik(mo, m.Rho)
	if math.Abs(at-m.LogLik) > 1e-9*math.Abs(at) {
		t.Errorf("log-likelihood %v, at ρ̂ %v", m.LogLik, at)
	}
	for _, d := range []float64{-1e-4, 1e-4} {
		if l := p.logLik(mo, m.Rho+d); l >= at {
			t.Errorf("ρ̂%+g: %v ≥ %v", d, l, at)
		}
	}
}

func TestFitRejects(t *testing.T) {
	g := weights.Lattice(3, 3, weights.Rook)
	p := prepare(t, g, Options{})
	for name, y := range map[string][]float64{
		"short":    {1, 2, 3},
		"constant": {2, 2, 2, 2, 2, 2, 2, 2, 2},
		"nan":      {1, 2, 3, 4, math.NaN(), 6, 7, 8, 9},
	} {
		if _, err := p.Fit(y); err == nil {
			t.Errorf("%s: no error", name)
		}
	}
}
