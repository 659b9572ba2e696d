package main

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"fmt"
	"image/png"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

type outcome struct {
	code           int
	stdout, stderr string
}

// runCLI runs one command line in this process (run, as main calls it).
func runCLI(t *testing.T, stdin string, args ...string) outcome {
	t.Helper()
	r := runIn(stdin, args...)
	return outcome{r.code, r.stdout, r.stderr}
}

func TestVersionAndHelp(t *testing.T) {
	if o := runCLI(t, "", "--version"); o.code != 0 || !strings.HasPrefix(o.stdout, "areatest ") {
		t.Fatalf("--version: %+v", o)
	}
	for _, args := range [][]string{{"--help"}, {"compare", "--help"}, {"demo", "--help"}, {"autocorr", "--help"}, {"screen", "--help"}, {"local", "--help"}, {"weights", "--help"}} {
		o := runCLI(t, "", args...)
		if o.code != 0 || !strings.Contains(o.stdout+o.stderr, "Examples:") {
			t.Errorf("%v: code %d, no examples in help", args, o.code)
		}
	}
}

func TestUsageErrorsExitTwo(t *testing.T) {
	for _, args := range [][]string{
		{},
		{"frobnicate"},
		{"compare", "--outcome", "rate", "--group", "policy"},
		{"compare", "--input", "x.geojson", "--group", "policy"},
		{"compare", "-i", "x.geojson", "-y", "rate", "-g", "policy", "--contiguity", "bishop"},
		{"compare", "-i", "x.geojson", "-y", "rate", "-g", "policy", "--statistic", "median"},
		{"compare", "-i", "x.geojson", "-y", "rate", "-g", "policy", "--permutations", "0"},
		{"compare", "-i", "x.geojson", "-y", "rate", "-g", "policy", "--alternative", "up"},
		{"compare", "-i", "x.geojson", "-y", "rate", "-g", "policy", "--contrast", "a,b,c"},
		{"compare", "-i", "x.geojson", "-y", "rate", "-g", "policy", "--no-such-flag"},
		{"demo", "--format", "xml"},
	} {
		if o := runCLI(t, "", args...); o.code != 2 {
			t.Errorf("%v: exit %d, want 2 (stderr %q)", args, o.code, o.stderr)
		}
	}
}

func TestDemoReport(t *testing.T) {
	o := runCLI(t, "", "demo", "--permutations", "999")
	if o.code != 0 {
		t.Fatalf("demo failed: %s", o.stderr)
	}
	for _, want := range []string{"rate", "policy", "free", "within province", "Moran's I", "not evidence that one thing causes", "ecological fallacy", "seed 1"} {
		if !strings.Contains(o.stdout, want) {
			t.Errorf("demo report lacks %q", want)
		}
	}
}

// The same seed gives byte-identical JSON whatever the number of workers.
func TestJSONIdenticalAcrossWorkers(t *testing.T) {
	a := runCLI(t, "", "demo", "--format", "json", "--workers", "1", "--permutations", "2999", "--seed", "17")
	b := runCLI(t, "", "demo", "--format", "json", "--workers", "8", "--permutations", "2999", "--seed", "17")
	if a.code != 0 || b.code != 0 {
		t.Fatalf("demo failed: %s %s", a.stderr, b.stderr)
	}
	if a.stdout != b.stdout {
		t.Fatal("JSON differs between --workers 1 and --workers 8")
	}
	c := runCLI(t, "", "demo", "--format", "json", "--workers", "2", "--permutations", "2999", "--seed", "18")
	if c.stdout == a.stdout {
		t.Fatal("a different seed gave identical output")
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(a.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	for _, key := range []string{"version", "seed", "input", "weights", "statistic", "tests", "autocorrelation", "excluded", "warnings"} {
		if _, ok := doc[key]; !ok {
			t.Errorf("JSON lacks %q", key)
		}
	}
	w := doc["weights"].(map[string]any)
	for _, key := range []string{"kind", "areas", "links", "islands"} {
		if _, ok := w[key]; !ok {
			t.Errorf("weights lacks %q", key)
		}
	}
	tests := doc["tests"].([]any)
	for _, key := range []string{"scheme", "p_value", "permutations", "exact", "interval"} {
		if _, ok := tests[0].(map[string]any)[key]; !ok {
			t.Errorf("tests[0] lacks %q", key)
		}
	}
	if doc["seed"].(float64) != 17 {
		t.Errorf("seed recorded as %v", doc["seed"])
	}
}

// A small layer of four squares in a row, two per group, in lon/lat.
func squares(props []string) string {
	var f []string
	for i, p := range props {
		x := float64(i)
		f = append(f, fmt.Sprintf(`{"type":"Feature","id":"a%d","properties":{%s},"geometry":{"type":"Polygon","coordinates":[[[%g,0],[%g,0],[%g,1],[%g,1],[%g,0]]]}}`,
			i+1, p, x, x+1, x+1, x, x))
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

func TestCompareFromStdin(t *testing.T) {
	layer := squares([]string{`"y":1,"g":"a"`, `"y":2,"g":"a"`, `"y":5,"g":"b"`, `"y":7,"g":"b"`, `"y":null,"g":"b"`, `"y":3,"g":"b"`})
	o := runCLI(t, layer, "compare", "-i", "-", "-y", "y", "-g", "g", "--format", "json", "--contrast", "b,a")
	if o.code != 0 {
		t.Fatalf("exit %d: %s", o.code, o.stderr)
	}
	var doc struct {
		Statistic struct {
			Observed float64
			Contrast []string
		}
		Tests []struct {
			Exact        bool
			Permutations int
			PValue       float64 `json:"p_value"`
		}
		Excluded []struct {
			Reason string
			Areas  int
			IDs    []string
		}
	}
	if err := json.Unmarshal([]byte(o.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	// b = {5, 7, 3} has median 5, a = {1, 2} median 1.5: b − a = 3.5.
	if doc.Statistic.Observed != 3.5 || doc.Statistic.Contrast[0] != "b" {
		t.Errorf("statistic %+v", doc.Statistic)
	}
	// C(5,2) = 10 arrangements, enumerated.
	if !doc.Tests[0].Exact || doc.Tests[0].Permutations != 10 {
		t.Errorf("test %+v", doc.Tests[0])
	}
	if len(doc.Excluded) != 1 || doc.Excluded[0].Areas != 1 || doc.Excluded[0].IDs[0] != "a5" {
		t.Errorf("excluded %+v", doc.Excluded)
	}
}

// Each kind of bad input stops with a one-line error naming what is wrong,
// exit 1, and leaves no output file behind.
func TestBadInputs(t *testing.T) {
	dir := t.TempDir()
	good := `"y":1,"g":"a"`
	cases := []struct {
		name, content string
		args          []string
		want          []string
	}{
		{"not json", `{"type": "FeatureCollection", "features": [`, nil, []string{"bad.geojson"}},
		{"not a collection", `{"type":"Feature","properties":{},"geometry":null}`, nil, []string{"bad.geojson", "FeatureCollection"}},
		{"point geometry", strings.Replace(squares([]string{good, `"y":2,"g":"a"`, `"y":3,"g":"b"`, `"y":4,"g":"b"`}),
			`{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,1],[0,0]]]}`, `{"type":"Point","coordinates":[0,0]}`, 1), nil, []string{"bad.geojson", "Point", "a1", "(use --skip-bad-geometry to leave such features out)"}},
		{"unknown column", squares([]string{good, good, `"y":3,"g":"b"`, `"y":4,"g":"b"`}), []string{"-y", "rate"}, []string{"rate"}},
		{"outcome not numeric", squares([]string{`"y":"low","g":"a"`, good, `"y":3,"g":"b"`, `"y":4,"g":"b"`}), nil, []string{"not numeric", `"y"`}},
		{"one group", squares([]string{good, good, good, good}), nil, []string{"one level"}},
		{"group of one area", squares([]string{good, `"y":2,"g":"a"`, `"y":3,"g":"a"`, `"y":4,"g":"b"`}), nil, []string{`"b"`, "at least 2"}},
		{"duplicate ids", strings.Replace(squares([]string{good, good, `"y":3,"g":"b"`, `"y":4,"g":"b"`}), `"id":"a2"`, `"id":"a1"`, 1), nil, []string{"a1", "same id", "feature 1"}},
		// Projected coordinates are read as planar (TestProjectedGeoJSON);
		// a file that calls itself lon/lat and is not contradicts itself.
		{"lon/lat crs with projected coordinates", strings.Replace(strings.Replace(squares([]string{good, good, `"y":3,"g":"b"`, `"y":4,"g":"b"`}), `[[[0,0],[1,0]`, `[[[0,0],[512000,0]`, 1),
			`{"type":"FeatureCollection",`, `{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"EPSG:4326"}},`, 1), nil, []string{"bad.geojson", "contradicts itself"}},
		{"empty layer", `{"type":"FeatureCollection","features":[]}`, nil, []string{"bad.geojson", "no features"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in := filepath.Join(dir, "bad.geojson")
			if err := os.WriteFile(in, []byte(c.content), 0o644); err != nil {
				t.Fatal(err)
			}
			out := filepath.Join(dir, "result.json")
			args := []string{"compare", "-i", in, "-y", "y", "-g", "g", "-o", out}
			args = append(args, c.args...)
			o := runCLI(t, "", args...)
			if o.code != 1 {
				t.Fatalf("exit %d, want 1 (stderr %q)", o.code, o.stderr)
			}
			msg := strings.TrimSpace(o.stderr)
			if strings.Count(msg, "\n") > 0 {
				t.Errorf("error is not one line: %q", msg)
			}
			for _, w := range c.want {
				if !strings.Contains(strings.ToLower(msg), strings.ToLower(w)) {
					t.Errorf("error %q lacks %q", msg, w)
				}
			}
			if _, err := os.Stat(out); err == nil {
				t.Error("an output file was written")
			}
			left, _ := filepath.Glob(filepath.Join(dir, ".result.json.tmp-*"))
			if len(left) > 0 {
				t.Error("a temporary file was left behind")
			}
		})
	}
}

func TestOutputFileAndNoOverwriteOfInput(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "layer.geojson")
	content := squares([]string{`"y":1,"g":"a"`, `"y":2,"g":"a"`, `"y":3,"g":"b"`, `"y":4,"g":"b"`})
	os.WriteFile(in, []byte(content), 0o644)
	out := filepath.Join(dir, "report.txt")
	if o := runCLI(t, "", "compare", "-i", in, "-y", "y", "-g", "g", "-o", out); o.code != 0 || o.stdout != "" {
		t.Fatalf("exit %d stdout %q stderr %q", o.code, o.stdout, o.stderr)
	}
	if b, err := os.ReadFile(out); err != nil || !bytes.Contains(b, []byte("Keep in mind")) {
		t.Fatalf("report file: %v", err)
	}
	o := runCLI(t, "", "compare", "-i", in, "-y", "y", "-g", "g", "-o", in)
	if o.code != 1 || !strings.Contains(o.stderr, "overwrite") {
		t.Fatalf("writing over the input: exit %d, %q", o.code, o.stderr)
	}
	if b, _ := os.ReadFile(in); string(b) != content {
		t.Fatal("the input was changed")
	}
}

func TestDemoWrite(t *testing.T) {
	dir := t.TempDir()
	if o := runCLI(t, "", "demo", "--write", dir); o.code != 0 {
		t.Fatalf("exit %d: %s", o.code, o.stderr)
	}
	path := filepath.Join(dir, "region.geojson")
	o := runCLI(t, "", "compare", "-i", path, "-y", "rate", "-g", "policy", "--strata", "province", "-n", "499")
	if o.code != 0 || !strings.Contains(o.stdout, "within province") {
		t.Fatalf("compare on the written sample: %d %s", o.code, o.stderr)
	}
}

// Under --skip-bad-geometry a Point feature is left out with a warning on
// stderr instead of stopping the run.
func TestSkipBadGeometry(t *testing.T) {
	layer := strings.Replace(squares([]string{`"y":1,"g":"a"`, `"y":2,"g":"a"`, `"y":2.5,"g":"a"`, `"y":3,"g":"b"`, `"y":4,"g":"b"`}),
		`{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,1],[0,0]]]}`, `{"type":"Point","coordinates":[0,0]}`, 1)
	o := runCLI(t, layer, "compare", "-i", "-", "-y", "y", "-g", "g", "--skip-bad-geometry", "--format", "json")
	if o.code != 0 {
		t.Fatalf("exit %d: %s", o.code, o.stderr)
	}
	if !strings.Contains(o.stderr, "warning") || !strings.Contains(o.stderr, "a1") {
		t.Errorf("no warning naming the skipped feature: %q", o.stderr)
	}
	var doc struct {
		Input struct{ Areas int }
	}
	json.Unmarshal([]byte(o.stdout), &doc)
	if doc.Input.Areas != 4 {
		t.Errorf("%d areas read, want 4", doc.Input.Areas)
	}
}

// The demo region has two offshore districts: they are counted, named and
// left out of the spatial check.
func TestDemoIslandsReported(t *testing.T) {
	o := runCLI(t, "", "demo", "--format", "json", "-n", "99")
	var doc struct {
		Weights struct {
			Islands   int
			IslandIDs []string `json:"island_ids"`
			Kind      string
		}
	}
	if err := json.Unmarshal([]byte(o.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.Weights.Islands != 2 || len(doc.Weights.IslandIDs) != 2 || doc.Weights.Kind != "queen contiguity" {
		t.Fatalf("weights %+v", doc.Weights)
	}
}

func TestWeightsCommand(t *testing.T) {
	dir := t.TempDir()
	if o := runCLI(t, "", "demo", "--write", dir); o.code != 0 {
		t.Fatal(o.stderr)
	}
	layer := filepath.Join(dir, "region.geojson")
	o := runCLI(t, "", "weights", "-i", layer)
	if o.code != 0 || !strings.Contains(o.stdout, "queen contiguity") || !strings.Contains(o.stdout, "islands       2 (D047, D059)") {
		t.Fatalf("summary: %d %s %s", o.code, o.stdout, o.stderr)
	}
	// Export the rook graph and read it back on compare: same result as
	// building it there.
	edges := filepath.Join(dir, "rook.csv")
	if o := runCLI(t, "", "weights", "-i", layer, "--contiguity", "rook", "--write", edges, "--format", "json"); o.code != 0 {
		t.Fatal(o.stderr)
	}
	built := runCLI(t, "", "compare", "-i", layer, "-y", "rate", "-g", "policy", "--contiguity", "rook", "-n", "499", "--format", "json")
	read := runCLI(t, "", "compare", "-i", layer, "-y", "rate", "-g", "policy", "--weights", edges, "-n", "499", "--format", "json")
	if built.code != 0 || read.code != 0 {
		t.Fatalf("compare: %s %s", built.stderr, read.stderr)
	}
	type doc struct {
		Autocorrelation struct {
			Outcome struct {
				MoransI float64 `json:"morans_i"`
				PValue  float64 `json:"p_value"`
			}
		}
		Weights struct{ Pairs int }
	}
	var a, b doc
	json.Unmarshal([]byte(built.stdout), &a)
	json.Unmarshal([]byte(read.stdout), &b)
	if a.Autocorrelation != b.Autocorrelation || a.Weights.Pairs != b.Weights.Pairs || a.Weights.Pairs == 0 {
		t.Fatalf("built %+v, read back %+v", a, b)
	}
	// k nearest neighbours on the command line.
	o = runCLI(t, "", "weights", "-i", layer, "--knn", "5", "--format", "json")
	var k struct {
		Weights struct {
			MinNeighbours int `json:"min_neighbours"`
			Kind          string
			Asymmetric    int
		}
	}
	json.Unmarshal([]byte(o.stdout), &k)
	if o.code != 0 || k.Weights.MinNeighbours != 5 || k.Weights.Kind != "5 nearest neighbours" {
		t.Fatalf("knn: %d %+v %s", o.code, k, o.stderr)
	}
	// Usage errors: two rules, a kernel without bandwidth.
	for _, args := range [][]string{
		{"weights", "-i", layer, "--knn", "4", "--band", "10"},
		{"weights", "-i", layer, "--kernel", "bisquare"},
		{"weights", "-i", layer, "--islands", "maybe"},
		{"weights", "-i", layer, "--transform", "cube"},
	} {
		if o := runCLI(t, "", args...); o.code != 2 {
			t.Errorf("%v: exit %d, want 2", args[3:], o.code)
		}
	}
	// Data errors: k too large, an edge list naming an unknown area.
	if o := runCLI(t, "", "weights", "-i", layer, "--knn", "500"); o.code != 1 {
		t.Errorf("--knn 500 on 200 areas: exit %d", o.code)
	}
	bad := filepath.Join(dir, "bad.csv")
	os.WriteFile(bad, []byte("from,to,weight\nD001,NOWHERE,1\n"), 0o644)
	o = runCLI(t, "", "compare", "-i", layer, "-y", "rate", "-g", "policy", "--weights", bad)
	if o.code != 1 || !strings.Contains(o.stderr, "bad.csv: line 2") || !strings.Contains(o.stderr, "NOWHERE") {
		t.Errorf("bad edge list: %d %q", o.code, o.stderr)
	}
}

func TestAutocorrAndScreenCommands(t *testing.T) {
	dir := t.TempDir()
	runCLI(t, "", "demo", "--write", dir)
	layer := filepath.Join(dir, "region.geojson")
	o := runCLI(t, "", "autocorr", "-i", layer, "--variables", "rate,urban", "--events", "cases", "--population", "population", "--lags", "2", "-n", "199")
	if o.code != 0 {
		t.Fatalf("autocorr: %s", o.stderr)
	}
	for _, want := range []string{"Moran's I", "Geary's C", "General G", "join counts", "EB scores", "order 2", "ecological fallacy"} {
		if !strings.Contains(o.stdout, want) {
			t.Errorf("autocorr report lacks %q", want)
		}
	}
	a := runCLI(t, "", "screen", "-i", layer, "--format", "json", "--workers", "1", "-n", "999")
	b := runCLI(t, "", "screen", "-i", layer, "--format", "json", "--workers", "4", "-n", "999")
	if a.code != 0 || a.stdout != b.stdout {
		t.Fatalf("screen differs across workers or failed: %s", a.stderr)
	}
	var doc struct {
		Columns []struct {
			Column string
			Rank   int
		}
		Skipped []struct{ Column, Reason string }
	}
	if err := json.Unmarshal([]byte(a.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Columns) != 4 || doc.Columns[0].Rank != 1 || len(doc.Skipped) != 4 {
		t.Fatalf("screen: %+v", doc)
	}
	csvOut := runCLI(t, "", "screen", "-i", layer, "--format", "csv", "-n", "99", "--exclude", "cases")
	if csvOut.code != 0 || !strings.HasPrefix(csvOut.stdout, "rank,column,areas") || strings.Contains(csvOut.stdout, ",cases,") {
		t.Fatalf("screen csv: %s %s", csvOut.stdout, csvOut.stderr)
	}
	for _, c := range []struct {
		code int
		args []string
	}{
		{2, []string{"autocorr", "-i", layer}},
		{2, []string{"autocorr", "-i", layer, "--events", "cases"}},
		{2, []string{"screen", "-i", layer, "--adjust", "sidak"}},
		{2, []string{"screen", "-i", layer, "--format", "xml"}},
		{1, []string{"autocorr", "-i", layer, "--variables", "nosuch"}},
		{1, []string{"autocorr", "-i", layer, "--events", "name", "--population", "population"}},
		{1, []string{"screen", "-i", layer, "--exclude", "nosuch"}},
	} {
		if o := runCLI(t, "", c.args...); o.code != c.code {
			t.Errorf("%v: exit %d, want %d (%s)", c.args[2:], o.code, c.code, o.stderr)
		}
	}
}

func TestLocalCommand(t *testing.T) {
	dir := t.TempDir()
	runCLI(t, "", "demo", "--write", dir)
	layer := filepath.Join(dir, "region.geojson")
	o := runCLI(t, "", "local", "-i", layer, "--variable", "rate", "-n", "199")
	if o.code != 0 {
		t.Fatalf("local: %s", o.stderr)
	}
	for _, want := range []string{"high-high", "low-low", "no data", "no neighbours", "after benjamini-hochberg", "ecological fallacy"} {
		if !strings.Contains(o.stdout, want) {
			t.Errorf("local report lacks %q", want)
		}
	}
	csvPath := filepath.Join(dir, "local.csv")
	gjPath := filepath.Join(dir, "local.geojson")
	a := runCLI(t, "", "local", "-i", layer, "--variable", "rate", "-n", "199", "--out", csvPath, "--workers", "1", "--format", "json")
	b := runCLI(t, "", "local", "-i", layer, "--variable", "rate", "-n", "199", "--out", gjPath, "--workers", "3", "--format", "json")
	if a.code != 0 || b.code != 0 {
		t.Fatalf("local out: %s %s", a.stderr, b.stderr)
	}
	// The written file names differ; everything else is identical.
	if strings.Replace(a.stdout, csvPath, "X", 1) != strings.Replace(b.stdout, gjPath, "X", 1) {
		t.Fatal("local JSON differs between --workers 1 and 3")
	}
	table, _ := os.ReadFile(csvPath)
	lines := strings.Split(strings.TrimSpace(string(table)), "\n")
	if len(lines) != 201 || !strings.HasPrefix(lines[0], "id,value,lag,statistic,expected,sd,z,p,p_adjusted,category") {
		t.Fatalf("csv: %d lines, header %q", len(lines), lines[0])
	}
	// The GeoJSON is the input layer with the results added, readable back.
	back := runCLI(t, "", "screen", "-i", gjPath, "-n", "99", "--format", "json")
	if back.code != 0 || !strings.Contains(back.stdout, `"local_z"`) {
		t.Fatalf("the written GeoJSON does not read back: %s", back.stderr)
	}
	for _, c := range []struct {
		code int
		args []string
	}{
		{2, []string{"local", "-i", layer}},
		{2, []string{"local", "-i", layer, "--variable", "rate", "--statistic", "lisa"}},
		{2, []string{"local", "-i", layer, "--variable", "rate", "--against", "income"}},
		{2, []string{"local", "-i", layer, "--variable", "rate", "--out", "x.txt"}},
		{2, []string{"local", "-i", layer, "--variable", "rate", "--histogram", "h.svg"}},
		{2, []string{"local", "-i", layer, "--variable", "rate", "--statistic", "geary", "--scatter", filepath.Join(dir, "s.svg"), "--out", filepath.Join(dir, "early.csv")}},
		{1, []string{"local", "-i", layer, "--variable", "name"}},
		{1, []string{"local", "-i", layer, "--variable", "rate", "--histogram", filepath.Join(dir, "h.svg"), "--area", "NOPE"}},
	} {
		if o := runCLI(t, "", c.args...); o.code != c.code {
			t.Errorf("%v: exit %d, want %d (%s)", c.args[3:], o.code, c.code, o.stderr)
		}
	}
	// A scatter that cannot be drawn is refused before anything is written.
	if _, err := os.Stat(filepath.Join(dir, "early.csv")); err == nil {
		t.Error("--scatter with local Geary wrote --out before refusing")
	}
}

// The pictures of `areatest local` are written, PNG decodes and SVG parses.
func TestLocalPictures(t *testing.T) {
	dir := t.TempDir()
	runCLI(t, "", "demo", "--write", dir)
	layer := filepath.Join(dir, "region.geojson")
	files := map[string]string{"--map": "cat.png", "--choropleth": "rate.svg", "--scatter": "scatter.svg", "--histogram": "hist.png"}
	args := []string{"local", "-i", layer, "--variable", "rate", "-n", "199", "--area", "D111"}
	for flag, name := range files {
		args = append(args, flag, filepath.Join(dir, name))
	}
	if o := runCLI(t, "", args...); o.code != 0 {
		t.Fatalf("local pictures: %s", o.stderr)
	}
	for _, name := range files {
		b, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		switch filepath.Ext(name) {
		case ".png":
			if _, err := png.Decode(bytes.NewReader(b)); err != nil {
				t.Errorf("%s: %v", name, err)
			}
		case ".svg":
			d := xml.NewDecoder(bytes.NewReader(b))
			for {
				if _, err := d.Token(); err == io.EOF {
					break
				} else if err != nil {
					t.Errorf("%s is not well-formed XML: %v", name, err)
					break
				}
			}
		}
	}
	if o := runCLI(t, "", "local", "-i", layer, "--variable", "rate", "--map", filepath.Join(dir, "x.gif")); o.code != 2 {
		t.Errorf("--map x.gif: exit %d, want 2", o.code)
	}
}

// The demo shows the spatially constrained p-value, the measured
// false-positive rate and the recommendation, in text and JSON.
func TestDemoHonestPValues(t *testing.T) {
	o := runCLI(t, "", "demo", "--format", "json", "-n", "999", "--surrogates", "199", "--false-positive-check", "100")
	if o.code != 0 {
		t.Fatal(o.stderr)
	}
	var doc struct {
		Tests []struct {
			Scheme string
			PValue float64 `json:"p_value"`
		}
		EffectiveSampleSize struct {
			EffectiveSampleSize float64 `json:"effective_sample_size"`
			Areas               int
		} `json:"effective_sample_size"`
		FalsePositiveRate struct {
			Alpha, Rate float64
			Interval    [2]float64
			Surrogates  int
		} `json:"false_positive_rate"`
		Recommended struct{ Scheme, Reason string }
		Warnings    []string
	}
	if err := json.Unmarshal([]byte(o.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Tests) != 3 || doc.Tests[2].Scheme != "spectral surrogates" {
		t.Fatalf("schemes %+v", doc.Tests)
	}
	if doc.Tests[2].PValue <= doc.Tests[0].PValue {
		t.Errorf("on the demo the spatially constrained p-value (%v) should exceed the free one (%v)", doc.Tests[2].PValue, doc.Tests[0].PValue)
	}
	if doc.FalsePositiveRate.Surrogates != 100 || doc.FalsePositiveRate.Interval[0] <= doc.FalsePositiveRate.Alpha {
		t.Errorf("false-positive rate %+v", doc.FalsePositiveRate)
	}
	if e := doc.EffectiveSampleSize; e.EffectiveSampleSize <= 0 || e.EffectiveSampleSize >= float64(e.Areas) {
		t.Errorf("effective sample size %+v", e)
	}
	if doc.Recommended.Scheme != "spectral surrogates" || !strings.Contains(strings.Join(doc.Warnings, " "), "Prefer the spatially constrained p-value") {
		t.Errorf("recommended %+v, warnings %q", doc.Recommended, doc.Warnings)
	}
	// No spatial problem: alternating groups on the four squares.
	layer := squares([]string{`"y":1,"g":"a"`, `"y":2,"g":"b"`, `"y":3,"g":"a"`, `"y":4,"g":"b"`, `"y":5,"g":"a"`, `"y":6,"g":"b"`})
	o = runCLI(t, layer, "compare", "-i", "-", "-y", "y", "-g", "g", "--format", "json")
	if o.code != 0 || strings.Contains(o.stdout, "Prefer the spatially constrained") || !strings.Contains(o.stdout, `"recommended"`) {
		t.Errorf("no-problem case: %d %s", o.code, o.stderr)
	}
}
