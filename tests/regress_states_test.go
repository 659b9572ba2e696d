package tests

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/regress"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
)

// regressRefs mirrors testdata/scipy/regress_refs.json, made by
// testdata/scipy/make_regress_refs.py with Debian's python3-statsmodels
// 0.13.5, python3-numpy 1.24.2 and python3-scipy 1.10.1: least-squares fits
// on the 49 linked states with statsmodels' diagnostics, and the residual
// Moran's I, its moments, exact p-value and the LM tests from dense numpy.
type regressRefs struct {
	IDs   []string `json:"ids"`
	Cases map[string]struct {
		Y               []float64   `json:"y"`
		X               [][]float64 `json:"x"`
		Names           []string    `json:"names"`
		Estimate, SE    []float64
		T, P            []float64
		R2              float64   `json:"r2"`
		AdjR2           float64   `json:"adj_r2"`
		F               float64   `json:"f"`
		FP              float64   `json:"f_p"`
		Sigma           float64   `json:"sigma"`
		DF              int       `json:"df"`
		Standardised    []float64 `json:"standardised"`
		ConditionNumber float64   `json:"condition_number"`
		VIF             []float64 `json:"vif"`
		JarqueBera      refTest   `json:"jarque_bera"`
		BreuschPagan    refTest   `json:"breusch_pagan"`
		Koenker         refTest   `json:"koenker"`
		Moran           struct {
			I, Mean, Variance, Z float64
			PGreater             float64 `json:"p_greater"`
			ExactPGreater        float64 `json:"exact_p_greater"`
		} `json:"moran"`
		LM map[string]refTest `json:"lm"`
	} `json:"cases"`
}

type refTest struct{ Statistic, P float64 }

// checkTest compares a statistic and its p-value to a reference.
func checkTest(t *testing.T, what string, got regress.Test, want refTest, tol float64) {
	t.Helper()
	if !relClose(got.Statistic, want.Statistic, tol) || !relClose(got.P, want.P, tol) {
		t.Errorf("%s: %v (p %v), reference %v (p %v)", what, got.Statistic, got.P, want.Statistic, want.P)
	}
}

// The least-squares fit and its diagnostics on real open data (the US
// states) against statsmodels, and the residual Moran's I, its exact
// moments and p-value and the LM tests against a dense numpy implementation
// of the formulas: everything to 1e-9 relative, except the exact p-value
// (two quadratures of Imhof's integral, 1e-7 relative).
func TestStatesRegressionAgainstStatsmodels(t *testing.T) {
	var r regressRefs
	testkit.LoadJSON(t, "scipy/regress_refs.json", &r)
	ar := loadAutocorrRefs(t)
	for k := range r.IDs {
		if r.IDs[k] != ar.IDs[k] {
			t.Fatalf("area %d: %s, autocorrelation references %s", k, r.IDs[k], ar.IDs[k])
		}
	}
	w := statesQueen(t, ar).RowStandardised()
	const tol = 1e-9
	for name, c := range r.Cases {
		f, err := regress.OLS(c.Y, c.X, c.Names)
		if err != nil {
			t.Fatal(err)
		}
		if f.DF != c.DF {
			t.Errorf("%s: df %d, statsmodels %d", name, f.DF, c.DF)
		}
		for j, co := range f.Coefficients {
			if !relClose(co.Estimate, c.Estimate[j], tol) || !relClose(co.SE, c.SE[j], tol) ||
				!relClose(co.T, c.T[j], tol) || !relClose(co.P, c.P[j], tol) {
				t.Errorf("%s %s: %+v, statsmodels %v %v %v %v", name, co.Name, co, c.Estimate[j], c.SE[j], c.T[j], c.P[j])
			}
		}
		for _, v := range [][3]float64{{f.R2, c.R2}, {f.AdjR2, c.AdjR2}, {f.F, c.F}, {f.FP, c.FP},
			{f.SigmaHat, c.Sigma}, {f.ConditionNumber, c.ConditionNumber}} {
			if !relClose(v[0], v[1], tol) {
				t.Errorf("%s: %v, reference %v", name, v[0], v[1])
			}
		}
		for j, v := range f.VIF {
			if !relClose(v, c.VIF[j], tol) {
				t.Errorf("%s: VIF of %s %v, statsmodels %v", name, c.Names[j], v, c.VIF[j])
			}
		}
		for i, v := range f.Standardised {
			if math.Abs(v-c.Standardised[i]) > tol {
				t.Errorf("%s: standardised residual %d %v, statsmodels %v", name, i, v, c.Standardised[i])
			}
		}
		checkTest(t, name+" Jarque–Bera", f.JarqueBera, c.JarqueBera, tol)
		checkTest(t, name+" Breusch–Pagan", f.BreuschPagan, c.BreuschPagan, tol)
		checkTest(t, name+" Koenker", f.Koenker, c.Koenker, tol)
		m, err := f.Moran(w, shuffle.Greater)
		if err != nil {
			t.Fatal(err)
		}
		want := c.Moran
		for _, v := range [][2]float64{{m.I, want.I}, {m.Mean, want.Mean}, {m.Variance, want.Variance}, {m.Z, want.Z}, {m.P, want.PGreater}} {
			if !relClose(v[0], v[1], tol) {
				t.Errorf("%s: residual Moran %+v, numpy %+v", name, m, want)
				break
			}
		}
		if !m.Exact || !relClose(m.ExactP, want.ExactPGreater, 1e-7) {
			t.Errorf("%s: exact p %v, numpy and scipy %v", name, m.ExactP, want.ExactPGreater)
		}
		lm, err := f.LagrangeMultipliers(w)
		if err != nil {
			t.Fatal(err)
		}
		for key, got := range map[string]regress.Test{"error": lm.Error, "lag": lm.Lag, "robust_error": lm.RobustError,
			"robust_lag": lm.RobustLag, "joint": lm.Joint} {
			checkTest(t, name+" LM "+key, got, c.LM[key], tol)
		}
		t.Logf("%s: R² %.4f, condition number %.1f, residual I %.4f (E %.4f), p normal %.4f exact %.4f; warnings %q",
			name, f.R2, f.ConditionNumber, m.I, m.Mean, m.P, m.ExactP, f.Warnings)
	}
}
