package report

import (
	"fmt"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/local"
)

// localPage lays out `areatest local` as its text report does: the
// settings, the count of each category and the top strongest areas.
func localPage(d *local.Result, top int) *page {
	s := d.Summary
	subject := d.Variable
	if d.Against != "" {
		subject += " against the lag of " + d.Against
	}
	pg := &page{Title: "Where does " + subject + " cluster?", Command: "local", Version: d.Version, Warnings: d.Warnings, Cautions: d.Cautions,
		Written: d.Written, Footer: fmt.Sprintf("seed %d · areatest %s", s.Seed, d.Version)}
	pg.Facts = []fact{{Label: "input", Value: d.Input}, {Label: "areas", Value: numtext.Count(len(d.Areas)) + " read, " + numtext.Count(s.Areas) + " analysed"},
		{Label: "statistic", Value: fmt.Sprintf("%s, %s conditional shuffles per area (%s p-values)", s.Statistic, numtext.Count(s.Permutations), s.Alternative)},
		weightsFact(d.Weights),
		{Label: "testing", Value: fmt.Sprintf("%s areas at p ≤ %g before adjustment, %s after %s", numtext.Count(d.RawSignificant), s.Alpha, numtext.Count(d.AdjustedSignificant), s.Adjustment)},
		{Label: "seed", Value: fmt.Sprint(s.Seed)}, {Label: "version", Value: "areatest " + d.Version}}
	c := newTable("Areas in each category", "category", "#areas")
	for _, k := range s.Categories {
		c.add(k.Category, numtext.Count(k.Areas))
	}
	sec := pg.section("Categories")
	sec.add(table(c), text(localExplanation(d)))
	if strongest := d.Strongest(top); len(strongest) > 0 {
		t := newTable("The strongest areas, by |z|", "id", "category", "#value", "#statistic", "#z", "#p", "#adjusted")
		for _, a := range strongest {
			t.add(a.ID, a.Category, Number(*a.Value), Number(a.Statistic), fmt.Sprintf("%.2f", a.Z), PValue(a.P), PValue(a.AdjustedP))
		}
		pg.section("Strongest areas").add(table(t))
	}
	return pg
}

// weightsPage lays out `areatest weights`: the summary, the histogram of
// neighbour counts as a table with bars, warnings and geometry problems.
func weightsPage(d *WeightsDocument) *page {
	s := d.Weights
	pg := &page{Title: "Neighbours in " + d.Input, Command: "weights", Version: d.Version, Warnings: s.Warnings,
		Footer: "areatest " + d.Version}
	pg.Facts = []fact{{Label: "input", Value: d.Input}}
	label := ""
	for _, f := range weightsFacts(d) {
		if f[0] != "" {
			label = f[0]
		}
		pg.Facts = append(pg.Facts, fact{Label: label, Value: f[1]})
	}
	pg.Facts = append(pg.Facts, fact{Label: "version", Value: "areatest " + d.Version})
	if d.Written != "" {
		pg.Written = []string{d.Written}
	}
	if len(s.Histogram) > 0 {
		t := newTable("Areas by their number of neighbours", "#neighbours", "#areas")
		t.Bars = true
		bins, peak := histogramBins(s)
		for _, bin := range bins {
			t.add(fmt.Sprint(bin[0]), numtext.Count(bin[1])).Bar = 100 * float64(bin[1]) / float64(peak)
		}
		pg.section("Neighbour counts").add(table(t))
	}
	if d.ListProblems {
		var items []string
		for _, p := range d.GeometryProblems {
			items = append(items, p.Text)
		}
		if len(items) == 0 {
			items = []string{"none"}
		}
		pg.section("Geometry problems").add(list(items...))
	}
	return pg
}

// idCells writes a list of ids, with how many more there are, for a cell.
func idCells(ids []string, total int) string {
	return strings.TrimSuffix(strings.TrimPrefix(idListOf(ids, total), " ("), ")")
}
