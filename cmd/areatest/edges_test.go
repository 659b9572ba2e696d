package main

import (
	"encoding/json"
	"fmt"
	"os"
	"strings"
	"testing"
)

// row returns a layer of unit squares in a row, named by ids, each with a
// value y; neighbouring squares share a side.
func row(ids []string) string {
	var f []string
	for i, id := range ids {
		name, _ := json.Marshal(id)
		x := float64(i)
		f = append(f, fmt.Sprintf(`{"type":"Feature","id":%s,"properties":{"y":%d},"geometry":{"type":"Polygon","coordinates":[[[%g,0],[%g,0],[%g,1],[%g,1],[%g,0]]]}}`,
			name, i%3, x, x+1, x+1, x, x))
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// A bad edge list is a data error (exit 1) that names the file, the line
// and the link, on the weights command and on the statistics alike —
// never a panic, never a complaint about the outcome column.
func TestEdgeListFileProblems(t *testing.T) {
	sampleDir(t)
	for _, c := range []struct{ name, text, want string }{
		{"bare quote", "from,to,weight\nD\"001,D005,1\n", `e.csv: line 2: column 2: bare " in non-quoted-field`},
		{"finite but too large", "from,to,weight\nD001,D005,1e308\n", `e.csv: line 2: link "D001"→"D005": weight 1e308 is too large; weights must be 0 or from 1e-100 to 1e+100`},
		{"hex float", "from,to,weight\nD001,D005,0x1p0\n", `e.csv: line 2: link "D001"→"D005": weight "0x1p0" is not a decimal number`},
		{"header only", "from,to,weight\n", `e.csv: the edge list has a header but no links`},
		{"all zero", "from,to,weight\nD001,D005,0\nD005,D001,0\n", `e.csv: all 2 links have weight 0`},
		{"unknown id", "from,to,weight\nD001,D005,1\nD005,D999,1\n", `e.csv: line 3: link "D005"→"D999": area "D999" is not an id of the layer`},
	} {
		if err := os.WriteFile("e.csv", []byte(c.text), 0o644); err != nil {
			t.Fatal(err)
		}
		for _, args := range [][]string{
			{"weights", "-i", "region.geojson", "--weights", "e.csv"},
			{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy", "--weights", "e.csv", "-n", "99"},
			{"local", "-i", "region.geojson", "--variable", "rate", "--weights", "e.csv", "-n", "99"},
		} {
			r := runIn("", args...)
			if r.code != 1 || !strings.Contains(r.stderr, c.want) || r.stdout != "" {
				t.Errorf("%s, %s: exit %d, stderr %q, want %q", c.name, args[0], r.code, r.stderr, c.want)
			}
		}
	}
}

// weights --write then --weights gives the same graph back, whatever the
// ids: spaces around them, commas, quotes, non-ASCII letters, ids that
// differ only in spaces; and writing the graph read back gives the same
// file.
func TestEdgeListRoundTripAwkwardIDs(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	ids := []string{" A01", "A01", "A01 ", "a,b", `say "hi"`, "Ærø–Å", "東京都", "-", "x\ty"}
	if err := os.WriteFile("row.geojson", []byte(row(ids)), 0o644); err != nil {
		t.Fatal(err)
	}
	built := runIn("", "weights", "-i", "row.geojson", "--write", "e.csv", "--format", "json")
	read := runIn("", "weights", "-i", "row.geojson", "--weights", "e.csv", "--write", "again.csv", "--format", "json")
	if built.code != 0 || read.code != 0 {
		t.Fatalf("exit %d %s / %d %s", built.code, built.stderr, read.code, read.stderr)
	}
	type doc struct {
		Weights struct {
			Links, Pairs int
			Histogram    []int
			FewestIDs    []string `json:"fewest_ids"`
		}
	}
	var a, b doc
	if err := json.Unmarshal([]byte(built.stdout), &a); err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal([]byte(read.stdout), &b); err != nil {
		t.Fatal(err)
	}
	// A row of 9 squares: 8 neighbour pairs, the two ends with one neighbour
	// (hand count).
	if a.Weights.Pairs != 8 || fmt.Sprint(a) != fmt.Sprint(b) || fmt.Sprint(b.Weights.FewestIDs) != fmt.Sprint([]string{" A01", "x\ty"}) {
		t.Errorf("built %+v, read back %+v", a, b)
	}
	first, _ := os.ReadFile("e.csv")
	again, _ := os.ReadFile("again.csv")
	if string(first) != string(again) || len(first) == 0 {
		t.Errorf("written %q, rewritten %q", first, again)
	}
}

// The weights command's help says it shows the weights as built unless
// --scaling is given, and it does; the statistics' help keeps their
// default, row-standardised.
func TestWeightsHelpStatesItsScalingDefault(t *testing.T) {
	sampleDir(t)
	scalingLine := func(help string) string {
		for _, l := range strings.Split(help, "\n") {
			if strings.Contains(l, "--scaling") && strings.Contains(l, "row (") {
				return l
			}
		}
		return ""
	}
	help := func(cmd string) string { r := runIn("", cmd, "--help"); return r.stdout + r.stderr }
	w := scalingLine(help("weights"))
	if !strings.HasSuffix(w, "(default: the weights as built, as none)") || strings.Contains(w, `(default "row")`) {
		t.Errorf("weights --help: %q", w)
	}
	for _, cmd := range []string{"compare", "autocorr", "local", "screen"} {
		if l := scalingLine(help(cmd)); !strings.HasSuffix(l, `(default "row")`) {
			t.Errorf("%s --help: %q", cmd, l)
		}
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{nil, "  weights       binary\n"},
		{[]string{"--scaling", "row"}, "  weights       row-standardised\n"},
		{[]string{"--kernel", "bisquare", "--adaptive", "6"}, "  weights       weighted\n"},
	} {
		r := runIn("", append([]string{"weights", "-i", "region.geojson"}, c.args...)...)
		if r.code != 0 || !strings.Contains(r.stdout, c.want) {
			t.Errorf("%v: exit %d, want %q in %s", c.args, r.code, c.want, r.stdout)
		}
	}
}

// manySlivers returns a layer of 60 unit squares in a row, S01…S60: S01–S40
// have a second part that is a sliver (a ring along a line), S41–S50 a
// second part that is a bow-tie (a ring crossing itself), and S58–S60 are
// nothing but a sliver.
func manySlivers() string {
	var f []string
	for i := range 60 {
		x := float64(i)
		parts := []string{fmt.Sprintf("[[[%g,0],[%g,0],[%g,1],[%g,1],[%g,0]]]", x, x+1, x+1, x, x)}
		sliver := fmt.Sprintf("[[[%g,3],[%g,3],[%g,3],[%g,3]]]", x, x+0.5, x+0.25, x)
		switch {
		case i >= 57:
			parts = []string{sliver}
		case i < 40:
			parts = append(parts, sliver)
		case i < 50:
			parts = append(parts, fmt.Sprintf("[[[%g,5],[%g,5.5],[%g,5],[%g,5.5],[%g,5]]]", x, x+0.5, x+0.5, x, x))
		}
		f = append(f, fmt.Sprintf(`{"type":"Feature","id":"S%02d","properties":{"y":%d},"geometry":{"type":"MultiPolygon","coordinates":[%s]}}`,
			i+1, i%4, strings.Join(parts, ",")))
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// Geometry problems come to stderr as one line per kind, with the count
// and the first five ids, on every command; the weights command lists every
// one in its JSON and, with --list-geometry-problems, in its text.
func TestGeometryProblemsSummedUp(t *testing.T) {
	t.Chdir(t.TempDir())
	if err := os.WriteFile("many.geojson", []byte(manySlivers()), 0o644); err != nil {
		t.Fatal(err)
	}
	// Counts by construction of the layer: 40 + 3 areas with sliver rings,
	// 3 with nothing else, 10 bow-ties.
	kinds := []string{
		`areatest: warning: many.geojson: 43 areas have rings without area (a mean width at most the snap distance), left out of the neighbour search: "S01", "S02", "S03", "S04", "S05" and 38 more`,
		`areatest: warning: many.geojson: 3 areas have no ring with an area and get no neighbour: "S58", "S59", "S60"`,
		`areatest: warning: many.geojson: 10 areas have rings that cross or touch themselves; their sides are still used to find neighbours: "S41", "S42", "S43", "S44", "S45" and 5 more (`,
	}
	for _, c := range []struct {
		args   []string
		advice string
	}{
		{[]string{"weights", "-i", "many.geojson"}, "(--list-geometry-problems lists every one, ring by ring)\n"},
		{[]string{"autocorr", "-i", "many.geojson", "--variables", "y", "-n", "99"}, "(areatest weights --list-geometry-problems, with the same input and neighbour rule, lists every one, ring by ring)\n"},
		{[]string{"local", "-i", "many.geojson", "--variable", "y", "--contiguity", "rook", "-n", "99"}, "(areatest weights --list-geometry-problems, with the same input and neighbour rule, lists every one, ring by ring)\n"},
	} {
		r := runIn("", c.args...)
		lines := strings.SplitAfter(r.stderr, "\n")
		if r.code != 0 || len(lines) != 4 || lines[3] != "" {
			t.Fatalf("%s: exit %d, stderr %q", c.args[0], r.code, r.stderr)
		}
		for k, want := range kinds {
			if !strings.HasPrefix(lines[k], want) {
				t.Errorf("%s: line %d is %q, want %q", c.args[0], k+1, lines[k], want)
			}
		}
		if !strings.HasSuffix(lines[2], c.advice) {
			t.Errorf("%s: %q does not end %q", c.args[0], lines[2], c.advice)
		}
	}
	var doc struct {
		Problems []struct{ Kind, ID, Text string } `json:"geometry_problems"`
	}
	r := runIn("", "weights", "-i", "many.geojson", "--format", "json")
	if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	count := map[string]int{}
	for _, p := range doc.Problems {
		count[p.Kind]++
		if !strings.Contains(p.Text, fmt.Sprintf("area %q", p.ID)) {
			t.Errorf("problem %+v: the text does not name the area", p)
		}
	}
	if len(doc.Problems) != 56 || count["sliver-ring"] != 43 || count["no-ring-with-area"] != 3 || count["ring-meets-itself"] != 10 {
		t.Errorf("JSON lists %d problems: %v", len(doc.Problems), count)
	}
	text := runIn("", "weights", "-i", "many.geojson", "--list-geometry-problems").stdout
	listed := strings.Split(text, "\nGeometry problems\n")
	if len(listed) != 2 || strings.Count(listed[1], "  - area ") != 56 || !strings.Contains(listed[1], `  - area "S60": the outer ring of part 1 has no area`) {
		t.Errorf("--list-geometry-problems: %s", text)
	}
	if plain := runIn("", "weights", "-i", "many.geojson").stdout; strings.Contains(plain, "Geometry problems") {
		t.Errorf("problems listed without the flag: %s", plain)
	}
}
