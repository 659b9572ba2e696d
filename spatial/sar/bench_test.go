package sar

import (
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// benchFit times Prepare and Fit on the demo region at n areas (the
// quadrature above DefaultExactLimit), outcome a SAR(0.8) field.
func benchFit(b *testing.B, n int) {
	g := regionGraph(b, n)
	p := prepare(b, g, Options{})
	truth, err := p.Model(0.8, 1, 1)
	if err != nil {
		b.Fatal(err)
	}
	y := make([]float64, n)
	var rng = newBenchStream()
	if err := truth.Simulate(&rng, y, truth.NewScratch()); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		p, err := Prepare(g, Options{})
		if err != nil {
			b.Fatal(err)
		}
		m, err := p.Fit(y)
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(m.Rho, "rho")
	}
}

// benchDraws times 1,000 draws at ρ = 0.95 on all cores.
func benchDraws(b *testing.B, n int) {
	g := regionGraph(b, n)
	m, err := prepare(b, g, Options{}).Model(0.95, 1, 1)
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		if err := m.ForDraws(1000, 1, 2, func(int, []float64) {}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkFit1000(b *testing.B)    { benchFit(b, 1000) }
func BenchmarkFit3000(b *testing.B)    { benchFit(b, 3000) }
func BenchmarkFit20000(b *testing.B)   { benchFit(b, 20000) }
func BenchmarkFit85000(b *testing.B)   { benchFit(b, 85000) }
func BenchmarkDraws3000(b *testing.B)  { benchDraws(b, 3000) }
func BenchmarkDraws20000(b *testing.B) { benchDraws(b, 20000) }

func newBenchStream() shuffle.Stream { return shuffle.NewStream(4, 5, 6) }

// The quadrature against the exact eigenvalues at 3,000 areas, too slow
// for a test (the dense spectrum takes about 15 s): reports the largest
// log-determinant error over ρ in [−0.9, 0.99] and the fitted ρ's
// distance from the exact fit, in standard errors, at ρ = 0.9, and the
// ratio of the two fits' standard errors.
func BenchmarkQuadratureAccuracy3000(b *testing.B) {
	g := regionGraph(b, 3000)
	exact := prepare(b, g, Options{ExactLimit: g.Len()})
	quad := prepare(b, g, Options{ExactLimit: -1})
	truth, err := exact.Model(0.9, 1, 1)
	if err != nil {
		b.Fatal(err)
	}
	y := make([]float64, g.Len())
	rng := newBenchStream()
	if err := truth.Simulate(&rng, y, truth.NewScratch()); err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		var worst float64
		for rho := -0.9; rho < 0.995; rho += 0.01 {
			e, _ := exact.LogDet(rho)
			q, _ := quad.LogDet(rho)
			worst = max(worst, abs(e-q))
		}
		me, err := exact.Fit(y)
		if err != nil {
			b.Fatal(err)
		}
		mq, err := quad.Fit(y)
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(worst, "max-logdet-error")
		b.ReportMetric((mq.Rho-me.Rho)/me.RhoSE, "rho-diff-in-SE")
		b.ReportMetric(me.Rho, "rho-exact")
		b.ReportMetric(mq.RhoSE/me.RhoSE, "se-ratio")
	}
}

func abs(x float64) float64 { return max(x, -x) }
