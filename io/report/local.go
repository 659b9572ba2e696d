package report

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/spatial/local"
)

// LocalText writes the summary of a local analysis: counts per category and
// the strongest areas.
func LocalText(w io.Writer, d *local.Result, top int) error {
	var b strings.Builder
	s := d.Summary
	subject := d.Variable
	if d.Against != "" {
		subject += " against the lag of " + d.Against
	}
	fmt.Fprintf(&b, "areatest %s: where does %s cluster?\n\n", d.Version, subject)
	fmt.Fprintf(&b, "  input       %s, %s areas, %s analysed\n", d.Input, numtext.Count(len(d.Areas)), numtext.Count(s.Areas))
	fmt.Fprintf(&b, "  statistic   %s, %s conditional shuffles per area (%s p-values)\n", s.Statistic, numtext.Count(s.Permutations), s.Alternative)
	fmt.Fprintf(&b, "  weights     %s, %s; %s, %s without neighbours\n", d.Weights.Kind, d.Weights.Scaling,
		plural(d.Weights.Pairs, "neighbour pair", "neighbour pairs"), numtext.Count(d.Weights.Islands))
	fmt.Fprintf(&b, "  testing     %s areas at p ≤ %g before adjustment, %s after %s\n\n", numtext.Count(d.RawSignificant), s.Alpha,
		numtext.Count(d.AdjustedSignificant), s.Adjustment)
	fmt.Fprintf(&b, "  %-22s %7s\n", "category", "areas")
	for _, c := range s.Categories {
		fmt.Fprintf(&b, "  %-22s %7s\n", c.Category, numtext.Count(c.Areas))
	}
	b.WriteString("\n")
	strongest := d.Strongest(top)
	if len(strongest) > 0 {
		fmt.Fprintf(&b, "  strongest areas (by |z|)\n  %-14s %-16s %10s %10s %8s %10s %10s\n", "id", "category", "value", "statistic", "z", "p", "adjusted")
		for _, a := range strongest {
			fmt.Fprintf(&b, "  %-14s %-16s %10s %10s %8.2f %10s %10s\n", truncate(a.ID, 14), truncate(a.Category, 16), Number(*a.Value),
				Number(a.Statistic), a.Z, PValue(a.P), PValue(a.AdjustedP))
		}
		b.WriteString("\n")
	}
	b.WriteString(Wrap(localExplanation(d), width, "  ", "  "))
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

// localExplanation says how each area was tested and how to read the
// categories.
func localExplanation(d *local.Result) string {
	s := d.Summary
	return fmt.Sprintf("Each area's statistic is compared with %s arrangements in which the area keeps its own value and its neighbours' values are drawn from the other areas. Categories use the %s p-values at %g. With one test per area, some areas pass by chance: the adjusted p-values (%s) keep that in check.",
		numtext.Count(s.Permutations), s.CategoriesFrom, s.Alpha, s.Adjustment)
}

// LocalCSV writes one row per area of the layer: id, value, lag,
// statistic, expected, sd, z, p, adjusted p and category, then the extra
// columns (one value per area, as text). Areas that were not analysed have
// empty statistics.
func LocalCSV(w io.Writer, d *local.Result, extra ...*layer.Column) error {
	cw := csv.NewWriter(w)
	head := []string{"id", "value", "lag", "statistic", "expected", "sd", "z", "p", "p_adjusted", "category", "neighbours", "exact"}
	for _, c := range extra {
		head = append(head, c.Name)
	}
	cw.Write(head)
	f := func(v float64) string { return strconv.FormatFloat(v, 'g', 10, 64) }
	for i, a := range d.Areas {
		var row []string
		if !a.Analysed {
			value := ""
			if a.Value != nil {
				value = f(*a.Value)
			}
			row = []string{a.ID, value, "", "", "", "", "", "", "", a.Category, "", ""}
		} else {
			row = []string{a.ID, f(*a.Value), f(a.Lag), f(a.Statistic), f(a.Expected), f(a.SD), f(a.Z), f(a.P), f(a.AdjustedP),
				a.Category, strconv.Itoa(a.Neighbours), strconv.FormatBool(a.Exact)}
		}
		for _, c := range extra {
			row = append(row, c.Label(i))
		}
		cw.Write(row)
	}
	cw.Flush()
	return cw.Error()
}

// LocalColumns returns the per-area results as layer columns, to be added
// to a copy of the layer: lag, statistic, expected, sd, z, p, adjusted p
// (missing where the area was not analysed) and category.
func LocalColumns(d *local.Result) []*layer.Column {
	n := len(d.Areas)
	num := func(name string, get func(a local.Area) float64) *layer.Column {
		c := &layer.Column{Name: name, Kind: layer.Number, Num: make([]float64, n), Missing: make([]bool, n)}
		for i, a := range d.Areas {
			c.Num[i], c.Missing[i] = get(a), !a.Analysed
		}
		return c
	}
	cat := &layer.Column{Name: "local_category", Kind: layer.Text, Str: make([]string, n), Missing: make([]bool, n)}
	for i, a := range d.Areas {
		cat.Str[i] = a.Category
	}
	return []*layer.Column{
		num("local_lag", func(a local.Area) float64 { return a.Lag }),
		num("local_statistic", func(a local.Area) float64 { return a.Statistic }),
		num("local_expected", func(a local.Area) float64 { return a.Expected }),
		num("local_sd", func(a local.Area) float64 { return a.SD }),
		num("local_z", func(a local.Area) float64 { return a.Z }),
		num("local_p", func(a local.Area) float64 { return a.P }),
		num("local_p_adjusted", func(a local.Area) float64 { return a.AdjustedP }),
		cat,
	}
}

// LocalPictures draws the pictures of a local result on the layer it was
// computed on; each method renders one picture in format f.
type LocalPictures struct {
	Layer  *layer.Layer
	Result *local.Result
	// Classes is the class rule of the choropleth.
	Classes figure.Classes
	// Mapped, when set, replaces the analysed values in the choropleth
	// (a rate smoothed for the map), one per area, NaN where missing;
	// MappedName names it.
	Mapped     []float64
	MappedName string
}

// classNames name the class rules in the choropleth's subtitle.
var classNames = map[figure.Classes]string{figure.Quantile: "quantile", figure.NaturalBreaks: "natural-breaks"}

func (p LocalPictures) note() string {
	return fmt.Sprintf("%s · seed %d · %s shuffles per area · areatest %s. Clusters are patterns across areas, not causes.",
		p.Layer.Source, p.Result.Summary.Seed, numtext.Count(p.Result.Summary.Permutations), p.Result.Version)
}

func (p LocalPictures) mapOptions(title, subtitle string) figure.MapOptions {
	return figure.MapOptions{Title: title, Subtitle: subtitle, LonLat: lonLat(p.Layer),
		Note: p.note(), IDs: p.Layer.IDs}
}

// Map draws every area of the layer in its category.
func (p LocalPictures) Map(w io.Writer, f figure.Format) error {
	r, s := p.Result, p.Result.Summary
	cats := make([]int, len(r.Areas))
	for i, a := range r.Areas {
		cats[i] = local.CategoryIndex(r.Kind, a.Category)
	}
	opt := p.mapOptions("Where "+r.Variable+" clusters",
		fmt.Sprintf("%s of %s, %s p-values at %g (%s); %s", s.Statistic, r.Variable, s.CategoriesFrom, s.Alpha, s.Adjustment, r.Weights.Kind))
	opt.LegendTitle = "category"
	return figure.CategoryMap(w, f, p.Layer.Geoms, cats, figure.LocalLegend(r.Kind), opt)
}

// Choropleth draws the variable in five classes.
func (p LocalPictures) Choropleth(w io.Writer, f figure.Format) error {
	r := p.Result
	values, missing := make([]float64, len(r.Areas)), make([]bool, len(r.Areas))
	for i, a := range r.Areas {
		if a.Value == nil {
			missing[i] = true
		} else {
			values[i] = *a.Value
		}
	}
	name := r.Variable
	if p.Mapped != nil {
		name = p.MappedName
		for i, v := range p.Mapped {
			values[i], missing[i] = v, math.IsNaN(v)
		}
	}
	opt := p.mapOptions(name, classNames[p.Classes]+" classes")
	return figure.Choropleth(w, f, p.Layer.Geoms, values, missing, p.Classes, 5, name, opt)
}

// Scatter draws the Moran scatter of the analysed areas: the standardised
// value against the lag of the neighbours', coloured by category, with the
// slope of the global statistic.
func (p LocalPictures) Scatter(w io.Writer, f figure.Format) error {
	r := p.Result
	areas := r.Analysed()
	z, lag, cats := make([]float64, len(areas)), make([]float64, len(areas)), make([]int, len(areas))
	for k, a := range areas {
		z[k], lag[k], cats[k] = a.Standardised, a.StandardisedLag, local.CategoryIndex(r.Kind, a.Category)
	}
	yLabel := "mean of the neighbours (standardised)"
	if r.Against != "" {
		yLabel = "neighbours' " + r.Against + " (standardised)"
	}
	opt := figure.ChartOptions{Title: r.Variable + " against its neighbours", Subtitle: r.Weights.Kind + ", " + r.Weights.Scaling,
		XLabel: r.Variable + " (standardised)", YLabel: yLabel, Note: p.note()}
	return figure.MoranScatter(w, f, z, lag, cats, figure.LocalLegend(r.Kind), r.Summary.Total/float64(len(areas)), opt)
}

// Histogram draws the null distribution of the area whose null the result
// kept (local.Result.NullArea).
func (p LocalPictures) Histogram(w io.Writer, f figure.Format) error {
	a, s := p.Result.NullArea(), p.Result.Summary
	if a == nil {
		return errors.New("the result kept no area's null distribution")
	}
	opt := figure.ChartOptions{Title: fmt.Sprintf("%s at area %s", s.Statistic, a.ID),
		Subtitle: fmt.Sprintf("%s conditional shuffles; p = %s (%s), category: %s", numtext.Count(a.Permutations), PValue(a.P), s.Alternative, a.Category),
		XLabel:   s.Statistic, YLabel: "shuffles", Note: p.note()}
	return figure.Histogram(w, f, a.Null, a.Statistic, opt)
}
