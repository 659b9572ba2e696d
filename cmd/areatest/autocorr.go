package main

import (
	"fmt"
	"io"
	"runtime"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/clustering"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

const autocorrUsage = `areatest autocorr: does a variable cluster in space, and how strongly?

For each variable: Moran's I with its moments under normality and
randomisation and a permutation p-value, the range Moran's I can take on
these weights, Geary's C, and Getis–Ord General G for values that are zero
or more. Text columns get join counts. With --events and --population the
rate events/population is tested raw and empirical-Bayes standardised, so
that small populations do not drive the result.

Usage:
  areatest autocorr --input FILE --variables COLUMN[,COLUMN…] [flags]

Examples:
  areatest autocorr --input counties.geojson --variables rate,income
  areatest autocorr -i counties.geojson --variables income --lags 4
  areatest autocorr -i counties.geojson --variables income --lags 6 --lag-width 25
  areatest autocorr -i counties.geojson --variables income --against rate
  areatest autocorr -i counties.geojson --events cases --population pop
  areatest autocorr -i counties.geojson --variables policy --knn 6 --format json
`

// clusterFlags are the settings autocorr and screen share.
type clusterFlags struct {
	input, id, alternative, format, output string
	skipBadGeometry                        bool
	permutations, workers                  int
	seed                                   uint64
	weights                                weightFlags
	spec                                   weights.Spec // set by prepare
}

func (c *clusterFlags) register(fs *pflag.FlagSet, formats string) {
	fs.StringVarP(&c.input, "input", "i", "", "GeoJSON FeatureCollection of polygons (- for stdin)")
	fs.StringVar(&c.id, "id", "", "column holding area ids (default: the feature id)")
	fs.BoolVar(&c.skipBadGeometry, "skip-bad-geometry", false, "leave out features with no or non-polygon geometry, with a warning")
	fs.StringVar(&c.alternative, "alternative", "two-sided", "two-sided, greater (more clustered than chance) or less (more dispersed)")
	fs.IntVarP(&c.permutations, "permutations", "n", 9999, "Monte Carlo shuffles per test")
	fs.Uint64Var(&c.seed, "seed", 1, "seed of the random shuffles; the same seed gives the same result")
	fs.IntVar(&c.workers, "workers", runtime.NumCPU(), "goroutines sharing the shuffles (results do not depend on it)")
	fs.StringVar(&c.format, "format", "text", formats)
	fs.StringVarP(&c.output, "output", "o", "-", "write the result here instead of stdout")
	c.weights.register(fs)
}

// prepare checks the shared flags, reads the layer and builds the graph.
func (c *clusterFlags) prepare(cmd string, stdin io.Reader, stderr io.Writer, formats ...string) (*layer.Layer, clustering.Input, clustering.Options, error) {
	var in clustering.Input
	var opt clustering.Options
	if c.input == "" {
		return nil, in, opt, usagef("--input is required (see areatest %s --help)", cmd)
	}
	okFormat := false
	for _, f := range formats {
		okFormat = okFormat || c.format == f
	}
	if !okFormat {
		return nil, in, opt, usagef("--format must be one of %v, not %q", formats, c.format)
	}
	alt, err := shuffle.ParseAlternative(c.alternative)
	if err != nil {
		return nil, in, opt, usagef("--alternative: %v", err)
	}
	if c.permutations < 1 || c.workers < 1 {
		return nil, in, opt, usagef("--permutations and --workers must be at least 1")
	}
	spec, transform, keep, err := c.weights.spec()
	if err != nil {
		return nil, in, opt, err
	}
	lay, warnings, err := readLayer(c.input, stdin, geojson.Options{IDColumn: c.id, SkipBadGeometry: c.skipBadGeometry})
	if err != nil {
		return nil, in, opt, err
	}
	for _, w := range warnings {
		warn(stderr, w)
	}
	c.spec = spec
	g, warnings, err := c.weights.graph(lay, spec)
	for _, w := range warnings {
		warn(stderr, w)
	}
	if err != nil {
		return nil, in, opt, err
	}
	in = clustering.Input{File: lay.Source, IDs: lay.IDs, Graph: g, Transform: transform, KeepIslands: keep}
	opt = clustering.Options{Permutations: c.permutations, Seed: c.seed, Workers: c.workers, Alternative: alt}
	return lay, in, opt, nil
}

func numericColumn(lay *layer.Layer, name, role string) (*clustering.Column, error) {
	col, err := lay.Column(name)
	if err != nil {
		return nil, err
	}
	if col.Kind != layer.Number {
		return nil, fmt.Errorf("%s: column %q is not numeric (first non-number value %q in area %s); %s must be a number", lay.Source, name, firstValue(col), firstID(lay, col), role)
	}
	return &clustering.Column{Name: name, Values: col.Num, Missing: col.Missing}, nil
}

func runAutocorr(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var c clusterFlags
	var variables []string
	var against, events, population string
	var lags int
	var lagWidth float64
	fs := newFlags("autocorr", autocorrUsage, stderr)
	fs.StringSliceVar(&variables, "variables", nil, "columns to test, comma-separated (text columns get join counts)")
	fs.StringVar(&against, "against", "", "also the bivariate Moran's I of each variable against the spatial lag of this column")
	fs.StringVar(&events, "events", "", "column of event counts: test the rate events/population")
	fs.StringVar(&population, "population", "", "column of populations at risk, with --events")
	fs.IntVar(&lags, "lags", 0, "also a correlogram: Moran's I at neighbour orders 1..K (or K distance classes with --lag-width)")
	fs.Float64Var(&lagWidth, "lag-width", 0, "with --lags: distance classes of this width (km on lon/lat layers) instead of neighbour orders")
	c.register(fs, "text or json")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if len(variables) == 0 && events == "" {
		return usagef("give --variables, or --events with --population (see areatest autocorr --help)")
	}
	if (events == "") != (population == "") {
		return usagef("--events and --population go together")
	}
	if lags < 0 {
		return usagef("--lags must not be negative")
	}
	if lagWidth < 0 || (lagWidth > 0 && lags == 0) {
		return usagef("--lag-width is a positive distance and goes with --lags")
	}
	lay, in, opt, err := c.prepare("autocorr", stdin, stderr, "text", "json")
	if err != nil {
		return err
	}
	for _, v := range variables {
		col, err := lay.Column(v)
		if err != nil {
			return err
		}
		if col.Kind == layer.Number {
			in.Numeric = append(in.Numeric, clustering.Column{Name: v, Values: col.Num, Missing: col.Missing})
		} else {
			in.Categorical = append(in.Categorical, clustering.Categories{Name: v, Labels: labels(col), Missing: col.Missing})
		}
	}
	if against != "" {
		if in.Against, err = numericColumn(lay, against, "the --against column"); err != nil {
			return err
		}
	}
	if events != "" {
		if in.Events, err = numericColumn(lay, events, "an event count"); err != nil {
			return err
		}
		if in.Population, err = numericColumn(lay, population, "a population"); err != nil {
			return err
		}
	}
	in.Lags = lags
	if lagWidth > 0 {
		in.Lags = 0
		if in.DistanceClasses, err = c.spec.DistanceClasses(lay.Geoms, lagWidth, lags); err != nil {
			return fmt.Errorf("%s: %v", lay.Source, err)
		}
	}
	bar := newProgress(stderr)
	opt.Progress = bar.stage
	res, err := clustering.Autocorr(in, opt)
	bar.finish()
	if err != nil {
		return fmt.Errorf("%s: %v", lay.Source, err)
	}
	res.Version = Version
	if c.format == "json" {
		for _, w := range res.Warnings {
			warn(stderr, w)
		}
	}
	return writeOutput(c.output, stdout, []string{c.input, c.weights.file}, func(w io.Writer) error {
		if c.format == "json" {
			return report.JSON(w, res)
		}
		return report.AutocorrText(w, res)
	})
}
