package main

import (
	"errors"
	"fmt"
	"io"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/progress"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/rates"
	"github.com/areatest/areatest/spatial/shuffle"
)

// compareFlags are the settings of compare and demo.
type compareFlags struct {
	sharedFlags
	outcome, group, strata, statistic, zones string
	contrast, covariates                     []string
	surrogates, fpChecks, fpShuffles         int
	plot                                     string // --plot: the picture of the null distributions
	alpha                                    float64
	// A comparison of rates: event and population columns instead of an
	// outcome.
	events, population          string
	per, unstableBelow          float64
	aboveAllowed, leaveOutCount bool
	opt                         compare.Options // set by check
	// The map of groups and outcome (compare only), and its class rule.
	mapFile, mapClasses string
	mapRule             figure.Classes
	// shard is --shard (compare only).
	shard shardFlags
}

func (c *compareFlags) register(fs *pflag.FlagSet, withColumns bool) {
	if withColumns {
		c.registerInput(fs)
		fs.StringVarP(&c.outcome, "outcome", "y", "", "numeric column to compare")
		fs.StringVar(&c.events, "events", "", "instead of --outcome: column of event counts (cases, deaths), compared as rates with --population")
		fs.StringVar(&c.population, "population", "", "with --events: column of populations at risk")
		fs.Float64Var(&c.per, "per", compare.DefaultPer, "with --events: show rates per this many people")
		fs.Float64Var(&c.unstableBelow, "unstable-below", rates.DefaultUnstable, "with --events: flag rates resting on fewer events than this as unstable")
		fs.BoolVar(&c.aboveAllowed, "allow-events-above-population", false, "with --events: accept more events than population (repeat events, person-time)")
		fs.BoolVar(&c.leaveOutCount, "leave-out-bad-counts", false, "with --events: leave out areas whose counts make no rate (population 0, negative counts), with the reason, instead of stopping")
		fs.StringVarP(&c.group, "group", "g", "", "column whose values name the groups")
		fs.StringVar(&c.strata, "strata", "", "column of strata: also shuffle only within each stratum")
		fs.StringSliceVar(&c.covariates, "covariates", nil, "numeric columns to adjust for: every shuffle tests the group effect adjusted for them (Freedman–Lane)")
		fs.StringVar(&c.mapFile, "map", "", "two maps side by side (.svg or .png): the groups, and the outcome in 5 classes (see --classes); areas left out hatched")
		fs.StringVar(&c.mapClasses, "classes", "quantile", "classes of the outcome in --map: quantile or natural (natural breaks, Fisher 1958)")
		c.shard.register(fs)
	}
	fs.IntVar(&c.surrogates, "surrogates", 999, "spectral surrogates of the outcome for the spatially constrained p-value (0: none; at most "+numtext.Count(compare.MaxSurrogates)+")")
	fs.IntVar(&c.fpChecks, "false-positive-check", 500, "surrogate outcomes on which to measure how often each label shuffle (free, --strata, --zones) cries wolf (0: none; at most "+numtext.Count(compare.MaxFalsePositiveChecks)+")")
	fs.IntVar(&c.fpShuffles, "check-shuffles", 199, "shuffles per surrogate and scheme in the false-positive check (Monte Carlo, never exact; 19 or more one-sided, 39 two-sided at --alpha 0.05; at most "+numtext.Count(compare.MaxCheckShuffles)+")")
	fs.StringVar(&c.zones, "zones", "none", "auto: without --strata, on 300 or more areas, also shuffle within automatic contiguous zones (off by default: measured to overstate significance when outcome and grouping cluster)")
	fs.StringVar(&c.statistic, "statistic", "", "median-diff, mean-diff, welch-t, rank-sum (two groups); kruskal-wallis, anova-f (any number)\n(default median-diff for two groups, kruskal-wallis for more);\nwith --events: rate-ratio, rate-difference (two groups), rate-homogeneity (any number), or one of the above on the area rates\n(default rate-ratio for two groups, rate-homogeneity for more)")
	fs.StringSliceVar(&c.contrast, "contrast", nil, "two levels A,B of the group column: report A − B (with more levels, test only these two)")
	fs.Float64Var(&c.alpha, "alpha", 0.05, "level at which the spatial check calls clustering significant")
	fs.StringVar(&c.plot, "plot", "", "draw every null model's distribution with the observed value, and the false-positive check, into this .svg or .png file")
	c.registerRun(fs, "text", "json")
	fs.Lookup("alternative").Usage = "two-sided, greater (A above B) or less"
	fs.Lookup("permutations").Usage = "Monte Carlo shuffles per scheme (at most " + numtext.Count(shuffle.MaxPermutations) + ")"
}

// check checks the flag values and turns them into the library's options.
func (c *compareFlags) check() error {
	c.opt = compare.Options{Contrast: c.contrast, Permutations: c.permutations, Seed: c.seed, Workers: c.workers, Alpha: c.alpha,
		Surrogates: c.surrogates, FalsePositives: c.fpChecks, FalsePositiveShuffles: c.fpShuffles}
	c.opt.Rates = compare.RateOptions{Per: c.per, EventsAbovePopulation: c.aboveAllowed, LeaveOutBadCounts: c.leaveOutCount, UnstableBelow: c.unstableBelow}
	if err := c.checkRates(); err != nil {
		return err
	}
	zones, err := choice.Parse("--zones", c.zones, choice.Name[bool]{Name: "auto", Value: true}, choice.Name[bool]{Name: "none"})
	c.opt.Zones = zones
	switch {
	case err != nil:
		return usagef("%v", err)
	case len(c.contrast) != 0 && len(c.contrast) != 2:
		return usagef("--contrast takes two levels, A,B (got %d)", len(c.contrast))
	case c.surrogates < 0 || c.fpChecks < 0 || c.fpShuffles < 1:
		return usagef("--surrogates and --false-positive-check must not be negative, --check-shuffles at least 1")
	case !(c.alpha > 0 && c.alpha < 1):
		return usagef("--alpha must be between 0 and 1")
	}
	for _, f := range []struct {
		name       string
		value, max int
	}{
		{"--surrogates", c.surrogates, compare.MaxSurrogates},
		{"--false-positive-check", c.fpChecks, compare.MaxFalsePositiveChecks},
		{"--check-shuffles", c.fpShuffles, compare.MaxCheckShuffles},
	} {
		if err := atMost(f.name, f.value, f.max); err != nil {
			return err
		}
	}
	if err := c.checkPictures(); err != nil {
		return err
	}
	if err := c.shard.check(&c.sharedFlags, map[string]string{"plot": c.plot, "map": c.mapFile}); err != nil {
		return err
	}
	// The shared flags last: they end by checking the output files, after
	// every usage error.
	if err := c.sharedFlags.check(shuffle.ParseAlternative); err != nil {
		return err
	}
	c.opt.Alternative, c.opt.Shard = c.alt, c.shard.part
	return nil
}

// checkPictures reads --classes and asks for the files of --map and
// --plot; the comparison keeps its null values only when they are to be
// drawn.
func (c *compareFlags) checkPictures() (err error) {
	if c.plot != "" || c.report != "" {
		c.opt.KeepNull = true
	}
	if err := c.wantPicture("--plot", c.plot); err != nil {
		return err
	}
	if c.mapClasses == "" { // demo registers neither --map nor --classes
		return nil
	}
	if c.mapRule, err = parseClasses(c.mapClasses); err != nil {
		return err
	}
	return c.wantPicture("--map", c.mapFile)
}

// atMost refuses a count flag above the maximum the library enforces
// (shuffle.MaxPermutations, compare.MaxSurrogates, …), naming it, as a
// usage error: the flag, not the data, is to change.
func atMost(flag string, value, max int) error {
	if value > max {
		return usagef("%s %s is more than the maximum of %s", flag, numtext.Count(value), numtext.Count(max))
	}
	return nil
}

func runCompare(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	return compareRun(args, stdin, stdout, stderr, nil)
}

// compareRun is compare, or, with replay, the merge of its parts: the
// random stages fold replay's tallies instead of drawing.
func compareRun(args []string, stdin io.Reader, stdout, stderr io.Writer, replay *shuffle.Ledger) error {
	var c compareFlags
	fs := newFlags("compare", stderr)
	c.register(fs, true)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	for _, req := range []struct{ name, val string }{{"input", c.input}, {"group", c.group}} {
		if req.val == "" {
			return usagef("--%s is required (see areatest compare --help)", req.name)
		}
	}
	if c.outcome == "" && c.events == "" {
		return usagef("--outcome is required, or --events with --population (see areatest compare --help)")
	}
	if err := c.check(); err != nil {
		return err
	}
	if replay != nil {
		c.opt.Shard = shuffle.NewReplay(replay)
	}
	if err := c.open(stdin, stderr); err != nil {
		return err
	}
	return c.run(stdout, stderr)
}

// run compares on the layer that is read and writes the result.
func (c *compareFlags) run(stdout, stderr io.Writer) error {
	res, err := c.compare(stderr)
	if err != nil {
		return err
	}
	if c.shard.part != nil {
		return c.shard.writePart(&c.sharedFlags, "compare", stdout, stderr)
	}
	pics := report.ComparePictures{Layer: c.lay, Result: res, Classes: c.mapRule}
	c.drawPicture("--plot", pics.Nulls)
	c.drawPicture("--map", pics.Map)
	return c.emit(stdout, stderr, res.Warnings, map[string]func(io.Writer) error{
		"json": func(w io.Writer) error { return report.JSON(w, res) },
		"text": func(w io.Writer) error { return report.CompareText(w, res) },
		"html": c.page(res, 0,
			pagePicture{"The null models", "Each null model's distribution of the statistic, the observed value marked, and below the share of true nulls each row called significant.", pics.Nulls},
			pagePicture{"The groups and the outcome on the map", "Left the groups, right the outcome in classes; areas left out are hatched.", pics.Map}),
	})
}

// compare pulls the named columns out of the layer, builds the neighbour
// graph and runs the comparison, with a progress bar on stderr.
func (c *compareFlags) compare(stderr io.Writer) (*compare.Result, error) {
	in, err := c.columns()
	if err != nil {
		return nil, err
	}
	if err := c.build(stderr); err != nil {
		return nil, err
	}
	in.Graph, in.Scaling, in.KeepIslands = c.graph, c.scaling, c.keepIslands
	bar := progress.New(stderr)
	opt := c.opt
	opt.Progress = bar.Stage
	res, err := compare.Run(in, opt)
	bar.Finish()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", c.lay.Source, flagAdvice(err))
	}
	res.Version, res.Input.File = Version, c.lay.Source
	return res, nil
}

// columns pulls the outcome, group, covariate and strata columns out of
// the layer.
func (c *compareFlags) columns() (compare.Input, error) {
	lay := c.lay
	group, err := lay.Column(c.group)
	if err != nil {
		return compare.Input{}, err
	}
	in := compare.Input{IDs: lay.IDs, GroupName: c.group, Group: group.Labels(), GroupMissing: group.Missing}
	if err := c.outcomeColumns(&in); err != nil {
		return in, err
	}
	for _, name := range c.covariates {
		if name == c.outcome || name == c.group {
			return in, fmt.Errorf("%s: %q cannot be both a covariate and the outcome or the group", lay.Source, name)
		}
		cov, err := lay.NumericColumn(name, "a covariate")
		if err != nil {
			return in, err
		}
		in.Covariates = append(in.Covariates, compare.Covariate{Name: name, Values: cov.Num, Missing: cov.Missing})
	}
	if c.strata != "" {
		strata, err := lay.Column(c.strata)
		if err != nil {
			return in, err
		}
		in.StrataName, in.Strata, in.StrataMissing = c.strata, strata.Labels(), strata.Missing
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
	var se *compare.CheckShufflesError
	switch {
	case errors.As(err, &ce):
		return &advised{"--contrast " + ce.Facts(), err}
	case errors.As(err, &le):
		return &advised{"--contrast " + le.Facts(), err}
	case errors.As(err, &te):
		return &advised{te.Facts() + "; use " + te.Instead + ", or pick two with --contrast", err}
	case errors.As(err, &se):
		// A setting, not the data, is to change: a usage error.
		return usagef("--check-shuffles %d cannot reject at --alpha %g: the smallest p-value %d shuffles give is %.3g; use --check-shuffles %d or more, or --false-positive-check 0",
			se.Shuffles, se.Alpha, se.Shuffles, se.Smallest, se.Need)
	}
	return err
}

// checkRates checks the flags of a comparison of rates and reads
// --statistic, which names a statistic of pooled rates or one of an
// outcome (with --events, of the area rates).
func (c *compareFlags) checkRates() error {
	changed := c.weights.changed
	rateFlags := changed("population") || changed("per") || changed("unstable-below") || c.aboveAllowed || c.leaveOutCount
	switch {
	case c.events != "" && c.outcome != "":
		return usagef("give --outcome, or --events with --population, not both")
	case c.events != "" && c.population == "":
		return usagef("--events needs --population")
	case c.events == "" && rateFlags:
		return usagef("--population, --per, --unstable-below, --allow-events-above-population and --leave-out-bad-counts go with --events")
	case c.events != "" && (!(c.per > 0) || c.unstableBelow < 0):
		return usagef("--per must be above 0, --unstable-below not negative")
	}
	if c.statistic == "" {
		return nil
	}
	if rs, err := rates.ParseStatistic(c.statistic); err == nil {
		if c.events == "" {
			return usagef("--statistic %s compares rates: give --events and --population", c.statistic)
		}
		c.opt.Rates.Statistic = rs
		return nil
	}
	s, err := groups.ParseStatistic(c.statistic)
	if err != nil {
		if c.events != "" {
			return usagef("--statistic: %v, or rate-ratio, rate-difference or rate-homogeneity", err)
		}
		return usagef("--statistic: %v", err)
	}
	c.opt.Statistic = &s
	return nil
}

// outcomeColumns puts the outcome, or the event and population columns of
// a comparison of rates, into in.
func (c *compareFlags) outcomeColumns(in *compare.Input) error {
	lay := c.lay
	if c.events == "" {
		if c.group == c.outcome {
			return fmt.Errorf("%s: the outcome and the group are the same column %q", lay.Source, c.group)
		}
		outcome, err := lay.NumericColumn(c.outcome, "the outcome")
		if err != nil {
			return err
		}
		in.OutcomeName, in.Outcome, in.OutcomeMissing = c.outcome, outcome.Num, outcome.Missing
		return nil
	}
	for _, name := range []string{c.events, c.population} {
		if name == c.group {
			return fmt.Errorf("%s: %q cannot be both a count and the group", lay.Source, name)
		}
	}
	events, err := lay.NumericColumn(c.events, "the event count")
	if err != nil {
		return err
	}
	pop, err := lay.NumericColumn(c.population, "the population")
	if err != nil {
		return err
	}
	in.Events = &compare.Count{Name: c.events, Values: events.Num, Missing: events.Missing}
	in.Population = &compare.Count{Name: c.population, Values: pop.Num, Missing: pop.Missing}
	return nil
}
