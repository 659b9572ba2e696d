package report

import (
	"fmt"
	"io"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/weights"
)

// WeightsDocument is what `areatest weights` reports: the graph's summary
// and where it came from.
type WeightsDocument struct {
	Version string `json:"version"`
	Input   string `json:"input"`
	// Settings describes the rule in words, e.g. "snap 1e-07 degrees".
	Settings []string        `json:"settings"`
	Weights  weights.Summary `json:"weights"`
	// GeometryProblems lists every problem contiguity worked around, in
	// the JSON always (left out when there is none); ListProblems asks the
	// text to list them too.
	GeometryProblems []weights.GeometryProblem `json:"geometry_problems,omitempty"`
	ListProblems     bool                      `json:"-"`
	Written          string                    `json:"written,omitempty"`
}

// WeightsText writes the summary of a neighbour graph for a person.
func WeightsText(w io.Writer, d *WeightsDocument) error {
	s := d.Weights
	var b strings.Builder
	fmt.Fprintf(&b, "areatest %s: neighbours in %s\n\n", d.Version, d.Input)
	for _, f := range weightsFacts(d) {
		fmt.Fprintf(&b, "  %-13s %s\n", f[0], f[1])
	}
	if len(s.Histogram) > 0 {
		b.WriteString("\n  neighbours   areas\n")
		bins, peak := histogramBins(s)
		for _, bin := range bins {
			bar := strings.Repeat("█", (bin[1]*40+peak-1)/peak)
			fmt.Fprintf(&b, "  %10d %7s  %s\n", bin[0], numtext.Count(bin[1]), bar)
		}
	}
	if len(s.Warnings) > 0 {
		b.WriteString("\nWarnings\n")
		for _, wn := range s.Warnings {
			b.WriteString(Wrap(wn, width, "  ! ", "    "))
		}
	}
	if d.ListProblems {
		geometryProblems(&b, d.GeometryProblems)
	}
	if d.Written != "" {
		fmt.Fprintf(&b, "\nedge list written to %s\n", d.Written)
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// weightsFacts are the summary's lines, label and value: the rule, the
// weights, the counts, islands, connectedness and symmetry.
func weightsFacts(d *WeightsDocument) [][2]string {
	s := d.Weights
	var facts [][2]string
	row := func(label, value string) { facts = append(facts, [2]string{label, value}) }
	row("rule", s.Kind)
	for _, set := range d.Settings {
		row("", set)
	}
	row("weights", s.Scaling)
	row("areas", numtext.Count(s.Areas))
	row("links", fmt.Sprintf("%s (%s directed links)", plural(s.Pairs, "neighbour pair", "neighbour pairs"), numtext.Count(s.Links)))
	if s.Areas > 0 {
		row("neighbours", fmt.Sprintf("mean %.2f, fewest %d%s, most %d%s", s.MeanNeighbours,
			s.MinNeighbours, idListOf(first(s.FewestIDs, 4), s.Histogram[s.MinNeighbours]),
			s.MaxNeighbours, idListOf(first(s.MostIDs, 4), s.Histogram[s.MaxNeighbours])))
	}
	islands := numtext.Count(s.Islands)
	if s.Islands > 0 {
		islands += idListOf(s.IslandIDs, s.Islands)
	}
	row("islands", islands)
	linkedGroups := s.Components - s.Islands
	switch {
	case linkedGroups <= 1 && s.Islands == 0:
		row("connected", "yes, one group of linked areas")
	case linkedGroups <= 1:
		row("connected", "yes, apart from the islands")
	default:
		row("connected", fmt.Sprintf("no: %d separate groups of linked areas, sizes %s", linkedGroups, sizeList(s.ComponentSizes[:linkedGroups])))
	}
	if s.Asymmetric > 0 {
		row("asymmetric", fmt.Sprintf("%s links have no link back", numtext.Count(s.Asymmetric)))
	} else {
		row("symmetric", "yes")
	}
	return facts
}

// histogramBins are the rows of the histogram of neighbour counts, count
// of neighbours and of areas (empty rows left out of a long one), and the
// largest count of areas (at least 1).
func histogramBins(s weights.Summary) (bins [][2]int, peak int) {
	peak = 1
	for _, c := range s.Histogram {
		peak = max(peak, c)
	}
	for k, c := range s.Histogram {
		if c == 0 && len(s.Histogram) > 30 {
			continue
		}
		bins = append(bins, [2]int{k, c})
	}
	return bins, peak
}

// geometryProblems lists every geometry problem, one sentence each.
func geometryProblems(b *strings.Builder, problems []weights.GeometryProblem) {
	b.WriteString("\nGeometry problems\n")
	if len(problems) == 0 {
		b.WriteString("  none\n")
	}
	for _, p := range problems {
		b.WriteString(Wrap(p.Text, width, "  - ", "    "))
	}
}

func first(ids []string, n int) []string {
	if len(ids) > n {
		return ids[:n]
	}
	return ids
}

// idListOf lists ids, saying how many more there are beyond the listed ones.
func idListOf(ids []string, total int) string {
	if total > len(ids) {
		return fmt.Sprintf(" (%s and %d more)", strings.Join(ids, ", "), total-len(ids))
	}
	return idList(ids, len(ids))
}

func sizeList(sizes []int) string {
	var parts []string
	for i, s := range sizes {
		if i == 8 {
			parts = append(parts, fmt.Sprintf("… (%d more)", len(sizes)-8))
			break
		}
		parts = append(parts, numtext.Count(s))
	}
	return strings.Join(parts, ", ")
}
