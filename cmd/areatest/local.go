package main

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/report"
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

// localFlags are the settings of `areatest local`.
type localFlags struct {
	sharedFlags
	variable, against, statistic, adjust, out, categories, classes string
	pics                                                           localPictures
	alpha                                                          float64
	top                                                            int
}

func (c *localFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&c.variable, "variable", "", "numeric column to analyse")
	fs.StringVar(&c.against, "against", "", "with --statistic cross-moran: the column whose neighbours' values are compared")
	fs.StringVar(&c.statistic, "statistic", "moran", "moran, cross-moran, geary, gi or gi-star")
	fs.StringVar(&c.adjust, "adjust", "bh", "adjustment across areas: bh (Benjamini–Hochberg), by, holm, bonferroni or none")
	fs.Float64Var(&c.alpha, "alpha", 0.05, "level at which an area counts as significant")
	fs.StringVar(&c.categories, "categories", "adjusted", "categories from the adjusted or the raw p-values")
	fs.StringVar(&c.out, "out", "", "per-area results: a .csv table or a .geojson copy of the layer with the results added")
	fs.StringVar(&c.pics.category, "map", "", "map of the areas' categories (.svg or .png)")
	fs.StringVar(&c.pics.value, "choropleth", "", "map of the variable in classes (.svg or .png), see --classes")
	fs.StringVar(&c.pics.scatter, "scatter", "", "scatter of the standardised variable against its spatial lag (.svg or .png)")
	fs.StringVar(&c.pics.histogram, "histogram", "", "permutation histogram of one area, named by --area (.svg or .png)")
	fs.StringVar(&c.pics.area, "area", "", "the area (id) for --histogram")
	fs.StringVar(&c.classes, "classes", "quantile", "classes of --choropleth: quantile or natural (natural breaks, Fisher 1958), 5 of them")
	fs.IntVar(&c.top, "top", 10, "how many of the strongest areas the text report lists")
	c.sharedFlags.register(fs, "text or json")
	fs.Lookup("alternative").Usage = "two-sided (default), folded (the tail the observed value falls in; flags about 2·alpha of areas without any pattern), greater or less"
}

// options checks the flags of local's own and returns the statistic and
// the options of the tests (the alternative comes with the shared flags).
func (c *localFlags) options() (local.Kind, local.Options, error) {
	var opt local.Options
	if c.variable == "" {
		return 0, opt, usagef("--variable is required (see areatest local --help)")
	}
	kind, err := local.ParseKind(c.statistic)
	if err != nil {
		return kind, opt, usagef("--statistic: %v", err)
	}
	if (kind == local.CrossMoran) != (c.against != "") {
		return kind, opt, usagef("--against goes with --statistic cross-moran, and that statistic needs it")
	}
	if opt.Adjustment, err = shuffle.ParseMethod(c.adjust); err != nil {
		return kind, opt, usagef("--adjust: %v", err)
	}
	if opt.RawCategories, err = choice.Parse("--categories", c.categories,
		choice.Name[bool]{Name: "adjusted", Value: false}, choice.Name[bool]{Name: "raw", Value: true}); err != nil {
		return kind, opt, usagef("%v", err)
	}
	if !(c.alpha > 0 && c.alpha < 1) {
		return kind, opt, usagef("--alpha must be between 0 and 1")
	}
	if err := c.pics.check(c.classes); err != nil {
		return kind, opt, err
	}
	if c.out != "" {
		if ext := strings.ToLower(filepath.Ext(c.out)); ext != ".csv" && ext != ".geojson" && ext != ".json" {
			return kind, opt, usagef("--out must end in .csv or .geojson, not %q", ext)
		}
	}
	opt.Permutations, opt.Seed, opt.Workers, opt.Alpha = c.permutations, c.seed, c.workers, c.alpha
	return kind, opt, nil
}

func runLocal(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var c localFlags
	fs := newFlags("local", localUsage, stderr)
	c.register(fs)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	kind, opt, err := c.options()
	if err != nil {
		return err
	}
	p, err := c.prepare("local", stdin, stderr, shuffle.ParseLocalAlternative, "text", "json")
	if err != nil {
		return err
	}
	if (kind == local.Gi || kind == local.GiStar) && !c.weights.changed("transform") {
		// Getis–Ord statistics are defined on binary weights (Ord & Getis
		// 1995), with w_ii = 1 for Gi*.
		p.transform = weights.Binary
	}
	in, err := c.input(p)
	if err != nil {
		return err
	}
	opt.Alternative = p.alt
	res, err := local.Analyse(kind, in, opt)
	if na := (*local.NotAnalysedError)(nil); errors.As(err, &na) {
		return fmt.Errorf("%s: --area %q is not an analysed area (unknown id, no value of %s, or no neighbour)", na.File, na.ID, na.Variable)
	}
	if err != nil {
		return err
	}
	res.Version = Version
	if err := c.write(p.lay, res, stdout); err != nil {
		return err
	}
	return c.emit(stdout, stderr, res.Warnings, map[string]func(io.Writer) error{
		"json": func(w io.Writer) error { return report.JSON(w, res) },
		"text": func(w io.Writer) error { return report.LocalText(w, res, c.top) },
	})
}

// input gathers the columns of the analysis from the layer.
func (c *localFlags) input(p *layerGraph) (local.Input, error) {
	in := local.Input{File: p.lay.Source, IDs: p.lay.IDs, Variable: c.variable, Against: c.against,
		Graph: p.graph, Transform: p.transform, KeepIslands: p.keepIslands, NullOf: c.pics.area}
	col, err := numericColumn(p.lay, c.variable, "the variable")
	if err != nil {
		return in, err
	}
	in.Values, in.Missing = col.Num, col.Missing
	if c.against != "" {
		if col, err = numericColumn(p.lay, c.against, "the --against column"); err != nil {
			return in, err
		}
		in.AgainstValues, in.AgainstMissing = col.Num, col.Missing
	}
	return in, nil
}

// write writes the per-area table (CSV, or the layer with the results
// added) and the pictures, and lists them in res.Written.
func (c *localFlags) write(lay *layer.Layer, res *local.Result, stdout io.Writer) error {
	if c.out != "" {
		err := writeOutput(c.out, stdout, c.inputs(), func(w io.Writer) error {
			if strings.EqualFold(filepath.Ext(c.out), ".csv") {
				return report.LocalCSV(w, res)
			}
			return geojson.Write(w, lay, report.LocalColumns(res))
		})
		if err != nil {
			return err
		}
		res.Written = append(res.Written, c.out)
	}
	return c.pics.draw(lay, res, stdout, c.inputs())
}
