package main

import (
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/tests/testkit"
)

// A contrast level that is not in the data lists every level of the group
// column among the areas with data, the contrast's own levels included.
func TestContrastListsTheRealLevels(t *testing.T) {
	for _, contrast := range []string{"no,maybe", "foo,bar", "maybe,no"} {
		o := runCLI(t, "", "demo", "--contrast", contrast, "-n", "9")
		if o.code != 1 || !strings.Contains(o.stderr, `(levels: "no", "yes")`) {
			t.Errorf("--contrast %s: exit %d, stderr %q", contrast, o.code, o.stderr)
		}
	}
}

var propertiesMember = regexp.MustCompile(`"properties":\{[^}]*\}`)

// screen on a layer with no numeric column names each column it skipped
// and why, in its one-line error.
func TestScreenNamesSkippedColumns(t *testing.T) {
	sampleDir(t)
	editedRegion(t, "words.geojson", func(i int, line string) string {
		code := fmt.Sprintf("%q", fmt.Sprint(i%7))
		if i == 4 {
			code = `"about 3"`
		}
		return propertiesMember.ReplaceAllString(line, fmt.Sprintf(`"properties":{"name":"a%d","kind":"k%d","depth":%s}`, i, i%3, code))
	})
	failsWith(t, runIn("", "screen", "-i", "words.geojson", "-n", "9"),
		"words.geojson: no numeric column could be screened; 3 skipped:",
		`"name" (not numeric)`, `"kind" (not numeric)`, `"depth" (not numeric: it holds numbers except for 1 of`, `"about 3" in area "D005"`)
}

// The islands warning names the flags of the remedy that fits the rule:
// the snap distance or --islands keep for contiguity, the band for a
// distance band, the bandwidth for a kernel; never another rule's flag.
func TestIslandAdviceNamesTheFlags(t *testing.T) {
	states := testkit.Testdata(t, "us-states.geojson") // 7 of 56 areas have no neighbour
	tests := []struct {
		rule      []string
		want, not []string
	}{
		{nil, []string{"(--snap)", "(--knn K)", "(--islands keep)"}, []string{"--band", "--bandwidth"}},
		{[]string{"--band", "300km"}, []string{"(--band)", "(--knn K)", "(--islands keep)"}, []string{"--snap", "--bandwidth"}},
		{[]string{"--kernel", "triangular", "--bandwidth", "300km"}, []string{"(--bandwidth)", "(--adaptive K)"}, []string{"--snap", "(--band)"}},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.rule, " "), func(t *testing.T) {
			o := runCLI(t, "", append([]string{"weights", "-i", states}, tc.rule...)...)
			if o.code != 0 {
				t.Fatalf("exit %d: %s", o.code, o.stderr)
			}
			text := strings.Join(strings.Fields(o.stdout), " ") // undo the wrapping
			for _, w := range tc.want {
				if !strings.Contains(text, w) {
					t.Errorf("no %q in %s", w, text)
				}
			}
			for _, w := range tc.not {
				if strings.Contains(text, w) {
					t.Errorf("%q in %s", w, text)
				}
			}
		})
	}
}

// The snap distance prints one way (3 significant digits) in the rule's
// description and in the geometry problems of the same run.
func TestSnapDistanceOneFormat(t *testing.T) {
	dir := t.TempDir()
	layer := filepath.Join(dir, "sliver.geojson")
	os.WriteFile(layer, []byte(`{"type":"FeatureCollection","features":[
{"type":"Feature","id":"a","properties":{"v":1},"geometry":{"type":"MultiPolygon","coordinates":[[[[0,0],[1,0],[1,1],[0,1],[0,0]]],[[[3,3],[3.5,3],[4,3],[3,3]]]]}},
{"type":"Feature","id":"b","properties":{"v":2},"geometry":{"type":"Polygon","coordinates":[[[1,0],[2,0],[2,1],[1,1],[1,0]]]}}]}`), 0o644)
	for _, snap := range []string{"0.000123456", "7.38014772241653e-07"} {
		o := runCLI(t, "", "weights", "-i", layer, "--snap", snap, "--list-geometry-problems")
		want := numtext.Length(mustFloat(t, snap))
		text := strings.Join(strings.Fields(o.stdout), " ")
		if o.code != 0 || !strings.Contains(text, "within "+want+" degrees") || !strings.Contains(text, "the snap distance "+want+")") {
			t.Errorf("--snap %s: exit %d, want %s in both places:\n%s", snap, o.code, want, o.stdout)
		}
		if strings.Contains(o.stdout+o.stderr, snap) {
			t.Errorf("--snap %s printed in full", snap)
		}
	}
}

func mustFloat(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

// local with too few shuffles for the adjustment across areas says so,
// with the smallest reachable adjusted p-value and the shuffles needed
// (worked out by hand for the sample: 196 areas, 26 at the two-sided floor
// 2/100 with 99 shuffles: BH reaches 0.02·196/26 = 0.151 at best and needs
// B + 1 ≥ 2·196/(0.05·26) = 301.5, so 301 shuffles; Bonferroni needs
// B + 1 ≥ 2·196/0.05 = 7,840). Enough shuffles, or no adjustment: no such
// warning.
func TestTooFewShufflesForTheAdjustment(t *testing.T) {
	sampleDir(t)
	tests := []struct {
		args []string
		want []string // nil: no such warning
	}{
		{[]string{"-n", "99"}, []string{"No area survives the benjamini-hochberg adjustment across 196 areas, though 45 pass at 0.05",
			"no two-sided p-value is below 0.02", "26 area(s) are at that value", "196/26 at best", "can reach is 0.151", "at least 301 shuffles"}},
		{[]string{"-n", "99", "--adjust", "bonferroni"}, []string{"can reach is 1,", "at least 7,839 shuffles"}},
		{[]string{"-n", "99", "--adjust", "none"}, nil},
		{[]string{"-n", "999"}, nil},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			o := runCLI(t, "", append([]string{"local", "-i", "region.geojson", "--variable", "rate"}, tc.args...)...)
			text := strings.Join(strings.Fields(o.stdout), " ")
			if o.code != 0 {
				t.Fatalf("exit %d: %s", o.code, o.stderr)
			}
			if tc.want == nil && strings.Contains(text, "No area survives") {
				t.Errorf("unexpected warning: %s", text)
			}
			for _, w := range tc.want {
				if !strings.Contains(text, w) {
					t.Errorf("no %q in %s", w, text)
				}
			}
		})
	}
}

// The report's warnings are in the report in every format; they also go to
// stderr unless the text report itself is on stdout, so that they are seen
// once when the report goes to a file.
func TestWarningsOnStderrWhenTheReportGoesToAFile(t *testing.T) {
	sampleDir(t)
	base := []string{"local", "-i", "region.geojson", "--variable", "rate", "-n", "99"}
	const w = `2 area(s) have no value and are drawn as "no data".`
	screen := runCLI(t, "", base...)
	if screen.code != 0 || !strings.Contains(screen.stdout, w) || strings.Contains(screen.stderr, "warning:") {
		t.Errorf("text on stdout: exit %d, stderr %q", screen.code, screen.stderr)
	}
	file := runCLI(t, "", append(base, "-o", "report.txt")...)
	b, _ := os.ReadFile("report.txt")
	if file.code != 0 || !strings.Contains(string(b), w) || !strings.Contains(file.stderr, "areatest: warning: "+w) {
		t.Errorf("text to a file: exit %d, stderr %q", file.code, file.stderr)
	}
}
