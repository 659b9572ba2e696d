package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/areatest/areatest/samples"
	"github.com/areatest/areatest/tests/testkit"
)

// result is what one in-process run of the command gave.
type result struct {
	code           int
	stdout, stderr string
}

// runIn runs one command line in this process, with stdin, as main would.
func runIn(stdin string, args ...string) result {
	var out, errb bytes.Buffer
	code := run(args, strings.NewReader(stdin), &out, &errb)
	return result{code, out.String(), errb.String()}
}

// sampleDir writes the sample region into a fresh directory and makes it
// the working directory, so reports name the input "region.geojson" as a
// user's run in that directory would.
func sampleDir(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, samples.RegionFile), samples.RegionGeoJSON, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Chdir(dir)
	return dir
}

// small keeps golden runs quick: few shuffles, surrogates and checks.
var small = []string{"-n", "199"}
var smallCompare = []string{"-n", "199", "--surrogates", "99", "--false-positive-check", "20", "--check-shuffles", "49"}

// The golden files pin every report byte for byte, so that restructuring
// the code cannot change what users see. `go test ./cmd/areatest -update`
// rewrites them from this build; review the diff before committing it.
func TestGoldenReports(t *testing.T) {
	cases := []struct {
		name  string
		args  []string
		files []string // outputs written next to the input, pinned too
	}{
		{"demo", append([]string{"demo"}, smallCompare...), nil},
		{"demo-json", append([]string{"demo", "--format", "json"}, smallCompare...), nil},
		{"compare", append([]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy"}, smallCompare...), nil},
		{"compare-json", append([]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy", "--format", "json"}, smallCompare...), nil},
		{"compare-rates", append([]string{"compare", "-i", "region.geojson", "--events", "cases", "--population", "population", "-g", "province",
			"--contrast", "Heikell,Trulyrre", "--per", "1000"}, smallCompare...), nil},
		{"local-rates", append([]string{"local", "-i", "region.geojson", "--events", "cases", "--population", "population", "--smooth", "spatial",
			"--out", "rates.csv"}, small...), []string{"rates.csv"}},
		{"compare-covariates", append([]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "province", "--covariates", "income",
			"--statistic", "kruskal-wallis", "--contiguity", "rook"}, smallCompare...), nil},
		{"compare-contrast-json", append([]string{"compare", "-i", "region.geojson", "-y", "income", "-g", "province", "--contrast", "Heikell,Trulyrre",
			"--alternative", "greater", "--knn", "5", "--format", "json"}, smallCompare...), nil},
		{"autocorr", append([]string{"autocorr", "-i", "region.geojson", "--variables", "income,urban", "--events", "cases", "--population", "population", "--lags", "3"}, small...), nil},
		{"autocorr-json", append([]string{"autocorr", "-i", "region.geojson", "--variables", "income,rate", "--against", "rate", "--format", "json"}, small...), nil},
		{"autocorr-distance-classes", append([]string{"autocorr", "-i", "region.geojson", "--variables", "income", "--lags", "3", "--lag-width", "20", "--knn", "6"}, small...), nil},
		{"screen", append([]string{"screen", "-i", "region.geojson"}, small...), nil},
		{"screen-json", append([]string{"screen", "-i", "region.geojson", "--format", "json", "--adjust", "holm"}, small...), nil},
		{"screen-csv", append([]string{"screen", "-i", "region.geojson", "--format", "csv", "--exclude", "cases"}, small...), nil},
		{"local", append([]string{"local", "-i", "region.geojson", "--variable", "rate", "--out", "local.csv"}, small...), []string{"local.csv"}},
		{"local-json", append([]string{"local", "-i", "region.geojson", "--variable", "rate", "--format", "json", "--out", "local.geojson"}, small...), []string{"local.geojson"}},
		{"local-pictures", append([]string{"local", "-i", "region.geojson", "--variable", "rate", "--map", "map.svg", "--choropleth", "rate.svg",
			"--classes", "natural", "--scatter", "scatter.svg", "--histogram", "hist.svg", "--area", "D111"}, small...),
			[]string{"map.svg", "rate.svg", "scatter.svg", "hist.svg"}},
		{"local-report", append([]string{"local", "-i", "region.geojson", "--variable", "rate", "--report", "report.html"}, small...), []string{"report.html"}},
		{"local-gi-star", append([]string{"local", "-i", "region.geojson", "--variable", "income", "--statistic", "gi-star", "--knn", "6", "--adjust", "by"}, small...), nil},
		{"local-geary-folded", append([]string{"local", "-i", "region.geojson", "--variable", "income", "--statistic", "geary", "--alternative", "folded"}, small...), nil},
		{"local-cross", append([]string{"local", "-i", "region.geojson", "--variable", "income", "--against", "rate", "--statistic", "cross-moran", "--top", "3"}, small...), nil},
		{"residuals", []string{"residuals", "-i", "region.geojson", "-y", "rate", "--covariates", "income,urban", "--out", "residuals.csv"}, []string{"residuals.csv"}},
		{"residuals-json", []string{"residuals", "-i", "region.geojson", "-y", "rate", "--covariates", "income,province,urban", "--islands", "keep",
			"--alternative", "greater", "--format", "json"}, nil},
		{"residuals-pictures", append([]string{"residuals", "-i", "region.geojson", "-y", "income", "--covariates", "urban", "--knn", "6",
			"--map", "residuals.svg", "--classes", "natural", "--local", "local.svg"}, small...), []string{"residuals.svg", "local.svg"}},
		{"weights", []string{"weights", "-i", "region.geojson"}, nil},
		{"weights-json", []string{"weights", "-i", "region.geojson", "--knn", "4", "--scaling", "row", "--format", "json", "--write", "knn4.csv"}, []string{"knn4.csv"}},
		{"weights-band", []string{"weights", "-i", "region.geojson", "--band", "15", "--order", "2", "--cumulative"}, nil},
		{"weights-kernel", []string{"weights", "-i", "region.geojson", "--kernel", "bisquare", "--adaptive", "6", "--points", "inside"}, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			sampleDir(t)
			r := runIn("", c.args...)
			if r.code != 0 {
				t.Fatalf("exit %d: %s", r.code, r.stderr)
			}
			golden := filepath.Join(goldenDir(t), c.name)
			testkit.Golden(t, golden+".stdout", []byte(r.stdout))
			testkit.Golden(t, golden+".stderr", []byte(r.stderr))
			for _, f := range c.files {
				b, err := os.ReadFile(f)
				if err != nil {
					t.Fatal(err)
				}
				testkit.Golden(t, golden+"."+f, b)
			}
		})
	}
}

// goldenDir is testdata/golden of this package, found before any test
// changes the working directory.
var goldenRoot = func() string {
	wd, err := os.Getwd()
	if err != nil {
		panic(err)
	}
	return filepath.Join(wd, "testdata", "golden")
}()

func goldenDir(t *testing.T) string { return goldenRoot }
