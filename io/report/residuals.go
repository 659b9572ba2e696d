package report

import (
	"fmt"
	"io"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/regress"
)

// ResidualsText writes the report of a least-squares fit and what its
// residuals keep in space.
func ResidualsText(w io.Writer, r *regress.Result) error {
	var b strings.Builder
	residualsHeader(&b, r)
	residualsFit(&b, r)
	residualsChecks(&b, r)
	residualsMoran(&b, r)
	residualsLM(&b, r)
	writeWarnings(&b, r.Warnings)
	writeCautions(&b, r.Cautions)
	if len(r.Written) > 0 {
		fmt.Fprintf(&b, "\nwritten: %s\n", strings.Join(r.Written, ", "))
	}
	draws := "no random draws"
	if d := r.Draws; d != nil {
		draws = fmt.Sprintf("seed %d · %s shuffles per area for %s", d.Seed, numtext.Count(d.Permutations), d.For)
	}
	fmt.Fprintf(&b, "\n%s · areatest %s\n", draws, r.Version)
	_, err := io.WriteString(w, b.String())
	return err
}

// residualsHeader writes the question, the input, the areas left out, the
// terms of the model and the weights.
func residualsHeader(b *strings.Builder, r *regress.Result) {
	in := r.Input
	fmt.Fprintf(b, "areatest %s: what does a least-squares model of %s leave in space?\n\n", r.Version, in.Outcome)
	fmt.Fprintf(b, "  input       %s, %s areas, %s in the model\n", in.File, numtext.Count(in.Areas), numtext.Count(in.Used))
	fmt.Fprintf(b, "  outcome     %s\n", in.Outcome)
	fmt.Fprintf(b, "  covariates  %s\n", strings.Join(in.Covariates, ", "))
	for _, ind := range r.Indicators {
		b.WriteString(Wrap(fmt.Sprintf("%s is text: indicator %s, baseline %s (%s)", ind.Column,
			strings.Join(ind.Terms, ", "), ind.Baseline, regress.LevelOrder), width, "              ", "                "))
	}
	for i, e := range r.Excluded {
		head := "  left out   "
		if i > 0 {
			head = "             "
		}
		fmt.Fprintf(b, "%s %s: %s%s\n", head, e.Reason, areas(e.Areas), idListOf(first(e.IDs, 6), e.Areas))
	}
	s := r.Weights
	b.WriteString(Wrap(fmt.Sprintf("%s, %s; %s among the areas with data, %s without neighbours%s", s.Kind, s.Scaling,
		plural(s.Pairs, "neighbour pair", "neighbour pairs"), numtext.Count(s.Islands), islandFate(r)), width, "  weights     ", "              "))
	b.WriteString("\n")
}

// islandFate says what became of the areas without a neighbour.
func islandFate(r *regress.Result) string {
	switch {
	case r.IslandsKept > 0:
		return " (kept, with a zero spatial lag)"
	case r.IslandsLeftOut > 0:
		return " (left out of the fit and the tests)"
	}
	return ""
}

// residualsFit writes the coefficients and the summary of the fit.
func residualsFit(b *strings.Builder, r *regress.Result) {
	f := r.Fit
	fmt.Fprintf(b, "  Least-squares fit on %s (%s residual degrees of freedom)\n", areas(f.Areas), numtext.Count(f.DF))
	fmt.Fprintf(b, "  %-26s %12s %12s %9s %10s\n", "term", "estimate", "std. error", "t", "p")
	for _, c := range f.Coefficients {
		fmt.Fprintf(b, "  %-26s %12s %12s %9.3f %10s\n", truncate(c.Name, 26), Number(c.Estimate), Number(c.SE), c.T, PValue(c.P))
	}
	k := len(f.Coefficients) - 1
	fTest := "no covariate to test"
	if k > 0 {
		fTest = fmt.Sprintf("F %s on %d and %d df, %s", Number(f.F), k, f.DF, pEquals(f.FP))
	}
	fmt.Fprintf(b, "  R² %.3f · adjusted R² %.3f · %s · residual SE %s\n\n", f.R2, f.AdjR2, fTest, Number(f.SigmaHat))
}

// residualsChecks writes the collinearity figures and the tests of the
// errors that need no graph.
func residualsChecks(b *strings.Builder, r *regress.Result) {
	f := r.Fit
	fmt.Fprintf(b, "  Collinearity: condition number %.1f (rules of thumb, not tests: a concern over %d,\n  and a variance inflation factor over %d)\n",
		f.ConditionNumber, regress.ConditionLimit, regress.VIFLimit)
	var vifs []string
	for j, v := range f.VIF {
		vifs = append(vifs, fmt.Sprintf("%s %.2f", f.Coefficients[j+1].Name, v))
	}
	if len(vifs) > 0 {
		b.WriteString(Wrap("variance inflation: "+strings.Join(vifs, ", "), width, "  ", "    "))
	}
	b.WriteString("\n")
	fmt.Fprintf(b, "  %-50s %10s %4s %10s\n", "the errors", "statistic", "df", "p")
	for _, t := range []struct {
		name string
		t    regress.Test
	}{
		{"normal (Jarque–Bera)", f.JarqueBera},
		{"one variance (Breusch–Pagan)", f.BreuschPagan},
		{"one variance, not assuming normal (Koenker)", f.Koenker},
	} {
		testRow(b, t.name, t.t, 50)
	}
	b.WriteString("\n")
}

// testRow writes a test statistic with its degrees of freedom and p.
func testRow(b *strings.Builder, name string, t regress.Test, w int) {
	fmt.Fprintf(b, "  %-*s %10s %4g %10s\n", w, name, Number(t.Statistic), t.DF, PValue(t.P))
}

// residualsMoran writes Moran's I of the residuals with its exact moments
// and p-values.
func residualsMoran(b *strings.Builder, r *regress.Result) {
	m := r.Moran
	fmt.Fprintf(b, "  Moran's I of the residuals: %.4f\n", m.I)
	b.WriteString(Wrap(fmt.Sprintf("with independent normal errors its mean is %.4f and its variance %s (exact for this design and graph): z %.2f",
		m.Mean, Number(m.Variance), m.Z), width, "  ", "  "))
	exact := "the exact p-value is computed up to " + numtext.Count(regress.ExactLimit) + " areas only"
	switch {
	case m.Exact && m.ExactP < 1e-10:
		exact = "exact (Imhof 1961): below 1e-10"
	case m.Exact:
		exact = "exact (Imhof 1961): " + PValue(m.ExactP)
	}
	b.WriteString(Wrap(fmt.Sprintf("p (%s): %s by the normal approximation; %s", m.Alternative, PValue(m.P), exact), width, "  ", "  "))
	b.WriteString("\n")
}

// residualsLM writes the Lagrange multiplier tests and their reading.
func residualsLM(b *strings.Builder, r *regress.Result) {
	if lm := r.LM; lm != nil {
		fmt.Fprintf(b, "  %-30s %10s %4s %10s\n", "Lagrange multiplier test", "statistic", "df", "p")
		for _, t := range []struct {
			name string
			t    regress.Test
		}{
			{"error", lm.Error}, {"lag", lm.Lag}, {"robust error", lm.RobustError}, {"robust lag", lm.RobustLag}, {"joint (error and lag)", lm.Joint},
		} {
			testRow(b, t.name, t.t, 30)
		}
		b.WriteString("\n")
	}
	b.WriteString(Wrap(r.Reading, width, "  → ", "    "))
	b.WriteString("\n")
}
