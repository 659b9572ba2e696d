package report

import (
	"fmt"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/clustering"
)

// autocorrPage lays out `areatest autocorr` as its text report does: one
// section per variable, per text column and for the rate.
func autocorrPage(r *clustering.Result) *page {
	pg := &page{Title: "Do these variables cluster in space?", Command: "autocorr", Version: r.Version, Warnings: r.Warnings, Cautions: r.Cautions,
		Footer: fmt.Sprintf("seed %d · %s shuffles per test · areatest %s", r.Seed, numtext.Count(r.Shuffles()), r.Version)}
	pg.Facts = []fact{{Label: "input", Value: r.Input}, {Label: "areas", Value: numtext.Count(r.Areas)}, weightsFact(r.Weights),
		{Label: "shuffles", Value: numtext.Count(r.Shuffles()) + " per test"}, {Label: "seed", Value: fmt.Sprint(r.Seed)}, {Label: "version", Value: "areatest " + r.Version}}
	for _, v := range r.Variables {
		variableSection(pg.section(v.Name), v)
	}
	for _, j := range r.Joins {
		joinsSection(pg.section(j.Name+": join counts"), j)
	}
	if rt := r.Rate; rt != nil {
		s := pg.section("Rate " + rt.Events + " per " + rt.Population)
		caption := fmt.Sprintf("Moran's I of the rate (%s areas, overall rate %s", numtext.Count(rt.Areas), Number(rt.MeanRate))
		if rt.Missing > 0 {
			caption += fmt.Sprintf(", %s without counts", numtext.Count(rt.Missing))
		}
		t := statisticTable(caption + ")")
		statisticRow(t, "raw rate", rt.Raw, true)
		statisticRow(t, "EB scores", rt.EB, true)
		s.add(table(t), text(rateSentence(rt)))
		if len(rt.Floored) > 0 {
			s.add(text(flooredSentence(rt)))
		}
	}
	pg.section("How to read the tables").add(note(autocorrFootnote))
	return pg
}

// statisticTable starts a table of global statistics.
func statisticTable(caption string) *tableView {
	return newTable(caption, "statistic", "#value", "#expected", "#z", "#p normal", "#p random", "#p shuffle")
}

// statisticRow adds one statistic; withNormal shows its p-value under
// normality, where it has one.
func statisticRow(t *tableView, name string, s clustering.Statistic, withNormal bool) {
	pn := "–"
	if withNormal {
		pn = PValue(s.PNormality)
	}
	t.add(name, Number(s.Value), Number(s.Expected), Number(s.ZRandomisation), pn, PValue(s.PRandomisation), PValue(s.Permutation.PValue))
}

// variableSection is one numeric variable: its statistics, the range of
// Moran's I and the correlogram.
func variableSection(s *section, v clustering.Variable) {
	t := statisticTable("Global statistics of " + v.Name + " (" + variableCounts(v) + ")")
	for _, st := range variableStatistics(v) {
		statisticRow(t, st.name, st.s, st.withNormal)
	}
	s.add(table(t), text(rangeSentence(v)))
	if v.GeneralGSkipped != "" {
		s.add(text(generalGSkipped(v)))
	}
	if len(v.Correlogram) > 0 {
		c := newTable("Correlogram of "+v.Name, "class", "#pairs", "#Moran's I", "#expected", "#p shuffle")
		for k, l := range v.Correlogram {
			c.add(v.CorrelogramClasses[k], numtext.Count(l.Pairs), fmt.Sprintf("%.3f", l.MoransI), fmt.Sprintf("%.3f", l.Expected), PValue(l.Permutation.PValue))
		}
		s.add(table(c))
	}
}

// joinsSection is the join counts of one text column.
func joinsSection(s *section, j clustering.Joins) {
	caption := fmt.Sprintf("Join counts of %s (%s areas, %s joins", j.Name, numtext.Count(j.Areas), numtext.Count(j.Test.Joins))
	if j.Missing > 0 {
		caption += fmt.Sprintf(", %s without a value", numtext.Count(j.Missing))
	}
	t := newTable(caption+")", "joins", "#areas", "#count", "#expected", "#z", "#p shuffle")
	for _, c := range j.Test.Same {
		t.add("both "+j.Levels[c.Category], numtext.Count(c.Areas), numtext.Count(c.Joins), fmt.Sprintf("%.1f", c.Expected), fmt.Sprintf("%.2f", c.Z), PValue(c.Permutation.PValue))
	}
	d := j.Test.Different
	t.add("different categories", "", numtext.Count(d.Joins), fmt.Sprintf("%.1f", d.Expected), fmt.Sprintf("%.2f", d.Z), PValue(d.Permutation.PValue))
	s.add(table(t), text(joinsNote))
}

// screenPage lays out `areatest screen`: the ranked columns and those not
// screened.
func screenPage(r *clustering.ScreenResult) *page {
	pg := &page{Title: "Which columns of " + r.Input + " cluster in space?", Command: "screen", Version: r.Version, Warnings: r.Warnings, Cautions: r.Cautions,
		Footer: fmt.Sprintf("seed %d · areatest %s", r.Seed, r.Version)}
	pg.Facts = []fact{{Label: "input", Value: r.Input}, {Label: "areas", Value: numtext.Count(r.Areas)}, weightsFact(r.Weights),
		{Label: "shuffles", Value: numtext.Count(r.Permutations) + " per column"},
		{Label: "p-values", Value: fmt.Sprintf("%s, adjusted across %s by %s", r.Alternative, plural(len(r.Rows), "column", "columns"), r.Adjustment)},
		{Label: "seed", Value: fmt.Sprint(r.Seed)}, {Label: "version", Value: "areatest " + r.Version}}
	t := newTable("Columns ranked by Moran's I", "rank", "column", "#areas", "#Moran's I", "#z", "#p", "#adjusted", "#Geary's C", "#adjusted")
	for _, row := range r.Rows {
		t.add(fmt.Sprint(row.Rank), row.Name, numtext.Count(row.Areas), fmt.Sprintf("%.3f", row.MoransI), fmt.Sprintf("%.2f", row.MoranZ),
			PValue(row.MoranP), PValue(row.MoranPAdjusted), fmt.Sprintf("%.3f", row.GearysC), PValue(row.GearyPAdjusted))
	}
	s := pg.section("Ranking")
	s.add(table(t), note(screenFootnote))
	if len(r.Skipped) > 0 {
		var items []string
		for _, k := range r.Skipped {
			items = append(items, k.Name+": "+k.Reason)
		}
		pg.section("Not screened").add(list(items...))
	}
	return pg
}
