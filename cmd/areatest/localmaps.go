package main

import (
	"fmt"
	"image/color"
	"io"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/plot"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/weights"
)

// localPictures are the files `areatest local` draws, by role.
type localPictures struct {
	category, value, scatter, histogram string
	classes, area                       string
}

// The colours of the categories that are not local Moran's own: the
// project's palette (io/plot) carries the four Moran categories; the others
// reuse its hues in the same sense (orange high, purple low, dark for
// resemblance, light for contrast).
var (
	noNeighboursColour = color.RGBA{0xbd, 0xbd, 0xbd, 0xff}
)

// legendFor returns the category legend of a statistic and the index of
// each category name in it.
func legendFor(kind local.Kind) ([]plot.Category, map[string]int) {
	pal := plot.LocalCategories()
	var legend []plot.Category
	switch kind {
	case local.Moran, local.CrossMoran:
		legend = []plot.Category{
			{Name: local.HighHigh + ": high, neighbours high", Color: pal[plot.HighHigh].Color},
			{Name: local.LowLow + ": low, neighbours low", Color: pal[plot.LowLow].Color},
			{Name: local.HighLow + ": high, neighbours low", Color: pal[plot.HighLow].Color},
			{Name: local.LowHigh + ": low, neighbours high", Color: pal[plot.LowHigh].Color},
		}
	case local.Geary:
		legend = []plot.Category{
			{Name: local.SimilarHigh + " (like neighbours, high)", Color: pal[plot.HighHigh].Color},
			{Name: local.SimilarLow + " (like neighbours, low)", Color: pal[plot.LowLow].Color},
			{Name: local.SimilarMixed + " (like neighbours, mixed)", Color: pal[plot.HighLow].Color},
			{Name: local.Dissimilar + " (unlike neighbours)", Color: pal[plot.LowHigh].Color},
		}
	default: // Gi, Gi*
		legend = []plot.Category{
			{Name: local.HighCluster + ": high values around", Color: pal[plot.HighHigh].Color},
			{Name: local.LowCluster + ": low values around", Color: pal[plot.LowLow].Color},
		}
	}
	legend = append(legend,
		plot.Category{Name: local.NotSignificant, Color: pal[plot.NotSignificant].Color},
		plot.Category{Name: local.NoNeighbours, Color: noNeighboursColour})
	keys := append(categoryKeys(kind), local.NotSignificant, local.NoNeighbours)
	index := map[string]int{}
	for k, name := range keys {
		index[name] = k
	}
	return legend, index
}

func categoryKeys(kind local.Kind) []string {
	switch kind {
	case local.Moran, local.CrossMoran:
		return []string{local.HighHigh, local.LowLow, local.HighLow, local.LowHigh}
	case local.Geary:
		return []string{local.SimilarHigh, local.SimilarLow, local.SimilarMixed, local.Dissimilar}
	}
	return []string{local.HighCluster, local.LowCluster}
}

func (p localPictures) draw(lay *layer.Layer, doc *report.LocalDocument, kind local.Kind, variable string,
	results []local.AreaResult, hist int, stdout io.Writer, inputs []string) error {
	lonLat := weights.DetectMetric(lay.Geoms) == weights.Geographic
	note := fmt.Sprintf("%s · seed %d · %s shuffles per area · areatest %s. Clusters are patterns across areas, not causes.",
		lay.Source, doc.Summary.Seed, numtext.Count(doc.Summary.Permutations), doc.Version)
	subtitle := fmt.Sprintf("%s of %s, %s p-values at %g (%s); %s", doc.Summary.Statistic, variable, doc.Summary.CategoriesFrom,
		doc.Summary.Alpha, doc.Summary.Adjustment, doc.Weights.Kind)
	mapOpt := plot.MapOptions{Subtitle: subtitle, LonLat: lonLat, Note: note, IDs: lay.IDs}
	if p.category != "" {
		legend, index := legendFor(kind)
		cats := make([]int, len(doc.Areas))
		for i, a := range doc.Areas {
			k, ok := index[a.Category]
			if !ok {
				k = -1 // no data
			}
			cats[i] = k
		}
		opt := mapOpt
		opt.Title = "Where " + variable + " clusters"
		opt.LegendTitle = "category"
		if err := drawTo(p.category, stdout, inputs, func(w io.Writer, f plot.Format) error {
			return plot.CategoryMap(w, f, lay.Geoms, cats, legend, opt)
		}); err != nil {
			return err
		}
	}
	if p.value != "" {
		values := make([]float64, len(doc.Areas))
		missing := make([]bool, len(doc.Areas))
		for i, a := range doc.Areas {
			if a.Value == nil {
				missing[i] = true
			} else {
				values[i] = *a.Value
			}
		}
		classes := plot.Quantile
		if p.classes == "natural" {
			classes = plot.NaturalBreaks
		}
		opt := mapOpt
		opt.Title = variable
		opt.Subtitle = fmt.Sprintf("%s classes", map[string]string{"quantile": "quantile", "natural": "natural-breaks"}[p.classes])
		if err := drawTo(p.value, stdout, inputs, func(w io.Writer, f plot.Format) error {
			return plot.Choropleth(w, f, lay.Geoms, values, missing, classes, 5, variable, opt)
		}); err != nil {
			return err
		}
	}
	if p.scatter != "" {
		if kind != local.Moran && kind != local.CrossMoran {
			return usagef("--scatter draws the Moran scatter, for --statistic moran or cross-moran")
		}
		legend, index := legendFor(kind)
		z := make([]float64, len(results))
		lag := make([]float64, len(results))
		cats := make([]int, len(results))
		for k, r := range results {
			z[k], lag[k] = r.Standardised, r.StandardisedLag
			cats[k] = index[r.Category]
		}
		slope := doc.Summary.Total / float64(len(results))
		yLabel := "mean of the neighbours (standardised)"
		if doc.Against != "" {
			yLabel = "neighbours' " + doc.Against + " (standardised)"
		}
		opt := plot.PlotOptions{Title: variable + " against its neighbours", Subtitle: doc.Weights.Kind + ", " + doc.Weights.Transform,
			XLabel: variable + " (standardised)", YLabel: yLabel, Note: note}
		if err := drawTo(p.scatter, stdout, inputs, func(w io.Writer, f plot.Format) error {
			return plot.MoranScatter(w, f, z, lag, cats, legend, slope, opt)
		}); err != nil {
			return err
		}
	}
	if p.histogram != "" {
		r := results[hist]
		opt := plot.PlotOptions{Title: fmt.Sprintf("%s at area %s", doc.Summary.Statistic, p.area),
			Subtitle: fmt.Sprintf("%s conditional shuffles; p = %s (%s), category: %s", numtext.Count(r.Permutations), report.PValue(r.P), doc.Summary.Alternative, r.Category),
			XLabel:   doc.Summary.Statistic, YLabel: "shuffles", Note: note}
		if err := drawTo(p.histogram, stdout, inputs, func(w io.Writer, f plot.Format) error {
			return plot.Histogram(w, f, r.Null, r.Statistic, opt)
		}); err != nil {
			return err
		}
	}
	return nil
}

// drawTo renders a picture into path (format from the extension) safely.
func drawTo(path string, stdout io.Writer, inputs []string, draw func(io.Writer, plot.Format) error) error {
	f, err := plot.FormatFromPath(path)
	if err != nil {
		return usagef("%v", err)
	}
	return writeOutput(path, stdout, inputs, func(w io.Writer) error { return draw(w, f) })
}
