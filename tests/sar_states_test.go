package tests

import (
	"math"
	"strconv"
	"testing"

	"github.com/areatest/areatest/spatial/sar"
	"github.com/areatest/areatest/tests/testkit"
)

// sarRefs mirrors testdata/scipy/sar_refs.json, made by
// testdata/scipy/make_sar_refs.py with Debian's python3-numpy 1.24.2 and
// python3-scipy 1.10.1: the dense-eigenvalue log-determinant of the
// row-standardised queen W of the 49 linked states and maximum-likelihood
// SAR fits by scipy.optimize.minimize_scalar.
type sarRefs struct {
	IDs      []string           `json:"ids"`
	Interval [2]float64         `json:"interval"`
	LogDet   map[string]float64 `json:"logdet"`
	Fits     map[string]struct {
		Y                []float64
		Rho, Intercept   float64
		Sigma2           float64
		LogLik           float64 `json:"loglik"`
		RhoSEProfile     float64 `json:"rho_se_profile"`
		RhoSEInformation float64 `json:"rho_se_information"`
	} `json:"fits"`
}

// The SAR fit on the real states layer against numpy/scipy: the admissible
// interval and log-determinants to 1e-10, the fitted ρ to 1e-9 (both
// solve the score equation at the end), μ and σ² to 1e-8 relative and the
// maximised log-likelihood to 1e-12, the standard error of ρ to
// 1e-4 of the scipy finite-difference curvature and within 5% of the
// expected-information figure (asymptotically equal, not in a sample of 49).
func TestStatesSARFitAgainstScipy(t *testing.T) {
	var r sarRefs
	testkit.LoadJSON(t, "scipy/sar_refs.json", &r)
	ar := loadAutocorrRefs(t)
	if len(r.IDs) != len(ar.IDs) {
		t.Fatalf("%d ids, %d in the autocorrelation references", len(r.IDs), len(ar.IDs))
	}
	for k := range r.IDs {
		if r.IDs[k] != ar.IDs[k] {
			t.Fatalf("area %d: %s, autocorrelation references %s", k, r.IDs[k], ar.IDs[k])
		}
	}
	p, err := sar.Prepare(statesQueen(t, ar), sar.Options{})
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := p.Interval()
	if !relClose(lo, r.Interval[0], 1e-10) || !relClose(hi, r.Interval[1], 1e-10) {
		t.Errorf("interval (%v, %v), scipy %v", lo, hi, r.Interval)
	}
	for key, want := range r.LogDet {
		rho, _ := strconv.ParseFloat(key, 64)
		if got, _ := p.LogDet(rho); math.Abs(got-want) > 1e-10*(1+math.Abs(want)) {
			t.Errorf("log-det at %v: %v, numpy %v", rho, got, want)
		}
	}
	for name, f := range r.Fits {
		m, err := p.Fit(f.Y)
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%s: ρ %.10f ± %.4f (scipy %.10f ± %.4f, information %.4f); ℓ differs by %.2g", name, m.Rho, m.RhoSE, f.Rho, f.RhoSEProfile, f.RhoSEInformation, m.LogLik-f.LogLik)
		if math.Abs(m.Rho-f.Rho) > 1e-9 || !relClose(m.Intercept, f.Intercept, 1e-8) ||
			!relClose(m.Sigma2, f.Sigma2, 1e-8) || !relClose(m.LogLik, f.LogLik, 1e-12) {
			t.Errorf("%s: ρ %v μ %v σ² %v ℓ %v; scipy %v %v %v %v", name, m.Rho, m.Intercept, m.Sigma2, m.LogLik,
				f.Rho, f.Intercept, f.Sigma2, f.LogLik)
		}
		if !relClose(m.RhoSE, f.RhoSEProfile, 1e-4) || !relClose(m.RhoSE, f.RhoSEInformation, 0.05) {
			t.Errorf("%s: SE %v, scipy %v (information %v)", name, m.RhoSE, f.RhoSEProfile, f.RhoSEInformation)
		}
	}
}
