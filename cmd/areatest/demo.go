package main

import (
	"bytes"
	"fmt"
	"io"
	"path/filepath"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/output"
	"github.com/areatest/areatest/samples"
)

const demoUsage = `areatest demo: the main job on a built-in sample region.

The sample is an invented region of about 200 districts with a disease rate,
a policy adopted by clusters of neighbouring districts, provinces and
populations. The demo runs

  areatest compare --input region.geojson --outcome rate --group policy --strata province

on it and prints the report. With --write DIR it writes the sample file
instead, so you can try every command on it.

Usage:
  areatest demo [flags]

Examples:
  areatest demo
  areatest demo --format json
  areatest demo --write .
`

func runDemo(args []string, stdout, stderr io.Writer) error {
	var c compareFlags
	var dir string
	fs := newFlags("demo", demoUsage, stderr)
	c.register(fs, false)
	fs.StringVar(&dir, "write", "", "write the sample layer into this directory and stop")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if dir != "" {
		path := filepath.Join(dir, samples.RegionFile)
		if err := output.Write(path, stdout, nil, func(w io.Writer) error {
			_, err := w.Write(samples.RegionGeoJSON)
			return err
		}); err != nil {
			return err
		}
		fmt.Fprintf(stderr, "wrote %s; try: areatest compare --input %s --outcome rate --group policy --strata province\n", path, path)
		return nil
	}
	c.outcome, c.group, c.strata = "rate", "policy", "province"
	if err := c.check(); err != nil {
		return err
	}
	lay, warnings, err := geojson.Read(bytes.NewReader(samples.RegionGeoJSON), "built-in "+samples.RegionFile, geojson.Options{})
	if err != nil {
		return err
	}
	warn(stderr, warnings...)
	c.lay = lay
	return c.run(stdout, stderr)
}
