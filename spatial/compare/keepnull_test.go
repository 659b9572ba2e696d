package compare

import (
	"fmt"
	"math/rand/v2"
	"reflect"
	"testing"

	"github.com/areatest/areatest/weights"
)

// With KeepNull every row that ran carries its null values — one per draw,
// the surrogates' too — and the result is otherwise the one without; the
// kept values are the same for one worker and for three.
func TestRowsKeepTheirNull(t *testing.T) {
	g := weights.Lattice(18, 18, weights.Rook) // 324 areas: automatic zones run
	n := g.Len()
	rng := rand.New(rand.NewPCG(5, 6))
	w := g.RowStandardised()
	y, z := autoregressive(t, w, 0.6, rng), autoregressive(t, w, 0.6, rng)
	lab := aboveMedian(autoregressive(t, w, 0.6, rng))
	ids, group, strata := make([]string, n), make([]string, n), make([]string, n)
	for i := range ids {
		ids[i], group[i], strata[i] = fmt.Sprint(i), []string{"A", "B"}[lab[i]], fmt.Sprint(i*3/n)
	}
	base := Input{IDs: ids, OutcomeName: "y", Outcome: y, OutcomeMissing: make([]bool, n), GroupName: "g", Group: group,
		GroupMissing: make([]bool, n), Graph: g}
	withStrata := base
	withStrata.StrataName, withStrata.Strata, withStrata.StrataMissing = "third", strata, make([]bool, n)
	adjusted := base
	adjusted.Covariates = []Covariate{{Name: "z", Values: z, Missing: make([]bool, n)}}
	cases := []struct {
		name string
		in   Input
		rows int
	}{
		{"free, zones, surrogates", base, 3},
		{"within strata", withStrata, 3},
		{"adjusted for a covariate", adjusted, 3},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			run := func(keep bool, workers int) *Result {
				res, err := Run(c.in, Options{Permutations: 199, Alpha: 0.05, Zones: true, Surrogates: 99, FalsePositives: 20,
					FalsePositiveShuffles: 39, SARChecks: 5, SARCheckSurrogates: 39, Seed: 3, Workers: workers, KeepNull: keep})
				if err != nil {
					t.Fatal(err)
				}
				return res
			}
			kept, plain := run(true, 1), run(false, 2)
			if len(kept.Tests) != c.rows {
				t.Fatalf("%d rows, want %d", len(kept.Tests), c.rows)
			}
			for _, row := range kept.Tests {
				if len(row.Null) != row.Permutations {
					t.Errorf("row %q keeps %d null values of %d draws", row.Scheme, len(row.Null), row.Permutations)
				}
			}
			if !reflect.DeepEqual(kept, run(true, 3)) {
				t.Error("one worker and three keep other null values")
			}
			for k := range kept.Tests {
				if plain.Tests[k].Null != nil {
					t.Errorf("row %q keeps its null without being asked", plain.Tests[k].Scheme)
				}
				kept.Tests[k].Null = nil
			}
			if !reflect.DeepEqual(kept, plain) {
				t.Error("keeping the null changed the result")
			}
		})
	}
}
