package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/weights"
)

// LocalArea is one area of a local analysis, named by id. Areas left out
// (no value, or no neighbour) carry only their id, value and category.
type LocalArea struct {
	ID string `json:"id"`
	// Value is the area's value, null when it has none (JSON has no NaN);
	// it shadows the embedded result's value.
	Value *float64 `json:"value"`
	local.AreaResult
	Analysed bool `json:"analysed"`
}

// LocalDocument is what `areatest local` reports.
type LocalDocument struct {
	Version  string          `json:"version"`
	Input    string          `json:"input"`
	Variable string          `json:"variable"`
	Against  string          `json:"against,omitempty"`
	Weights  weights.Summary `json:"weights"`
	Summary  local.Summary   `json:"summary"`
	// RawSignificant and AdjustedSignificant count the areas with a p-value
	// at most alpha before and after the multiple-testing adjustment.
	RawSignificant      int         `json:"significant_before_adjustment"`
	AdjustedSignificant int         `json:"significant_after_adjustment"`
	Areas               []LocalArea `json:"areas"`
	Warnings            []string    `json:"warnings"`
	Cautions            []string    `json:"cautions"`
	Written             []string    `json:"written,omitempty"`
}

// LocalText writes the summary of a local analysis: counts per category and
// the strongest areas.
func LocalText(w io.Writer, d *LocalDocument, top int) error {
	var b strings.Builder
	s := d.Summary
	subject := d.Variable
	if d.Against != "" {
		subject += " against the lag of " + d.Against
	}
	fmt.Fprintf(&b, "areatest %s: where does %s cluster?\n\n", d.Version, subject)
	fmt.Fprintf(&b, "  input       %s, %s areas, %s analysed\n", d.Input, numtext.Count(len(d.Areas)), numtext.Count(s.Areas))
	fmt.Fprintf(&b, "  statistic   %s, %s conditional shuffles per area (%s p-values)\n", s.Statistic, numtext.Count(s.Permutations), s.Alternative)
	fmt.Fprintf(&b, "  weights     %s, %s; %s, %s without neighbours\n", d.Weights.Kind, d.Weights.Transform,
		plural(d.Weights.Pairs, "neighbour pair", "neighbour pairs"), numtext.Count(d.Weights.Islands))
	fmt.Fprintf(&b, "  testing     %s areas at p ≤ %g before adjustment, %s after %s\n\n", numtext.Count(d.RawSignificant), s.Alpha,
		numtext.Count(d.AdjustedSignificant), s.Adjustment)
	fmt.Fprintf(&b, "  %-22s %7s\n", "category", "areas")
	for _, c := range s.Categories {
		fmt.Fprintf(&b, "  %-22s %7s\n", c.Category, numtext.Count(c.Areas))
	}
	b.WriteString("\n")
	strongest := strongestAreas(d.Areas, top)
	if len(strongest) > 0 {
		fmt.Fprintf(&b, "  strongest areas (by |z|)\n  %-14s %-16s %10s %10s %8s %10s %10s\n", "id", "category", "value", "statistic", "z", "p", "adjusted")
		for _, a := range strongest {
			fmt.Fprintf(&b, "  %-14s %-16s %10s %10s %8.2f %10s %10s\n", truncate(a.ID, 14), truncate(a.Category, 16), Number(*a.Value),
				Number(a.Statistic), a.Z, PValue(a.P), PValue(a.AdjustedP))
		}
		b.WriteString("\n")
	}
	b.WriteString(Wrap(fmt.Sprintf("Each area's statistic is compared with %s arrangements in which the area keeps its own value and its neighbours' values are drawn from the other areas. Categories use the %s p-values at %g. With one test per area, some areas pass by chance: the adjusted p-values (%s) keep that in check.",
		numtext.Count(s.Permutations), s.CategoriesFrom, s.Alpha, s.Adjustment), width, "  ", "  "))
	b.WriteString("\n")
	writeWarnings(&b, d.Warnings)
	writeCautions(&b, d.Cautions)
	if len(d.Written) > 0 {
		fmt.Fprintf(&b, "\nwritten: %s\n", strings.Join(d.Written, ", "))
	}
	fmt.Fprintf(&b, "\nseed %d · areatest %s\n", s.Seed, d.Version)
	_, err := io.WriteString(w, b.String())
	return err
}

func strongestAreas(areas []LocalArea, top int) []LocalArea {
	var out []LocalArea
	for _, a := range areas {
		if a.Analysed && a.Category != local.NotSignificant && a.Category != local.NoNeighbours {
			out = append(out, a)
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return math.Abs(out[i].Z) > math.Abs(out[j].Z) })
	if len(out) > top {
		out = out[:top]
	}
	return out
}

// LocalCSV writes one row per area of the layer: id, value, lag,
// statistic, expected, sd, z, p, adjusted p and category. Areas that were
// not analysed have empty statistics.
func LocalCSV(w io.Writer, d *LocalDocument) error {
	cw := csv.NewWriter(w)
	cw.Write([]string{"id", "value", "lag", "statistic", "expected", "sd", "z", "p", "p_adjusted", "category", "neighbours", "exact"})
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', 10, 64) }
	for _, a := range d.Areas {
		if !a.Analysed {
			value := ""
			if a.Value != nil {
				value = f(*a.Value)
			}
			cw.Write([]string{a.ID, value, "", "", "", "", "", "", "", a.Category, "", ""})
			continue
		}
		cw.Write([]string{a.ID, f(*a.Value), f(a.Lag), f(a.Statistic), f(a.Expected), f(a.SD), f(a.Z), f(a.P), f(a.AdjustedP),
			a.Category, strconv.Itoa(a.Neighbours), strconv.FormatBool(a.Exact)})
	}
	cw.Flush()
	return cw.Error()
}
