package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/plot"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/clustering"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

const localUsage = `areatest local: where are the clusters and outliers?

Computes a statistic for every area and tests it by conditional
permutation: the area keeps its own value while its neighbours' values are
drawn from the other areas. P-values are adjusted across areas
(Benjamini–Hochberg by default) and each area gets a category.

Statistics: moran (local Moran, default), cross-moran (with --against),
geary (local Geary), gi and gi-star (Getis–Ord).

Usage:
  areatest local --input FILE --variable COLUMN [flags]

Examples:
  areatest local --input counties.geojson --variable rate
  areatest local -i counties.geojson --variable rate --out clusters.geojson --map clusters.png
  areatest local -i counties.geojson --variable rate --out clusters.csv --adjust holm
  areatest local -i counties.geojson --variable rate --statistic gi-star --knn 8
  areatest local -i counties.geojson --variable income --against rate --statistic cross-moran
  areatest local -i counties.geojson --variable rate --histogram d017.svg --area D017
`

// nodata is the category of areas without a value of the variable.
const nodata = "no data"

func runLocal(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var c clusterFlags
	var variable, against, statistic, adjust, out, mapFile, valueMap, scatterFile, histFile, area, classes, categoriesFrom string
	var alpha float64
	var top int
	fs := newFlags("local", localUsage, stderr)
	fs.StringVar(&variable, "variable", "", "numeric column to analyse")
	fs.StringVar(&against, "against", "", "with --statistic cross-moran: the column whose neighbours' values are compared")
	fs.StringVar(&statistic, "statistic", "moran", "moran, cross-moran, geary, gi or gi-star")
	fs.StringVar(&adjust, "adjust", "bh", "adjustment across areas: bh (Benjamini–Hochberg), by, holm, bonferroni or none")
	fs.Float64Var(&alpha, "alpha", 0.05, "level at which an area counts as significant")
	fs.StringVar(&categoriesFrom, "categories", "adjusted", "categories from the adjusted or the raw p-values")
	fs.StringVar(&out, "out", "", "per-area results: a .csv table or a .geojson copy of the layer with the results added")
	fs.StringVar(&mapFile, "map", "", "map of the areas' categories (.svg or .png)")
	fs.StringVar(&valueMap, "choropleth", "", "map of the variable in classes (.svg or .png), see --classes")
	fs.StringVar(&scatterFile, "scatter", "", "scatter of the standardised variable against its spatial lag (.svg or .png)")
	fs.StringVar(&histFile, "histogram", "", "permutation histogram of one area, named by --area (.svg or .png)")
	fs.StringVar(&area, "area", "", "the area (id) for --histogram")
	fs.StringVar(&classes, "classes", "quantile", "classes of --choropleth: quantile or natural (natural breaks, Fisher 1958), 5 of them")
	fs.IntVar(&top, "top", 10, "how many of the strongest areas the text report lists")
	c.register(fs, "text or json")
	fs.Lookup("alternative").Usage = "two-sided (default), folded (the tail the observed value falls in; flags about 2·alpha of areas without any pattern), greater or less"
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if variable == "" {
		return usagef("--variable is required (see areatest local --help)")
	}
	kind, err := local.ParseKind(statistic)
	if err != nil {
		return usagef("--statistic: %v", err)
	}
	if (kind == local.CrossMoran) != (against != "") {
		return usagef("--against goes with --statistic cross-moran, and that statistic needs it")
	}
	method, err := shuffle.ParseMethod(adjust)
	if err != nil {
		return usagef("--adjust: %v", err)
	}
	if categoriesFrom != "adjusted" && categoriesFrom != "raw" {
		return usagef("--categories must be adjusted or raw")
	}
	if !(alpha > 0 && alpha < 1) {
		return usagef("--alpha must be between 0 and 1")
	}
	if (histFile == "") != (area == "") {
		return usagef("--histogram and --area go together")
	}
	if classes != "quantile" && classes != "natural" {
		return usagef("--classes must be quantile or natural, not %q", classes)
	}
	for _, f := range []string{mapFile, valueMap, scatterFile, histFile} {
		if f != "" {
			if _, err := plot.FormatFromPath(f); err != nil {
				return usagef("%v", err)
			}
		}
	}
	if out != "" {
		if ext := strings.ToLower(filepath.Ext(out)); ext != ".csv" && ext != ".geojson" && ext != ".json" {
			return usagef("--out must end in .csv or .geojson, not %q", ext)
		}
	}
	alt, err := shuffle.ParseLocalAlternative(c.alternative)
	if err != nil {
		return usagef("--alternative: %v", err)
	}
	c.alternative = "two-sided" // checked above; prepare knows only the global alternatives
	lay, in, _, err := c.prepare("local", stdin, stderr, "text", "json")
	if err != nil {
		return err
	}
	if (kind == local.Gi || kind == local.GiStar) && !c.weights.changed("transform") {
		// Getis–Ord statistics are defined on binary weights (Ord & Getis
		// 1995), with w_ii = 1 for Gi*.
		in.Transform = weights.Binary
	}
	col, err := numericColumn(lay, variable, "the variable")
	if err != nil {
		return err
	}
	masks := [][]bool{col.Missing}
	var yCol *clustering.Column
	if against != "" {
		if yCol, err = numericColumn(lay, against, "the --against column"); err != nil {
			return err
		}
		masks = append(masks, yCol.Missing)
	}
	keep := presentAreas(lay.Len(), masks...)
	r, err := weights.Restrict(in.Graph, keep, lay.IDs, in.Transform, in.KeepIslands)
	if err != nil {
		return err
	}
	if len(r.Used) < 3 || r.Graph.Links() == 0 {
		return fmt.Errorf("%s: only %d areas with a value of %s have a neighbour among themselves; a local analysis needs more", lay.Source, len(r.Used), variable)
	}
	x := make([]float64, len(r.Used))
	var y []float64
	for k, u := range r.Used {
		x[k] = col.Values[keep[u]]
	}
	if yCol != nil {
		y = make([]float64, len(r.Used))
		for k, u := range r.Used {
			y[k] = yCol.Values[keep[u]]
		}
	}
	histIndex := -1
	if area != "" {
		for k, u := range r.Used {
			if lay.IDs[keep[u]] == area {
				histIndex = k
			}
		}
		if histIndex < 0 {
			return fmt.Errorf("%s: --area %q is not an analysed area (unknown id, no value of %s, or no neighbour)", lay.Source, area, variable)
		}
	}
	lopt := local.Options{Permutations: c.permutations, Seed: c.seed, Workers: c.workers, Alternative: alt, Alpha: alpha,
		Adjustment: method, RawCategories: categoriesFrom == "raw"}
	if histIndex >= 0 {
		lopt.KeepNull = []int{histIndex}
	}
	results, err := local.Run(kind, x, y, r.Graph, lopt)
	if err != nil {
		return fmt.Errorf("%s: %v", lay.Source, err)
	}
	doc := &report.LocalDocument{Version: Version, Input: lay.Source, Variable: variable, Against: against,
		Weights: r.Summary, Summary: local.Summarise(kind, results, lopt), Warnings: append([]string{}, r.Summary.Warnings...),
		Cautions: localCautions}
	for _, res := range results {
		if res.P <= alpha {
			doc.RawSignificant++
		}
		if res.AdjustedP <= alpha {
			doc.AdjustedSignificant++
		}
	}
	doc.Areas = make([]report.LocalArea, lay.Len())
	for i := range doc.Areas {
		doc.Areas[i] = report.LocalArea{ID: lay.IDs[i], AreaResult: local.AreaResult{Index: i, Category: nodata}}
		if !col.Missing[i] {
			doc.Areas[i].Value = &col.Values[i]
		}
	}
	for _, k := range keep {
		doc.Areas[k].Category = local.NoNeighbours
	}
	for k, res := range results {
		i := keep[r.Used[k]]
		res.Index = i
		doc.Areas[i] = report.LocalArea{ID: lay.IDs[i], Value: &col.Values[i], AreaResult: res, Analysed: true}
	}
	// Count categories over the whole layer, so the areas left out show too.
	count := map[string]int{}
	for _, a := range doc.Areas {
		count[a.Category]++
	}
	doc.Summary.Categories = doc.Summary.Categories[:0]
	for _, name := range append(local.Categories(kind), nodata) {
		if name != nodata || count[nodata] > 0 {
			doc.Summary.Categories = append(doc.Summary.Categories, local.CategoryCount{Category: name, Areas: count[name]})
		}
	}
	if missing := lay.Len() - len(keep); missing > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d area(s) have no value and are drawn as \"%s\".", missing, nodata))
	}
	if islands := len(keep) - len(r.Used); islands > 0 {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("%d area(s) have no neighbour among the areas with values and are left out (category \"%s\").", islands, local.NoNeighbours))
	}
	if alt == shuffle.Folded {
		doc.Warnings = append(doc.Warnings, fmt.Sprintf("Folded p-values are one-sided in the direction each area departs: on a map without any spatial pattern about %g%% of areas pass at %g before adjustment.", 200*alpha, alpha))
	}
	inputs := []string{c.input, c.weights.file}
	if out != "" {
		if err := writeLocalTable(out, lay, doc, stdout, inputs); err != nil {
			return err
		}
		doc.Written = append(doc.Written, out)
	}
	pics := localPictures{category: mapFile, value: valueMap, scatter: scatterFile, histogram: histFile, classes: classes, area: area}
	if err := pics.draw(lay, doc, kind, variable, results, histIndex, stdout, inputs); err != nil {
		return err
	}
	for _, f := range []string{mapFile, valueMap, scatterFile, histFile} {
		if f != "" {
			doc.Written = append(doc.Written, f)
		}
	}
	if c.format == "json" {
		for _, w := range doc.Warnings {
			warn(stderr, w)
		}
	}
	return writeOutput(c.output, stdout, inputs, func(w io.Writer) error {
		if c.format == "json" {
			return report.JSON(w, doc)
		}
		return report.LocalText(w, doc, top)
	})
}

var localCautions = []string{
	"A cluster on the map is a pattern across areas; it does not say what causes it.",
	"Results for areas do not carry over to the individuals living in them (the ecological fallacy).",
	"Rates from areas with small populations are unstable and often show up as outliers; smooth or standardise rates first.",
	"This tool supports, and does not replace, the judgement of trained epidemiologists and local rules of practice.",
}

// presentAreas lists the areas where no mask is set.
func presentAreas(n int, masks ...[]bool) []int {
	var keep []int
outer:
	for i := 0; i < n; i++ {
		for _, m := range masks {
			if m[i] {
				continue outer
			}
		}
		keep = append(keep, i)
	}
	return keep
}

// writeLocalTable writes the per-area results as CSV, or as the input
// features with the results added as properties.
func writeLocalTable(path string, lay *layer.Layer, doc *report.LocalDocument, stdout io.Writer, inputs []string) error {
	if strings.EqualFold(filepath.Ext(path), ".csv") {
		return writeOutput(path, stdout, inputs, func(w io.Writer) error { return report.LocalCSV(w, doc) })
	}
	n := lay.Len()
	num := func(name string, get func(a report.LocalArea) float64) *layer.Column {
		c := &layer.Column{Name: name, Kind: layer.Number, Num: make([]float64, n), Missing: make([]bool, n)}
		for i, a := range doc.Areas {
			c.Num[i], c.Missing[i] = get(a), !a.Analysed
		}
		return c
	}
	cat := &layer.Column{Name: "local_category", Kind: layer.Text, Str: make([]string, n), Missing: make([]bool, n)}
	for i, a := range doc.Areas {
		cat.Str[i] = a.Category
	}
	extra := []*layer.Column{
		num("local_lag", func(a report.LocalArea) float64 { return a.Lag }),
		num("local_statistic", func(a report.LocalArea) float64 { return a.Statistic }),
		num("local_expected", func(a report.LocalArea) float64 { return a.Expected }),
		num("local_sd", func(a report.LocalArea) float64 { return a.SD }),
		num("local_z", func(a report.LocalArea) float64 { return a.Z }),
		num("local_p", func(a report.LocalArea) float64 { return a.P }),
		num("local_p_adjusted", func(a report.LocalArea) float64 { return a.AdjustedP }),
		cat,
	}
	return writeOutput(path, stdout, inputs, func(w io.Writer) error { return geojson.Write(w, lay, extra) })
}
