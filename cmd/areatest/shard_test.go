package main

import (
	"fmt"
	"math/rand/v2"
	"os"
	"strings"
	"testing"
)

// shardCompare is compare on the sample region with every default stage
// (free shuffle, spectral surrogates, false-positive and SAR checks,
// spatial check) on small counts.
var shardCompare = []string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy",
	"-n", "199", "--surrogates", "99", "--false-positive-check", "40", "--check-shuffles", "39"}

// parts runs the n parts of args with workers goroutines each, writing
// part K to partK-of-N.json, and returns the files' names.
func parts(t *testing.T, args []string, n, workers int) []string {
	t.Helper()
	var names []string
	for k := 1; k <= n; k++ {
		name := fmt.Sprintf("part%d-of-%d.json", k, n)
		r := runIn("", append(args, "--shard", fmt.Sprintf("%d/%d", k, n), "-o", name, "--workers", fmt.Sprint(workers))...)
		if r.code != 0 {
			t.Fatalf("part %d of %d: %d %s", k, n, r.code, r.stderr)
		}
		names = append(names, name)
	}
	return names
}

// The merge of 1, 2, 3 and 7 parts (more parts than some stages have
// blocks), given in any order, computed with 1 or 3 workers, is the
// whole run's text and JSON byte for byte; with strata too.
func TestMergedPartsAreTheWholeRun(t *testing.T) {
	sampleDir(t)
	withStrata := append(append([]string(nil), shardCompare...), "--strata", "province", "--false-positive-check", "30")
	for _, args := range [][]string{shardCompare, withStrata} {
		want := map[string]string{}
		for _, format := range []string{"text", "json"} {
			r := runIn("", append(args, "--format", format)...)
			if r.code != 0 {
				t.Fatalf("whole run: %s", r.stderr)
			}
			want[format] = r.stdout
		}
		rng := rand.New(rand.NewPCG(1, 2))
		for _, n := range []int{1, 2, 3, 7} {
			for _, workers := range []int{1, 3} {
				names := parts(t, args, n, workers)
				rng.Shuffle(len(names), func(i, j int) { names[i], names[j] = names[j], names[i] })
				for _, format := range []string{"text", "json"} {
					r := runIn("", append([]string{"merge", "--format", format}, names...)...)
					if r.code != 0 {
						t.Fatalf("merge of %d parts: %d %s", n, r.code, r.stderr)
					}
					if r.stdout != want[format] {
						t.Errorf("%v, %d parts, %d workers, %s: merge differs from the whole run:\n%s\nwant\n%s", args[len(args)-2:], n, workers, format, r.stdout, want[format])
					}
				}
			}
		}
	}
}

// Parts that do not belong together are refused, naming the parts.
func TestMergeRefusesPartsOfOtherRuns(t *testing.T) {
	sampleDir(t)
	three := parts(t, shardCompare, 3, 2)
	two := parts(t, shardCompare, 2, 2)
	seed := "seed9.json"
	if r := runIn("", append(shardCompare, "--seed", "9", "--shard", "2/3", "-o", seed)...); r.code != 0 {
		t.Fatal(r.stderr)
	}
	old, err := os.ReadFile(three[1])
	if err != nil {
		t.Fatal(err)
	}
	release := "release.json"
	if err := os.WriteFile(release, []byte(strings.Replace(string(old), `"areatest_version": "`+Version+`"`, `"areatest_version": "0.0.9"`, 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	format := "format.json"
	if err := os.WriteFile(format, []byte(strings.Replace(string(old), `"format": 1`, `"format": 2`, 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name  string
		parts []string
		want  string
	}{
		{"a part missing", three[:2], "part 3 of 3 missing (given: part 1, 2)"},
		{"a part twice", []string{three[0], three[1], three[1], three[2]}, "part2-of-3.json and part2-of-3.json are both part 2 of 3"},
		{"another seed", []string{three[0], seed, three[2]}, "part1-of-3.json and seed9.json are parts of different runs: seed 1 and 9"},
		{"another count of parts", []string{three[0], two[1], three[2]}, "count of parts 3 and 2"},
		{"another release", []string{three[0], release, three[2]}, "release.json was written by areatest 0.0.9"},
		{"another format", []string{three[0], format, three[2]}, "format.json: a partial result of format 2"},
		{"not a part", []string{"region.geojson"}, "not a partial result"},
	} {
		r := runIn("", append([]string{"merge"}, c.parts...)...)
		if r.code == 0 || !strings.Contains(r.stderr, c.want) {
			t.Errorf("%s: %d %q, want %q", c.name, r.code, r.stderr, c.want)
		}
	}
	// A part of another input, and an input changed since the parts.
	lay, err := os.ReadFile("region.geojson")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile("region.geojson", append(lay, '\n'), 0o644); err != nil {
		t.Fatal(err)
	}
	if r := runIn("", append(shardCompare, "--shard", "2/3", "-o", "changed.json")...); r.code != 0 {
		t.Fatal(r.stderr)
	}
	for _, c := range []struct {
		name  string
		parts []string
		want  string
	}{
		{"another input", []string{three[0], "changed.json", three[2]}, "were computed from different contents of region.geojson"},
		{"an input changed", three, "region.geojson (the layer) has changed since the parts were computed"},
	} {
		r := runIn("", append([]string{"merge"}, c.parts...)...)
		if r.code != 1 || !strings.Contains(r.stderr, c.want) {
			t.Errorf("%s: %d %q, want %q", c.name, r.code, r.stderr, c.want)
		}
	}
}

// Bad --shard settings are usage errors (exit 2).
func TestShardUsage(t *testing.T) {
	sampleDir(t)
	for _, c := range []struct {
		extra []string
		want  string
	}{
		{[]string{"--shard", "0/2", "-o", "p.json"}, "--shard takes K/N"},
		{[]string{"--shard", "3/2", "-o", "p.json"}, "--shard takes K/N"},
		{[]string{"--shard", "two", "-o", "p.json"}, "--shard takes K/N"},
		{[]string{"--shard", "1/2"}, "name its file with --output"},
		{[]string{"--shard", "1/2", "-o", "p.json", "--format", "text"}, "as JSON"},
		{[]string{"--shard", "1/2", "-o", "p.json", "--plot", "n.svg"}, "--plot does not go with --shard"},
		{[]string{"--shard", "1/2", "-o", "p.json", "--report", "r.html"}, "--report does not go with --shard"},
	} {
		r := runIn("", append(append([]string(nil), shardCompare...), c.extra...)...)
		if r.code != 2 || !strings.Contains(r.stderr, c.want) {
			t.Errorf("%v: %d %q, want %q", c.extra, r.code, r.stderr, c.want)
		}
	}
	if r := runIn("", "merge"); r.code != 2 {
		t.Errorf("merge of nothing: %d %s", r.code, r.stderr)
	}
}

// screen and autocorr split too: the merge of 1, 2 and 5 parts is the whole
// run's text and JSON (autocorr with numeric variables, a rate and the
// bivariate Moran's I); autocorr refuses --shard with --lags and with text
// columns, whose tests share one stream in this version.
func TestMergedPartsOfScreenAndAutocorr(t *testing.T) {
	sampleDir(t)
	for _, args := range [][]string{
		{"screen", "-i", "region.geojson", "-n", "499"},
		{"autocorr", "-i", "region.geojson", "--variables", "income,rate", "--events", "cases", "--population", "population", "--against", "income", "-n", "499"},
	} {
		for _, format := range []string{"text", "json"} {
			whole := runIn("", append(args, "--format", format)...)
			if whole.code != 0 {
				t.Fatalf("%v: %s", args, whole.stderr)
			}
			for _, n := range []int{1, 2, 5} {
				names := parts(t, args, n, 2)
				r := runIn("", append([]string{"merge", "--format", format}, names...)...)
				if r.code != 0 || r.stdout != whole.stdout {
					t.Errorf("%s, %d parts, %s: exit %d %s; merge differs from the whole run", args[0], n, format, r.code, r.stderr)
				}
			}
		}
	}
	for _, bad := range [][]string{
		{"autocorr", "-i", "region.geojson", "--variables", "income", "--lags", "2"},
		{"autocorr", "-i", "region.geojson", "--variables", "urban"},
	} {
		if r := runIn("", append(bad, "--shard", "1/2", "-o", "p.json")...); r.code != 2 {
			t.Errorf("%v --shard: exit %d, %s", bad, r.code, r.stderr)
		}
	}
}
