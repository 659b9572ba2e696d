package main

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/samples"
)

func runDemo(args []string, _ io.Reader, stdout, stderr io.Writer) error {
	var c compareFlags
	var dir string
	flags := newFlags("demo", stderr)
	c.register(flags, false)
	flags.StringVar(&dir, "write", "", "write the sample layer into this directory and stop")
	if err := parseFlags(flags, args); err != nil {
		return err
	}
	if flags.Changed("write") {
		return writeSample(&c, flags, dir, stdout, stderr)
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
	sum := sha256.Sum256(samples.RegionGeoJSON)
	c.digests = []report.InputFile{{Role: "layer", Name: lay.Source, SHA256: hex.EncodeToString(sum[:])}}
	return c.run(stdout, stderr)
}

// writeSample writes the sample layer into dir, for demo --write. It
// writes and stops, so every other flag is refused (it would have no
// effect). It never replaces a file: when dir already has a file of the
// sample's name, a copy of the sample is left as it is (with a note on
// stderr, exit 0), and anything else there is an error.
func writeSample(c *compareFlags, flags *pflag.FlagSet, dir string, stdout, stderr io.Writer) error {
	var others []string
	flags.Visit(func(f *pflag.Flag) {
		if f.Name != "write" {
			others = append(others, "--"+f.Name)
		}
	})
	switch {
	case dir == "":
		return usagef("--write needs a directory (. for this one)")
	case len(others) > 0:
		return usagef("--write writes the sample and stops; %s would have no effect with it", strings.Join(others, ", "))
	}
	path := filepath.Join(dir, samples.RegionFile)
	if same, err := holdsSample(path); err != nil || same {
		if same {
			fmt.Fprintf(stderr, "%s already holds the sample; left as it is\n", path)
		}
		return err
	}
	c.wantOutput("--write", path)
	if err := c.planOutputs(); err != nil {
		return err
	}
	c.fileOf("--write").SetRender(func(w io.Writer) error {
		_, err := w.Write(samples.RegionGeoJSON)
		return err
	})
	if err := c.plan.Commit(stdout); err != nil {
		return err
	}
	fmt.Fprintf(stderr, "wrote %s; try: areatest compare --input %s --outcome rate --group policy --strata province\n", path, path)
	return nil
}

// holdsSample reports whether path is a copy of the sample; it is an error
// for path to be anything else (a file is only read when it is a regular
// one of the sample's size, so a FIFO is never waited on).
func holdsSample(path string) (bool, error) {
	info, err := os.Stat(path)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return false, nil // a missing folder is the output plan's to name
	case errors.Is(err, syscall.ENOTDIR):
		return false, fmt.Errorf("--write: %s is not a folder", filepath.Dir(path))
	case err != nil:
		return false, fmt.Errorf("%s: %w", path, err)
	}
	if info.Mode().IsRegular() && info.Size() == int64(len(samples.RegionGeoJSON)) {
		had, err := os.ReadFile(path)
		if err != nil {
			return false, fmt.Errorf("%s: %w", path, err)
		}
		if bytes.Equal(had, samples.RegionGeoJSON) {
			return true, nil
		}
	}
	return false, fmt.Errorf("%s already exists and is not the sample; demo --write replaces no file: remove it or choose another directory", path)
}
