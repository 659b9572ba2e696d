package tests

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// statesSizeReps is the number of replicates per ρ of the size check on
// the states.
const statesSizeReps = 100

// The p-value table's size on real boundaries: the queen graph of the 49
// linked US states (Census cartographic boundaries), with outcome and
// grouping independent SAR(ρ) fields (the grouping split at its median;
// fields exact by testkit's dense LU, Whittle 1954), so that every
// rejection is a false positive. At ρ = 0.5 and 0.9, statesSizeReps
// replicates of compare.Run with 99 shuffles and 99 surrogates, and a
// check of 40 surrogates × 39 shuffles with the SAR check's defaults: the
// recommended p-value's rejections must be consistent with 5% (their 99%
// Clopper–Pearson interval, Clopper & Pearson 1934, contains 0.05), and
// every measured row's mean reported false-positive rate must lie in the
// 99% interval of its actual rejections. Every row is logged.
func TestStatesSizeOfEveryRow(t *testing.T) {
	if testing.Short() {
		t.Skip("a size simulation")
	}
	r := loadAutocorrRefs(t)
	g := statesQueen(t, r)
	// Two-sided, p ≤ 0.05 is exactly 5% of a null p-value's values with
	// 99 shuffles (5 of 100) and with 39 check shuffles (2 of 40).
	opt := compare.Options{Permutations: 99, Surrogates: 99, Alpha: 0.05, FalsePositives: 40, FalsePositiveShuffles: 39}
	for _, rho := range []float64{0.5, 0.9} {
		sz := statesSize(t, g, r.IDs, rho, opt)
		t.Logf("ρ %.1f, %d replicates:\n%s", rho, statesSizeReps, sz)
		lo, hi := shuffle.ClopperPearson(sz.recommended, statesSizeReps, 0.99)
		if lo > 0.05 || hi < 0.05 {
			t.Errorf("ρ %.1f: the recommended p-value rejected %d of %d true nulls (99%% interval %.3f–%.3f)",
				rho, sz.recommended, statesSizeReps, lo, hi)
		}
		for _, row := range sz.rows {
			if row.measured == 0 {
				continue
			}
			mean := row.rateSum / float64(row.measured)
			if lo, hi := shuffle.ClopperPearson(row.rejected, statesSizeReps, 0.99); mean < lo || mean > hi {
				t.Errorf("ρ %.1f, %s: reported %.3f on average, rejected %d of %d (99%% interval %.3f–%.3f)",
					rho, row.scheme, mean, row.rejected, statesSizeReps, lo, hi)
			}
		}
	}
}

// sizeRow is one row's tally over the replicates: its rejections at 5% and
// the false-positive rates the check reported for it, summed.
type sizeRow struct {
	scheme             string
	rejected, measured int
	rateSum            float64
}

// sizeTally is every row's tally and the recommended p-value's rejections.
type sizeTally struct {
	rows        []sizeRow
	recommended int
}

// statesSize runs statesSizeReps replicates at ρ on g.
func statesSize(t *testing.T, g *weights.Graph, ids []string, rho float64, opt compare.Options) sizeTally {
	n := g.Len()
	w := g.RowStandardised()
	gen := testkit.NewSAR(testkit.Dense(w.Offsets, w.Neighbours, w.Weights), rho)
	rng := rand.New(rand.NewPCG(23, uint64(100*rho)))
	field := func() []float64 {
		eps := make([]float64, n)
		for i := range eps {
			eps[i] = rng.NormFloat64()
		}
		return gen.Field(t, eps)
	}
	var sz sizeTally
	for rep := range statesSizeReps {
		in := compare.Input{IDs: ids, OutcomeName: "y", Outcome: field(), OutcomeMissing: make([]bool, n),
			GroupName: "g", Group: splitAtMedian(field()), GroupMissing: make([]bool, n), Graph: g}
		o := opt
		o.Seed = uint64(rep + 1)
		res, err := compare.Run(in, o)
		if err != nil {
			t.Fatal(err)
		}
		sz.add(t, res)
	}
	return sz
}

// splitAtMedian labels x's values "low" below its median and "high" at or
// above it.
func splitAtMedian(x []float64) []string {
	s := append([]float64(nil), x...)
	slices.Sort(s)
	lab := make([]string, len(x))
	for i, v := range x {
		lab[i] = "high"
		if v < s[len(s)/2] {
			lab[i] = "low"
		}
	}
	return lab
}

// add tallies one result: each row of the table, the modified t-test last.
func (sz *sizeTally) add(t *testing.T, res *compare.Result) {
	if sz.rows == nil {
		for _, row := range res.Tests {
			sz.rows = append(sz.rows, sizeRow{scheme: row.Scheme})
		}
		sz.rows = append(sz.rows, sizeRow{scheme: "modified t-test"})
	}
	if len(sz.rows) != len(res.Tests)+1 {
		t.Fatalf("%d rows, earlier %d", len(res.Tests), len(sz.rows)-1)
	}
	for k, row := range res.Tests {
		if row.PValue <= 0.05 {
			sz.rows[k].rejected++
		}
		if f := row.FalsePositives; f != nil {
			sz.rows[k].measured++
			sz.rows[k].rateSum += f.Rate
		}
	}
	if e := res.EffectiveSampleSize; e != nil && e.PValue <= 0.05 {
		sz.rows[len(res.Tests)].rejected++
	}
	if res.Recommended.PValue <= 0.05 {
		sz.recommended++
	}
}

// String lists every row's rejections with their 95% Clopper–Pearson
// interval and its mean reported rate.
func (sz sizeTally) String() string {
	var b strings.Builder
	line := func(name string, k int, note string) {
		lo, hi := shuffle.ClopperPearson(k, statesSizeReps, 0.95)
		fmt.Fprintf(&b, "  %-20s rejected %3d of %d (95%% %4.1f–%4.1f%%)%s\n", name, k, statesSizeReps, 100*lo, 100*hi, note)
	}
	for _, row := range sz.rows {
		note := ""
		if row.measured > 0 {
			note = fmt.Sprintf(", reported %4.1f%% on average", 100*row.rateSum/float64(row.measured))
		}
		line(row.scheme, row.rejected, note)
	}
	line("recommended", sz.recommended, "")
	return b.String()
}
