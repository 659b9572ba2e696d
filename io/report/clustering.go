package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/clustering"
)

// AutocorrText writes the plain text report of `areatest autocorr`.
func AutocorrText(w io.Writer, r *clustering.Result) error {
	var b strings.Builder
	fmt.Fprintf(&b, "areatest %s: do these variables cluster in space?\n\n", r.Version)
	fmt.Fprintf(&b, "  input      %s, %s areas\n", r.Input, numtext.Count(r.Areas))
	fmt.Fprintf(&b, "  weights    %s, %s; %s, %s without neighbours%s\n\n", r.Weights.Kind, r.Weights.Scaling,
		plural(r.Weights.Pairs, "neighbour pair", "neighbour pairs"), numtext.Count(r.Weights.Islands), idListOf(first(r.Weights.IslandIDs, 6), r.Weights.Islands))
	for _, v := range r.Variables {
		variableText(&b, v)
	}
	for _, j := range r.Joins {
		joinsText(&b, j)
	}
	if rt := r.Rate; rt != nil {
		rateText(&b, rt)
	}
	b.WriteString(Wrap(autocorrFootnote, width, "  ", "  "))
	b.WriteString("\n")
	writeWarnings(&b, r.Warnings)
	writeCautions(&b, r.Cautions)
	fmt.Fprintf(&b, "\nseed %d · %s shuffles per test · areatest %s\n", r.Seed, numtext.Count(r.Shuffles()), r.Version)
	_, err := io.WriteString(w, b.String())
	return err
}

// autocorrFootnote says what the columns of autocorr's tables are.
const autocorrFootnote = "z is under randomisation; \"p normal\" and \"p random\" are the normal approximations under the normality and randomisation hypotheses (Cliff & Ord 1981), \"p shuffle\" the permutation p-value (1 + b)/(1 + B). Geary's C below 1 and Moran's I above its expected value mean neighbours are alike."

// joinsNote says how clustering shows in join counts.
const joinsNote = "Clustering shows as more same-category joins and fewer different-category joins than expected."

// screenFootnote says how to read the screen's ranking.
const screenFootnote = "A small adjusted p-value says the column clusters more than a random arrangement of its values would; Moran's I says how strongly. The ranking is a screen, not a conclusion: look at the maps and the data before modelling."

// statisticHead writes the column heads of statistic lines.
func statisticHead(b *strings.Builder) {
	fmt.Fprintf(b, "  %-12s %9s %9s %9s %10s %10s %10s\n", "", "value", "expected", "z", "p normal", "p random", "p shuffle")
}

// statisticLine writes one statistic; withNormal shows its p-value under
// normality, where it has one.
func statisticLine(b *strings.Builder, name string, s clustering.Statistic, withNormal bool) {
	pn := "–"
	if withNormal {
		pn = PValue(s.PNormality)
	}
	fmt.Fprintf(b, "  %-12s %9s %9s %9s %10s %10s %10s\n", name, Number(s.Value), Number(s.Expected),
		Number(s.ZRandomisation), pn, PValue(s.PRandomisation), PValue(s.Permutation.PValue))
}

// rangeSentence reads Moran's I against the range it can take, and says
// how the range was found: a dense one is exact, a Lanczos one is stated
// with its tolerance or as approximate.
func rangeSentence(v clustering.Variable) string {
	if v.Bounds == nil {
		return "The range of Moran's I on these weights was not computed (" + v.RangeSkipped + ")."
	}
	share, towardsMax := v.RangeShare()
	side := "minimum"
	if towardsMax {
		side = "maximum"
	}
	return fmt.Sprintf("Moran's I can range from %s to %s on these weights (de Jong et al. 1984%s); %s is %.0f%% of the way from its expected value to the %s.",
		Number(v.Bounds.Min), Number(v.Bounds.Max), rangeMethod(*v.Bounds), Number(v.MoransI.Value), 100*share, side)
}

// rangeMethod is nothing for the exact dense range, else how near the
// iteration came.
func rangeMethod(b autocorr.Bounds) string {
	switch {
	case b.Method == "dense":
		return ""
	case b.Converged:
		return "; found by iteration, each end exact to within " + roundUp(b.Tolerance)
	}
	return fmt.Sprintf("; approximate: the iteration stopped at %s steps, and the true range is at least this wide", numtext.Count(b.Iterations))
}

// roundUp writes x > 0 rounded up to one significant digit ("7e-07"), so a
// stated tolerance is never below the one achieved.
func roundUp(x float64) string {
	if !(x > 0) {
		return "0"
	}
	e := math.Floor(math.Log10(x))
	m := math.Ceil(x / math.Pow(10, e) * (1 - 1e-12))
	if m >= 10 {
		m, e = 1, e+1
	}
	return strconv.FormatFloat(m*math.Pow(10, e), 'e', 0, 64)
}

func generalGSkipped(v clustering.Variable) string {
	return "General G skipped: " + v.GeneralGSkipped + "."
}

// variableCounts says on how many areas a variable was analysed.
func variableCounts(v clustering.Variable) string {
	s := numtext.Count(v.Areas) + " areas"
	if v.Missing > 0 {
		s += fmt.Sprintf(", %s without a value", numtext.Count(v.Missing))
	}
	if v.Islands > 0 {
		s += fmt.Sprintf(", %s left out without neighbours", numtext.Count(v.Islands))
	}
	return s
}

// namedStatistic is one line of a variable's table; withNormal says it has
// a p-value under normality.
type namedStatistic struct {
	name       string
	s          clustering.Statistic
	withNormal bool
}

// variableStatistics are the lines of a variable's table.
func variableStatistics(v clustering.Variable) []namedStatistic {
	out := []namedStatistic{{"Moran's I", v.MoransI, true}, {"Geary's C", v.GearysC, true}}
	if v.GeneralG != nil {
		out = append(out, namedStatistic{"General G", *v.GeneralG, false})
	}
	if v.Bivariate != nil {
		out = append(out, namedStatistic{"bivariate I", v.Bivariate.Statistic, false})
	}
	return out
}

func variableText(b *strings.Builder, v clustering.Variable) {
	fmt.Fprintf(b, "%s (%s)\n", v.Name, variableCounts(v))
	statisticHead(b)
	for _, st := range variableStatistics(v) {
		statisticLine(b, st.name, st.s, st.withNormal)
	}
	b.WriteString(Wrap(rangeSentence(v), width, "  ", "  "))
	if v.GeneralGSkipped != "" {
		b.WriteString(Wrap(generalGSkipped(v), width, "  ", "  "))
	}
	if len(v.Correlogram) > 0 {
		fmt.Fprintf(b, "  %-30s %9s %9s %9s %10s\n", "correlogram", "pairs", "Moran's I", "expected", "p shuffle")
		for k, l := range v.Correlogram {
			fmt.Fprintf(b, "  %-30s %9s %9.3f %9.3f %10s\n", truncate(v.CorrelogramClasses[k], 30), numtext.Count(l.Pairs), l.MoransI, l.Expected, PValue(l.Permutation.PValue))
		}
	}
	b.WriteString("\n")
}

func joinsText(b *strings.Builder, j clustering.Joins) {
	fmt.Fprintf(b, "%s: join counts (%s areas, %s joins", j.Name, numtext.Count(j.Areas), numtext.Count(j.Test.Joins))
	if j.Missing > 0 {
		fmt.Fprintf(b, ", %s without a value", numtext.Count(j.Missing))
	}
	b.WriteString(")\n")
	fmt.Fprintf(b, "  %-22s %7s %7s %10s %8s %10s\n", "joins", "areas", "count", "expected", "z", "p shuffle")
	for _, s := range j.Test.Same {
		fmt.Fprintf(b, "  %-22s %7s %7s %10.1f %8.2f %10s\n", truncate("both "+j.Levels[s.Category], 22), numtext.Count(s.Areas), numtext.Count(s.Joins), s.Expected, s.Z, PValue(s.Permutation.PValue))
	}
	d := j.Test.Different
	fmt.Fprintf(b, "  %-22s %7s %7s %10.1f %8.2f %10s\n", "different categories", "", numtext.Count(d.Joins), d.Expected, d.Z, PValue(d.Permutation.PValue))
	b.WriteString("  " + joinsNote + "\n\n")
}

// rateSentence says why the empirical-Bayes Moran's I is to be trusted.
func rateSentence(rt *clustering.Rate) string {
	return fmt.Sprintf("The empirical-Bayes (EB) Moran's I (Assunção & Reis 1999) weighs each area's rate by how much its population lets it be trusted; populations here range from %s to %s. When the two disagree, trust the EB value.", Number(rt.Smallest), Number(rt.Largest))
}

// flooredSentence names the areas whose EB variance was floored.
func flooredSentence(rt *clustering.Rate) string {
	return fmt.Sprintf("%d area(s) had a negative estimated variance and used the Poisson part alone: %s.", len(rt.Floored), strings.Join(first(rt.Floored, 8), ", "))
}

func rateText(b *strings.Builder, rt *clustering.Rate) {
	fmt.Fprintf(b, "rate %s per %s (%s areas, overall rate %s", rt.Events, rt.Population, numtext.Count(rt.Areas), Number(rt.MeanRate))
	if rt.Missing > 0 {
		fmt.Fprintf(b, ", %s without counts", numtext.Count(rt.Missing))
	}
	b.WriteString(")\n")
	statisticHead(b)
	statisticLine(b, "raw rate", rt.Raw, true)
	statisticLine(b, "EB scores", rt.EB, true)
	b.WriteString(Wrap(rateSentence(rt), width, "  ", "  "))
	if len(rt.Floored) > 0 {
		b.WriteString(Wrap(flooredSentence(rt), width, "  ", "  "))
	}
	b.WriteString("\n")
}

func writeWarnings(b *strings.Builder, warnings []string) {
	if len(warnings) == 0 {
		return
	}
	b.WriteString("Warnings\n")
	for _, wn := range warnings {
		b.WriteString(Wrap(wn, width, "  ! ", "    "))
	}
	b.WriteString("\n")
}

func writeCautions(b *strings.Builder, cautions []string) {
	b.WriteString("Keep in mind\n")
	for _, c := range cautions {
		b.WriteString(Wrap(c, width, "  - ", "    "))
	}
}

// ScreenText writes the ranked table of `areatest screen`.
func ScreenText(w io.Writer, r *clustering.ScreenResult) error {
	var b strings.Builder
	fmt.Fprintf(&b, "areatest %s: which columns of %s cluster in space?\n\n", r.Version, r.Input)
	fmt.Fprintf(&b, "  %s areas; %s, %s; %s, %s without neighbours\n", numtext.Count(r.Areas), r.Weights.Kind, r.Weights.Scaling,
		plural(r.Weights.Pairs, "neighbour pair", "neighbour pairs"), numtext.Count(r.Weights.Islands))
	fmt.Fprintf(&b, "  %s shuffles per column; p-values %s, adjusted across %s by %s\n\n", numtext.Count(r.Permutations), r.Alternative,
		plural(len(r.Rows), "column", "columns"), r.Adjustment)
	fmt.Fprintf(&b, "  %4s  %-22s %7s %9s %7s %9s %9s %9s %9s\n", "rank", "column", "areas", "Moran's I", "z", "p", "adjusted", "Geary's C", "adjusted")
	for _, row := range r.Rows {
		fmt.Fprintf(&b, "  %4d  %-22s %7s %9.3f %7.2f %9s %9s %9.3f %9s\n", row.Rank, truncate(row.Name, 22), numtext.Count(row.Areas),
			row.MoransI, row.MoranZ, PValue(row.MoranP), PValue(row.MoranPAdjusted), row.GearysC, PValue(row.GearyPAdjusted))
	}
	b.WriteString("\n")
	if len(r.Skipped) > 0 {
		b.WriteString("Not screened\n")
		for _, s := range r.Skipped {
			b.WriteString(Wrap(s.Name+": "+s.Reason, width, "  - ", "    "))
		}
		b.WriteString("\n")
	}
	b.WriteString(Wrap(screenFootnote, width, "  ", "  "))
	b.WriteString("\n")
	writeWarnings(&b, r.Warnings)
	writeCautions(&b, r.Cautions)
	fmt.Fprintf(&b, "\nseed %d · areatest %s\n", r.Seed, r.Version)
	_, err := io.WriteString(w, b.String())
	return err
}

// ScreenCSV writes one row per screened column, for spreadsheets.
func ScreenCSV(w io.Writer, r *clustering.ScreenResult) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"rank", "column", "areas", "missing", "morans_i", "morans_i_z", "morans_i_p", "morans_i_p_adjusted",
		"gearys_c", "gearys_c_p", "gearys_c_p_adjusted", "adjustment", "permutations", "seed", "weights", "version"})
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', 10, 64) }
	for _, row := range r.Rows {
		cw.Write([]string{strconv.Itoa(row.Rank), row.Name, strconv.Itoa(row.Areas), strconv.Itoa(row.Missing),
			f(row.MoransI), f(row.MoranZ), f(row.MoranP), f(row.MoranPAdjusted), f(row.GearysC), f(row.GearyP), f(row.GearyPAdjusted),
			r.Adjustment, strconv.Itoa(r.Permutations), strconv.FormatUint(r.Seed, 10), r.Weights.Kind + ", " + r.Weights.Scaling, r.Version})
	}
	cw.Flush()
	return cw.Error()
}
