package main

import (
	"fmt"
	"io"

	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/progress"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/clustering"
	"github.com/areatest/areatest/spatial/shuffle"
)

const screenUsage = `areatest screen: which attributes of a layer cluster in space?

The first command to run on a new layer. Every numeric column (not the ids,
not constants; the report says which were skipped and why) gets Moran's I
and Geary's C with permutation p-values, adjusted across columns for
multiple testing, and the columns are ranked by Moran's I.

Usage:
  areatest screen --input FILE [flags]

Examples:
  areatest screen --input counties.geojson
  areatest screen -i counties.geojson --exclude population,area --adjust holm
  areatest screen -i counties.geojson --format csv -o screen.csv
`

func runScreen(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var c sharedFlags
	var exclude []string
	var adjust string
	fs := newFlags("screen", screenUsage, stderr)
	fs.StringSliceVar(&exclude, "exclude", nil, "columns to leave out, comma-separated")
	fs.StringVar(&adjust, "adjust", "bh", "multiple-testing adjustment across columns: bh (Benjamini–Hochberg), holm, bonferroni, by (Benjamini–Yekutieli) or none")
	c.register(fs, "text", "json", "csv")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	method, err := shuffle.ParseMethod(adjust)
	if err != nil {
		return usagef("--adjust: %v", err)
	}
	if err := c.prepare("screen", stdin, stderr, shuffle.ParseAlternative); err != nil {
		return err
	}
	in, opt := c.clustering()
	opt.Adjust = method
	sin := clustering.ScreenInput{Input: in, IDColumn: c.lay.IDColumn, Excluded: exclude}
	for _, col := range c.lay.Columns {
		if col.Kind == layer.Number {
			sin.Numeric = append(sin.Numeric, clusterColumn(col))
		} else {
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
	return c.emit(stdout, stderr, res.Warnings, map[string]func(io.Writer) error{
		"json": func(w io.Writer) error { return report.JSON(w, res) },
		"csv":  func(w io.Writer) error { return report.ScreenCSV(w, res) },
		"text": func(w io.Writer) error { return report.ScreenText(w, res) },
	})
}
