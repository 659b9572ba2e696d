package compare

import (
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

var adjustedRows = flag.Bool("adjusted-rows", false, "BenchmarkRowsSize: give the outcome a covariate")

// rowTally is what the replicates found for one row of the p-value table:
// how often its p-value rejected at 5% (every rejection a false positive,
// the outcome and the grouping being independent), and the false-positive
// rates the check reported for it, summed.
type rowTally struct {
	Scheme   string
	Rejected int
	// RateSum sums the reported rates over the Measured replicates; Sound
	// counts the replicates whose rate was sound (interval not above α).
	RateSum         float64
	Measured, Sound int
}

// The SAR fields of the zones benchmark, by fixed-point iteration, against
// testkit's dense LU solve of (I − ρW)y = ε with the same ε.
func TestSARFieldByIteration(t *testing.T) {
	w := weights.Lattice(9, 11, weights.Queen).RowStandardised()
	for _, rho := range []float64{0.5, 0.95} {
		y := sarField(w, rho, rand.New(rand.NewPCG(1, 2)))
		rng := rand.New(rand.NewPCG(1, 2))
		eps := make([]float64, w.Len())
		for i := range eps {
			eps[i] = rng.NormFloat64()
		}
		want := testkit.NewSAR(testkit.Dense(w.Offsets, w.Neighbours, w.Weights), rho).Field(t, eps)
		for i := range y {
			if math.Abs(y[i]-want[i]) > 1e-9*(1+math.Abs(want[i])) {
				t.Fatalf("ρ %v, area %d: %v, LU %v", rho, i, y[i], want[i])
			}
		}
	}
}

// simTally is the tally of all rows over Reps replicates, and how often
// the recommended p-value rejected.
type simTally struct {
	// None counts the replicates on which no row was recommended (with
	// covariates, when even the spectral row is unsound: the modified
	// t-test, which does not adjust, is not offered).
	Reps, Recommended, None int
	Rows                    []rowTally
}

// simulateRows runs compare on reps pairs of independent SAR(ρ) fields on
// g, the outcome one field and the grouping the other split at its median,
// so that every rejection is a false positive. With adjusted, the outcome
// is 0.8·z plus the field, z a third independent SAR(ρ) field given as a
// covariate, so that the rows test the Freedman–Lane adjusted statistic;
// the group effect is still nil.
func simulateRows(tb testing.TB, g *weights.Graph, rho float64, reps int, opt Options, seed uint64, adjusted bool) simTally {
	n := g.Len()
	w := g.RowStandardised()
	sar := testkit.NewSAR(testkit.Dense(w.Offsets, w.Neighbours, w.Weights), rho)
	rng := rand.New(rand.NewPCG(seed, uint64(1000*rho)))
	field := func() []float64 {
		eps := make([]float64, n)
		for i := range eps {
			eps[i] = rng.NormFloat64()
		}
		return sar.Field(tb, eps)
	}
	ids := make([]string, n)
	for i := range ids {
		ids[i] = fmt.Sprint(i)
	}
	var st simTally
	for r := range reps {
		y, lab := field(), aboveMedian(field())
		group := make([]string, n)
		for i, l := range lab {
			group[i] = []string{"A", "B"}[l]
		}
		in := Input{IDs: ids, OutcomeName: "y", Outcome: y, OutcomeMissing: make([]bool, n),
			GroupName: "g", Group: group, GroupMissing: make([]bool, n), Graph: g}
		if adjusted {
			z := field()
			for i := range y {
				y[i] += 0.8 * z[i]
			}
			in.Covariates = []Covariate{{Name: "z", Values: z, Missing: make([]bool, n)}}
		}
		o := opt
		o.Seed = seed + uint64(r)
		res, err := Run(in, o)
		if err != nil {
			tb.Fatal(err)
		}
		st.tally(tb, res)
	}
	return st
}

func (st *simTally) tally(tb testing.TB, res *Result) {
	if st.Rows == nil {
		st.Rows = make([]rowTally, len(res.Tests)+1)
		for k, t := range res.Tests {
			st.Rows[k].Scheme = t.Scheme
		}
		st.Rows[len(res.Tests)].Scheme = "modified t-test"
	}
	if len(res.Tests)+1 != len(st.Rows) {
		tb.Fatalf("rows %d, earlier %d", len(res.Tests), len(st.Rows)-1)
	}
	st.Reps++
	warnings := strings.Join(res.Warnings, " ")
	for _, t := range res.Tests {
		if !t.Unsound() {
			continue
		}
		if res.Recommended.Scheme == t.Scheme {
			tb.Errorf("the unsound row %s was recommended", t.Scheme)
		}
		if !strings.Contains(warnings, rowName(t.Scheme)+" rejected "+rateText(t.FalsePositives)) {
			tb.Errorf("no warning names the unsound row %s: %q", t.Scheme, warnings)
		}
		if strings.HasSuffix(t.Scheme, "automatic zones") && !strings.Contains(warnings, "strata of your own") {
			tb.Errorf("unsound zones without the advice to give strata: %q", warnings)
		}
	}
	for k, t := range res.Tests {
		row := &st.Rows[k]
		if t.PValue <= 0.05 {
			row.Rejected++
		}
		if f := t.FalsePositives; f != nil {
			row.Measured++
			row.RateSum += f.Rate
			if !t.Unsound() {
				row.Sound++
			}
		}
	}
	if e := res.EffectiveSampleSize; e != nil && e.PValue <= 0.05 {
		st.Rows[len(res.Tests)].Rejected++
	}
	switch {
	case res.Recommended.Scheme == "":
		st.None++
	case res.Recommended.PValue <= 0.05:
		st.Recommended++
	}
}

// table writes the tally as the lines of a size table.
func (st simTally) table(rho float64) string {
	var b strings.Builder
	for _, row := range st.Rows {
		lo, hi := shuffle.ClopperPearson(row.Rejected, st.Reps, 0.95)
		measured := "not measured"
		if row.Measured > 0 {
			measured = fmt.Sprintf("reported %4.1f%%, sound in %d of %d", 100*row.RateSum/float64(row.Measured), row.Sound, row.Measured)
		}
		fmt.Fprintf(&b, "ρ %.2f  %-28s rejected %3d of %d (%4.1f%%, 95%% %4.1f–%4.1f%%)  %s\n",
			rho, truncateName(row.Scheme), row.Rejected, st.Reps, 100*float64(row.Rejected)/float64(st.Reps), 100*lo, 100*hi, measured)
	}
	lo, hi := shuffle.ClopperPearson(st.Recommended, st.Reps, 0.95)
	fmt.Fprintf(&b, "ρ %.2f  %-28s rejected %3d of %d (%4.1f%%, 95%% %4.1f–%4.1f%%); none recommended on %d\n", rho, "recommended", st.Recommended, st.Reps,
		100*float64(st.Recommended)/float64(st.Reps), 100*lo, 100*hi, st.None)
	return b.String()
}

// truncateName shortens "within 9 automatic zones" to "within zones", the
// number of zones being the same on every replicate of a layer.
func truncateName(s string) string {
	if strings.HasSuffix(s, "automatic zones") {
		return "within automatic zones"
	}
	return s
}

// check fails when a measured row's mean reported rate lies outside the
// 99% Clopper–Pearson interval of its actual rejections, or the
// recommended p-value's rejections are above 5% (the whole 99% interval
// above it).
func (st simTally) check(t *testing.T, rho float64) {
	for _, row := range st.Rows {
		if row.Measured == 0 {
			continue
		}
		mean := row.RateSum / float64(row.Measured)
		if lo, hi := shuffle.ClopperPearson(row.Rejected, st.Reps, 0.99); mean < lo || mean > hi {
			t.Errorf("ρ %.2f, %s: reported %.3f on average, actual rejections %d of %d (99%% interval %.3f–%.3f)", rho, row.Scheme, mean, row.Rejected, st.Reps, lo, hi)
		}
	}
	if lo, _ := shuffle.ClopperPearson(st.Recommended, st.Reps, 0.99); lo > 0.05 {
		t.Errorf("ρ %.2f: the recommended p-value rejected %d of %d true nulls", rho, st.Recommended, st.Reps)
	}
}

// With covariates: the same check of every row's reported rate, each row
// now the Freedman–Lane test adjusted for a spatially structured covariate
// and the spectral row the surrogates of the residuals, at ρ 0.5 and 0.95.
func TestAdjustedRowsReportTheirFalsePositives(t *testing.T) {
	if testing.Short() {
		t.Skip("a size simulation")
	}
	g := weights.Lattice(18, 18, weights.Rook)
	opt := Options{Permutations: 99, Alpha: 0.05, Zones: true, Surrogates: 99, FalsePositives: 60, FalsePositiveShuffles: 39,
		SARChecks: 40, SARCheckSurrogates: 39}
	for _, rho := range []float64{0.5, 0.95} {
		st := simulateRows(t, g, rho, 25, opt, 9, true)
		t.Logf("\n%s", st.table(rho))
		st.check(t, rho)
		for _, row := range st.Rows[:len(st.Rows)-1] {
			if !strings.Contains(row.Scheme, "adjusted for z") && row.Scheme != SpectralScheme {
				t.Errorf("row %q does not test the adjusted statistic", row.Scheme)
			}
			if row.Measured != st.Reps {
				t.Errorf("row %q measured in %d of %d replicates", row.Scheme, row.Measured, st.Reps)
			}
		}
	}
}

// Each row's reported false-positive rate against its actual rejection
// rate: on an 18×18 rook lattice (324 areas, so automatic zones are added)
// with independent SAR(ρ) outcome and grouping, every rejection of a row's
// p-value is a false positive; the mean rate the check reported for the
// row must lie in the 99% Clopper–Pearson interval of its rejections over
// the replicates, and the recommended p-value must hold 5%. The benchmark
// BenchmarkRowsSize runs more replicates for the table.
func TestRowsReportTheirFalsePositives(t *testing.T) {
	if testing.Short() {
		t.Skip("a size simulation")
	}
	g := weights.Lattice(18, 18, weights.Rook)
	// 39 check shuffles: two-sided, p ≤ 0.05 is exactly 5% of a null
	// p-value's values, as with the default 199 (99 would give 4%).
	opt := Options{Permutations: 99, Alpha: 0.05, Zones: true, Surrogates: 99, FalsePositives: 60, FalsePositiveShuffles: 39,
		SARChecks: 40, SARCheckSurrogates: 39}
	for _, rho := range []float64{0, 0.5, 0.8, 0.95} {
		st := simulateRows(t, g, rho, 25, opt, 7, false)
		t.Logf("\n%s", st.table(rho))
		st.check(t, rho)
	}
}

// BenchmarkRowsSize is the size table behind TestRowsReportTheirFalsePositives
// with more replicates: 100 per ρ on the 20×20 rook lattice, 199 shuffles
// and surrogates, 200 surrogates × 199 shuffles for the check. Run with
//
//	go test ./spatial/compare -run '^$' -bench RowsSize -benchtime 1x -v
//
// With -adjusted-rows the outcome carries a covariate and every row tests
// the adjusted statistic (simulateRows).
func BenchmarkRowsSize(b *testing.B) {
	g := weights.Lattice(20, 20, weights.Rook)
	opt := Options{Permutations: 199, Alpha: 0.05, Zones: true, Surrogates: 199, FalsePositives: 200, FalsePositiveShuffles: 199}
	for range b.N {
		for _, rho := range []float64{0, 0.5, 0.8, 0.95} {
			st := simulateRows(b, g, rho, 100, opt, 11, *adjustedRows)
			b.Logf("\n%s", st.table(rho))
		}
	}
}

// With covariates the whole comparison — Freedman–Lane rows, surrogates of
// the residuals, both checks — is the same for one worker and for three.
func TestAdjustedRunIdenticalAcrossWorkers(t *testing.T) {
	g := weights.Lattice(12, 12, weights.Rook)
	n := g.Len()
	rng := rand.New(rand.NewPCG(3, 4))
	w := g.RowStandardised()
	y, z := autoregressive(t, w, 0.7, rng), autoregressive(t, w, 0.7, rng)
	lab := aboveMedian(autoregressive(t, w, 0.7, rng))
	ids, group := make([]string, n), make([]string, n)
	for i := range ids {
		ids[i], group[i] = fmt.Sprint(i), []string{"A", "B"}[lab[i]]
	}
	in := Input{IDs: ids, OutcomeName: "y", Outcome: y, OutcomeMissing: make([]bool, n), GroupName: "g", Group: group,
		GroupMissing: make([]bool, n), Graph: g, Covariates: []Covariate{{Name: "z", Values: z, Missing: make([]bool, n)}}}
	run := func(workers int) *Result {
		res, err := Run(in, Options{Permutations: 99, Alpha: 0.05, Surrogates: 99, FalsePositives: 30, FalsePositiveShuffles: 39,
			SARChecks: 12, SARCheckSurrogates: 39, Seed: 8, Workers: workers})
		if err != nil {
			t.Fatal(err)
		}
		return res
	}
	one, three := run(1), run(3)
	if !reflect.DeepEqual(one, three) {
		t.Fatalf("one worker and three differ:\n%+v\n%+v", one.Tests, three.Tests)
	}
	if one.SARCheck == nil || one.SARCheck.Skipped != "" || one.Tests[0].FalsePositives == nil || findRow(one, SpectralScheme) < 0 {
		t.Fatalf("checks missing: %+v", one)
	}
}
