package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"runtime"

	"github.com/spf13/pflag"
	"golang.org/x/term"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/output"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Version is the release of this build; it is written into every output.
const Version = "0.1.0"

// usageError marks a mistake in how the command was called (exit 2), as
// opposed to a problem with the data (exit 1).
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

func usagef(format string, a ...any) error { return &usageError{fmt.Sprintf(format, a...)} }

func main() {
	os.Exit(run(os.Args[1:], os.Stdin, os.Stdout, os.Stderr))
}

// run executes one command line and returns the exit status: 0 success,
// 1 error, 2 usage error.
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprint(stderr, help("areatest"))
		return 2
	}
	var err error
	switch args[0] {
	case "-h", "--help", "help":
		fmt.Fprint(stdout, help("areatest"))
		return 0
	case "--version", "version":
		fmt.Fprintf(stdout, "areatest %s\n", Version)
		return 0
	case "compare":
		err = runCompare(args[1:], stdin, stdout, stderr)
	case "demo":
		err = runDemo(args[1:], stdout, stderr)
	case "weights":
		err = runWeights(args[1:], stdin, stdout, stderr)
	case "autocorr":
		err = runAutocorr(args[1:], stdin, stdout, stderr)
	case "screen":
		err = runScreen(args[1:], stdin, stdout, stderr)
	case "local":
		err = runLocal(args[1:], stdin, stdout, stderr)
	default:
		err = usagef("unknown command %q (commands: compare, autocorr, screen, local, weights, demo; see areatest --help)", args[0])
	}
	var ue *usageError
	switch {
	case err == nil:
		return 0
	case errors.Is(err, pflag.ErrHelp):
		return 0
	case errors.As(err, &ue):
		fmt.Fprintf(stderr, "areatest: %v\n", err)
		return 2
	default:
		fmt.Fprintf(stderr, "%s %v\n", paint(stderr, "31", "areatest: error:"), err)
		return 1
	}
}

// paint colours a label for a terminal (ANSI code, 31 red, 33 yellow),
// unless NO_COLOR is set (no-color.org).
func paint(w io.Writer, code, s string) string {
	if f, ok := w.(*os.File); ok && term.IsTerminal(int(f.Fd())) && os.Getenv("NO_COLOR") == "" {
		return "\x1b[1;" + code + "m" + s + "\x1b[0m"
	}
	return s
}

// warn writes one warning line a message to stderr.
func warn(w io.Writer, msgs ...string) {
	for _, m := range msgs {
		fmt.Fprintf(w, "%s %s\n", paint(w, "33", "areatest: warning:"), m)
	}
}

// newFlags makes a flag set that reports errors instead of exiting, with
// the given usage text.
func newFlags(name, usage string, stderr io.Writer) *pflag.FlagSet {
	fs := pflag.NewFlagSet(name, pflag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.SortFlags = false
	fs.Usage = func() {
		fmt.Fprint(stderr, usage)
		fmt.Fprintln(stderr, "\nFlags:")
		fmt.Fprint(stderr, fs.FlagUsages())
	}
	return fs
}

// parseFlags parses args, turning flag errors into usage errors.
func parseFlags(fs *pflag.FlagSet, args []string) error {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			return err
		}
		return usagef("%v (see areatest %s --help)", err, fs.Name())
	}
	if fs.NArg() > 0 {
		return usagef("unexpected argument %q (see areatest %s --help)", fs.Arg(0), fs.Name())
	}
	return nil
}

// sharedFlags are the settings autocorr, screen and local share, and what
// prepare makes of them.
type sharedFlags struct {
	input, id, alternative, format, output string
	skipBadGeometry                        bool
	permutations, workers                  int
	seed                                   uint64
	weights                                weightFlags
	formats                                []choice.Name[string]
	// Set by prepare: the layer, the neighbour graph of all its areas and
	// how the statistics use it.
	lay         *layer.Layer
	graph       *weights.Graph
	spec        weights.Spec
	scaling     weights.Scaling
	keepIslands bool
	alt         shuffle.Alternative
}

// register adds the shared flags to fs; the first of formats is the
// default.
func (c *sharedFlags) register(fs *pflag.FlagSet, formats ...string) {
	c.registerInput(fs)
	c.registerRun(fs, formats...)
}

// registerInput adds the flags that name the layer.
func (c *sharedFlags) registerInput(fs *pflag.FlagSet) {
	fs.StringVarP(&c.input, "input", "i", "", "GeoJSON FeatureCollection of polygons (- for stdin)")
	fs.StringVar(&c.id, "id", "", "column holding area ids (default: the feature id)")
	fs.BoolVar(&c.skipBadGeometry, "skip-bad-geometry", false, "leave out features with no or non-polygon geometry, with a warning")
}

// registerRun adds the flags of the shuffles, the output and the weights.
func (c *sharedFlags) registerRun(fs *pflag.FlagSet, formats ...string) {
	fs.StringVar(&c.alternative, "alternative", "two-sided", "two-sided, greater (more clustered than chance) or less (more dispersed)")
	fs.IntVarP(&c.permutations, "permutations", "n", 9999, "Monte Carlo shuffles per test")
	fs.Uint64Var(&c.seed, "seed", 1, "seed of the random shuffles; the same seed gives the same result")
	fs.IntVar(&c.workers, "workers", runtime.NumCPU(), "goroutines sharing the shuffles (results do not depend on it)")
	c.registerOutput(fs, formats...)
	c.weights.register(fs)
}

// registerOutput adds --format (the first of formats is the default) and
// --output.
func (c *sharedFlags) registerOutput(fs *pflag.FlagSet, formats ...string) {
	for _, f := range formats {
		c.formats = append(c.formats, choice.Name[string]{Name: f, Value: f})
	}
	fs.StringVar(&c.format, "format", formats[0], choice.List(c.formats))
	fs.StringVarP(&c.output, "output", "o", "-", "write the result here instead of stdout")
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

// check checks the shared flags and reads the weights settings.
func (c *sharedFlags) check(parseAlt func(string) (shuffle.Alternative, error)) (err error) {
	if err = c.checkOutput(); err != nil {
		return err
	}
	if c.alt, err = parseAlt(c.alternative); err != nil {
		return usagef("--alternative: %v", err)
	}
	if c.permutations < 1 || c.workers < 1 {
		return usagef("--permutations and --workers must be at least 1")
	}
	c.spec, c.scaling, c.keepIslands, err = c.weights.spec()
	return err
}

// checkOutput reads --format.
func (c *sharedFlags) checkOutput() (err error) {
	if c.format, err = choice.Parse("--format", c.format, c.formats...); err != nil {
		return usagef("%v", err)
	}
	return nil
}

// open reads the layer named by --input, with its warnings on stderr.
func (c *sharedFlags) open(stdin io.Reader, stderr io.Writer) (err error) {
	var warnings []string
	c.lay, warnings, err = readLayer(c.input, stdin, geojson.Options{IDColumn: c.id, SkipBadGeometry: c.skipBadGeometry})
	warn(stderr, warnings...)
	return err
}

// build makes (or reads) the neighbour graph of the layer.
func (c *sharedFlags) build(stderr io.Writer) (err error) {
	var warnings []string
	c.graph, warnings, err = c.weights.graph(c.lay, c.spec)
	warn(stderr, warnings...)
	return err
}

// readLayer reads a GeoJSON layer from a path, or from stdin for "-". A
// feature that could be left out gets the flag that does so named.
func readLayer(path string, stdin io.Reader, opt geojson.Options) (lay *layer.Layer, warnings []string, err error) {
	if path == "-" {
		lay, warnings, err = geojson.Read(stdin, "stdin", opt)
	} else {
		lay, warnings, err = geojson.ReadFile(path, opt)
	}
	if fe := (*geojson.Error)(nil); errors.As(err, &fe) && fe.Skippable {
		err = fmt.Errorf("%w (use --skip-bad-geometry to leave such features out)", err)
	}
	return lay, warnings, err
}

// emit writes the result in the chosen format, by render; the text report
// shows its warnings itself, the other formats leave them to stderr.
func (c *sharedFlags) emit(stdout, stderr io.Writer, warnings []string, render map[string]func(io.Writer) error) error {
	if c.format != "text" {
		warn(stderr, warnings...)
	}
	return output.Write(c.output, stdout, c.inputs(), render[c.format])
}

// inputs are the files no output may overwrite.
func (c *sharedFlags) inputs() []string { return []string{c.input, c.weights.file} }
