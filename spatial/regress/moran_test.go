package regress

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// The exact moments of the residual Moran's I against a Monte Carlo of
// normal errors on the same design and graph: 20,000 data sets on a 7×8
// lattice with two covariates; the simulated mean and variance lie within
// four standard errors of the formulas (Cliff & Ord 1981), on the
// row-standardised rook graph (W not symmetric) and the binary queen
// graph (symmetric).
func TestMomentsAgainstSimulation(t *testing.T) {
	const rows, cols, draws = 7, 8, 20000
	x := design(rows, cols, 2, 3)
	for _, c := range []struct {
		name string
		g    *weights.Graph
	}{{"row-standardised", lattice(rows, cols)}, {"binary", weights.Lattice(rows, cols, weights.Queen)}} {
		n := rows * cols
		rng := shuffle.NewStream(11, 2, 0)
		y := make([]float64, n)
		rng.Normals(y)
		f := mustOLS(t, outcome(x, y), x)
		r, err := f.Moran(c.g, shuffle.Greater)
		if err != nil {
			t.Fatal(err)
		}
		s0, _, _ := weightTraces(c.g)
		sim := make([]float64, draws)
		eps, we, tmp := make([]float64, n), make([]float64, n), make([]float64, f.k)
		for d := range sim {
			rng.Normals(eps)
			sim[d] = residualMoran(f, c.g, s0, eps, we, tmp)
		}
		mean, v, seV := meanVar(sim)
		seMean := math.Sqrt(v / draws)
		t.Logf("%s: E[I] %.5f, simulated %.5f ± %.5f; Var %.6f, simulated %.6f ± %.6f", c.name, r.Mean, mean, seMean, r.Variance, v, seV)
		if math.Abs(mean-r.Mean) > 4*seMean || math.Abs(v-r.Variance) > 4*seV {
			t.Errorf("%s: moments (%v, %v), simulation (%v ± %v, %v ± %v)", c.name, r.Mean, r.Variance, mean, seMean, v, seV)
		}
	}
}

// The sparse traces against dense matrices built with gonum, on a graph
// with unequal, non-symmetric weights and three covariates.
func TestTracesAgainstDense(t *testing.T) {
	const rows, cols = 5, 6
	n := rows * cols
	base := weights.Lattice(rows, cols, weights.Queen)
	var links []weights.Link
	for i := 0; i < n; i++ {
		nb, _ := base.Row(i)
		for _, j := range nb {
			links = append(links, weights.Link{From: int32(i), To: j, Weight: 1 + float64((3*i+int(j))%5)})
		}
	}
	g, err := weights.FromEntries(n, links, "test", "weighted")
	if err != nil {
		t.Fatal(err)
	}
	x := design(rows, cols, 3, 5)
	f := mustOLS(t, outcome(x, make([]float64, n)), x)
	tr := f.traces(g)
	w := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		nb, wt := g.Row(i)
		for s, j := range nb {
			w.Set(i, int(j), wt[s])
		}
	}
	q := mat.NewDense(n, f.k, f.basis)
	var h, m, mw, mwm mat.Dense
	h.Mul(q, q.T())
	m.Sub(eye(n), &h)
	mw.Mul(&m, w)
	mwm.Mul(&mw, &mw)
	var mwmwt, tmp mat.Dense
	tmp.Mul(&mw, &m)
	mwmwt.Mul(&tmp, w.T())
	for _, c := range [][3]any{{"tr(MW)", tr.mw, mat.Trace(&mw)}, {"tr(MWMW)", tr.mwmw, mat.Trace(&mwm)}, {"tr(MWMWᵀ)", tr.mwmwt, mat.Trace(&mwmwt)}} {
		got, want := c[1].(float64), c[2].(float64)
		if math.Abs(got-want) > 1e-10*(1+math.Abs(want)) {
			t.Errorf("%s: %v, dense %v", c[0], got, want)
		}
	}
}

func eye(n int) *mat.Dense {
	d := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		d.Set(i, i, 1)
	}
	return d
}

// With the intercept alone, the residuals are the centred outcome, so the
// residual Moran's I and its moments are those of Moran's I under
// normality: E[I] = −1/(n − 1) and Cliff & Ord's variance, as
// spatial/autocorr computes them.
func TestInterceptOnlyIsMoranUnderNormality(t *testing.T) {
	g := weights.Lattice(6, 7, weights.Queen)
	y := design(6, 7, 3, 9)[2]
	f := mustOLS(t, y, nil)
	r, err := f.Moran(g, shuffle.TwoSided)
	if err != nil {
		t.Fatal(err)
	}
	mm, err := autocorr.MoranMoments(y, g)
	if err != nil {
		t.Fatal(err)
	}
	i, _ := autocorr.MoransI(y, g)
	if math.Abs(r.I-i) > 1e-12 || math.Abs(r.Mean-mm.Expected) > 1e-12 || math.Abs(r.Variance-mm.VarianceNormality) > 1e-12 {
		t.Errorf("I %v E %v Var %v; autocorr %v %v %v", r.I, r.Mean, r.Variance, i, mm.Expected, mm.VarianceNormality)
	}
	if f.F != 0 || f.FP != 1 || len(f.VIF) != 0 || f.ConditionNumber != 1 {
		t.Errorf("intercept only: F %v p %v VIF %v condition %v", f.F, f.FP, f.VIF, f.ConditionNumber)
	}
	if _, err := f.LagrangeMultipliers(lattice(6, 7)); err != ErrNoLagSignal {
		t.Errorf("LM without covariates on a row-standardised graph: %v, want ErrNoLagSignal", err)
	}
}
