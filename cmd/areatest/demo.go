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

func runDemo(args []string, _ io.Reader, stdout, stderr io.Writer) error {
	var c compareFlags
	var dir string
	fs := newFlags("demo", stderr)
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
