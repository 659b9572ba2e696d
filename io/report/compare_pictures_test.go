package report

import (
	"bytes"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/weights"
)

// lattice is a comparison on a 12×12 rook lattice: an outcome that drifts
// across the lattice, two groups split by column parity and three strata
// of rows, with hostile-looking column names.
func lattice(covariate bool) compare.Input {
	g := weights.Lattice(12, 12, weights.Rook)
	n := g.Len()
	in := compare.Input{IDs: make([]string, n), OutcomeName: "rate<b>", Outcome: make([]float64, n), OutcomeMissing: make([]bool, n),
		GroupName: "policy", Group: make([]string, n), GroupMissing: make([]bool, n), Graph: g,
		StrataName: "province", Strata: make([]string, n), StrataMissing: make([]bool, n)}
	z := make([]float64, n)
	for i := range n {
		r, c := i/12, i%12
		in.IDs[i] = fmt.Sprint(i)
		in.Outcome[i] = float64(r) + 3*math.Sin(float64(i*7))
		in.Group[i] = []string{"yes", "no"}[c%2]
		in.Strata[i] = fmt.Sprint(r / 4)
		z[i] = math.Cos(float64(i))
	}
	if covariate {
		in.Covariates = []compare.Covariate{{Name: "income", Values: z, Missing: make([]bool, n)}}
	}
	return in
}

// The picture has a panel per row of the comparison, a rate row per row
// whose false-positive rate was measured, and the words of the report.
func TestComparePicturesNulls(t *testing.T) {
	for _, c := range []struct {
		name      string
		covariate bool
		checks    int
		want      []string
	}{
		{"plain", false, 20, []string{"difference in medians, yes − no (units of rate&lt;b&gt;)", "within province", "spectral surrogates", "199 shuffles", "99 surrogates"}},
		{"adjusted, no check", true, 0, []string{"t of the group effect, adjusted for income", "free, adjusted for income"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			res, err := compare.Run(lattice(c.covariate), compare.Options{Permutations: 199, Seed: 2, Workers: 2, Alpha: 0.05,
				Surrogates: 99, FalsePositives: c.checks, FalsePositiveShuffles: 39, SARChecks: 5, SARCheckSurrogates: 39, KeepNull: true})
			if err != nil {
				t.Fatal(err)
			}
			res.Version, res.Input.File = "test", "lattice.geojson"
			var buf bytes.Buffer
			if err := (ComparePictures{Result: res}).Nulls(&buf, figure.SVG); err != nil {
				t.Fatal(err)
			}
			s := buf.String()
			measured := 0
			for _, row := range res.Tests {
				if row.FalsePositives != nil {
					measured++
				}
			}
			if got := strings.Count(s, `<g class="panel"`); got != len(res.Tests) {
				t.Errorf("%d panels for %d rows", got, len(res.Tests))
			}
			if got := strings.Count(s, `<g class="rate"`); got != measured {
				t.Errorf("%d rate rows for %d measured rates", got, measured)
			}
			for _, w := range append(c.want, "seed 2 · areatest test", "not evidence that one causes the other") {
				if !strings.Contains(s, w) {
					t.Errorf("picture lacks %q", w)
				}
			}
		})
	}
	res, err := compare.Run(lattice(false), compare.Options{Permutations: 99, Seed: 2, Alpha: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	if err := (ComparePictures{Result: res}).Nulls(&bytes.Buffer{}, figure.SVG); err == nil {
		t.Error("a result without its null values was drawn")
	}
}
