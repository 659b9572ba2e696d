package report

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/compare"
)

const width = 88

// CompareText writes the plain text report of a comparison.
func CompareText(w io.Writer, r *compare.Result) error {
	var b strings.Builder
	compareHeader(&b, r)
	compareGroups(&b, r)
	compareTests(&b, r)
	compareChecks(&b, r)
	compareAdvice(&b, r)
	fmt.Fprintf(&b, "\nseed %d · %s shuffles per scheme · areatest %s\n", r.Seed, numtext.Count(permutationsAsked(r)), r.Version)
	_, err := io.WriteString(w, b.String())
	return err
}

// compareHeader writes the question, the input and the areas left out.
func compareHeader(b *strings.Builder, r *compare.Result) {
	fmt.Fprintf(b, "areatest %s: does %s differ between the groups of %s?\n\n", r.Version, r.Input.Outcome, r.Input.Group)
	fmt.Fprintf(b, "  input      %s, %s areas, %s tested\n", r.Input.File, numtext.Count(r.Input.Areas), numtext.Count(r.Input.Tested))
	fmt.Fprintf(b, "  outcome    %s\n", r.Input.Outcome)
	fmt.Fprintf(b, "  groups     %s\n", r.Input.Group)
	if r.Input.Strata != "" {
		fmt.Fprintf(b, "  strata     %s\n", r.Input.Strata)
	}
	for i, e := range r.Excluded {
		head := "  left out  "
		if i > 0 {
			head = "            "
		}
		fmt.Fprintf(b, "%s %s: %s%s\n", head, e.Reason, areas(e.Areas), idListOf(first(e.IDs, 6), e.Areas))
	}
	b.WriteString("\n")
}

// compareGroups writes the table of groups and the observed statistic.
func compareGroups(b *strings.Builder, r *compare.Result) {
	if r.Rates != nil {
		rateGroups(b, r)
		return
	}
	fmt.Fprintf(b, "  %-22s %7s %12s %12s %12s\n", r.Input.Group, "areas", "median", "mean", "sd")
	for _, g := range r.Groups {
		fmt.Fprintf(b, "  %-22s %7s %12s %12s %12s\n", truncate(g.Level, 22), numtext.Count(g.Areas), Number(g.Median), Number(g.Mean), Number(g.SD))
	}
	b.WriteString("\n")
	fmt.Fprintf(b, "  %s\n\n", statisticSentence(r))
}

// statisticSentence names the group statistic and gives its observed
// value, for the text report and the page.
func statisticSentence(r *compare.Result) string {
	s := r.Statistic
	switch {
	case len(s.Contrast) == 2 && s.InOutcomeUnits:
		return fmt.Sprintf("%s, %s − %s: %s (units of %s)", capitalise(s.Label), s.Contrast[0], s.Contrast[1], Number(s.Observed), r.Input.Outcome)
	case len(s.Contrast) == 2:
		return fmt.Sprintf("%s, %s against %s: %s", capitalise(s.Label), s.Contrast[0], s.Contrast[1], Number(s.Observed))
	}
	return fmt.Sprintf("%s across %d groups: %s", capitalise(s.Label), len(r.Groups), Number(s.Observed))
}

// compareTests writes the covariate adjustment and the table of null
// models with its footnote.
func compareTests(b *strings.Builder, r *compare.Result) {
	if r.Adjusted != nil {
		b.WriteString(Wrap(adjustedSentence(r.Adjusted), width, "  ", "  "))
		b.WriteString("\n")
	}
	if r.FalsePositiveRate != nil {
		testTableWithRates(b, r)
	} else {
		fmt.Fprintf(b, "  %-30s %10s   %-21s %12s\n", "null model", "p-value", "95% interval", "draws")
		for _, t := range r.Tests {
			interval, count := testCells(t)
			fmt.Fprintf(b, "  %-30s %10s   %-21s %12s\n", truncate(t.Scheme, 30), PValue(t.PValue), interval, count)
		}
	}
	if len(r.Tests) > 0 {
		b.WriteString(Wrap(testFootnote(r), width, "  ", "  "))
	}
	b.WriteString("\n")
}

// testCells writes a row's interval and its count of draws.
func testCells(t compare.TestRow) (interval, count string) {
	interval = "exact"
	count = numtext.Count(t.Permutations)
	if !t.Exact {
		interval = bound(t.Interval[0]) + " to " + bound(t.Interval[1])
	} else {
		count += " (all)"
	}
	return interval, count
}

// testTableWithRates writes the table of null models with each
// label-shuffle row's measured false-positive rate, and under a row whose
// rate lies above alpha the mark that says so.
func testTableWithRates(b *strings.Builder, r *compare.Result) {
	fmt.Fprintf(b, "  %-26s %8s   %-18s %9s   %s\n", "null model", "p-value", "95% interval", "draws", "false positives")
	for _, t := range r.Tests {
		interval, count := testCells(t)
		fmt.Fprintf(b, "  %-26s %8s   %-18s %9s   %s\n", truncate(t.Scheme, 26), PValue(t.PValue), interval, count, rateCell(t))
		if mark := unsoundMark(t); mark != "" {
			b.WriteString(Wrap(mark, width, "    ! ", "      "))
		}
		if c := calibratedMark(t); c != "" {
			b.WriteString(Wrap(c, width, "    ~ ", "      "))
		}
	}
}

// adjustedSentence describes the covariate adjustment.
func adjustedSentence(a *compare.CovariateInfo) string {
	return fmt.Sprintf("Adjusted for %s (Freedman & Lane 1983): %s = %s, classical %s. The shuffles below test this adjusted statistic.",
		strings.Join(a.Covariates, ", "), a.Statistic, Number(a.Observed), pEquals(a.ClassicalP))
}

// rateCell writes a row's measured false-positive rate with its interval.
func rateCell(t compare.TestRow) string {
	f := t.FalsePositives
	if f == nil {
		return "not measured"
	}
	return fmt.Sprintf("%s (%s–%s)", percent(f.Rate), strings.TrimSuffix(percent(f.Interval[0]), "%"), percent(f.Interval[1]))
}

// unsoundMark is the warning under a row whose rate lies above alpha, ""
// for a sound row.
func unsoundMark(t compare.TestRow) string {
	if !t.Unsound() {
		return ""
	}
	mark := "too many false positives here: " + percent(t.FalsePositives.Rate) + ", do not read this p-value"
	if strings.HasSuffix(t.Scheme, "automatic zones") {
		mark += "; give strata of your own"
	}
	return mark
}

// calibratedMark gives the spectral row's calibrated p-value when its
// rate lies above alpha, "" otherwise.
func calibratedMark(t compare.TestRow) string {
	c := t.Calibrated
	if c == nil || t.FalsePositives.Rate <= t.FalsePositives.Alpha {
		return ""
	}
	level := fmt.Sprintf("rejects %g%% of its nulls at p ≤ %s", 100*c.Alpha, PValue(c.Level))
	if c.Level == 0 {
		level = fmt.Sprintf("no threshold rejects as few as %g%% of its nulls", 100*c.Alpha)
	}
	return fmt.Sprintf("calibrated to the SAR null: p = %s (%s)", PValue(c.PValue), level)
}

// sarCheckText says how the spectral surrogates' own rate was measured,
// or why it was not.
func sarCheckText(r *compare.Result) string {
	s := r.SARCheck
	switch {
	case s == nil:
		return "The spectral surrogates' own rate is not measured here."
	case s.Skipped != "":
		return "The spectral surrogates' own rate is not measured here: the SAR check could not run (" + s.Skipped + ")."
	}
	bound := ""
	if s.AtBound {
		bound = ", at the end of its range"
	}
	return fmt.Sprintf("The spectral surrogates' rate is measured on %s outcomes simulated from the simultaneous autoregressive model fitted to %s (ρ = %.3f ± %.3f%s, maximum likelihood, log-determinant by %s), each tested against %s surrogates of its own; surrogates of the data would be circular.",
		numtext.Count(s.Simulations), r.NullPattern(), s.Rho, s.RhoSE, bound, s.LogDet, numtext.Count(s.Surrogates))
}

// percent writes a share as a percentage, with a decimal below 10%.
func percent(x float64) string {
	if 100*x < 9.95 {
		return fmt.Sprintf("%.1f%%", 100*x)
	}
	return fmt.Sprintf("%.0f%%", 100*x)
}

// compareChecks writes the false-positive check, the effective sample size
// and the spatial check.
func compareChecks(b *strings.Builder, r *compare.Result) {
	if r.FalsePositiveRate != nil {
		b.WriteString(Wrap(falsePositiveSentence(r), width, "  ", "  "))
		b.WriteString("\n")
	}
	if r.EffectiveSampleSize != nil {
		b.WriteString(Wrap(effectiveSentence(r), width, "  ", "  "))
		b.WriteString("\n")
	}
	a := r.Autocorrelation
	fmt.Fprintf(b, "  Spatial check: Moran's I, %s\n", spatialCheckWeights(r))
	fmt.Fprintf(b, "  (%s)\n", spatialCheckGraph(r))
	if a.Outcome.Variable != "" {
		fmt.Fprintf(b, "  %-24s %10s %10s %10s\n", "variable", "Moran's I", "expected", "p-value")
		for _, m := range append([]compare.VariableMoran{a.Outcome}, a.Group...) {
			fmt.Fprintf(b, "  %-24s %10.3f %10.3f %10s\n", truncate(m.Variable, 24), m.MoransI, m.Expected, PValue(m.PValue))
		}
	}
	b.WriteString("\n")
}

// falsePositiveSentence says how the false-positive rates were measured.
func falsePositiveSentence(r *compare.Result) string {
	f := r.FalsePositiveRate
	return fmt.Sprintf("False-positive check: on %s surrogate outcomes with the spatial pattern of %s and no link to %s, each label shuffle above (%s shuffles each) called the share under \"false positives\" significant at the %g level, with its 95%% interval; a sound test calls %g%%. %s",
		numtext.Count(f.Surrogates), r.NullPattern(), r.Input.Group, numtext.Count(f.Permutations), f.Alpha, 100*f.Alpha, sarCheckText(r))
}

// effectiveSentence gives the modified t-test's effective sample size.
func effectiveSentence(r *compare.Result) string {
	e := r.EffectiveSampleSize
	subject := r.Input.Group + "=" + e.Level
	text := fmt.Sprintf("Effective sample size (modified t-test, Dutilleul 1993): the %s areas carry about %s areas' worth of independent information on %s and %s. Modified t = %s on %.1f degrees of freedom, %s; the ordinary t-test, which counts every area as independent, gives %s. This tests the difference in means.",
		numtext.Count(e.Areas), numtext.Count(int(math.Round(e.EffectiveSampleSize))), r.Input.Outcome, subject, Number(e.T), e.DF, pEquals(e.PValue), pEquals(e.OrdinaryPValue))
	if e.Capped {
		text += " (The estimate reached the number of areas, so no reduction was applied.)"
	}
	if e.Note != "" {
		text += " With more than two groups: " + e.Note + "."
	}
	return text
}

// spatialCheckWeights names the weights of the spatial check.
func spatialCheckWeights(r *compare.Result) string {
	return r.Weights.Scaling + " " + r.Weights.Kind + " weights"
}

// spatialCheckGraph sums up the graph of the spatial check.
func spatialCheckGraph(r *compare.Result) string {
	return fmt.Sprintf("%s areas, %s neighbour pairs, %s without neighbours%s", numtext.Count(r.Weights.Areas), numtext.Count(r.Weights.Pairs),
		numtext.Count(r.Weights.Islands), idListOf(first(r.Weights.IslandIDs, 6), r.Weights.Islands))
}

// readSentence is the recommendation: the p-value to read and why.
func readSentence(r *compare.Result) string {
	return fmt.Sprintf("Read: %s, %s. %s", r.Recommended.Scheme, pEquals(r.Recommended.PValue), r.Recommended.Reason)
}

// compareAdvice writes the p-value to read, the warnings and the cautions.
func compareAdvice(b *strings.Builder, r *compare.Result) {
	if r.Recommended.Scheme != "" {
		b.WriteString(Wrap(readSentence(r), width, "  → ", "    "))
		b.WriteString("\n")
	}
	if len(r.Warnings) > 0 {
		b.WriteString("Warnings\n")
		for _, wn := range r.Warnings {
			b.WriteString(Wrap(wn, width, "  ! ", "    "))
		}
		b.WriteString("\n")
	}
	b.WriteString("Keep in mind\n")
	for _, c := range r.Cautions {
		b.WriteString(Wrap(c, width, "  - ", "    "))
	}
}

func testFootnote(r *compare.Result) string {
	t := r.Tests[0]
	side := map[string]string{
		"two-sided": "Two-sided: twice the smaller one-sided p-value.",
		"greater":   "One-sided: shuffles with a statistic at least as large as observed.",
		"less":      "One-sided: shuffles with a statistic at most as large as observed.",
	}[t.Alternative]
	if len(r.Statistic.Contrast) == 0 {
		side = "One-sided by nature: only large values of " + r.Statistic.Label + " are evidence."
	}
	note := side + " Monte Carlo p = (1 + draws as extreme) / (1 + draws), with a 95% Clopper–Pearson interval for the p-value all arrangements would give; \"exact\" means every distinct arrangement was counted. Spectral surrogates are outcomes with the same mean, variance and Moran's I as the data but no link to the grouping (Wagner & Dray 2015)."
	return note
}

func permutationsAsked(r *compare.Result) int {
	for _, t := range r.Tests {
		if !t.Exact {
			return t.Permutations
		}
	}
	if r.Autocorrelation.Outcome.Permutations > 0 && !r.Autocorrelation.Outcome.Exact {
		return r.Autocorrelation.Outcome.Permutations
	}
	if len(r.Tests) > 0 {
		return r.Tests[0].Permutations
	}
	return 0
}

// pEquals writes "p = 0.0123", or "p < 1e-15" far in a tail.
func pEquals(p float64) string {
	if p == 0 {
		return "p < 1e-15"
	}
	return "p = " + PValue(p)
}

// bound writes an end of a p-value interval; 0 is a true end there, not
// an underflow.
func bound(p float64) string {
	if p == 0 {
		return "0"
	}
	return PValue(p)
}

// areas writes "1 area" or "12 areas".
func areas(n int) string { return plural(n, "area", "areas") }

func idList(ids []string, max int) string {
	if len(ids) == 0 {
		return ""
	}
	if len(ids) <= max {
		return " (" + strings.Join(ids, ", ") + ")"
	}
	return fmt.Sprintf(" (%s and %d more)", strings.Join(ids[:max], ", "), len(ids)-max)
}

func truncate(s string, n int) string {
	r := []rune(s)
	if len(r) <= n {
		return s
	}
	return string(r[:n-1]) + "…"
}

func capitalise(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// rateGroups writes the groups' pooled rates, the median area rate and the
// observed statistic of a comparison of rates.
func rateGroups(b *strings.Builder, r *compare.Result) {
	rt := r.Rates
	per := "per " + numtext.Count(int(rt.Per))
	fmt.Fprintf(b, "  %-22s %7s %12s %14s %14s %14s\n", r.Input.Group, "areas", rt.Events, rt.Population, "pooled rate", "median rate")
	for k, g := range rt.Groups {
		median := ""
		if k < len(r.Groups) {
			median = Number(r.Groups[k].Median * rt.Per)
		}
		fmt.Fprintf(b, "  %-22s %7s %12s %14s %14s %14s\n", truncate(g.Level, 22), numtext.Count(g.Areas), Number(g.Events), Number(g.Population), Number(g.PerRate), median)
	}
	fmt.Fprintf(b, "  %-22s %7s %12s %14s %14s\n", "all tested areas", numtext.Count(r.Input.Tested), "", "", Number(rt.MapRate))
	fmt.Fprintf(b, "  (rates %s)\n\n", per)
	s := r.Statistic
	if len(s.Contrast) == 2 {
		fmt.Fprintf(b, "  %s, %s against %s: %s\n", capitalise(s.Label), s.Contrast[0], s.Contrast[1], Number(s.Observed))
	} else {
		fmt.Fprintf(b, "  %s across %d groups: %s\n", capitalise(s.Label), len(r.Groups), Number(s.Observed))
	}
	b.WriteString(Wrap(rt.Spatial, width, "  ", "  "))
	b.WriteString("\n")
}
