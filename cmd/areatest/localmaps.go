package main

import (
	"fmt"
	"io"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/plot"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/weights"
)

// localPictures are the files `areatest local` draws, by role, with the
// class rule of the choropleth (set by check) and the area of the
// histogram.
type localPictures struct {
	category, value, scatter, histogram string
	area                                string
	classes                             classRule
}

// classRule is a --classes value: the rule and its name in the subtitle.
type classRule struct {
	rule plot.Classes
	name string
}

// check validates the picture flags, reading classes into p.classes.
func (p *localPictures) check(classes string) error {
	if (p.histogram == "") != (p.area == "") {
		return usagef("--histogram and --area go together")
	}
	var err error
	if p.classes, err = choice.Parse("--classes", classes,
		choice.Name[classRule]{Name: "quantile", Value: classRule{plot.Quantile, "quantile"}},
		choice.Name[classRule]{Name: "natural", Value: classRule{plot.NaturalBreaks, "natural-breaks"}}); err != nil {
		return usagef("%v", err)
	}
	for _, f := range []string{p.category, p.value, p.scatter, p.histogram} {
		if f != "" {
			if _, err := plot.FormatFromPath(f); err != nil {
				return usagef("%v", err)
			}
		}
	}
	return nil
}

// draw writes the pictures asked for and lists them in res.Written.
func (p *localPictures) draw(lay *layer.Layer, res *local.Result, stdout io.Writer, inputs []string) error {
	s := res.Summary
	note := fmt.Sprintf("%s · seed %d · %s shuffles per area · areatest %s. Clusters are patterns across areas, not causes.",
		lay.Source, s.Seed, numtext.Count(s.Permutations), res.Version)
	mapOpt := plot.MapOptions{LonLat: weights.DetectMetric(lay.Geoms) == weights.Geographic, Note: note, IDs: lay.IDs}
	pictures := []struct {
		path string
		draw func(w io.Writer, f plot.Format) error
	}{
		{p.category, func(w io.Writer, f plot.Format) error {
			cats := make([]int, len(res.Areas))
			for i, a := range res.Areas {
				cats[i] = local.CategoryIndex(res.Kind, a.Category)
			}
			opt := mapOpt
			opt.Title, opt.LegendTitle = "Where "+res.Variable+" clusters", "category"
			opt.Subtitle = fmt.Sprintf("%s of %s, %s p-values at %g (%s); %s", s.Statistic, res.Variable, s.CategoriesFrom, s.Alpha, s.Adjustment, res.Weights.Kind)
			return plot.CategoryMap(w, f, lay.Geoms, cats, plot.LocalLegend(res.Kind), opt)
		}},
		{p.value, func(w io.Writer, f plot.Format) error {
			col, err := lay.Column(res.Variable)
			if err != nil {
				return err
			}
			opt := mapOpt
			opt.Title, opt.Subtitle = res.Variable, p.classes.name+" classes"
			return plot.Choropleth(w, f, lay.Geoms, col.Num, col.Missing, p.classes.rule, 5, res.Variable, opt)
		}},
		{p.scatter, func(w io.Writer, f plot.Format) error { return moranScatter(w, f, res, note) }},
		{p.histogram, func(w io.Writer, f plot.Format) error {
			a := res.NullArea()
			opt := plot.PlotOptions{Title: fmt.Sprintf("%s at area %s", s.Statistic, p.area),
				Subtitle: fmt.Sprintf("%s conditional shuffles; p = %s (%s), category: %s", numtext.Count(a.Permutations), report.PValue(a.P), s.Alternative, a.Category),
				XLabel:   s.Statistic, YLabel: "shuffles", Note: note}
			return plot.Histogram(w, f, a.Null, a.Statistic, opt)
		}},
	}
	for _, pic := range pictures {
		if pic.path == "" {
			continue
		}
		f, err := plot.FormatFromPath(pic.path)
		if err != nil {
			return usagef("%v", err)
		}
		if err := writeOutput(pic.path, stdout, inputs, func(w io.Writer) error { return pic.draw(w, f) }); err != nil {
			return err
		}
		res.Written = append(res.Written, pic.path)
	}
	return nil
}

// moranScatter draws the analysed areas' standardised values against the
// lag of their neighbours', coloured by category.
func moranScatter(w io.Writer, f plot.Format, res *local.Result, note string) error {
	if res.Kind != local.Moran && res.Kind != local.CrossMoran {
		return usagef("--scatter draws the Moran scatter, for --statistic moran or cross-moran")
	}
	areas := res.Analysed()
	z, lag, cats := make([]float64, len(areas)), make([]float64, len(areas)), make([]int, len(areas))
	for k, a := range areas {
		z[k], lag[k], cats[k] = a.Standardised, a.StandardisedLag, local.CategoryIndex(res.Kind, a.Category)
	}
	yLabel := "mean of the neighbours (standardised)"
	if res.Against != "" {
		yLabel = "neighbours' " + res.Against + " (standardised)"
	}
	opt := plot.PlotOptions{Title: res.Variable + " against its neighbours", Subtitle: res.Weights.Kind + ", " + res.Weights.Transform,
		XLabel: res.Variable + " (standardised)", YLabel: yLabel, Note: note}
	return plot.MoranScatter(w, f, z, lag, cats, plot.LocalLegend(res.Kind), res.Summary.Total/float64(len(areas)), opt)
}
