//go:build unix

// The files of a run on a Unix system: devices, FIFOs and links.

package main

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"github.com/areatest/areatest/samples"
)

// fast keeps the runs that get as far as computing short.
var fast = []string{"-n", "19"}

// localRun is `areatest local` on the sample region, quickly.
func localRun(args ...string) []string {
	return append(append([]string{"local", "-i", "region.geojson", "--variable", "rate"}, fast...), args...)
}

// wantRefused runs args and checks the exit code, that stderr holds want
// and no panic, and that none of the named files exists afterwards.
func wantRefused(t *testing.T, code int, want string, args []string, absent ...string) {
	t.Helper()
	r := runIn("", args...)
	if r.code != code || !strings.Contains(r.stderr, want) || strings.Contains(r.stderr, "panic") {
		t.Errorf("%v: exit %d, stderr %q; want exit %d and %q", args, r.code, r.stderr, code, want)
	}
	for _, f := range absent {
		if _, err := os.Lstat(f); err == nil {
			t.Errorf("%v: %s was written", args, f)
		}
	}
	if left, _ := filepath.Glob(".*.tmp-*"); len(left) > 0 {
		t.Errorf("%v: temporary files left: %v", args, left)
	}
}

// Item 3: every integer flag is a count; a negative one is a usage error
// (exit 2) on every command, never a panic (--top -5 used to panic).
func TestNegativeCountsRefused(t *testing.T) {
	sampleDir(t)
	in := []string{"-i", "region.geojson"}
	for _, args := range [][]string{
		localRun("--top", "-5"),
		localRun("--workers", "-1"),
		localRun("-n", "-3"),
		append([]string{"autocorr", "--variables", "rate", "--lags", "-1"}, in...),
		append([]string{"compare", "-y", "rate", "-g", "policy", "--surrogates", "-1"}, in...),
		append([]string{"compare", "-y", "rate", "-g", "policy", "--false-positive-check", "-2"}, in...),
		append([]string{"compare", "-y", "rate", "-g", "policy", "--check-shuffles", "-4"}, in...),
		{"demo", "--surrogates", "-1"},
		append([]string{"weights", "--knn", "-3"}, in...),
		append([]string{"weights", "--kernel", "bisquare", "--adaptive", "-2"}, in...),
		append([]string{"weights", "--order", "-1"}, in...),
		append([]string{"screen", "--permutations", "-9"}, in...),
	} {
		wantRefused(t, 2, "must not be negative", args)
	}
}

// Item 12: no float flag takes NaN or an infinity (--lag-width NaN used to
// be accepted and ignored, --snap NaN too).
func TestNonFiniteFloatsRefused(t *testing.T) {
	sampleDir(t)
	in := []string{"-i", "region.geojson"}
	for _, args := range [][]string{
		append([]string{"autocorr", "--variables", "rate", "--lags", "2", "--lag-width", "NaN"}, in...),
		append([]string{"autocorr", "--variables", "rate", "--lags", "2", "--lag-width", "Inf"}, in...),
		append([]string{"weights", "--snap", "nan"}, in...),
		append([]string{"weights", "--band", "+Inf"}, in...),
		append([]string{"weights", "--idw", "infinity"}, in...),
		append([]string{"weights", "--kernel", "gaussian", "--bandwidth", "-Inf"}, in...),
		append([]string{"compare", "-y", "rate", "-g", "policy", "--alpha", "NaN"}, in...),
		localRun("--alpha", "inf"),
	} {
		wantRefused(t, 2, "must be a finite number", args)
	}
}

// Item 13: no command writes over a file it reads, the layer or the edge
// list, by any of its outputs, even through a link; the refusal comes before
// the computation and the file is unchanged.
func TestInputsNeverOverwritten(t *testing.T) {
	sampleDir(t)
	if r := runIn("", "weights", "-i", "region.geojson", "--write", "edges.csv"); r.code != 0 {
		t.Fatal(r.stderr)
	}
	os.Symlink("region.geojson", "layer-link.geojson")
	edges := []string{"--weights", "edges.csv"}
	cmp := []string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy"}
	for _, args := range [][]string{
		append(cmp, "-o", "region.geojson"),
		append(cmp, "-o", "layer-link.geojson"),
		append(append(cmp, edges...), "-o", "edges.csv"),
		{"demo", "--weights", "edges.csv", "-o", "edges.csv"},
		{"autocorr", "-i", "region.geojson", "--variables", "rate", "-o", "region.geojson"},
		{"screen", "-i", "region.geojson", "--weights", "edges.csv", "-o", "edges.csv"},
		localRun("--out", "layer-link.geojson"),
		localRun(append(edges, "--out", "edges.csv")...),
		localRun("-o", "region.geojson"),
		{"weights", "-i", "region.geojson", "--weights", "edges.csv", "--write", "edges.csv"},
		{"weights", "-i", "region.geojson", "--weights", "edges.csv", "-o", "edges.csv"},
		{"weights", "-i", "region.geojson", "--write", "layer-link.geojson"},
	} {
		wantRefused(t, 1, "refusing to overwrite the input", args)
	}
	if b, _ := os.ReadFile("region.geojson"); string(b) != string(samples.RegionGeoJSON) {
		t.Error("the layer was changed")
	}
}

// Item 14: every output target is checked before the computation, and a run
// that fails leaves no new file.
func TestNoFileFromAFailedRun(t *testing.T) {
	sampleDir(t)
	os.WriteFile("plain", []byte("a file"), 0o644)
	for _, c := range []struct {
		code int
		want string
		args []string
	}{
		{1, "--map: nodir/m.svg: cannot write there: the folder nodir does not exist", localRun("--out", "r.csv", "--map", "nodir/m.svg")},
		{1, "plain is not a folder", localRun("--out", "r.csv", "--scatter", "plain/s.svg")},
		{2, "--scatter draws the Moran scatter", localRun("--statistic", "geary", "--out", "r.geojson", "--map", "m.svg", "--scatter", "s.svg")},
		// A data error after the outputs were planned.
		{1, "--area", localRun("--out", "r.csv", "--map", "m.svg", "--histogram", "h.svg", "--area", "NOPE")},
		{1, "not numeric", []string{"local", "-i", "region.geojson", "--variable", "name", "--out", "r.csv", "-o", "report.txt"}},
		// The outputs are checked before the layer is read: the missing
		// input is not reached.
		{1, "--output: nodir/report.txt", []string{"compare", "-i", "missing.geojson", "-y", "rate", "-g", "policy", "-o", "nodir/report.txt"}},
		{1, "--output: nodir/report.txt", []string{"screen", "-i", "missing.geojson", "-o", "nodir/report.txt"}},
	} {
		wantRefused(t, c.code, c.want, c.args, "r.csv", "r.geojson", "m.svg", "s.svg", "h.svg", "report.txt")
	}
}

// Item 15: two outputs of one run that are one file, however spelled or
// linked, are a usage error, and nothing is written.
func TestOutputsOfOneRunDiffer(t *testing.T) {
	sampleDir(t)
	os.Symlink("r.csv", "to-r.csv")
	os.WriteFile("old.svg", []byte("old"), 0o644)
	os.Link("old.svg", "hard.svg")
	for _, c := range []struct {
		want string
		args []string
	}{
		{"--output r.csv and --out r.csv are the same file", localRun("--out", "r.csv", "-o", "r.csv")},
		{"--map m.svg and --choropleth m.svg are the same file", localRun("--map", "m.svg", "--choropleth", "m.svg")},
		{"--map m.svg and --scatter ./m.svg are the same file", localRun("--map", "m.svg", "--scatter", "./m.svg")},
		{"--output to-r.csv and --out r.csv are the same file", localRun("--out", "r.csv", "-o", "to-r.csv")},
		{"--map old.svg and --histogram hard.svg are the same file", localRun("--map", "old.svg", "--histogram", "hard.svg", "--area", "D111")},
	} {
		wantRefused(t, 2, c.want, c.args, "r.csv", "m.svg")
	}
	wantRefused(t, 2, "--output x.csv and --write x.csv are the same file", []string{"weights", "-i", "region.geojson", "--write", "x.csv", "-o", "x.csv"}, "x.csv")
	if b, _ := os.ReadFile("old.svg"); string(b) != "old" {
		t.Error("old.svg was changed")
	}
}

// Item 16: a device and a FIFO are written straight, a link through to its
// target; none is replaced by a regular file.
func TestSpecialTargetsKept(t *testing.T) {
	sampleDir(t)
	if r := runIn("", localRun("-o", os.DevNull, "--out", "r.csv")...); r.code != 0 || r.stdout != "" {
		t.Fatalf("-o %s: exit %d %s", os.DevNull, r.code, r.stderr)
	}
	if st, err := os.Stat(os.DevNull); err != nil || st.Mode()&os.ModeDevice == 0 {
		t.Fatalf("%s is no longer a device", os.DevNull)
	}
	os.Symlink("r.csv", "link.csv")
	if r := runIn("", localRun("-o", "link.csv")...); r.code != 0 {
		t.Fatal(r.stderr)
	}
	if st, _ := os.Lstat("link.csv"); st.Mode()&os.ModeSymlink == 0 {
		t.Error("the link was replaced")
	}
	if b, _ := os.ReadFile("r.csv"); !strings.Contains(string(b), "where does rate cluster") {
		t.Error("the link's target did not get the report")
	}
	if err := syscall.Mkfifo("fifo.txt", 0o644); err != nil {
		t.Skip("no FIFO:", err)
	}
	got := make(chan string)
	go func() { b, _ := os.ReadFile("fifo.txt"); got <- string(b) }()
	if r := runIn("", "weights", "-i", "region.geojson", "-o", "fifo.txt"); r.code != 0 {
		t.Fatal(r.stderr)
	}
	if s := <-got; !strings.Contains(s, "queen contiguity") {
		t.Errorf("the FIFO's reader got %q", s)
	}
	if st, _ := os.Lstat("fifo.txt"); st.Mode()&os.ModeNamedPipe == 0 {
		t.Error("the FIFO was replaced")
	}
}

// Item 18: demo --write replaces no file: a copy of the sample is left as
// it is (exit 0, a note), anything else of that name is refused (exit 1,
// unchanged; a FIFO is not waited on), and other flags are refused (exit 2).
func TestDemoWriteReplacesNothing(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	if r := runIn("", "demo", "--write", "."); r.code != 0 || !strings.Contains(r.stderr, "wrote region.geojson") {
		t.Fatalf("first write: %d %s", r.code, r.stderr)
	}
	if r := runIn("", "demo", "--write", "."); r.code != 0 || !strings.Contains(r.stderr, "region.geojson already holds the sample; left as it is") {
		t.Errorf("second write: %d %s", r.code, r.stderr)
	}
	os.Mkdir("mine", 0o755)
	os.WriteFile("mine/region.geojson", []byte("my own data"), 0o644)
	os.Mkdir("pipe", 0o755)
	syscall.Mkfifo("pipe/region.geojson", 0o644)
	for _, d := range []string{"mine", "pipe"} {
		wantRefused(t, 1, "already exists and is not the sample", []string{"demo", "--write", d})
	}
	if b, _ := os.ReadFile("mine/region.geojson"); string(b) != "my own data" {
		t.Error("demo --write replaced a file")
	}
	wantRefused(t, 1, "the folder nowhere does not exist", []string{"demo", "--write", "nowhere"})
	os.WriteFile("plain", []byte("a file"), 0o644)
	wantRefused(t, 1, "--write: plain is not a folder", []string{"demo", "--write", "plain"})
	wantRefused(t, 2, "--format, --permutations would have no effect", []string{"demo", "--write", "new", "--format", "json", "-n", "9"})
	wantRefused(t, 2, "--write needs a directory", []string{"demo", "--write", ""})
}

// Item 19 (part): -o a directory says so; --out - and a picture to - say
// that these go to files.
func TestOutputMessages(t *testing.T) {
	sampleDir(t)
	os.Mkdir("out", 0o755)
	os.Mkdir("table.csv", 0o755)
	wantRefused(t, 1, "--output: out is a directory; give a file name", localRun("-o", "out"))
	wantRefused(t, 1, "--output: out/ is a directory", []string{"screen", "-i", "region.geojson", "-o", "out/"})
	wantRefused(t, 1, "--out: table.csv is a directory", localRun("--out", "table.csv"))
	wantRefused(t, 2, "--out writes a file, not standard output", localRun("--out", "-"))
	wantRefused(t, 2, "--map draws into a file, not standard output", localRun("--map", "-"))
	wantRefused(t, 2, "--choropleth: c.gif: unknown picture extension", localRun("--choropleth", "c.gif"))
}
