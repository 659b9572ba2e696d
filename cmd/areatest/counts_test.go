package main

import (
	"encoding/json"
	"fmt"
	"strings"
	"testing"
	"time"
)

// countsIslands is a layer of n unit squares with gaps between them, so
// that no area touches another: A01…An, y rising, g alternating a/b.
func countsIslands(n int, props func(i int) string) string {
	f := make([]string, n)
	for i := range f {
		x := float64(2 * i)
		f[i] = fmt.Sprintf(`{"type":"Feature","id":"A%02d","properties":{%s},"geometry":{"type":"Polygon","coordinates":[[[%g,0],[%g,0],[%g,1],[%g,1],[%g,0]]]}}`,
			i+1, props(i), x, x+1, x+1, x, x)
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

func countsProps(i int) string {
	return fmt.Sprintf(`"y":%g,"g":"%c"`, float64(i)*1.5+float64(i%3), "ab"[i%2])
}

// countsRow is n touching squares in a row with the same columns.
func countsRow(n int) string {
	p := make([]string, n)
	for i := range p {
		p[i] = countsProps(i)
	}
	return squares(p)
}

// A layer on which no area has both an outcome and a group value is a data
// error (exit 1) naming the file and counting what the areas lack, not a
// panic; a contrast level absent from the areas with data lists the levels
// the column has there.
func TestCompareWithNothingToTest(t *testing.T) {
	none := countsIslands(6, func(i int) string {
		if i%2 == 0 {
			return `"y":null,"g":"a"`
		}
		return `"y":1,"g":null`
	})
	cases := []struct {
		name, layer string
		args        []string
		want        []string
	}{
		{"no area with both", none, nil, []string{"stdin:", "no area can be tested", "3 missing y", "3 missing g"}},
		{"no area with both, contrast", none, []string{"--contrast", "a,b"}, []string{"no area can be tested"}},
		{"contrast level absent", countsRow(8), []string{"--contrast", "x,z"}, []string{`--contrast level "x"`, `(levels: "a", "b")`}},
		{"other contrast level absent", countsRow(8), []string{"--contrast", "a,z"}, []string{`level "z"`, `(levels: "a", "b")`}},
	}
	for _, c := range cases {
		o := runIn(c.layer, append([]string{"compare", "-i", "-", "-y", "y", "-g", "g", "-n", "99"}, c.args...)...)
		if o.code != 1 {
			t.Errorf("%s: exit %d, want 1 (%s)", c.name, o.code, o.stderr)
		}
		for _, w := range c.want {
			if !strings.Contains(o.stderr, w) {
				t.Errorf("%s: %q lacks %q", c.name, o.stderr, w)
			}
		}
	}
}

// Every count flag has a maximum, refused above it as a usage error (exit
// 2) that names the maximum, before the layer is read; the maxima are the
// libraries' (shuffle.MaxPermutations, compare.MaxSurrogates, …).
func TestCountFlagsHaveAMaximum(t *testing.T) {
	sampleDir(t)
	in := []string{"-i", "region.geojson"}
	cmp := func(more ...string) []string {
		return append([]string{"compare", "-y", "rate", "-g", "policy", "-i", "region.geojson"}, more...)
	}
	cases := []struct {
		args []string
		want string
	}{
		{cmp("--permutations", "1000000000000"), "--permutations 1,000,000,000,000 is more than the maximum of 5,000,000"},
		{cmp("-n", "5000001"), "maximum of 5,000,000"},
		{cmp("--surrogates", "100001"), "--surrogates 100,001 is more than the maximum of 100,000"},
		{cmp("--false-positive-check", "10001"), "--false-positive-check 10,001 is more than the maximum of 10,000"},
		{cmp("--check-shuffles", "10001"), "--check-shuffles 10,001 is more than the maximum of 10,000"},
		{[]string{"demo", "--check-shuffles", "1000000000"}, "maximum of 10,000"},
		{append([]string{"autocorr", "--variables", "rate", "-n", "5000001"}, in...), "maximum of 5,000,000"},
		{append([]string{"screen", "-n", "5000001"}, in...), "maximum of 5,000,000"},
		{append([]string{"local", "--variable", "rate", "-n", "5000001"}, in...), "maximum of 5,000,000"},
		{append([]string{"local", "--variable", "rate", "-n", "1000000000000"}, "-i", "missing.geojson"), "maximum of 5,000,000"},
	}
	for _, c := range cases {
		start := time.Now()
		o := runIn("", c.args...)
		if o.code != 2 || !strings.Contains(o.stderr, c.want) {
			t.Errorf("%v: exit %d, %q; want exit 2 with %q", c.args, o.code, o.stderr, c.want)
		}
		if d := time.Since(start); d > 5*time.Second {
			t.Errorf("%v: took %v to refuse", c.args, d)
		}
	}
}

// The false-positive check draws its own number of shuffles, never
// enumerating: 22 areas split 11/11 (C(22, 11) = 705,432 arrangements,
// under the exact limit) report the 49 shuffles asked for and finish at
// once; a count too small to reach alpha is a usage error saying what
// would do (two-sided at 0.05: 39, as 2/(1 + 39) = 0.05).
func TestFalsePositiveCheckUsesItsOwnCount(t *testing.T) {
	base := []string{"compare", "-i", "-", "-y", "y", "-g", "g", "-n", "99", "--surrogates", "0", "--false-positive-check", "20"}
	start := time.Now()
	o := runIn(countsRow(22), append(base, "--check-shuffles", "49", "--format", "json")...)
	if o.code != 0 {
		t.Fatalf("exit %d: %s", o.code, o.stderr)
	}
	var doc struct {
		FPR struct{ Surrogates, Permutations int } `json:"false_positive_rate"`
	}
	if err := json.Unmarshal([]byte(o.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	if doc.FPR.Surrogates != 20 || doc.FPR.Permutations != 49 {
		t.Errorf("check %+v, want 20 surrogates of 49 shuffles", doc.FPR)
	}
	if d := time.Since(start); d > 20*time.Second {
		t.Errorf("the check took %v: enumerating?", d)
	}
	o = runIn(countsRow(22), append(base, "--check-shuffles", "5")...)
	if o.code != 2 || !strings.Contains(o.stderr, "--check-shuffles 5 cannot reject at --alpha 0.05") || !strings.Contains(o.stderr, "use --check-shuffles 39 or more") {
		t.Errorf("5 check shuffles: exit %d, %q", o.code, o.stderr)
	}
}

// On a layer where no area has a neighbour, compare lists the islands with
// the right count of the others, says the spatial check could not run and
// does not recommend the free shuffle on the grounds that nothing
// clusters; local with the islands kept does not claim that they have
// neighbours.
func TestAllIslands(t *testing.T) {
	layer := countsIslands(25, countsProps)
	o := runIn(layer, "compare", "-i", "-", "-y", "y", "-g", "g", "-n", "99")
	if o.code != 0 {
		t.Fatalf("exit %d: %s", o.code, o.stderr)
	}
	text := strings.Join(strings.Fields(o.stdout), " ") // unwrapped
	for _, w := range []string{"25 without neighbours (A01, A02, A03, A04, A05, A06 and 19 more)", "Read: free", "The spatial check could not run (only 0 of the 25 tested areas have a neighbour"} {
		if !strings.Contains(text, w) {
			t.Errorf("report lacks %q:\n%s", w, o.stdout)
		}
	}
	if strings.Contains(text, "do not both cluster") {
		t.Errorf("report claims no clustering without a check:\n%s", o.stdout)
	}
	o = runIn(layer, "compare", "-i", "-", "-y", "y", "-g", "g", "-n", "99", "--format", "json")
	var doc struct {
		Autocorrelation struct{ Skipped string } `json:"autocorrelation"`
	}
	if err := json.Unmarshal([]byte(o.stdout), &doc); err != nil || !strings.HasPrefix(doc.Autocorrelation.Skipped, "only 0 of the 25") {
		t.Errorf("JSON skipped %q (%v)", doc.Autocorrelation.Skipped, err)
	}
	for _, islands := range []string{"keep", "drop"} {
		o = runIn(layer, "local", "-i", "-", "--variable", "y", "-n", "99", "--islands", islands)
		if o.code != 1 || !strings.Contains(o.stderr, "only 0 of the 25 areas with a value of y have a neighbour") {
			t.Errorf("local --islands %s: exit %d, %q", islands, o.code, o.stderr)
		}
	}
}

// Areas left out are listed with the right count of the others.
func TestExcludedListCountsEveryArea(t *testing.T) {
	layer := countsIslands(25, func(i int) string {
		if i < 9 {
			return `"y":null,"g":"a"`
		}
		return countsProps(i)
	})
	o := runIn(layer, "compare", "-i", "-", "-y", "y", "-g", "g", "-n", "99")
	if want := "missing y: 9 areas (A01, A02, A03, A04, A05, A06 and 3 more)"; !strings.Contains(o.stdout, want) {
		t.Errorf("report lacks %q:\n%s", want, o.stdout)
	}
}
