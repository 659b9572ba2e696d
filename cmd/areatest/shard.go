package main

import (
	"encoding/csv"
	"fmt"
	"io"
	"maps"
	"slices"
	"strconv"
	"strings"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/io/partial"
	"github.com/areatest/areatest/spatial/shuffle"
)

// shardFlags hold --shard K/N: the run computes only the K-th of N parts
// of its random work and writes a partial result for areatest merge.
type shardFlags struct {
	spec string
	fs   *pflag.FlagSet
	// part is set by check when --shard was given.
	part *shuffle.Shard
}

// notSettings are the flags that do not decide a result: a part does not
// record them, and the merge takes its own.
var notSettings = []string{"output", "format", "workers", "shard", "report"}

func (s *shardFlags) register(fs *pflag.FlagSet) {
	s.fs = fs
	fs.StringVar(&s.spec, "shard", "", "K/N: compute only the K-th of N parts of the random work and write a partial result (JSON, to --output) for areatest merge")
}

// check reads --shard; a part writes only its partial result, so it
// needs a file named by --output and takes no other output (pictures
// names the command's picture flags, by value).
func (s *shardFlags) check(c *sharedFlags, pictures map[string]string) error {
	if s.spec == "" {
		return nil
	}
	k, n, ok := parseShard(s.spec)
	if !ok {
		return usagef("--shard takes K/N with 1 ≤ K ≤ N, e.g. --shard 2/8 (got %q)", s.spec)
	}
	switch {
	case !s.fs.Changed("output") || c.output == "-":
		return usagef("--shard writes a partial result: name its file with --output")
	case s.fs.Changed("format") && c.format != "json":
		return usagef("--shard writes its partial result as JSON; give --format to areatest merge")
	case c.input == "-":
		return usagef("--shard needs the layer in a file (--input), which the merge reads again: not standard input")
	case c.report != "":
		return usagef("--report does not go with --shard: a part holds no result yet")
	}
	for _, name := range slices.Sorted(maps.Keys(pictures)) {
		if pictures[name] != "" {
			return usagef("--%s does not go with --shard: a part holds no result yet", name)
		}
	}
	s.part, _ = shuffle.NewPart(k, n)
	return nil
}

// parseShard reads "K/N".
func parseShard(spec string) (k, n int, ok bool) {
	a, b, found := strings.Cut(spec, "/")
	k, err1 := strconv.Atoi(a)
	n, err2 := strconv.Atoi(b)
	if !found || err1 != nil || err2 != nil || n < 1 || k < 1 || k > n {
		return 0, 0, false
	}
	return k, n, true
}

// settings are the flags given that decide the result, normalised: one
// "--name=value" per flag, sorted by name; a list flag's values as one
// CSV record, as pflag reads it back.
func settings(fs *pflag.FlagSet) []string {
	var out []string
	fs.Visit(func(f *pflag.Flag) {
		if slices.Contains(notSettings, f.Name) {
			return
		}
		value := f.Value.String()
		if sv, ok := f.Value.(pflag.SliceValue); ok {
			var b strings.Builder
			w := csv.NewWriter(&b)
			_ = w.Write(sv.GetSlice()) // into a strings.Builder: cannot fail
			w.Flush()
			value = strings.TrimSuffix(b.String(), "\n")
		}
		out = append(out, "--"+f.Name+"="+value)
	})
	slices.Sort(out)
	return out
}

// partInputs are the files the run read, with their SHA-256.
func (c *sharedFlags) partInputs() ([]partial.Input, error) {
	var out []partial.Input
	for _, in := range c.inputFiles() {
		sum, err := fileDigest(in.path)
		if err != nil {
			return nil, err
		}
		out = append(out, partial.Input{Role: in.role, Path: in.path, SHA256: sum})
	}
	return out, nil
}

// writePart writes the partial result of the part s ran, for command, to
// --output.
func (s *shardFlags) writePart(c *sharedFlags, command string, stdout, stderr io.Writer) error {
	inputs, err := c.partInputs()
	if err != nil {
		return err
	}
	k, n, _ := parseShard(s.spec)
	doc := &partial.Document{Format: partial.Format, Version: Version, Command: command, Settings: settings(s.fs),
		Seed: c.seed, Part: k, Parts: n, Inputs: inputs, Stages: s.part.Ledger()}
	c.fileOf("--output").SetRender(func(w io.Writer) error { return partial.Write(w, doc) })
	if err := c.plan.Commit(stdout); err != nil {
		return err
	}
	note(stderr, fmt.Sprintf("part %d of %d written to %s; merge all %d with areatest merge", k, n, c.output, n))
	return nil
}
