package main

import (
	"fmt"
	"io"
	"slices"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/progress"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/clustering"
	"github.com/areatest/areatest/spatial/shuffle"
)

func runAutocorr(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	return autocorrRun(args, stdin, stdout, stderr, nil)
}

// autocorrFlags are the settings of `areatest autocorr`.
type autocorrFlags struct {
	sharedFlags
	shard                       shardFlags
	pics                        autocorrPictureFlags
	variables                   []string
	against, events, population string
	lags                        int
	lagWidth                    float64
	lagWidthUnits               *distanceFlag
	moranRange                  bool
}

func (c *autocorrFlags) register(fs *pflag.FlagSet) {
	fs.StringSliceVar(&c.variables, "variables", nil, "columns to test, comma-separated (text columns get join counts)")
	fs.StringVar(&c.against, "against", "", "also the bivariate Moran's I of each variable against the spatial lag of this column")
	fs.StringVar(&c.events, "events", "", "column of event counts: test the rate events/population")
	fs.StringVar(&c.population, "population", "", "column of populations at risk, with --events")
	fs.IntVar(&c.lags, "lags", 0, "also a correlogram: Moran's I at neighbour orders 1..K (or K distance classes with --lag-width)")
	c.lagWidthUnits = distanceVar(fs, &c.lagWidth, "lag-width", "with --lags: distance classes of this width instead of neighbour orders"+distanceHelp)
	fs.BoolVar(&c.moranRange, "moran-range", false, "compute the range of Moran's I at any size (unasked only up to "+numtext.Count(clustering.AutoRangeAreas)+" areas)")
	c.pics.register(fs)
	c.sharedFlags.register(fs, "text", "json")
	c.shard.register(fs)
}

// check checks autocorr's own flags, --shard and the pictures' files.
func (c *autocorrFlags) check() error {
	p := c.pics
	if err := c.shard.check(&c.sharedFlags, map[string]string{"scatter": p.scatter, "histogram": p.histogram, "correlogram": p.correlogram}); err != nil {
		return err
	}
	switch {
	case c.shard.spec != "" && c.lags > 0:
		// The orders of a correlogram share their shuffles (one stream),
		// which a part's ledger cannot tell apart yet.
		return usagef("--lags does not go with --shard in this version")
	case len(c.variables) == 0 && c.events == "":
		return usagef("give --variables, or --events with --population (see areatest autocorr --help)")
	case (c.events == "") != (c.population == ""):
		return usagef("--events and --population go together")
	case c.lags < 0:
		return usagef("--lags must not be negative")
	case c.lagWidth < 0 || (c.lagWidth > 0 && c.lags == 0):
		return usagef("--lag-width is a positive distance and goes with --lags")
	}
	return c.pics.check(&c.sharedFlags, len(c.variables), c.lags)
}

// autocorrRun is autocorr, or, with replay, the merge of its parts.
func autocorrRun(args []string, stdin io.Reader, stdout, stderr io.Writer, replay *shuffle.Ledger) error {
	var c autocorrFlags
	fs := newFlags("autocorr", stderr)
	c.register(fs)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if err := c.check(); err != nil {
		return err
	}
	if err := c.prepare("autocorr", stdin, stderr, shuffle.ParseAlternative); err != nil {
		return err
	}
	in, opt, err := c.input(replay)
	if err != nil {
		return err
	}
	bar := progress.New(stderr)
	opt.Progress = bar.Stage
	res, err := clustering.Autocorr(in, opt)
	bar.Finish()
	if err != nil {
		return fmt.Errorf("%s: %w", c.lay.Source, err)
	}
	res.Version = Version
	if c.shard.part != nil {
		return c.shard.writePart(&c.sharedFlags, "autocorr", stdout, stderr)
	}
	return c.write(report.AutocorrPictures{Input: in, Options: opt, Result: res}, stdout, stderr)
}

// input gathers the columns and options of the run from the layer read:
// the variables, the correlogram's lags or distance classes, the shard.
func (c *autocorrFlags) input(replay *shuffle.Ledger) (clustering.Input, clustering.Options, error) {
	in, opt := c.clustering()
	opt.MoranRange, opt.RangeAdvice, opt.Shard = c.moranRange, "ask for it with --moran-range", c.shard.part
	if replay != nil {
		opt.Shard = shuffle.NewReplay(replay)
	}
	if err := autocorrColumns(&in, c.lay, c.variables, c.against, c.events, c.population); err != nil {
		return in, opt, err
	}
	if c.shard.spec != "" && len(in.Categorical) > 0 {
		// The join counts of a text column test every category on the same
		// shuffles (one stream), which a part's ledger cannot tell apart yet.
		return in, opt, usagef("--shard does not go with text columns (join counts of %q) in this version", in.Categorical[0].Name)
	}
	if err := c.lagWidthUnits.resolve(c.lay.CRS, &c.lagWidth); err != nil {
		return in, opt, err
	}
	if in.Lags = c.lags; c.lagWidth > 0 {
		in.Lags = 0
		var err error
		if in.DistanceClasses, err = c.spec.DistanceClasses(c.lay.Geoms, c.lagWidth, c.lags); err != nil {
			return in, opt, fmt.Errorf("%s: %w", c.lay.Source, err)
		}
	}
	return in, opt, nil
}

// write draws the pictures asked for and writes the report, with the
// islands left out said among the warnings.
func (c *autocorrFlags) write(ap report.AutocorrPictures, stdout, stderr io.Writer) error {
	res := ap.Result
	if err := c.pics.draw(&c.sharedFlags, ap); err != nil {
		return err
	}
	pagePics := []pagePicture{{"Moran scatter", "Each area's standardised value against its neighbours' mean; the slope of the line is Moran's I.", ap.Scatter},
		{"Moran's I under the shuffles", "Moran's I in each shuffle of the values over the areas, with the observed value marked.", ap.Histogram}}
	if c.lags > 0 {
		pagePics = append(pagePics, pagePicture{"Correlogram", "Moran's I at each lag, with the band of 95% of the shuffles' values and the value expected without clustering.", ap.Correlogram})
	}
	if res.IslandsLeftOut > 0 {
		res.Warnings = slices.Insert(res.Warnings, len(res.Weights.Warnings), fmt.Sprintf(
			"%d area(s) have no neighbour and are left out of every statistic (use --islands keep to keep them with a zero spatial lag).", res.IslandsLeftOut))
	}
	return c.emit(stdout, stderr, res.Warnings, map[string]func(io.Writer) error{
		"json": func(w io.Writer) error { return report.JSON(w, res) },
		"text": func(w io.Writer) error { return report.AutocorrText(w, res) },
		"html": c.page(res, 0, pagePics...),
	})
}

// autocorrColumns puts the named columns of the layer into in: numeric
// variables, text ones for join counts, the --against column and the rate's
// events and population. A text column most of whose values are numbers
// is an error naming the values that are not: it is numbers with a few bad
// values, not categories (the join counts' other rule, on categories of a
// single area, is clustering's).
func autocorrColumns(in *clustering.Input, lay *layer.Layer, variables []string, against, events, population string) error {
	for _, v := range variables {
		col, err := lay.Column(v)
		switch {
		case err != nil:
			return err
		case col.Kind == layer.Number:
			in.Numeric = append(in.Numeric, clusterColumn(col))
		case col.MostlyNumbers():
			return fmt.Errorf("%s: column %q %s; correct them to test it as numbers (join counts take only columns of categories)", lay.Source, col.Name, lay.NotNumeric(col, "").Detail())
		default:
			in.Categorical = append(in.Categorical, clustering.Categories{Name: v, Labels: col.Labels(), Missing: col.Missing})
		}
	}
	for _, n := range []struct {
		name, role string
		to         **clustering.Column
	}{{against, "the --against column", &in.Against}, {events, "an event count", &in.Events}, {population, "a population", &in.Population}} {
		if n.name == "" {
			continue
		}
		col, err := lay.NumericColumn(n.name, n.role)
		if err != nil {
			return err
		}
		cc := clusterColumn(col)
		*n.to = &cc
	}
	return nil
}

// clustering returns the input and options of package clustering.
func (c *sharedFlags) clustering() (clustering.Input, clustering.Options) {
	return clustering.Input{File: c.lay.Source, IDs: c.lay.IDs, Graph: c.graph, Scaling: c.scaling, KeepIslands: c.keepIslands},
		clustering.Options{Permutations: c.permutations, Seed: c.seed, Workers: c.workers, Alternative: c.alt}
}

func clusterColumn(col *layer.Column) clustering.Column {
	return clustering.Column{Name: col.Name, Values: col.Num, Missing: col.Missing}
}

// autocorrPictureFlags name the pictures of autocorr: one file each, with
// a panel per numeric variable.
type autocorrPictureFlags struct{ scatter, histogram, correlogram string }

func (p *autocorrPictureFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&p.scatter, "scatter", "", "Moran scatter of each numeric variable, one panel each (.svg or .png)")
	fs.StringVar(&p.histogram, "histogram", "", "permutation distribution of Moran's I of each numeric variable, observed value marked (.svg or .png)")
	fs.StringVar(&p.correlogram, "correlogram", "", "with --lags: Moran's I at each lag with its 95% null band, one panel per variable (.svg or .png)")
}

// check checks the picture flags and asks for their files, before any
// data is read.
func (p *autocorrPictureFlags) check(c *sharedFlags, variables, lags int) error {
	switch {
	case p.correlogram != "" && lags == 0:
		return usagef("--correlogram draws the correlogram of --lags; give --lags")
	case (p.scatter != "" || p.histogram != "" || p.correlogram != "") && variables > figure.MaxPanels:
		return usagef("the pictures hold at most %d variables, one panel each; --variables names %d", figure.MaxPanels, variables)
	}
	for _, f := range []struct{ flag, path string }{{"--scatter", p.scatter}, {"--histogram", p.histogram}, {"--correlogram", p.correlogram}} {
		if err := c.wantPicture(f.flag, f.path); err != nil {
			return err
		}
	}
	return nil
}

// draw gives the planned pictures their renderers; pictures of a result
// without a numeric variable are refused now, before anything is written.
func (p *autocorrPictureFlags) draw(c *sharedFlags, pics report.AutocorrPictures) error {
	if (p.scatter != "" || p.histogram != "" || p.correlogram != "") && len(pics.Result.Variables) == 0 {
		return fmt.Errorf("%s: --scatter, --histogram and --correlogram draw numeric --variables, and none is given", c.lay.Source)
	}
	c.drawPicture("--scatter", pics.Scatter)
	c.drawPicture("--histogram", pics.Histogram)
	c.drawPicture("--correlogram", pics.Correlogram)
	return nil
}
