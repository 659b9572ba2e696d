package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"io"
	"math"
	"os"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/input"
	"github.com/areatest/areatest/spatial/regress"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// copyIncome adds to every feature a column income2 equal to its income.
func copyIncome(_ int, line string) string {
	v := strings.TrimPrefix(incomeValue.FindString(line), `"income":`)
	return strings.Replace(line, `"properties":{`, `"properties":{"income2":`+v+`,`, 1)
}

// The mistakes in a call are usage errors (exit 2), refused before any
// file is written; the problems of the data are errors (exit 1) naming the
// file and the column.
func TestResidualsBadInputs(t *testing.T) {
	sampleDir(t)
	editedRegion(t, "copy.geojson", copyIncome)
	editedRegion(t, "comma.geojson", setIncome(map[int]string{3: `"41,5"`}))
	tiny := squares([]string{`"y":1,"x":2,"z":1`, `"y":3,"x":1,"z":5`, `"y":2,"x":4,"z":2`})
	if err := os.WriteFile("tiny.geojson", []byte(tiny), 0o644); err != nil {
		t.Fatal(err)
	}
	base := []string{"residuals", "-i", "region.geojson", "-y", "rate"}
	for _, c := range []struct {
		args []string
		code int
		msg  string
	}{
		{base, 2, "--covariates is required"},
		{[]string{"residuals", "-i", "region.geojson", "--covariates", "income"}, 2, "--outcome is required"},
		{[]string{"residuals", "-y", "rate", "--covariates", "income"}, 2, "--input is required"},
		{append(base, "--covariates", "income,rate"), 2, "names the outcome rate"},
		{append(base, "--covariates", "income,urban,income"), 2, "names income twice"},
		{append(base, "--covariates", "income", "--alpha", "1"), 2, "--alpha"},
		{append(base, "--covariates", "income", "--out", "fit.txt"), 2, `not ".txt"`},
		{append(base, "--covariates", "income", "--out", "-"), 2, "not standard output"},
		{append(base, "--covariates", "income", "--map", "m.gif"), 2, "use .svg or .png"},
		{append(base, "--covariates", "income", "--local", "-"), 2, "not standard output"},
		{append(base, "--covariates", "income", "--map", "m.svg", "--classes", "equal"), 2, "--classes"},
		{append(base, "--covariates", "income", "--map", "same.svg", "--local", "same.svg"), 2, "the same file"},
		{append(base, "--covariates", "nope"), 1, `region.geojson: no column "nope"`},
		{[]string{"residuals", "-i", "region.geojson", "-y", "name", "--covariates", "income"}, 1, "the outcome must be a number"},
		{[]string{"residuals", "-i", "comma.geojson", "-y", "rate", "--covariates", "income"}, 1, `"41,5" in area "D004"`},
		{[]string{"residuals", "-i", "copy.geojson", "-y", "rate", "--covariates", "income,income2"}, 1, `copy.geojson: covariate "income2" is constant or a linear combination`},
		{[]string{"residuals", "-i", "tiny.geojson", "-y", "y", "--covariates", "x,z"}, 1, "tiny.geojson: 3 areas are too few for 3 coefficients"},
	} {
		r := runIn("", c.args...)
		if r.code != c.code || !strings.Contains(r.stderr, c.msg) {
			t.Errorf("%v: exit %d, %q; want %d with %q", c.args[1:], r.code, r.stderr, c.code, c.msg)
		}
		for _, f := range []string{"fit.txt", "m.gif", "m.svg", "same.svg"} {
			if _, err := os.Stat(f); err == nil {
				t.Errorf("%v wrote %s", c.args[1:], f)
			}
		}
	}
	if r := runIn("", "residuals", "--help"); r.code != 0 || !strings.Contains(r.stdout, "Examples:") || !strings.Contains(r.stdout, "--covariates") {
		t.Errorf("--help: exit %d, %q", r.code, r.stdout)
	}
}

// libraryFit fits rate on income and urban (urban = 1 for "urban") by
// calling the library directly on the areas of rows of the sample region,
// on the command's default graph among them.
func libraryFit(t *testing.T, rows []int) (*regress.Fit, regress.ResidualMoran, regress.LM) {
	t.Helper()
	var c sharedFlags
	fs := newFlags("residuals", io.Discard)
	c.register(fs, "text")
	if err := parseFlags(fs, []string{"-i", "region.geojson"}); err != nil {
		t.Fatal(err)
	}
	if err := c.prepare("residuals", nil, io.Discard, shuffle.ParseAlternative); err != nil {
		t.Fatal(err)
	}
	rate, _ := c.lay.Column("rate")
	income, _ := c.lay.Column("income")
	urban, _ := c.lay.Column("urban")
	y, x := make([]float64, len(rows)), [][]float64{make([]float64, len(rows)), make([]float64, len(rows))}
	for k, i := range rows {
		y[k], x[0][k] = rate.Num[i], income.Num[i]
		if urban.Str[i] == "urban" {
			x[1][k] = 1
		}
	}
	fit, err := regress.OLS(y, x, []string{"income", "urban=urban"})
	if err != nil {
		t.Fatal(err)
	}
	g, err := c.graph.Subset(rows).Scaled(weights.RowStandardised)
	if err != nil {
		t.Fatal(err)
	}
	moran, err := fit.Moran(g, shuffle.TwoSided)
	if err != nil {
		t.Fatal(err)
	}
	lm, err := fit.LagrangeMultipliers(g)
	if err != nil {
		t.Fatal(err)
	}
	return fit, moran, lm
}

// asJSON is v as JSON decoded into plain values, to compare documents.
func asJSON(t *testing.T, v any) any {
	t.Helper()
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	var out any
	if err := json.Unmarshal(b, &out); err != nil {
		t.Fatal(err)
	}
	return out
}

// The command's figures are the library's on the same areas and graph,
// bit for bit in JSON, and its --out table holds the library's per-area
// values (to its 10 significant digits), empty for the areas left out; the
// GeoJSON copy of the layer holds the same values.
func TestResidualsEqualLibrary(t *testing.T) {
	sampleDir(t)
	r := runIn("", "residuals", "-i", "region.geojson", "-y", "rate", "--covariates", "income,urban", "--format", "json", "--out", "fit.csv")
	g := runIn("", "residuals", "-i", "region.geojson", "-y", "rate", "--covariates", "income,urban", "--out", "fit.geojson")
	if r.code != 0 || g.code != 0 {
		t.Fatalf("exit %d %d: %s %s", r.code, g.code, r.stderr, g.stderr)
	}
	var doc struct {
		Excluded []regress.Exclusion `json:"left_out"`
		Fit      json.RawMessage     `json:"fit"`
		Moran    json.RawMessage     `json:"residual_moran"`
		LM       json.RawMessage     `json:"lagrange_multipliers"`
		Draws    *regress.Draws      `json:"random_draws"`
		Written  []string            `json:"written"`
	}
	if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	lay, _, err := input.Read("region.geojson", nil, input.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var left []string
	for _, e := range doc.Excluded {
		left = append(left, e.IDs...)
	}
	var rows []int
	for i, id := range lay.IDs {
		if !slices.Contains(left, id) {
			rows = append(rows, i)
		}
	}
	if len(left) != 4 || len(rows) != 196 || doc.Draws != nil || !reflect.DeepEqual(doc.Written, []string{"fit.csv"}) {
		t.Fatalf("left out %v, draws %v, written %v", left, doc.Draws, doc.Written)
	}
	fit, moran, lm := libraryFit(t, rows)
	for _, c := range []struct {
		name      string
		got, want any
	}{{"fit", doc.Fit, fit}, {"residual Moran", doc.Moran, moran}, {"LM", doc.LM, lm}} {
		if !reflect.DeepEqual(asJSON(t, c.got), asJSON(t, c.want)) {
			t.Errorf("%s: the command's\n%s\nthe library's %+v", c.name, c.got, c.want)
		}
	}
	checkFitTable(t, lay.IDs, rows, fit)
	back, _, err := input.Read("fit.geojson", nil, input.Options{})
	if err != nil {
		t.Fatal(err)
	}
	col, err := back.NumericColumn("ols_standardised_residual", "")
	if err != nil {
		t.Fatal(err)
	}
	for k, i := range rows {
		if col.Missing[i] || col.Num[i] != fit.Standardised[k] {
			t.Fatalf("GeoJSON area %s: %v, the library's %v", lay.IDs[i], col.Num[i], fit.Standardised[k])
		}
	}
}

// checkFitTable reads fit.csv: one row per area, the library's values on
// rows, empty cells elsewhere.
func checkFitTable(t *testing.T, ids []string, rows []int, fit *regress.Fit) {
	t.Helper()
	b, err := os.ReadFile("fit.csv")
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil || len(recs) != len(ids)+1 || strings.Join(recs[0], ",") != "id,ols_fitted,ols_residual,ols_standardised_residual" {
		t.Fatalf("fit.csv: %v, %d rows, header %v", err, len(recs), recs[0])
	}
	want := map[string][3]float64{}
	for k, i := range rows {
		want[ids[i]] = [3]float64{fit.Fitted[k], fit.Residuals[k], fit.Standardised[k]}
	}
	for _, rec := range recs[1:] {
		w, used := want[rec[0]]
		for c := range 3 {
			if !used {
				if rec[c+1] != "" {
					t.Errorf("%s, left out, has %q", rec[0], rec[c+1])
				}
				continue
			}
			v, err := strconv.ParseFloat(rec[c+1], 64)
			if err != nil || math.Abs(v-w[c]) > 1e-9*math.Abs(w[c]) {
				t.Errorf("%s column %d: %q, the library's %v", rec[0], c+1, rec[c+1], w[c])
			}
		}
	}
}

// --map draws every area once, the four left out (two without a rate, two
// without a neighbour) hatched; --local draws the local Moran categories
// of the residuals, the same for any number of workers, its shuffles
// stated by the report, which is otherwise the report without pictures.
func TestResidualsPictures(t *testing.T) {
	sampleDir(t)
	base := []string{"residuals", "-i", "region.geojson", "-y", "rate", "--covariates", "income,urban", "-n", "199"}
	plain := runIn("", base...)
	var locals [][]byte
	for _, workers := range []string{"1", "3"} {
		r := runIn("", append(base, "--workers", workers, "--map", "r"+workers+".svg", "--local", "l"+workers+".svg")...)
		if r.code != 0 {
			t.Fatalf("exit %d: %s", r.code, r.stderr)
		}
		for _, name := range []string{"r" + workers + ".svg", "l" + workers + ".svg"} {
			b, err := os.ReadFile(name)
			if err != nil {
				t.Fatal(err)
			}
			s := string(b)
			if n, hatched := strings.Count(s, "</title></path>"), strings.Count(s, ": no data</title>"); n != 200 || hatched != 4 {
				t.Errorf("%s: %d areas drawn, %d hatched; want 200 and 4", name, n, hatched)
			}
		}
		l, _ := os.ReadFile("l" + workers + ".svg")
		locals = append(locals, l)
		if !strings.Contains(string(l), "high-high") || !strings.Contains(r.stdout, "seed 1 · 199 shuffles per area for the local Moran map") {
			t.Errorf("no local categories in the map, or no seed in the report")
		}
		want := strings.Replace(plain.stdout, "no random draws", "seed 1 · 199 shuffles per area for the local Moran map of the residuals", 1)
		want = strings.Replace(want, "\n\nseed 1", "\n\nwritten: r"+workers+".svg, l"+workers+".svg\n\nseed 1", 1)
		if r.stdout != want {
			t.Errorf("the pictures changed the report:\n%s", r.stdout)
		}
	}
	if !bytes.Equal(locals[0], locals[1]) {
		t.Error("the --local map differs between --workers 1 and 3")
	}
}

// The whole residuals run, in process, from reading the GeoJSON of n
// invented districts (queen contiguity) to the text report: at 3,000
// areas without the exact p-value (above regress.ExactLimit), at 1,500
// with it.
func BenchmarkResiduals3000(b *testing.B) { benchResiduals(b, 3000) }
func BenchmarkResiduals1500(b *testing.B) { benchResiduals(b, 1500) }

func benchResiduals(b *testing.B, n int) {
	data := benchLayer(b, n)
	args := []string{"residuals", "-i", "-", "-y", "rate", "--covariates", "income,urban,province"}
	b.ResetTimer()
	for range b.N {
		var stderr bytes.Buffer
		if code := run(args, bytes.NewReader(data), io.Discard, &stderr); code != 0 {
			b.Fatalf("exit %d: %s", code, stderr.String())
		}
	}
}
