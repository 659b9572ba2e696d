package main

import (
	"fmt"
	"io"
	"strings"

	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/progress"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/clustering"
	"github.com/areatest/areatest/spatial/shuffle"
)

func runScreen(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	return screenRun(args, stdin, stdout, stderr, nil)
}

// screenRun is screen, or, with replay, the merge of its parts.
func screenRun(args []string, stdin io.Reader, stdout, stderr io.Writer, replay *shuffle.Ledger) error {
	var c sharedFlags
	var shard shardFlags
	var exclude []string
	var adjust string
	fs := newFlags("screen", stderr)
	fs.StringSliceVar(&exclude, "exclude", nil, "columns to leave out, comma-separated")
	fs.StringVar(&adjust, "adjust", "bh", "multiple-testing adjustment across columns: bh (Benjamini–Hochberg), holm, bonferroni, by (Benjamini–Yekutieli) or none")
	c.register(fs, "text", "json", "csv")
	shard.register(fs)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if err := shard.check(&c, nil); err != nil {
		return err
	}
	method, err := shuffle.ParseAdjustment(adjust)
	if err != nil {
		return usagef("--adjust: %v", err)
	}
	if err := c.prepare("screen", stdin, stderr, shuffle.ParseAlternative); err != nil {
		return err
	}
	in, opt := c.clustering()
	opt.Adjust, opt.Shard = method, shard.part
	if replay != nil {
		opt.Shard = shuffle.NewReplay(replay)
	}
	sin := clustering.ScreenInput{Input: in, IDColumn: c.lay.IDColumn, Excluded: exclude, TextReasons: map[string]string{}}
	for _, col := range c.lay.Columns {
		switch {
		case col.Kind == layer.Number:
			sin.Numeric = append(sin.Numeric, clusterColumn(col))
		case col.MostlyNumbers():
			// Numbers with a few bad values: name them, so that they can be
			// fixed, rather than call the column text.
			sin.Text = append(sin.Text, col.Name)
			sin.TextReasons[col.Name] = strings.TrimPrefix(c.lay.NotNumeric(col, "").Detail(), "is ")
		default:
			sin.Text = append(sin.Text, col.Name)
		}
	}
	for _, e := range exclude {
		if _, err := c.lay.Column(e); err != nil {
			return fmt.Errorf("--exclude: %w", err)
		}
	}
	bar := progress.New(stderr)
	opt.Progress = bar.Stage
	res, err := clustering.Screen(sin, opt)
	bar.Finish()
	if err != nil {
		return err
	}
	res.Version = Version
	if shard.part != nil {
		return shard.writePart(&c, "screen", stdout, stderr)
	}
	return c.emit(stdout, stderr, res.Warnings, map[string]func(io.Writer) error{
		"json": func(w io.Writer) error { return report.JSON(w, res) },
		"csv":  func(w io.Writer) error { return report.ScreenCSV(w, res) },
		"text": func(w io.Writer) error { return report.ScreenText(w, res) },
		"html": c.page(res, 0),
	})
}
