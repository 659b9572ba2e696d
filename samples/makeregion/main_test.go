package main

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"github.com/areatest/areatest/samples"
	"github.com/areatest/areatest/samples/region"
)

func TestRunWritesShippedFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, samples.RegionFile)
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := run(region.DefaultConfig(), path); err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, samples.RegionGeoJSON) {
		t.Error("makeregion with the default settings does not reproduce the shipped file")
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != 1 {
		t.Errorf("temporary files left behind: %v", entries)
	}
}

func TestRunRejectsBadConfig(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "x.geojson")
	if err := run(region.Config{Areas: 3}, path); err == nil {
		t.Fatal("no error for 3 areas")
	}
	if _, err := os.Stat(path); !os.IsNotExist(err) {
		t.Errorf("a file was written despite the error: %v", err)
	}
}
