package main

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"path/filepath"

	"github.com/areatest/areatest/samples/region"
)

func main() {
	def := region.DefaultConfig()
	out := flag.String("o", "", "path of the GeoJSON file to write (required)")
	areas := flag.Int("areas", def.Areas, "number of districts, islands included")
	seed := flag.Uint64("seed", def.Seed, "seed that selects the region")
	flag.Parse()
	if *out == "" || flag.NArg() > 0 {
		fmt.Fprintln(os.Stderr, "usage: makeregion -o FILE [-areas N] [-seed S]")
		os.Exit(2)
	}
	cfg := def
	cfg.Areas, cfg.Seed = *areas, *seed
	if err := run(cfg, *out); err != nil {
		fmt.Fprintln(os.Stderr, "makeregion:", err)
		os.Exit(1)
	}
}

func run(cfg region.Config, path string) error {
	r, err := region.Build(cfg)
	if err != nil {
		return err
	}
	var buf bytes.Buffer
	if err := r.WriteGeoJSON(&buf); err != nil {
		return err
	}
	return writeAtomic(path, buf.Bytes())
}

// writeAtomic writes through a temporary file in the target's directory and
// renames it into place, so readers never see a half-written file and a
// failure leaves any old file untouched.
func writeAtomic(path string, data []byte) error {
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".*.tmp")
	if err != nil {
		return err
	}
	name := tmp.Name()
	defer os.Remove(name) // no-op once renamed
	if _, err := tmp.Write(data); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Sync(); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Close(); err != nil {
		return err
	}
	if err := os.Chmod(name, 0o644); err != nil {
		return err
	}
	return os.Rename(name, path)
}
