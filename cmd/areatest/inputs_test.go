package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/areatest/areatest/tests/testkit"
)

// A shapefile given by its .shp is read with its companions, so the
// digests of --report and of a part (--shard) cover them too, whatever the
// case of their extensions; a missing one is simply not listed.
func TestInputFilesOfAShapefile(t *testing.T) {
	dir := t.TempDir()
	for _, name := range []string{"a.shp", "a.DBF", "a.shx", "a.prj", "t.csv"} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(name), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	c := sharedFlags{input: filepath.Join(dir, "a.shp"), table: filepath.Join(dir, "t.csv")}
	got := c.inputFiles()
	want := []inputFile{{"layer", "a.shp"}, {"layer shx", "a.shx"}, {"layer dbf", "a.DBF"}, {"layer prj", "a.prj"}, {"table", "t.csv"}}
	if len(got) != len(want) {
		t.Fatalf("%v", got)
	}
	for i, w := range want {
		if got[i].role != w.role || filepath.Base(got[i].path) != w.path {
			t.Errorf("file %d: %v, want %v", i, got[i], w)
		}
	}
}

// The weights summary's warnings reach stderr when the report is not text
// on stdout, as every command's do (the US states: 7 of 56 areas are
// islands).
func TestWeightsWarningsOnStderr(t *testing.T) {
	states := testkit.Testdata(t, "us-states.geojson")
	r := runIn("", "weights", "-i", states, "--format", "json")
	if r.code != 0 || !strings.Contains(r.stderr, "areatest: warning:") || !strings.Contains(r.stderr, "have no neighbour") {
		t.Errorf("exit %d, stderr %q", r.code, r.stderr)
	}
	if text := runIn("", "weights", "-i", states); strings.Contains(text.stderr, "have no neighbour") {
		t.Errorf("the text report's warnings went to stderr too: %q", text.stderr)
	}
}
