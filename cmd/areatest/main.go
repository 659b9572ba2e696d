package main

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"

	"github.com/spf13/pflag"
	"golang.org/x/term"
)

// Version is the release of this build; it is written into every output.
const Version = "0.1.0"

// usageError marks a mistake in how the command was called (exit 2), as
// opposed to a problem with the data (exit 1).
type usageError struct{ msg string }

func (e *usageError) Error() string { return e.msg }

func usagef(format string, a ...any) error { return &usageError{fmt.Sprintf(format, a...)} }

// helpRequest is what parsing returns when -h or --help was given: the
// command's help text, which run writes to stdout with exit 0 — help asked
// for is the command's output, not a complaint.
type helpRequest struct{ text string }

func (h *helpRequest) Error() string { return "help requested" }

// Unwrap makes a help request read as pflag.ErrHelp to errors.Is.
func (h *helpRequest) Unwrap() error { return pflag.ErrHelp }

// commands are the subcommands by name, each in a file of its own.
var commands = map[string]func(args []string, stdin io.Reader, stdout, stderr io.Writer) error{
	"compare": runCompare, "demo": runDemo, "autocorr": runAutocorr, "screen": runScreen, "local": runLocal, "weights": runWeights,
	"residuals": runResiduals, "merge": runMerge,
}

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
	switch cmd, ok := commands[args[0]]; {
	case args[0] == "-h" || args[0] == "--help" || args[0] == "help":
		fmt.Fprint(stdout, help("areatest"))
		return 0
	case args[0] == "--version" || args[0] == "version":
		fmt.Fprintf(stdout, "areatest %s\n", Version)
		return 0
	case ok:
		err = cmd(args[1:], stdin, stdout, stderr)
	default:
		err = usagef("unknown command %q (commands: compare, autocorr, screen, local, residuals, weights, merge, demo; see areatest --help)", args[0])
	}
	var ue *usageError
	var hr *helpRequest
	switch {
	case err == nil:
		return 0
	case errors.As(err, &hr):
		fmt.Fprint(stdout, hr.text)
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

// warn writes each message as a warning line to stderr.
func warn(w io.Writer, msgs ...string) {
	for _, m := range msgs {
		fmt.Fprintf(w, "%s %s\n", paint(w, "33", "areatest: warning:"), m)
	}
}

// note writes a message that is neither a result nor a warning (what a
// step did) to stderr.
func note(w io.Writer, msg string) {
	fmt.Fprintf(w, "areatest: %s\n", msg)
}

// newFlags makes the flag set of a command, which reports errors instead of
// exiting; its help text (help/NAME.txt and the flags) comes back from
// parseFlags as a helpRequest.
func newFlags(name string, stderr io.Writer) *pflag.FlagSet {
	fs := pflag.NewFlagSet(name, pflag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.SortFlags = false
	fs.Usage = func() {} // the text goes to stdout through run, not here
	return fs
}

// commandHelp is the full help of a command: its text and its flags.
func commandHelp(fs *pflag.FlagSet) string {
	return help(fs.Name()) + "\nFlags:\n" + fs.FlagUsages()
}

// parseFlags parses args, turning flag errors into usage errors and -h or
// --help into a helpRequest.
func parseFlags(fs *pflag.FlagSet, args []string) error {
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			return &helpRequest{commandHelp(fs)}
		}
		return usagef("%v (see areatest %s --help)", err, fs.Name())
	}
	if fs.NArg() > 0 {
		return usagef("unexpected argument %q (see areatest %s --help)", fs.Arg(0), fs.Name())
	}
	return checkNumbers(fs)
}

// checkNumbers refuses, on every flag given, the numbers no flag of this
// tool takes, so that no command has to remember to: every integer flag is
// a count (of shuffles, areas, neighbours, orders, lines), so none may be
// negative, and no float flag takes NaN or an infinity. Each command still
// checks its own ranges (at least 1, between 0 and 1, …).
func checkNumbers(fs *pflag.FlagSet) (err error) {
	fs.Visit(func(f *pflag.Flag) {
		if err != nil {
			return
		}
		switch f.Value.Type() {
		case "int":
			if n, _ := fs.GetInt(f.Name); n < 0 {
				err = usagef("--%s must not be negative (got %d)", f.Name, n)
			}
		case "float64":
			if x, _ := fs.GetFloat64(f.Name); math.IsNaN(x) || math.IsInf(x, 0) {
				err = usagef("--%s must be a finite number, not %s", f.Name, f.Value)
			}
		}
	})
	return err
}
