package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"runtime"
	"strings"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/io/input"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/output"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/io/table"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// sharedFlags are the settings the commands share (all of them for
// autocorr, screen and local; compare, demo and weights register the parts
// they use), and what check, open and build make of them.
type sharedFlags struct {
	input, id, alternative, format, output string
	// report is the HTML page of --report; digests the files read, with
	// their SHA-256, for it.
	report  string
	digests []report.InputFile
	// The layer's name in a file of several, and the table joined onto it.
	layerName, table, key, tableKey string
	skipBadGeometry                 bool
	permutations, workers           int
	seed                            uint64
	weights                         weightFlags
	formats                         []choice.Name[string]
	// Set by check, open and build: the layer, the neighbour graph of all
	// its areas and how the statistics use it.
	lay         *layer.Layer
	join        *table.JoinReport
	graph       *weights.Graph
	spec        weights.Spec
	scaling     weights.Scaling
	keepIslands bool
	alt         shuffle.Alternative
	// The files the run writes: asked for by wantOutput, checked and put
	// into plan by checkOutput, written together by emit.
	files []plannedFile
	plan  *output.Plan
}

// register adds the shared flags to fs; the first of formats is the
// default.
func (c *sharedFlags) register(fs *pflag.FlagSet, formats ...string) {
	c.registerInput(fs)
	c.registerRun(fs, formats...)
}

// registerInput adds the flags that name the layer.
func (c *sharedFlags) registerInput(fs *pflag.FlagSet) {
	fs.StringVarP(&c.input, "input", "i", "", "the layer of polygons: GeoJSON, GeoPackage, or a shapefile (.shp or a .zip holding one); - for stdin")
	fs.StringVar(&c.id, "id", "", "column holding area ids (default: the feature id)")
	fs.StringVar(&c.layerName, "layer", "", "the layer to read from a file of several (a GeoPackage's feature table, a shapefile in a zip)")
	fs.StringVar(&c.table, "table", "", "CSV table whose columns are joined onto the areas by key (comma, semicolon or tab)")
	fs.StringVar(&c.key, "key", "", "with --table: the layer's key column (default: the area ids)")
	fs.StringVar(&c.tableKey, "table-key", "", "with --table: the table's key column, when it is named otherwise than --key (default: --key, or the table's first column)")
	fs.BoolVar(&c.skipBadGeometry, "skip-bad-geometry", false, "leave out features with no or non-polygon geometry, with a warning")
}

// registerRun adds the flags of the shuffles, the output and the weights.
func (c *sharedFlags) registerRun(fs *pflag.FlagSet, formats ...string) {
	fs.StringVar(&c.alternative, "alternative", "two-sided", "two-sided, greater (more clustered than chance) or less (more dispersed)")
	fs.IntVarP(&c.permutations, "permutations", "n", 9999, "Monte Carlo shuffles per test (at most "+numtext.Count(shuffle.MaxPermutations)+")")
	fs.Uint64Var(&c.seed, "seed", 1, "seed of the random shuffles; the same seed gives the same result")
	fs.IntVar(&c.workers, "workers", runtime.NumCPU(), "goroutines sharing the shuffles (results do not depend on it)")
	c.registerOutput(fs, formats...)
	c.weights.register(fs)
}

// registerOutput adds --format (the first of formats is the default),
// --output and --report (the HTML page, see reportflag.go).
func (c *sharedFlags) registerOutput(fs *pflag.FlagSet, formats ...string) {
	for _, f := range formats {
		c.formats = append(c.formats, choice.Name[string]{Name: f, Value: f})
	}
	fs.StringVar(&c.format, "format", formats[0], choice.List(c.formats))
	fs.StringVarP(&c.output, "output", "o", "-", "write the result here instead of stdout")
	fs.StringVar(&c.report, "report", "", "also write the result as one self-contained HTML page here (.html), tables and pictures in it")
}

// prepare checks the shared flags (the alternative read by parseAlt),
// reads the layer and builds the graph.
func (c *sharedFlags) prepare(cmd string, stdin io.Reader, stderr io.Writer, parseAlt func(string) (shuffle.Alternative, error)) error {
	if c.input == "" {
		return usagef("--input is required (see areatest %s --help)", cmd)
	}
	if err := c.check(parseAlt); err != nil {
		return err
	}
	if err := c.open(stdin, stderr); err != nil {
		return err
	}
	return c.build(stderr)
}

// check checks the shared flags and reads the weights settings; the
// output files come last, once every flag is known to be right.
func (c *sharedFlags) check(parseAlt func(string) (shuffle.Alternative, error)) (err error) {
	if c.alt, err = parseAlt(c.alternative); err != nil {
		return usagef("--alternative: %v", err)
	}
	if err := c.checkTable(); err != nil {
		return err
	}
	if c.permutations < 1 || c.workers < 1 {
		return usagef("--permutations and --workers must be at least 1")
	}
	if err := atMost("--permutations", c.permutations, shuffle.MaxPermutations); err != nil {
		return err
	}
	if c.spec, c.scaling, c.keepIslands, err = c.weights.spec(); err != nil {
		return err
	}
	return c.checkOutput()
}

// plannedFile is a file the run writes, by the flag that names it.
type plannedFile struct {
	flag, path string
	file       *output.File // set by checkOutput
}

// wantOutput asks for the file that flag names ("" asks for none);
// checkOutput checks it, with --output.
func (c *sharedFlags) wantOutput(flag, path string) {
	if path != "" {
		c.files = append(c.files, plannedFile{flag: flag, path: path})
	}
}

// fileOf is the planned file of flag, nil when that flag asked for none.
func (c *sharedFlags) fileOf(flag string) *output.File {
	for _, f := range c.files {
		if f.flag == flag {
			return f.file
		}
	}
	return nil
}

// checkOutput reads --format and puts --output and the files asked for by
// wantOutput into the run's plan (planOutputs).
func (c *sharedFlags) checkOutput() (err error) {
	if c.format, err = choice.Parse("--format", c.format, c.formats...); err != nil {
		return usagef("%v", err)
	}
	if err := c.checkReport(); err != nil {
		return err
	}
	c.files = append([]plannedFile{{flag: "--output", path: c.output}}, c.files...)
	return c.planOutputs()
}

// planOutputs puts the files asked for into the run's plan, each checked
// now, before any data is read: two outputs of one run going to the same
// file are a usage error (exit 2); a target that cannot be written (a
// directory, a missing directory, no permission, an input of the run) is an
// error about the files (exit 1), as a missing input is.
func (c *sharedFlags) planOutputs() (err error) {
	c.plan = output.NewPlan(c.inputs()...)
	for i, f := range c.files {
		c.files[i].file, err = c.plan.Add(f.path)
		var te *output.TargetError
		switch {
		case errors.As(err, &te) && te.Problem == output.Repeated:
			return usagef("%s %s and %s %s are the same file; give each output a file of its own", c.files[te.Earlier].flag, te.EarlierPath, f.flag, f.path)
		case err != nil:
			return fmt.Errorf("%s: %w", f.flag, err)
		}
	}
	return nil
}

// open reads the layer named by --input, with its warnings on stderr.
func (c *sharedFlags) open(stdin io.Reader, stderr io.Writer) (err error) {
	var warnings []string
	stdin, digest := c.digestStdin(stdin)
	c.lay, warnings, err = readLayer(c.input, stdin, input.Options{IDColumn: c.id, SkipBadGeometry: c.skipBadGeometry, Layer: c.layerName})
	warn(stderr, warnings...)
	if err != nil {
		return err
	}
	if err := c.digestInputs(digest); err != nil {
		return err
	}
	if err := c.joinTable(stderr); err != nil {
		return err
	}
	return c.weights.resolve(&c.spec, c.lay.CRS)
}

// checkTable checks the flags of the join.
func (c *sharedFlags) checkTable() error {
	switch {
	case c.table == "" && (c.key != "" || c.tableKey != ""):
		return usagef("--key and --table-key go with --table")
	case c.table == "-":
		return usagef("--table must name a file: standard input can hold only the layer")
	}
	return nil
}

// joinTable joins --table onto the layer, with the join's warnings and a
// line that sums it up on stderr.
func (c *sharedFlags) joinTable(stderr io.Writer) error {
	if c.table == "" {
		return nil
	}
	t, warnings, err := table.ReadFile(c.table)
	warn(stderr, warnings...)
	if err != nil {
		return err
	}
	lay, rep, warnings, err := table.Join(c.lay, t, table.JoinOptions{LayerKey: c.key, TableKey: c.tableKey})
	if err != nil {
		return err
	}
	key := "the area ids"
	if rep.LayerKey != "" {
		key = rep.LayerKey
	}
	padded := ""
	if rep.Padded > 0 {
		padded = fmt.Sprintf(" (%s after zero padding)", numtext.Count(rep.Padded))
	}
	note(stderr, fmt.Sprintf("%s joined on %s = %s: %s of %s areas matched%s; %s of %s rows match no area; columns added: %s",
		rep.Table, key, rep.TableKey, numtext.Count(rep.Matched), numtext.Count(rep.Areas), padded,
		numtext.Count(rep.Unused), numtext.Count(rep.Rows), strings.Join(rep.Columns, ", ")))
	warn(stderr, warnings...)
	c.lay, c.join = lay, rep
	return nil
}

// build makes (or reads) the neighbour graph of the layer.
func (c *sharedFlags) build(stderr io.Writer) (err error) {
	var warnings []string
	c.graph, warnings, err = c.weights.graph(c.lay, c.spec)
	warn(stderr, warnings...)
	return err
}

// readLayer reads the layer at path (any format io/input reads), or from
// stdin for "-". A feature that could be left out gets the flag that does
// so named.
func readLayer(path string, stdin io.Reader, opt input.Options) (lay *layer.Layer, warnings []string, err error) {
	lay, warnings, err = input.Read(path, stdin, opt)
	switch {
	case input.Skippable(err):
		err = fmt.Errorf("%w (use --skip-bad-geometry to leave such features out)", err)
	case input.Choices(err) != nil:
		err = fmt.Errorf("%w (with --layer NAME)", err)
	case input.LooksLikeTable(err):
		err = fmt.Errorf("%w (give the layer to --input and the table to --table)", err)
	}
	return lay, warnings, err
}

// emit writes the result in the chosen format, by render, to --output,
// together with the run's other planned outputs (the page of --report by
// render["html"], see page). The report carries its warnings in every
// format; they also go to stderr, one line each, unless the text report
// itself is on stdout — so that whoever runs the command sees them once
// whether the report goes to the screen, to a file or into a program.
func (c *sharedFlags) emit(stdout, stderr io.Writer, warnings []string, render map[string]func(io.Writer) error) error {
	nameFlags(warnings)
	if c.format != "text" || !c.fileOf("--output").Stdout() {
		warn(stderr, warnings...)
	}
	r := render[c.format]
	if f := c.fileOf("--report"); f != nil {
		f.SetRender(render["html"])
	}
	if names, values := c.layerFacts(); c.format == "json" && len(names) > 0 {
		doc := r
		r = func(w io.Writer) error {
			var buf bytes.Buffer
			if err := doc(&buf); err != nil {
				return err
			}
			out, err := report.AddMembers(buf.Bytes(), names, values)
			if err != nil {
				return err
			}
			_, err = w.Write(out)
			return err
		}
	}
	c.fileOf("--output").SetRender(r)
	return c.plan.Commit(stdout)
}

// layerFacts are what a JSON document records of the layer beyond what
// the result says: a projected coordinate system, and the join.
func (c *sharedFlags) layerFacts() ([]string, map[string]any) {
	var names []string
	values := map[string]any{}
	if c.lay != nil && c.lay.CRS.Projected {
		names = append(names, "coordinate_system")
		values["coordinate_system"] = c.lay.CRS
	}
	if c.join != nil {
		names = append(names, "join")
		values["join"] = c.join
	}
	return names, values
}

// inputs are the files no output may overwrite.
func (c *sharedFlags) inputs() []string { return []string{c.input, c.weights.file, c.table} }
