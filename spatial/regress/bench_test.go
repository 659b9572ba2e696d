package regress

import (
	"math"
	"strings"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// benchResiduals times the whole least-squares screen — fit, residual
// Moran's I with its moments (normal approximation) and the LM tests — with
// five covariates on a row-standardised queen lattice of rows×cols areas.
func benchResiduals(b *testing.B, rows, cols int) {
	g := weights.Lattice(rows, cols, weights.Queen).RowStandardised()
	x := design(rows, cols, 5, 47)
	u := make([]float64, rows*cols)
	rng := shuffle.NewStream(53, 6, 0)
	rng.Normals(u)
	y := solveLag(g, 0.3, outcome(x, u))
	b.ResetTimer()
	for b.Loop() {
		f, err := OLS(y, x, nil)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := f.Moran(g, shuffle.Greater); err != nil {
			b.Fatal(err)
		}
		if _, err := f.LagrangeMultipliers(g); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkResiduals3000x5: 3,000 areas (50×60), five covariates.
func BenchmarkResiduals3000x5(b *testing.B) { benchResiduals(b, 50, 60) }

// BenchmarkResiduals85000x5: 85,000 areas (250×340), five covariates.
func BenchmarkResiduals85000x5(b *testing.B) { benchResiduals(b, 250, 340) }

// BenchmarkExact1500 times Moran with its exact p-value at ExactLimit
// areas (30×50), two covariates: dominated by the dense eigenvalues.
func BenchmarkExact1500(b *testing.B) {
	g := weights.Lattice(30, 50, weights.Queen).RowStandardised()
	x := design(30, 50, 2, 59)
	u := make([]float64, 1500)
	rng := shuffle.NewStream(61, 7, 0)
	rng.Normals(u)
	f, err := OLS(outcome(x, u), x, nil)
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if r, err := f.Moran(g, shuffle.Greater); err != nil || !r.Exact {
			b.Fatal(err)
		}
	}
}

// BenchmarkLMNull5000 is the bigger version of TestLMNullDistribution:
// 5,000 normal-error data sets on a 30×30 lattice with two covariates,
// reporting each test's Kolmogorov–Smirnov distance from its χ² (the 0.1%
// critical value is 1.95/√5000 = 0.028) and its rejection rate at 5%.
func BenchmarkLMNull5000(b *testing.B) {
	const count = 5000
	g := lattice(30, 30)
	x := design(30, 30, 2, 67)
	for b.Loop() {
		draws := lmDraws(b, g, x, "none", 0, count, 71)
		for _, s := range statistic {
			ks, rate := nullFit(draws, s.of, s.df)
			b.ReportMetric(ks, "ks_"+metricName(s.name))
			b.ReportMetric(rate, "level_"+metricName(s.name))
		}
	}
}

// BenchmarkLMPower2000 is the bigger version of TestLMPower: 2,000 data
// sets per process on a 30×30 lattice, reporting every test's rejection
// rate at 5% under a spatial error (λ = 0.15) and a spatial lag (ρ = 0.07)
// process (weaker than in the test: 900 areas have more power).
func BenchmarkLMPower2000(b *testing.B) {
	const count = 2000
	g := lattice(30, 30)
	x := design(30, 30, 4, 73)[2:]
	for b.Loop() {
		for _, c := range []struct {
			kind string
			par  float64
		}{{"error", 0.15}, {"lag", 0.07}} {
			rates := make([]float64, len(statistic))
			for _, lm := range lmDraws(b, g, x, c.kind, c.par, count, 79) {
				for k, s := range statistic {
					if s.of(lm).P < 0.05 {
						rates[k] += 1.0 / count
					}
				}
			}
			for k, s := range statistic {
				b.ReportMetric(math.Round(rates[k]*1000)/1000, c.kind+"_"+metricName(s.name))
			}
		}
	}
}

// metricName turns "robust error" into "robust_error" for ReportMetric.
func metricName(s string) string { return strings.ReplaceAll(s, " ", "_") }
