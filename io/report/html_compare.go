package report

import (
	"fmt"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/weights"
)

// comparePage lays out a comparison as the text report does: inputs,
// areas left out, groups, the p-values with their false-positive rates,
// the checks, the recommendation, warnings and cautions.
func comparePage(r *compare.Result) *page {
	in := r.Input
	pg := &page{Title: fmt.Sprintf("Does %s differ between the groups of %s?", in.Outcome, in.Group), Command: "compare", Version: r.Version,
		Warnings: r.Warnings, Cautions: r.Cautions,
		Footer: fmt.Sprintf("seed %d · %s shuffles per scheme · areatest %s", r.Seed, numtext.Count(permutationsAsked(r)), r.Version)}
	pg.Facts = []fact{{Label: "input", Value: in.File}, {Label: "areas", Value: numtext.Count(in.Areas) + " read, " + numtext.Count(in.Tested) + " tested"},
		{Label: "outcome", Value: in.Outcome}, {Label: "groups", Value: in.Group}}
	if in.Strata != "" {
		pg.Facts = append(pg.Facts, fact{Label: "strata", Value: in.Strata})
	}
	pg.Facts = append(pg.Facts, weightsFact(r.Weights), fact{Label: "seed", Value: fmt.Sprint(r.Seed)}, fact{Label: "version", Value: "areatest " + r.Version})
	if r.Recommended.Scheme != "" {
		pg.Read = readSentence(r)
	}
	if len(r.Excluded) > 0 {
		t := newTable("Areas left out of the comparison", "reason", "#areas", "ids")
		for _, e := range r.Excluded {
			t.add(e.Reason, numtext.Count(e.Areas), idCells(first(e.IDs, 20), e.Areas))
		}
		pg.section("Areas left out").add(table(t))
	}
	g := newTable("The outcome "+in.Outcome+" in each group of "+in.Group, in.Group, "#areas", "#median", "#mean", "#sd", "#min", "#max")
	for _, gr := range r.Groups {
		g.add(gr.Level, numtext.Count(gr.Areas), Number(gr.Median), Number(gr.Mean), Number(gr.SD), Number(gr.Min), Number(gr.Max))
	}
	pg.section("Groups").add(table(g), text(statisticSentence(r)))
	compareTestSection(pg.section("P-values"), r)
	compareSpatialSection(pg.section("Spatial check"), r)
	return pg
}

// compareTestSection is the table of null models, each with its measured
// false-positive rate and the marks under a row not to read.
func compareTestSection(s *section, r *compare.Result) {
	if r.Adjusted != nil {
		s.add(text(adjustedSentence(r.Adjusted)))
	}
	t := newTable("P-value of "+r.Statistic.Label+" under each null model", "null model", "#p-value", "95% interval", "#draws", "false positives")
	for _, row := range r.Tests {
		interval, count := testCells(row)
		v := t.add(row.Scheme, PValue(row.PValue), interval, count, rateCell(row))
		if m := unsoundMark(row); m != "" {
			v.Warn, v.Notes = true, append(v.Notes, m)
		}
		if c := calibratedMark(row); c != "" {
			v.Notes = append(v.Notes, c)
		}
	}
	if len(r.Tests) > 0 {
		s.add(table(t), note(testFootnote(r)))
	}
	if r.FalsePositiveRate != nil {
		s.add(text(falsePositiveSentence(r)))
	}
	if r.EffectiveSampleSize != nil {
		s.add(text(effectiveSentence(r)))
	}
}

// compareSpatialSection is Moran's I of the outcome and the groups.
func compareSpatialSection(s *section, r *compare.Result) {
	a := r.Autocorrelation
	if a.Skipped != "" {
		s.add(text("The spatial check could not run: " + a.Skipped + "."))
	}
	if a.Outcome.Variable == "" {
		return
	}
	t := newTable("Moran's I of the outcome and the groups", "variable", "#Moran's I", "#expected", "#p-value")
	for _, m := range append([]compare.VariableMoran{a.Outcome}, a.Group...) {
		t.add(m.Variable, fmt.Sprintf("%.3f", m.MoransI), fmt.Sprintf("%.3f", m.Expected), PValue(m.PValue))
	}
	s.add(table(t), note("On "+spatialCheckWeights(r)+": "+spatialCheckGraph(r)+"."))
}

// weightsFact sums up the neighbour graph a result used.
func weightsFact(w weights.Summary) fact {
	return fact{Label: "weights", Value: fmt.Sprintf("%s, %s; %s, %s without neighbours%s", w.Kind, w.Scaling,
		plural(w.Pairs, "neighbour pair", "neighbour pairs"), numtext.Count(w.Islands), idListOf(first(w.IslandIDs, 6), w.Islands))}
}
