package report

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/spatial/compare"
)

// Nulls draws the null distribution of every row of the comparison, one
// panel each on the statistic's axis with the observed value marked and
// the row's p-value written in, and below them the false-positive check of
// every row whose rate was measured.
func (p ComparePictures) Nulls(w io.Writer, f figure.Format) error {
	r := p.Result
	if len(r.Tests) == 0 {
		return errors.New("the comparison ran no null model")
	}
	var panels []figure.NullPanel
	var rates []figure.RateRow
	alpha := 0.0
	skipped := ""
	for _, t := range r.Tests {
		if r.Rates != nil && t.Scheme == compare.SpectralScheme {
			// Its statistic is of the empirical-Bayes scores, not of the
			// pooled rates on this axis.
			skipped = "; the spectral row tests the empirical-Bayes scores and is not drawn"
			continue
		}
		if len(t.Null) == 0 {
			return fmt.Errorf("the comparison kept no null values of %q (compare.Options.KeepNull)", t.Scheme)
		}
		panels = append(panels, figure.NullPanel{Name: t.Scheme, Detail: nullDetail(t), Null: t.Null})
		if fp := t.FalsePositives; fp != nil {
			rates = append(rates, rateRow(t))
			alpha = fp.Alpha
		}
	}
	opt := figure.NullOptions{ChartOptions: figure.ChartOptions{
		Title:    "The observed " + statisticName(r) + " against each null model",
		Subtitle: fmt.Sprintf("%s by %s; %s p-values; each panel counts its own draws%s", r.Input.Outcome, r.Input.Group, r.Tests[0].Alternative, skipped),
		XLabel:   statisticAxis(r), Note: p.note()}, Alpha: alpha}
	if len(rates) > 0 {
		opt.CheckTitle = fmt.Sprintf("False-positive check: outcomes with the spatial pattern of %s and no link to %s", r.NullPattern(), r.Input.Group)
		opt.CheckLabel = fmt.Sprintf("share called significant at the %g level (a sound test: %g%%)", alpha, 100*alpha)
	}
	return figure.NullPanels(w, f, panels, r.Tests[0].Observed, rates, opt)
}

// nullDetail is a panel's p-value and draws: "p = 0.0004 · 9,999
// shuffles", or every arrangement for an exact test.
func nullDetail(t compare.TestRow) string {
	what := "shuffles"
	if t.Scheme == compare.SpectralScheme {
		what = "surrogates"
	}
	if t.Exact {
		return fmt.Sprintf("%s · exact: all %s arrangements", pEquals(t.PValue), numtext.Count(t.Permutations))
	}
	return fmt.Sprintf("%s · %s %s", pEquals(t.PValue), numtext.Count(t.Permutations), what)
}

// rateRow is a row's measured false-positive rate, worded as in the text
// report.
func rateRow(t compare.TestRow) figure.RateRow {
	fp := t.FalsePositives
	of := "surrogates"
	if t.Scheme == compare.SpectralScheme {
		of = "SAR outcomes"
	}
	detail := fmt.Sprintf("%s (%s–%s) of %s %s", percent(fp.Rate), strings.TrimSuffix(percent(fp.Interval[0]), "%"), percent(fp.Interval[1]),
		numtext.Count(fp.Surrogates), of)
	if t.Unsound() {
		detail += " · too many"
	}
	return figure.RateRow{Name: t.Scheme, Detail: detail, Rate: fp.Rate, Interval: fp.Interval, Unsound: t.Unsound()}
}

// statisticName is what the rows test: the group statistic, or with
// covariates the adjusted one.
func statisticName(r *compare.Result) string {
	if a := r.Adjusted; a != nil {
		return a.Statistic
	}
	return r.Statistic.Label
}

// statisticAxis names the statistic and its units for the shared axis.
func statisticAxis(r *compare.Result) string {
	s := r.Statistic
	switch {
	case r.Adjusted != nil:
		return fmt.Sprintf("%s, adjusted for %s", r.Adjusted.Statistic, strings.Join(r.Adjusted.Covariates, ", "))
	case len(s.Contrast) == 2 && s.InOutcomeUnits:
		return fmt.Sprintf("%s, %s − %s (units of %s)", s.Label, s.Contrast[0], s.Contrast[1], r.Input.Outcome)
	case len(s.Contrast) == 2:
		return fmt.Sprintf("%s, %s against %s", s.Label, s.Contrast[0], s.Contrast[1])
	}
	return fmt.Sprintf("%s across %d groups", s.Label, len(r.Groups))
}
