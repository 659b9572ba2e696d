package report

import (
	"strings"
	"testing"

	"github.com/areatest/areatest/spatial/regress"
)

// residualsResult is a made-up result of a fit on one covariate.
func residualsResult() *regress.Result {
	return &regress.Result{Version: "9.9", Input: regress.Inputs{File: "f.geojson", Areas: 2000, Used: 1990, Outcome: "y", Covariates: []string{"x"}},
		Fit: &regress.Fit{Areas: 1990, DF: 1988, Coefficients: []regress.Coefficient{{Name: "intercept"}, {Name: "x"}},
			Collinearity: regress.Collinearity{VIF: []float64{1}}},
		Moran:    regress.ResidualMoran{I: 0.1, Alternative: "two-sided", P: 0.0123},
		LM:       &regress.LM{Error: regress.Test{Statistic: 12, DF: 1, P: 0.0005}},
		Reading:  "the reading",
		Warnings: []string{}, Cautions: regress.Cautions}
}

// The parts of the report that depend on the result: the exact p-value
// (computed, tiny, or not computed above the limit), the LM table or why
// it is missing, and the random draws or their absence.
func TestResidualsTextBranches(t *testing.T) {
	for _, c := range []struct {
		name      string
		edit      func(r *regress.Result)
		want, not []string
	}{
		{"above the exact limit", func(r *regress.Result) {},
			[]string{"p (two-sided): 0.0123 by the normal approximation; the exact p-value is computed up to 1,500 areas only",
				"error 12 1 0.0005", "no random draws · areatest 9.9"}, []string{"Imhof"}},
		{"exact", func(r *regress.Result) { r.Moran.Exact, r.Moran.ExactP = true, 0.0234 },
			[]string{"exact (Imhof 1961): 0.0234"}, []string{"computed up to"}},
		{"exact and tiny", func(r *regress.Result) { r.Moran.Exact, r.Moran.ExactP = true, 3e-13 },
			[]string{"exact (Imhof 1961): below 1e-10"}, nil},
		{"no LM tests", func(r *regress.Result) {
			r.LM, r.Reading = nil, "The Lagrange multiplier tests are not computed: because."
		},
			[]string{"→ The Lagrange multiplier tests are not computed: because."}, []string{"Lagrange multiplier test statistic"}},
		{"draws and files", func(r *regress.Result) {
			r.Draws = &regress.Draws{Seed: 7, Permutations: 999, For: "a map"}
			r.Written = []string{"a.svg"}
		}, []string{"written: a.svg seed 7 · 999 shuffles per area for a map · areatest 9.9\n"}, []string{"no random draws"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			r := residualsResult()
			c.edit(r)
			var b strings.Builder
			if err := ResidualsText(&b, r); err != nil {
				t.Fatal(err)
			}
			// Compared word by word: where lines wrap is the layout's
			// business.
			words := func(s string) string { return strings.Join(strings.Fields(s), " ") }
			for _, w := range c.want {
				if !strings.Contains(words(b.String()), words(w)) {
					t.Errorf("report lacks %q:\n%s", w, b.String())
				}
			}
			for _, w := range c.not {
				if strings.Contains(words(b.String()), words(w)) {
					t.Errorf("report has %q", w)
				}
			}
		})
	}
}
