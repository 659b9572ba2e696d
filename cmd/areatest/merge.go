package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"runtime"
	"slices"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/io/partial"
	"github.com/areatest/areatest/spatial/shuffle"
)

// mergeCommands are the commands whose parts merge folds, by name: each
// runs with the parts' settings, its random stages replaying the parts.
var mergeCommands = map[string]func(args []string, stdin io.Reader, stdout, stderr io.Writer, replay *shuffle.Ledger) error{
	"compare":  compareRun,
	"autocorr": autocorrRun,
	"screen":   screenRun,
}

// mergeFlags are merge's own settings: where and how the result goes.
type mergeFlags struct {
	format, output string
	workers        int
}

func runMerge(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var m mergeFlags
	fs := newFlags("merge", stderr)
	fs.StringVar(&m.format, "format", "", "text or json, as the command's --format (default: the command's)")
	fs.StringVarP(&m.output, "output", "o", "-", "write the result here instead of stdout")
	fs.IntVar(&m.workers, "workers", runtime.NumCPU(), "goroutines sharing the steps run again (results do not depend on it)")
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			return &helpRequest{commandHelp(fs)}
		}
		return usagef("%v (see areatest merge --help)", err)
	}
	if err := checkNumbers(fs); err != nil {
		return err
	}
	names := fs.Args()
	switch {
	case len(names) == 0:
		return usagef("merge needs the partial results to fold: areatest merge PART.json... (see areatest merge --help)")
	case m.workers < 1:
		return usagef("--workers must be at least 1")
	case slices.ContainsFunc(names, func(n string) bool { return sameFile(n, m.output) }):
		return usagef("--output %s is one of the parts; give the result a file of its own", m.output)
	}
	docs := make([]*partial.Document, len(names))
	for i, name := range names {
		var err error
		if docs[i], err = partial.Read(name); err != nil {
			return err
		}
	}
	all, err := partial.Check(docs, names, Version)
	if err != nil {
		return err
	}
	return m.fold(docs[0], all, stdin, stdout, stderr)
}

// fold checks the inputs against the parts' digests and runs the parts'
// command with their settings, replaying all.
func (m *mergeFlags) fold(d *partial.Document, all *shuffle.Ledger, stdin io.Reader, stdout, stderr io.Writer) error {
	run, ok := mergeCommands[d.Command]
	if !ok {
		return fmt.Errorf("the parts are of areatest %s, whose parts this release cannot merge", d.Command)
	}
	for _, in := range d.Inputs {
		sum, err := fileDigest(in.Path)
		if err != nil {
			return fmt.Errorf("the parts read %s: %w", in.Path, err)
		}
		if sum != in.SHA256 {
			return fmt.Errorf("%s (the %s) has changed since the parts were computed: SHA-256 %s now, %s in the parts", in.Path, in.Role, sum, in.SHA256)
		}
	}
	args := append(slices.Clone(d.Settings), "--output="+m.output, fmt.Sprintf("--workers=%d", m.workers))
	if m.format != "" {
		args = append(args, "--format="+m.format)
	}
	return run(args, stdin, stdout, stderr, all)
}

// sameFile reports whether paths a and b name one existing file.
func sameFile(a, b string) bool {
	fa, err1 := os.Stat(a)
	fb, err2 := os.Stat(b)
	return err1 == nil && err2 == nil && os.SameFile(fa, fb)
}
