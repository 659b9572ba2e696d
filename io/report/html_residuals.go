package report

import (
	"fmt"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/regress"
)

// residualsPage lays out `areatest residuals` as its text report does: the
// model and the areas used, the coefficients, the checks of the fit, what
// the residuals keep in space, and the reading.
func residualsPage(r *regress.Result) *page {
	f := r.Fit
	pg := &page{Title: "What does the model of " + r.Input.Outcome + " leave in space?", Command: "residuals", Version: r.Version,
		Read: r.Reading, Warnings: r.Warnings, Cautions: r.Cautions, Written: r.Written, Footer: "areatest " + r.Version}
	if r.Draws != nil {
		pg.Footer = fmt.Sprintf("seed %d · areatest %s", r.Draws.Seed, r.Version)
	}
	pg.Facts = []fact{{Label: "input", Value: r.Input.File},
		{Label: "areas", Value: numtext.Count(r.Input.Areas) + " read, " + numtext.Count(r.Input.Used) + " used"},
		{Label: "outcome", Value: r.Input.Outcome}, {Label: "covariates", Value: strings.Join(r.Input.Covariates, ", ")},
		weightsFact(r.Weights), {Label: "version", Value: "areatest " + r.Version}}
	if len(r.Excluded) > 0 {
		t := newTable("Areas left out of the fit", "reason", "#areas", "ids")
		for _, e := range r.Excluded {
			t.add(e.Reason, numtext.Count(e.Areas), idCells(e.IDs, e.Areas))
		}
		pg.section("Areas left out").add(table(t))
	}
	coef := newTable("Least-squares coefficients", "term", "#estimate", "#standard error", "#t", "#p")
	for _, c := range f.Coefficients {
		coef.add(c.Name, Number(c.Estimate), Number(c.SE), fmt.Sprintf("%.3f", c.T), PValue(c.P))
	}
	fit := pg.section("The fit")
	fit.add(table(coef), text(fmt.Sprintf("R² %.4f, adjusted R² %.4f; F = %s on %d and %d degrees of freedom, %s; residual standard error %s.",
		f.R2, f.AdjR2, Number(f.F), len(f.Coefficients)-1, f.DF, pEquals(f.FP), Number(f.SigmaHat))))
	for _, ind := range r.Indicators {
		fit.add(note(fmt.Sprintf("%s enters as %s against the baseline %q (%s).", ind.Column, strings.Join(ind.Terms, ", "), ind.Baseline, regress.LevelOrder)))
	}
	checks := newTable("Checks of the fit", "test", "#statistic", "#df", "#p")
	for _, t := range []struct {
		name string
		t    regress.Test
	}{{"Jarque–Bera (normal errors)", f.JarqueBera}, {"Breusch–Pagan (constant variance)", f.BreuschPagan}, {"Koenker (studentised Breusch–Pagan)", f.Koenker}} {
		checks.add(t.name, Number(t.t.Statistic), Number(t.t.DF), PValue(t.t.P))
	}
	sec := pg.section("Checks of the fit")
	sec.add(table(checks), text(fmt.Sprintf("Condition number of the scaled design %s.", Number(f.ConditionNumber))))
	for _, w := range f.Warnings {
		sec.add(note(w))
	}
	m := r.Moran
	moran := pg.section("What the residuals keep")
	exact := "not computed (above " + numtext.Count(regress.ExactLimit) + " areas)"
	if m.Exact {
		exact = PValue(m.ExactP)
	}
	moran.add(text(fmt.Sprintf("Moran's I of the residuals %s; its exact expected value under the model %s, variance %s; z = %.3f, normal p = %s (%s); exact p under normal errors: %s.",
		Number(m.I), Number(m.Mean), Number(m.Variance), m.Z, PValue(m.P), m.Alternative, exact)))
	if r.LM != nil {
		lm := newTable("Lagrange multiplier tests", "test", "#statistic", "#df", "#p")
		for _, t := range []struct {
			name string
			t    regress.Test
		}{{"error", r.LM.Error}, {"lag", r.LM.Lag}, {"robust error", r.LM.RobustError}, {"robust lag", r.LM.RobustLag}, {"joint", r.LM.Joint}} {
			lm.add(t.name, Number(t.t.Statistic), Number(t.t.DF), PValue(t.t.P))
		}
		moran.add(table(lm))
	} else if r.LMNotComputed != "" {
		moran.add(note("Lagrange multiplier tests not computed: " + r.LMNotComputed))
	}
	moran.add(note(regress.Caution))
	return pg
}
