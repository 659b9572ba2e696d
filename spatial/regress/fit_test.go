package regress

import (
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// A fit recovers an exact linear relation, and its fitted values and
// residuals add up to the outcome.
func TestOLSExactFit(t *testing.T) {
	x := [][]float64{{1, 2, 3, 4, 5, 6}, {0, 1, 0, 1, 0, 2}}
	y := make([]float64, 6)
	noise := []float64{0.01, -0.02, 0.01, 0.02, -0.01, -0.01}
	for i := range y {
		y[i] = 3 - 2*x[0][i] + 0.5*x[1][i] + noise[i]
	}
	f, err := OLS(y, x, []string{"a", "b"})
	if err != nil {
		t.Fatal(err)
	}
	if f.Coefficients[0].Name != "intercept" || f.Coefficients[2].Name != "b" || f.DF != 3 {
		t.Errorf("names %+v, df %d", f.Coefficients, f.DF)
	}
	for j, want := range []float64{3, -2, 0.5} {
		if math.Abs(f.Coefficients[j].Estimate-want) > 0.05 {
			t.Errorf("coefficient %d: %v, want about %v", j, f.Coefficients[j].Estimate, want)
		}
	}
	for i := range y {
		if math.Abs(f.Fitted[i]+f.Residuals[i]-y[i]) > 1e-12 {
			t.Fatalf("area %d: fitted + residual ≠ outcome", i)
		}
	}
	if f.R2 < 0.999 || f.FP > 1e-4 {
		t.Errorf("R² %v, F p %v", f.R2, f.FP)
	}
}

// Bad inputs give typed errors.
func TestOLSRejects(t *testing.T) {
	y := []float64{1, 2, 4, 3, 5}
	cases := []struct {
		name  string
		y     []float64
		x     [][]float64
		names []string
		check func(error) bool
	}{
		{"too few", y[:2], [][]float64{{1, 2}}, nil, func(e error) bool { var v *TooFewAreasError; return errors.As(e, &v) && v.Coefficients == 2 }},
		{"constant covariate", y, [][]float64{{1, 1, 1, 1, 1}}, []string{"c"}, func(e error) bool { var v *CollinearError; return errors.As(e, &v) && v.Covariate == "c" }},
		{"combination", y, [][]float64{{1, 2, 3, 4, 6}, {2, 4, 6, 8, 12}}, []string{"a", "twice a"}, func(e error) bool {
			var v *CollinearError
			return errors.As(e, &v) && v.Covariate == "twice a"
		}},
		{"NaN", []float64{1, 2, math.NaN(), 3, 4}, nil, nil, func(e error) bool { var v *ValueError; return errors.As(e, &v) && v.Index == 2 }},
		{"infinite covariate", y, [][]float64{{1, 2, math.Inf(1), 3, 4}}, nil, func(e error) bool { var v *ValueError; return errors.As(e, &v) && v.Column == "x1" }},
		{"short covariate", y, [][]float64{{1, 2}}, nil, func(e error) bool { var v *ValueError; return errors.As(e, &v) && v.Index < 0 }},
		{"names", y, [][]float64{{1, 2, 3, 5, 4}}, []string{"a", "b"}, func(e error) bool { var v *ValueError; return errors.As(e, &v) }},
		{"constant outcome", []float64{2, 2, 2, 2, 2}, nil, nil, func(e error) bool { var v *ValueError; return errors.As(e, &v) && v.Column == "outcome" }},
	}
	for _, c := range cases {
		_, err := OLS(c.y, c.x, c.names)
		if err == nil || !c.check(err) {
			t.Errorf("%s: error %v", c.name, err)
		}
	}
	f := mustOLS(t, y, nil)
	if _, err := f.Moran(lattice(2, 3), shuffle.Greater); err == nil {
		t.Error("graph of 6 areas for a fit of 5 accepted")
	}
}

// Nearly collinear covariates raise the VIFs and the condition number over
// the rules of thumb, and the warnings say so and say they are rules of
// thumb; independent ones raise none.
func TestCollinearityWarnings(t *testing.T) {
	cols := design(10, 10, 5, 43)[2:]
	x := cols[:2]
	f := mustOLS(t, outcome(x, cols[2]), x)
	if len(f.Warnings) != 0 || f.VIF[0] > 2 {
		t.Errorf("independent covariates: VIF %v, warnings %q", f.VIF, f.Warnings)
	}
	near := make([]float64, 100)
	for i := range near {
		near[i] = x[0][i] + 0.01*cols[2][i]
	}
	x = [][]float64{x[0], x[1], near}
	f = mustOLS(t, outcome(x, cols[1]), x)
	if f.VIF[2] < 1000 || f.ConditionNumber < 100 || len(f.Warnings) != 3 {
		t.Fatalf("VIF %v, condition %v, warnings %q", f.VIF, f.ConditionNumber, f.Warnings)
	}
	for _, w := range f.Warnings {
		if !strings.Contains(w, "rule of thumb") {
			t.Errorf("warning %q does not say it is a rule of thumb", w)
		}
	}
}

// The decision rule, case by case, and the caution in every reading.
func TestSuggestAndReading(t *testing.T) {
	p := func(v float64) Test { return Test{Statistic: 1, DF: 1, P: v} }
	cases := []struct {
		lm   LM
		want Suggestion
	}{
		{LM{Error: p(0.3), Lag: p(0.2), RobustError: p(0.01), RobustLag: p(0.5)}, NoDependence},
		{LM{Error: p(0.01), Lag: p(0.2)}, ErrorModel},
		{LM{Error: p(0.2), Lag: p(0.01)}, LagModel},
		{LM{Error: p(0.01), Lag: p(0.01), RobustError: p(0.01), RobustLag: p(0.4)}, ErrorModel},
		{LM{Error: p(0.01), Lag: p(0.01), RobustError: p(0.4), RobustLag: p(0.01)}, LagModel},
		{LM{Error: p(0.01), Lag: p(0.01), RobustError: p(0.01), RobustLag: p(0.02)}, BothKinds},
		{LM{Error: p(0.01), Lag: p(0.01), RobustError: p(0.3), RobustLag: p(0.2)}, Unclear},
	}
	for _, c := range cases {
		if got := Suggest(c.lm, 0.05); got != c.want {
			t.Errorf("%+v: %v, want %v", c.lm, got, c.want)
		}
		r := Reading(c.lm, 0.05)
		if !strings.HasSuffix(r, Caution) {
			t.Errorf("reading without the caution: %q", r)
		}
	}
	both := LM{Error: p(0.01), Lag: p(0.01), RobustError: Test{Statistic: 9, P: 0.003}, RobustLag: Test{Statistic: 5, P: 0.02}}
	if r := Reading(both, 0.05); !strings.Contains(r, "the error term is the stronger") {
		t.Errorf("both kinds: %q", r)
	}
}
