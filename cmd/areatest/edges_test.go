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
