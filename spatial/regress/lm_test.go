package regress

import (
	"math"
	"sort"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// lmDraws fits count simulated data sets on the design x and graph g and
// returns the LM tests of each: the outcome is Xβ + u with u normal
// (kind "none"), u = (I − λW)⁻¹ε ("error") or y = (I − ρW)⁻¹(Xβ + ε)
// ("lag"), at the parameter par, data set d from the stream (seed, 5, d).
func lmDraws(tb testing.TB, g *weights.Graph, x [][]float64, kind string, par float64, count int, seed uint64) []LM {
	n := g.Len()
	out := make([]LM, count)
	eps := make([]float64, n)
	for d := range out {
		rng := shuffle.NewStream(seed, 5, d)
		rng.Normals(eps)
		var y []float64
		switch kind {
		case "error":
			y = outcome(x, solveLag(g, par, eps))
		case "lag":
			y = solveLag(g, par, outcome(x, eps))
		default:
			y = outcome(x, eps)
		}
		lm, err := mustOLS(tb, y, x).LagrangeMultipliers(g)
		if err != nil {
			tb.Fatal(err)
		}
		out[d] = lm
	}
	return out
}

// ksDistance returns the Kolmogorov–Smirnov distance sup |F_N − F| between
// the sample and the continuous CDF.
func ksDistance(sample []float64, cdf func(float64) float64) float64 {
	s := append([]float64(nil), sample...)
	sort.Float64s(s)
	n := float64(len(s))
	var d float64
	for i, v := range s {
		f := cdf(v)
		d = math.Max(d, math.Max(f-float64(i)/n, float64(i+1)/n-f))
	}
	return d
}

// statistic picks one test out of an LM.
var statistic = []struct {
	name string
	df   float64
	of   func(LM) Test
}{
	{"error", 1, func(l LM) Test { return l.Error }},
	{"lag", 1, func(l LM) Test { return l.Lag }},
	{"robust error", 1, func(l LM) Test { return l.RobustError }},
	{"robust lag", 1, func(l LM) Test { return l.RobustLag }},
	{"joint", 2, func(l LM) Test { return l.Joint }},
}

// nullFit returns the Kolmogorov–Smirnov distance of one test's statistics
// over the draws from χ² with df degrees of freedom, and the share of draws
// it rejects at 5%.
func nullFit(draws []LM, of func(LM) Test, df float64) (ks, rate float64) {
	vals := make([]float64, len(draws))
	for d, lm := range draws {
		vals[d] = of(lm).Statistic
		if of(lm).P < 0.05 {
			rate++
		}
	}
	return ksDistance(vals, distuv.ChiSquared{K: df}.CDF), rate / float64(len(draws))
}

// Under no spatial dependence (independent normal errors; 1,000 data sets
// on a 20×20 lattice with two covariates) each LM statistic's distribution
// matches its χ²: the Kolmogorov–Smirnov distance is below the asymptotic
// 0.1% critical value 1.95/√N (Kolmogorov's distribution: √(−ln(0.0005)/2)),
// and each test rejects at 5% in a share within four binomial standard
// errors of 0.05.
func TestLMNullDistribution(t *testing.T) {
	const rows, cols, count = 20, 20, 1000
	g := lattice(rows, cols)
	x := design(rows, cols, 2, 29)
	draws := lmDraws(t, g, x, "none", 0, count, 31)
	crit := 1.95 / math.Sqrt(count)
	se := math.Sqrt(0.05 * 0.95 / count)
	for _, s := range statistic {
		ks, rate := nullFit(draws, s.of, s.df)
		t.Logf("%s: KS %.4f (critical %.4f), rejects %.3f at 5%%", s.name, ks, crit, rate)
		if ks > crit || math.Abs(rate-0.05) > 4*se {
			t.Errorf("%s: KS distance %v (critical %v), rejection rate %v", s.name, ks, crit, rate)
		}
	}
	for _, lm := range draws {
		if d := lm.Joint.Statistic - lm.RobustError.Statistic - lm.Lag.Statistic; math.Abs(d) > 1e-9*lm.Joint.Statistic {
			t.Fatalf("joint %v ≠ robust error %v + lag %v", lm.Joint.Statistic, lm.RobustError.Statistic, lm.Lag.Statistic)
		}
	}
}

// Power on simulated data (200 data sets each on a 15×15 lattice, two
// independent normal covariates with β = (2, 0.5)): under a
// spatial error process (λ = 0.3) the error test rejects more often than
// the lag test, and the robust error test more often than the robust lag
// test, which stays near its level while the plain lag test rejects often
// (the robust forms correct the other's spill-over); under a spatial lag
// process (ρ = 0.15) the reverse. This is what
// the literature reports (Anselin, Bera, Florax & Yoon 1996, tables 3–4)
// and what the decision rule rests on.
func TestLMPower(t *testing.T) {
	const rows, cols, count = 15, 15, 200
	g := lattice(rows, cols)
	// Independent covariates: a smooth one would have WXβ nearly in the
	// span of X, and then the two alternatives cannot be told apart.
	x := design(rows, cols, 4, 37)[2:]
	for _, c := range []struct {
		kind string
		par  float64
	}{{"error", 0.3}, {"lag", 0.15}} {
		rates := map[string]float64{}
		for _, lm := range lmDraws(t, g, x, c.kind, c.par, count, 41) {
			for _, s := range statistic {
				if s.of(lm).P < 0.05 {
					rates[s.name] += 1.0 / count
				}
			}
		}
		t.Logf("%s process: rejection rates %v", c.kind, rates)
		own, other := "error", "lag"
		if c.kind == "lag" {
			own, other = other, own
		}
		// The robust form of the other test stays near its level (0.05;
		// 0.12 is over four binomial standard errors above it): it is not
		// misled by the spill-over that makes the plain one reject.
		if rates[own] <= rates[other] || rates["robust "+own] <= rates["robust "+other] || rates["robust "+other] > 0.12 {
			t.Errorf("%s process: rates %v", c.kind, rates)
		}
	}
}
