package main

import (
	"errors"
	"fmt"
	"io"
	"runtime"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

const compareUsage = `areatest compare: does an outcome differ between groups of areas beyond chance?

Reads a layer of areas and tests the difference between groups against
several null models side by side: shuffles of the group labels (freely, and
within strata or automatic contiguous zones), and spectral surrogates of the
outcome that keep its spatial pattern. It checks with Moran's I whether the
outcome and the grouping cluster in space, estimates how many independent
areas the data are worth, measures how often the free shuffle would cry wolf
on outcomes like this one, and says which p-value to read.

Usage:
  areatest compare --input FILE --outcome COLUMN --group COLUMN [flags]

Examples:
  areatest compare --input counties.geojson --outcome rate --group policy
  areatest compare -i counties.geojson -y rate -g policy --strata state
  areatest compare -i districts.geojson -y income -g zone --statistic anova-f
  areatest compare -i counties.geojson -y rate -g region --contrast north,south --alternative greater
  areatest compare -i counties.geojson -y rate -g policy --covariates income,age65
  cat counties.geojson | areatest compare -i - -y rate -g policy --format json -o result.json
`

// compareFlags are the settings shared by compare and demo.
type compareFlags struct {
	input, id, outcome, group, strata string
	statistic, alternative, zones     string
	format, output                    string
	contrast, covariates              []string
	permutations, workers             int
	surrogates, fpChecks, fpShuffles  int
	seed                              uint64
	alpha                             float64
	skipBadGeometry                   bool
	weights                           weightFlags
	transform                         weights.Transform // set by options
	keepIslands                       bool              // set by options
}

func (c *compareFlags) register(fs *pflag.FlagSet, withColumns bool) {
	if withColumns {
		fs.StringVarP(&c.input, "input", "i", "", "GeoJSON FeatureCollection of polygons (- for stdin)")
		fs.StringVarP(&c.outcome, "outcome", "y", "", "numeric column to compare")
		fs.StringVarP(&c.group, "group", "g", "", "column whose values name the groups")
		fs.StringVar(&c.strata, "strata", "", "column of strata: also shuffle only within each stratum")
		fs.StringVar(&c.id, "id", "", "column holding area ids (default: the feature id)")
		fs.BoolVar(&c.skipBadGeometry, "skip-bad-geometry", false, "leave out features with no or non-polygon geometry, with a warning, instead of stopping")
		fs.StringSliceVar(&c.covariates, "covariates", nil, "numeric columns to adjust for: every shuffle tests the group effect adjusted for them (Freedman–Lane)")
	}
	fs.IntVar(&c.surrogates, "surrogates", 999, "spectral surrogates of the outcome for the spatially constrained p-value (0: none)")
	fs.IntVar(&c.fpChecks, "false-positive-check", 500, "surrogate outcomes on which to measure how often the free shuffle cries wolf (0: none)")
	fs.IntVar(&c.fpShuffles, "check-shuffles", 199, "free shuffles per surrogate in the false-positive check")
	fs.StringVar(&c.zones, "zones", "auto", "without --strata, on 300 or more areas: also shuffle within automatic contiguous zones (auto), or not (none)")
	fs.StringVar(&c.statistic, "statistic", "", "median-diff, mean-diff, welch-t, rank-sum (two groups); kruskal-wallis, anova-f (any number)\n(default median-diff for two groups, kruskal-wallis for more)")
	fs.StringSliceVar(&c.contrast, "contrast", nil, "two levels A,B of the group column: report A − B (with more levels, test only these two)")
	fs.StringVar(&c.alternative, "alternative", "two-sided", "two-sided, greater (A above B) or less")
	fs.IntVarP(&c.permutations, "permutations", "n", 9999, "Monte Carlo shuffles per scheme")
	fs.Uint64Var(&c.seed, "seed", 1, "seed of the random shuffles; the same seed gives the same result")
	fs.IntVar(&c.workers, "workers", runtime.NumCPU(), "goroutines sharing the shuffles (results do not depend on it)")
	fs.Float64Var(&c.alpha, "alpha", 0.05, "level at which the spatial check calls clustering significant")
	fs.StringVar(&c.format, "format", "text", "text or json")
	fs.StringVarP(&c.output, "output", "o", "-", "write the result here instead of stdout")
	c.weights.register(fs)
}

// options checks the flag values and turns them into library options and
// the recipe of the neighbour graph.
func (c *compareFlags) options() (compare.Options, weights.Spec, error) {
	opt := compare.Options{Contrast: c.contrast, Permutations: c.permutations, Seed: c.seed, Workers: c.workers, Alpha: c.alpha,
		Surrogates: c.surrogates, FalsePositives: c.fpChecks, FalsePositiveShuffles: c.fpShuffles, Word: wordNotice}
	rule, transform, keep, err := c.weights.spec()
	if err != nil {
		return opt, rule, err
	}
	c.transform, c.keepIslands = transform, keep
	if c.statistic != "" {
		s, err := groups.ParseStatistic(c.statistic)
		if err != nil {
			return opt, rule, usagef("--statistic: %v", err)
		}
		opt.Statistic = &s
	}
	if opt.Alternative, err = shuffle.ParseAlternative(c.alternative); err != nil {
		return opt, rule, usagef("--alternative: %v", err)
	}
	zones, zonesErr := choice.Parse("--zones", c.zones, choice.Name[bool]{Name: "auto", Value: true}, choice.Name[bool]{Name: "none"})
	_, formatErr := c.json()
	switch {
	case len(c.contrast) != 0 && len(c.contrast) != 2:
		return opt, rule, usagef("--contrast takes two levels, A,B (got %d)", len(c.contrast))
	case c.permutations < 1:
		return opt, rule, usagef("--permutations must be at least 1")
	case c.workers < 1:
		return opt, rule, usagef("--workers must be at least 1")
	case zonesErr != nil:
		return opt, rule, usagef("%v", zonesErr)
	case c.surrogates < 0 || c.fpChecks < 0 || c.fpShuffles < 1:
		return opt, rule, usagef("--surrogates and --false-positive-check must not be negative, --check-shuffles at least 1")
	case !(c.alpha > 0 && c.alpha < 1):
		return opt, rule, usagef("--alpha must be between 0 and 1")
	case formatErr != nil:
		return opt, rule, usagef("%v", formatErr)
	}
	opt.Zones = zones
	return opt, rule, nil
}

// json reports whether --format asks for JSON (otherwise text).
func (c *compareFlags) json() (bool, error) {
	return choice.Parse("--format", c.format, choice.Name[bool]{Name: "text"}, choice.Name[bool]{Name: "json", Value: true})
}

func runCompare(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var c compareFlags
	fs := newFlags("compare", compareUsage, stderr)
	c.register(fs, true)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	for _, req := range []struct{ name, val string }{{"input", c.input}, {"outcome", c.outcome}, {"group", c.group}} {
		if req.val == "" {
			return usagef("--%s is required (see areatest compare --help)", req.name)
		}
	}
	return c.run(stdout, stderr, []string{c.input, c.weights.file}, func() (*layer.Layer, []string, error) {
		return readLayer(c.input, stdin, geojson.Options{IDColumn: c.id, SkipBadGeometry: c.skipBadGeometry})
	})
}

// run checks the flags, reads the layer, runs the comparison on it and
// writes the result; inputs are the files the output must not overwrite.
func (c *compareFlags) run(stdout, stderr io.Writer, inputs []string, read func() (*layer.Layer, []string, error)) error {
	opt, spec, err := c.options()
	if err != nil {
		return err
	}
	lay, warnings, err := read()
	if err != nil {
		return err
	}
	for _, w := range warnings {
		warn(stderr, w)
	}
	res, err := compareLayer(lay, c, opt, spec, stderr)
	if err != nil {
		return err
	}
	return emitCompare(res, c, stdout, stderr, inputs)
}

// readLayer reads a GeoJSON layer from a path, or from stdin for "-".
func readLayer(path string, stdin io.Reader, opt geojson.Options) (*layer.Layer, []string, error) {
	if path == "-" {
		return geojson.Read(stdin, "stdin", opt)
	}
	return geojson.ReadFile(path, opt)
}

// compareLayer pulls the named columns out of the layer, builds the
// neighbour graph and runs the comparison, with the graph's warnings and a
// progress bar on stderr.
func compareLayer(lay *layer.Layer, c *compareFlags, opt compare.Options, spec weights.Spec, stderr io.Writer) (*compare.Result, error) {
	in, err := compareInput(lay, c)
	if err != nil {
		return nil, err
	}
	var res *compare.Result
	graph, warnings, err := c.weights.graph(lay, spec)
	if err == nil {
		in.Graph, in.Transform, in.KeepIslands = graph, c.transform, c.keepIslands
		bar := newProgress(stderr)
		opt.Progress = bar.stage
		if res, err = compare.Run(in, opt); err != nil {
			err = fmt.Errorf("%s: %w", lay.Source, flagAdvice(err))
		}
		bar.finish()
	}
	for _, w := range warnings {
		warn(stderr, w)
	}
	if err != nil {
		return nil, err
	}
	res.Version, res.Input.File = Version, lay.Source
	return res, nil
}

// compareInput pulls the outcome, group, covariate and strata columns out
// of the layer.
func compareInput(lay *layer.Layer, c *compareFlags) (compare.Input, error) {
	var in compare.Input
	outcome, err := lay.Column(c.outcome)
	if err != nil {
		return in, err
	}
	if outcome.Kind != layer.Number {
		return in, fmt.Errorf("%s: column %q is not numeric (first non-number value %q in area %s); the outcome must be a number in every area that has one",
			lay.Source, c.outcome, firstValue(outcome), firstID(lay, outcome))
	}
	group, err := lay.Column(c.group)
	if err != nil {
		return in, err
	}
	if c.group == c.outcome {
		return in, fmt.Errorf("%s: the outcome and the group are the same column %q", lay.Source, c.group)
	}
	in = compare.Input{IDs: lay.IDs, OutcomeName: c.outcome, Outcome: outcome.Num, OutcomeMissing: outcome.Missing,
		GroupName: c.group, Group: labels(group), GroupMissing: group.Missing}
	for _, name := range c.covariates {
		cov, err := lay.Column(name)
		if err != nil {
			return in, err
		}
		if cov.Kind != layer.Number {
			return in, fmt.Errorf("%s: covariate %q is not numeric (first non-number value %q in area %s)", lay.Source, name, firstValue(cov), firstID(lay, cov))
		}
		if name == c.outcome || name == c.group {
			return in, fmt.Errorf("%s: %q cannot be both a covariate and the outcome or the group", lay.Source, name)
		}
		in.Covariates = append(in.Covariates, compare.Covariate{Name: name, Values: cov.Num, Missing: cov.Missing})
	}
	if c.strata != "" {
		strata, err := lay.Column(c.strata)
		if err != nil {
			return in, err
		}
		in.StrataName, in.Strata, in.StrataMissing = c.strata, labels(strata), strata.Missing
	}
	return in, nil
}

// advised is a library error worded in terms of the command's flags.
type advised struct {
	msg string
	err error
}

func (a *advised) Error() string { return a.msg }
func (a *advised) Unwrap() error { return a.err }

// flagAdvice words the comparison's errors about its settings in terms of
// the flags that set them.
func flagAdvice(err error) error {
	var ce *compare.ContrastError
	var le *compare.LevelError
	var te *compare.TwoGroupError
	switch {
	case errors.As(err, &ce):
		return &advised{"--contrast " + ce.Facts(), err}
	case errors.As(err, &le):
		return &advised{"--contrast " + le.Facts(), err}
	case errors.As(err, &te):
		return &advised{te.Facts() + "; use kruskal-wallis or anova-f, or pick two with --contrast", err}
	}
	return err
}

// wordNotice words the comparison's notices in terms of the flags.
func wordNotice(n compare.Notice) string {
	if n == compare.SurrogatesWithCovariates {
		return "Spectral surrogates and the false-positive check are not run with --covariates: the adjusted statistic would need surrogates of the residuals, which this version does not make."
	}
	return n.String()
}

func labels(c *layer.Column) []string {
	out := make([]string, len(c.Missing))
	for i := range out {
		out[i] = c.Label(i)
	}
	return out
}

func firstValue(c *layer.Column) string {
	for i, m := range c.Missing {
		if !m {
			return c.Label(i)
		}
	}
	return ""
}

func firstID(l *layer.Layer, c *layer.Column) string {
	for i, m := range c.Missing {
		if !m {
			return fmt.Sprintf("%q", l.IDs[i])
		}
	}
	return "?"
}

// emitCompare writes the result in the chosen format; with JSON on stdout
// the warnings go to stderr as well, where a reader of the terminal sees
// them.
func emitCompare(res *compare.Result, c *compareFlags, stdout, stderr io.Writer, inputs []string) error {
	json, _ := c.json() // checked by options
	if json {
		for _, w := range res.Warnings {
			warn(stderr, w)
		}
	}
	return writeOutput(c.output, stdout, inputs, func(w io.Writer) error {
		if json {
			return report.JSON(w, res)
		}
		return report.CompareText(w, res)
	})
}
