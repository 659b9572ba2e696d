package main

import (
	"crypto/sha256"
	"encoding/hex"
	"os"
	"regexp"
	"strings"
	"testing"

	"github.com/areatest/areatest/samples"
)

// regionDigest is the SHA-256 of the sample region as the tests write it.
var regionDigest = func() string {
	s := sha256.Sum256(samples.RegionGeoJSON)
	return hex.EncodeToString(s[:])
}()

// externalRef finds anything in a page that could load from outside it.
var externalRef = regexp.MustCompile(`(?i)https?:|file:|//|<script|<link|@import|<iframe|<object|<embed`)

// --report writes one page per command, with what the text report says,
// the input's digest, and nothing that reaches outside the file.
func TestReportPages(t *testing.T) {
	cases := []struct {
		name string
		args []string
		want []string
		// pictures is the number of <figure>s; areaShapes the shapes with
		// an id tooltip in the first one (one per area of a map).
		pictures, areaShapes int
	}{
		{"compare", append([]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy"}, smallCompare...),
			[]string{"Does rate differ between the groups of policy?", "What to read", "Read: spectral surrogates", "false positives", "Effective sample size", "Spatial check", "An association between areas is not evidence", "The null models", "The groups and the outcome on the map"}, 2, 0},
		{"autocorr", append([]string{"autocorr", "-i", "region.geojson", "--variables", "income,urban", "--events", "cases", "--population", "population", "--lags", "3"}, small...),
			[]string{"Do these variables cluster in space?", "Correlogram of income", "urban: join counts", "EB scores", "order 3", "Moran scatter"}, 3, 0},
		{"screen", append([]string{"screen", "-i", "region.geojson"}, small...),
			[]string{"Which columns of region.geojson cluster in space?", "Columns ranked by Moran&#39;s I", "Not screened", "province: not numeric"}, 0, 0},
		{"local", append([]string{"local", "-i", "region.geojson", "--variable", "rate"}, "-n", "999"),
			[]string{"Where does rate cluster?", "Areas in each category", "The strongest areas", "high-high", "Moran scatter"}, 3, 200},
		{"local geary", append([]string{"local", "-i", "region.geojson", "--variable", "income", "--statistic", "geary"}, small...),
			[]string{"local Geary"}, 2, 200},
		{"residuals", []string{"residuals", "-i", "region.geojson", "--outcome", "rate", "--covariates", "income,urban"},
			[]string{"What does the model of rate leave in space?", "Least-squares coefficients", "Lagrange multiplier tests", "urban=urban", "The residuals on the map"}, 1, 200},
		{"weights", []string{"weights", "-i", "region.geojson"},
			[]string{"Neighbours in region.geojson", "Areas by their number of neighbours", `<span style="width: 100%">`, "apart from the islands"}, 0, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			sampleDir(t)
			plain := runIn("", c.args...)
			r := runIn("", append(c.args, "--report", "page.html")...)
			if r.code != 0 {
				t.Fatalf("exit %d: %s", r.code, r.stderr)
			}
			// local and residuals list the page among the files written.
			if !strings.HasPrefix(c.name, "local") && c.name != "residuals" && r.stdout != plain.stdout {
				t.Error("--report changed the text report")
			}
			b, err := os.ReadFile("page.html")
			if err != nil {
				t.Fatal(err)
			}
			page := string(b)
			for _, w := range append(c.want, regionDigest, "<caption>", `<th scope="col"`, "@media print", "areatest 0.1.0") {
				if !strings.Contains(page, w) {
					t.Errorf("page lacks %q", w)
				}
			}
			if m := externalRef.FindString(page); m != "" {
				t.Errorf("page holds %q", m)
			}
			if n := strings.Count(page, "<figure"); n != c.pictures {
				t.Errorf("%d pictures, want %d", n, c.pictures)
			}
			if c.areaShapes > 0 {
				first := page[strings.Index(page, "<figure"):strings.Index(page, "</figure>")]
				if n := strings.Count(first, "</title></path>"); n != c.areaShapes {
					t.Errorf("the map has %d area shapes, want %d", n, c.areaShapes)
				}
			}
		})
	}
}

// The page is the same for any --workers, and for the same seed.
func TestReportSameForAnyWorkers(t *testing.T) {
	for _, args := range [][]string{
		append([]string{"local", "-i", "region.geojson", "--variable", "rate"}, small...),
		append([]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy"}, smallCompare...),
	} {
		t.Run(args[0], func(t *testing.T) {
			sampleDir(t)
			var pages []string
			for _, w := range []string{"1", "2", "3"} {
				if r := runIn("", append(args, "--workers", w, "--report", "page.html")...); r.code != 0 {
					t.Fatalf("exit %d: %s", r.code, r.stderr)
				}
				b, err := os.ReadFile("page.html")
				if err != nil {
					t.Fatal(err)
				}
				pages = append(pages, string(b))
			}
			if pages[0] != pages[1] || pages[1] != pages[2] {
				t.Error("the page depends on --workers")
			}
		})
	}
}

// --report goes through the output plan: a wrong name is a usage error
// before anything is read, an input is never overwritten, and a layer from
// standard input is hashed as read.
func TestReportFlag(t *testing.T) {
	base := append([]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy"}, smallCompare...)
	cases := []struct {
		name  string
		stdin string
		args  []string
		code  int
		msg   string // in stderr, or in the page for code 0
	}{
		{"not html", "", append(base, "--report", "page.txt"), 2, "name ending in .html"},
		{"stdout", "", append(base, "--report", "-"), 2, "not standard output"},
		{"same as output", "", append(base, "--report", "out.html", "-o", "out.html"), 2, "same file"},
		{"over an input", "", append(base, "--table", "t.html", "--report", "t.html"), 1, "--report"},
		{"htm", "", append(base, "--report", "page.HTM"), 0, regionDigest},
		{"stdin", string(samples.RegionGeoJSON), append([]string{"local", "-i", "-", "--variable", "rate", "-n", "99"}, "--report", "page.html"), 0, "standard input"},
		{"weights file", "", []string{"weights", "-i", "region.geojson", "--knn", "4", "--write", "knn.csv"}, 0, ""},
		{"weights read back", "", []string{"autocorr", "-i", "region.geojson", "--variables", "income", "-n", "99", "--weights", "knn.csv", "--report", "page.html"}, 0, "weights file"},
	}
	dir := sampleDir(t)
	const table = "id,x\nD001,1\n"
	if err := os.WriteFile("t.html", []byte(table), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			os.Remove("page.html")
			r := runIn(c.stdin, c.args...)
			if r.code != c.code {
				t.Fatalf("exit %d, want %d: %s", r.code, c.code, r.stderr)
			}
			if c.code != 0 {
				if !strings.Contains(r.stderr, c.msg) {
					t.Errorf("stderr %q lacks %q", r.stderr, c.msg)
				}
				if _, err := os.Stat("page.txt"); err == nil {
					t.Error("a page was written")
				}
				return
			}
			name := "page.html"
			if c.name == "htm" {
				name = "page.HTM"
			}
			if c.msg == "" {
				return
			}
			b, err := os.ReadFile(name)
			if err != nil {
				t.Fatal(err)
			}
			if !strings.Contains(string(b), c.msg) {
				t.Errorf("page lacks %q", c.msg)
			}
			if c.stdin != "" && !strings.Contains(string(b), regionDigest) {
				t.Error("the page lacks the digest of the bytes read from standard input")
			}
		})
	}
	if b, _ := os.ReadFile(dir + "/region.geojson"); string(b) != string(samples.RegionGeoJSON) {
		t.Error("the layer was changed")
	}
	if b, _ := os.ReadFile("t.html"); string(b) != table {
		t.Error("the table was changed")
	}
}
