package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/spatial/rates"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// localFlags are the settings of `areatest local`.
type localFlags struct {
	sharedFlags
	variable, against, statistic, adjust, out, categories, classes string
	// The pictures, and the area of the histogram.
	mapFile, choropleth, scatter, histogram, area string
	alpha                                         float64
	top                                           int
	// A rate from counts: analysed as its empirical-Bayes scores, mapped
	// raw or smoothed.
	events, population, smooth string
	unstableBelow              float64
	mapped                     []float64 // set by input when counts are given
	mappedName                 string
	// Set by check.
	kind      local.Kind
	opt       local.Options
	classRule figure.Classes
}

func (c *localFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&c.variable, "variable", "", "numeric column to analyse")
	fs.StringVar(&c.events, "events", "", "instead of --variable: column of event counts, analysed as the rate events/population by its empirical-Bayes standardised scores (Assunção & Reis 1999)")
	fs.StringVar(&c.population, "population", "", "with --events: column of populations at risk")
	fs.StringVar(&c.smooth, "smooth", "raw", "with --events: the rate --choropleth maps: raw, global (empirical-Bayes smoothed towards the map's rate, Marshall 1991) or spatial (towards each area's neighbourhood)")
	fs.Float64Var(&c.unstableBelow, "unstable-below", rates.DefaultUnstable, "with --events: flag rates resting on fewer events than this as unstable")
	fs.StringVar(&c.against, "against", "", "with --statistic cross-moran: the column whose neighbours' values are compared")
	fs.StringVar(&c.statistic, "statistic", "moran", "moran, cross-moran, geary, gi or gi-star")
	fs.StringVar(&c.adjust, "adjust", "bh", "adjustment across areas: bh (Benjamini–Hochberg), by, holm, bonferroni or none")
	fs.Float64Var(&c.alpha, "alpha", 0.05, "level at which an area counts as significant")
	fs.StringVar(&c.categories, "categories", "adjusted", "categories from the adjusted or the raw p-values")
	fs.StringVar(&c.out, "out", "", "per-area results: a .csv table, or a copy of the layer with the results added: .gpkg (GeoPackage, in the layer's coordinate system) or .geojson (lon/lat layers only)")
	fs.StringVar(&c.mapFile, "map", "", "map of the areas' categories (.svg or .png)")
	fs.StringVar(&c.choropleth, "choropleth", "", "map of the variable in classes (.svg or .png), see --classes")
	fs.StringVar(&c.scatter, "scatter", "", "scatter of the standardised variable against its spatial lag (.svg or .png)")
	fs.StringVar(&c.histogram, "histogram", "", "permutation histogram of one area, named by --area (.svg or .png)")
	fs.StringVar(&c.area, "area", "", "the area (id) for --histogram")
	fs.StringVar(&c.classes, "classes", "quantile", "classes of --choropleth: quantile or natural (natural breaks, Fisher 1958), 5 of them")
	fs.IntVar(&c.top, "top", 10, "how many of the strongest areas the text report lists")
	c.sharedFlags.register(fs, "text", "json")
	fs.Lookup("alternative").Usage = "two-sided (default), folded (the tail the observed value falls in; flags about 2·alpha of areas without any pattern), greater or less"
}

// check checks local's own flags and reads the statistic, the options of
// the tests (the alternative comes with the shared flags) and the class
// rule of the choropleth.
func (c *localFlags) check() (err error) {
	switch {
	case c.variable == "" && c.events == "":
		return usagef("--variable is required, or --events with --population (see areatest local --help)")
	case c.variable != "" && c.events != "":
		return usagef("give --variable, or --events with --population, not both")
	case (c.events == "") != (c.population == ""):
		return usagef("--events and --population go together")
	case c.events == "" && (c.weights.changed("smooth") || c.weights.changed("unstable-below")):
		return usagef("--smooth and --unstable-below go with --events")
	}
	if _, err := choice.Parse("--smooth", c.smooth, choice.Name[string]{Name: "raw"}, choice.Name[string]{Name: "global"}, choice.Name[string]{Name: "spatial"}); err != nil {
		return usagef("%v", err)
	}
	if c.kind, err = local.ParseKind(c.statistic); err != nil {
		return usagef("--statistic: %v", err)
	}
	if c.opt.Adjustment, err = shuffle.ParseAdjustment(c.adjust); err != nil {
		return usagef("--adjust: %v", err)
	}
	if c.opt.RawCategories, err = choice.Parse("--categories", c.categories,
		choice.Name[bool]{Name: "adjusted", Value: false}, choice.Name[bool]{Name: "raw", Value: true}); err != nil {
		return usagef("%v", err)
	}
	if c.classRule, err = choice.Parse("--classes", c.classes,
		choice.Name[figure.Classes]{Name: "quantile", Value: figure.Quantile}, choice.Name[figure.Classes]{Name: "natural", Value: figure.NaturalBreaks}); err != nil {
		return usagef("%v", err)
	}
	if err = c.checkFiles(); err != nil {
		return err
	}
	c.opt.Permutations, c.opt.Seed, c.opt.Workers, c.opt.Alpha = c.permutations, c.seed, c.workers, c.alpha
	return nil
}

// checkFiles checks the flags of the table and the pictures and asks for
// the files they name. The table and the pictures always go to files (their
// kind is read from the extension); only the report of --output goes to
// standard output.
func (c *localFlags) checkFiles() error {
	switch {
	case (c.kind == local.CrossMoran) != (c.against != ""):
		return usagef("--against goes with --statistic cross-moran, and that statistic needs it")
	case !(c.alpha > 0 && c.alpha < 1):
		return usagef("--alpha must be between 0 and 1")
	case c.scatter != "" && c.kind != local.Moran && c.kind != local.CrossMoran:
		return usagef("--scatter draws the Moran scatter, for --statistic moran or cross-moran")
	case (c.histogram == "") != (c.area == ""):
		return usagef("--histogram and --area go together")
	}
	if err := checkAreaTable("--out", c.out); err != nil {
		return err
	}
	c.wantOutput("--out", c.out)
	for _, p := range []struct{ flag, path string }{{"--map", c.mapFile}, {"--choropleth", c.choropleth}, {"--scatter", c.scatter}, {"--histogram", c.histogram}} {
		switch _, err := figure.FormatFromPath(p.path); {
		case p.path == "":
			continue
		case p.path == "-":
			return usagef("%s draws into a file, not standard output: give a name ending in .svg or .png", p.flag)
		case err != nil:
			return usagef("%s: %v", p.flag, err)
		}
		c.wantOutput(p.flag, p.path)
	}
	return nil
}

func runLocal(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var c localFlags
	fs := newFlags("local", stderr)
	c.register(fs)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if err := c.check(); err != nil {
		return err
	}
	if err := c.prepare("local", stdin, stderr, shuffle.ParseLocalAlternative); err != nil {
		return err
	}
	if err := checkAreaTableCRS("--out", c.out, c.lay); err != nil {
		return err
	}
	if (c.kind == local.Gi || c.kind == local.GiStar) && !c.weights.scalingGiven() {
		// Getis–Ord statistics are defined on binary weights (Ord & Getis
		// 1995), with w_ii = 1 for Gi*.
		c.scaling = weights.Binary
	}
	in, err := c.input()
	if err != nil {
		return err
	}
	c.opt.Alternative = c.alt
	res, err := local.Analyse(c.kind, in, c.opt)
	if na := (*local.NotAnalysedError)(nil); errors.As(err, &na) {
		return fmt.Errorf("%s: --area %q is not an analysed area (unknown id, no value of %s, or no neighbour)", na.File, na.ID, na.Variable)
	}
	if err != nil {
		return err
	}
	res.Version = Version
	if w := c.unstableWarning(); w != "" {
		res.Warnings = append(res.Warnings, w)
	}
	pics := report.LocalPictures{Layer: c.lay, Result: res, Classes: c.classRule}
	if c.mapped != nil {
		pics.Mapped, pics.MappedName = c.mapped, c.mappedName
	}
	c.write(pics)
	return c.emit(stdout, stderr, res.Warnings, map[string]func(io.Writer) error{
		"json": func(w io.Writer) error { return report.JSON(w, res) },
		"text": func(w io.Writer) error { return report.LocalText(w, res, c.top) },
		"html": c.page(res, c.top, localPagePictures(pics)...),
	})
}

// input gathers the columns of the analysis from the layer.
func (c *localFlags) input() (local.Input, error) {
	in := local.Input{File: c.lay.Source, IDs: c.lay.IDs, Variable: c.variable, Against: c.against,
		Graph: c.graph, Scaling: c.scaling, KeepIslands: c.keepIslands, NullOf: c.area}
	if c.events != "" {
		return in, c.rateInput(&in)
	}
	col, err := c.lay.NumericColumn(c.variable, "the variable")
	if err != nil {
		return in, err
	}
	in.Values, in.Missing = col.Num, col.Missing
	if c.against != "" {
		if col, err = c.lay.NumericColumn(c.against, "the --against column"); err != nil {
			return in, err
		}
		in.AgainstValues, in.AgainstMissing = col.Num, col.Missing
	}
	return in, nil
}

// write gives each planned file of the table and the pictures its
// renderer, and lists them in res.Written; emit writes them with the
// report.
func (c *localFlags) write(pics report.LocalPictures) {
	res := pics.Result
	table := func(w io.Writer, _ figure.Format) error {
		return writeAreaTable(w, c.out, pics.Layer, func(w io.Writer) error { return report.LocalCSV(w, res, c.rateColumns()...) },
			func() []*layer.Column { return append(report.LocalColumns(res), c.rateColumns()...) })
	}
	draw := map[string]func(io.Writer, figure.Format) error{"--out": table, "--map": pics.Map, "--choropleth": pics.Choropleth,
		"--scatter": pics.Scatter, "--histogram": pics.Histogram, "--report": nil}
	res.Written = append(res.Written, c.renderFiles(draw)...)
}

// crsLabel names a coordinate system for a message: " (EPSG:5070)", " (a
// name)" or "".
func crsLabel(c layer.CRS) string {
	switch {
	case c.EPSG > 0:
		return fmt.Sprintf(" (EPSG:%d)", c.EPSG)
	case c.Name != "":
		return fmt.Sprintf(" (%s)", c.Name)
	}
	return ""
}

// localPagePictures are the pictures of the page of --report: the
// category map and the choropleth always, the Moran scatter for the Moran
// statistics.
func localPagePictures(p report.LocalPictures) []pagePicture {
	pics := []pagePicture{
		{"Categories", "Each area in its category at the level of the test; hatched areas have no value. Clusters are patterns across areas, not causes.", p.Map},
		{p.Result.Variable + " in classes", "The variable itself in five classes, lightest for the lowest; hatched areas have no value.", p.Choropleth},
	}
	if k := p.Result.Kind; k == local.Moran || k == local.CrossMoran {
		pics = append(pics, pagePicture{"Moran scatter", "Each analysed area's standardised value against its neighbours' mean; the slope of the line is the global Moran's I.", p.Scatter})
	}
	return pics
}

// rateInput makes the analysed variable of --events/--population: the
// empirical-Bayes standardised rates of the areas with both counts (each
// area's counts checked, an error naming the first that makes no rate),
// and the rate --smooth asks the choropleth to map.
func (c *localFlags) rateInput(in *local.Input) error {
	lay := c.lay
	ev, err := lay.NumericColumn(c.events, "the event count")
	if err != nil {
		return err
	}
	pop, err := lay.NumericColumn(c.population, "the population")
	if err != nil {
		return err
	}
	keep := weights.Present(lay.Len(), ev.Missing, pop.Missing)
	e, p, ids := make([]float64, len(keep)), make([]float64, len(keep)), make([]string, len(keep))
	for k, i := range keep {
		e[k], p[k], ids[k] = ev.Num[i], pop.Num[i], lay.IDs[i]
	}
	if err := rates.Validate(e, p, true, ids); err != nil {
		return fmt.Errorf("%s: %w", lay.Source, err)
	}
	eb, err := rates.EBStandardise(e, p)
	if err != nil {
		return fmt.Errorf("%s: %w", lay.Source, err)
	}
	mapped, err := c.smoothed(e, p, keep, eb.Rates)
	if err != nil {
		return err
	}
	n := lay.Len()
	in.Variable = c.events + " per " + c.population + " (empirical-Bayes standardised)"
	in.Values, in.Missing = make([]float64, n), make([]bool, n)
	c.mapped = make([]float64, n)
	for i := range in.Missing {
		in.Missing[i], c.mapped[i] = true, math.NaN()
	}
	for k, i := range keep {
		in.Values[i], in.Missing[i], c.mapped[i] = eb.Scores[k], false, mapped[k]*100000
	}
	c.mappedName = fmt.Sprintf("%s rate of %s per 100,000 %s", map[string]string{"raw": "raw", "global": "smoothed (global empirical-Bayes)", "spatial": "smoothed (spatial empirical-Bayes)"}[c.smoothRule()], c.events, c.population)
	return nil
}

// smoothRule is --smooth read (checked by check).
func (c *localFlags) smoothRule() string {
	rule, _ := choice.Parse("--smooth", c.smooth, choice.Name[string]{Name: "raw", Value: "raw"}, choice.Name[string]{Name: "global", Value: "global"}, choice.Name[string]{Name: "spatial", Value: "spatial"})
	return rule
}

// smoothed gives the rates of the areas keep (with counts e over p) the
// choropleth maps: raw, or smoothed by empirical Bayes towards the map's
// rate or each area's neighbourhood (rates.GlobalEB, rates.SpatialEB on
// the neighbour graph among those areas).
func (c *localFlags) smoothed(e, p []float64, keep []int, raw []float64) ([]float64, error) {
	switch c.smoothRule() {
	case "global":
		return rates.GlobalEB(e, p)
	case "spatial":
		s, _, err := rates.SpatialEB(e, p, c.graph.Subset(keep))
		return s, err
	}
	return raw, nil
}

// unstableWarning counts the analysed areas whose rate rests on fewer than
// --unstable-below events, for the result's warnings ("" when none).
func (c *localFlags) unstableWarning() string {
	if c.events == "" {
		return ""
	}
	ev, _ := c.lay.NumericColumn(c.events, "the event count")
	pop, _ := c.lay.NumericColumn(c.population, "the population")
	var ids []string
	count, total := 0, 0
	for i := range c.lay.IDs {
		if ev.Missing[i] || pop.Missing[i] {
			continue
		}
		total++
		if ev.Num[i] < c.unstableBelow {
			if count++; len(ids) < 5 {
				ids = append(ids, c.lay.IDs[i])
			}
		}
	}
	if count == 0 {
		return ""
	}
	more := ""
	if count > len(ids) {
		more = fmt.Sprintf(" and %d more", count-len(ids))
	}
	return fmt.Sprintf("%d of %d areas have fewer than %g events (%s%s): their rates are unstable; the empirical-Bayes scores weigh them by their populations, and --smooth maps them smoothed.",
		count, total, c.unstableBelow, strings.Join(ids, ", "), more)
}

// rateColumns are the per-area columns of a rate from counts for --out:
// the rate mapped (per 100,000; raw or smoothed as --smooth says) and
// whether it rests on fewer than --unstable-below events; none without
// --events.
func (c *localFlags) rateColumns() []*layer.Column {
	if c.events == "" {
		return nil
	}
	n := c.lay.Len()
	ev, _ := c.lay.NumericColumn(c.events, "the event count")
	rate := &layer.Column{Name: "rate_per_100000", Kind: layer.Number, Num: c.mapped, Missing: make([]bool, n)}
	unstable := &layer.Column{Name: "unstable_rate", Kind: layer.Text, Str: make([]string, n), Missing: make([]bool, n)}
	for i := range n {
		rate.Missing[i] = math.IsNaN(c.mapped[i])
		unstable.Missing[i] = rate.Missing[i]
		unstable.Str[i] = strconv.FormatBool(!unstable.Missing[i] && ev.Num[i] < c.unstableBelow)
	}
	return []*layer.Column{rate, unstable}
}
