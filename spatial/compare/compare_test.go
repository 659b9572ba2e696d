package compare

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// path builds a chain of n areas, each the neighbour of the next.
func path(n int) *weights.Graph {
	var pairs [][2]int32
	for i := 0; i+1 < n; i++ {
		pairs = append(pairs, [2]int32{int32(i), int32(i + 1)})
	}
	g, err := weights.FromLinks(n, pairs, "path")
	if err != nil {
		panic(err)
	}
	return g
}

func input(y []float64, g []string) Input {
	n := len(y)
	ids := make([]string, n)
	for i := range ids {
		ids[i] = string(rune('a' + i))
	}
	return Input{IDs: ids, OutcomeName: "y", Outcome: y, OutcomeMissing: make([]bool, n),
		GroupName: "g", Group: g, GroupMissing: make([]bool, n), Graph: path(n)}
}

func opts() Options {
	return Options{Permutations: 999, Seed: 1, Workers: 2, Alpha: 0.05}
}

func TestLevelOrderAndContrast(t *testing.T) {
	y := []float64{1, 2, 3, 10, 11, 12, 13, 5}
	g := []string{"no", "no", "no", "yes", "yes", "yes", "yes", "no"}
	res, err := Run(input(y, g), opts())
	if err != nil {
		t.Fatal(err)
	}
	// "yes" reads as having the policy, so the default contrast is yes − no:
	// median(10..13) − median(1,2,3,5) = 11.5 − 2.5 = 9.
	if c := res.Statistic.Contrast; c[0] != "yes" || c[1] != "no" || res.Statistic.Observed != 9 {
		t.Fatalf("contrast %v observed %v", c, res.Statistic.Observed)
	}
	o := opts()
	o.Contrast = []string{"no", "yes"}
	res, err = Run(input(y, g), o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Statistic.Observed != -9 {
		t.Fatalf("reversed contrast gives %v", res.Statistic.Observed)
	}
	// C(8,4) = 70 arrangements, enumerated. Two of them reach −9: "no" as
	// {1,2,3,5} and as {1,2,3,10} (both medians 2.5, the other side's 11.5),
	// so the two-sided p is 2·2/70 (counted by hand).
	if tst := res.Tests[0]; !tst.Exact || tst.Permutations != 70 || tst.AtMost != 2 || math.Abs(tst.PValue-4.0/70) > 1e-12 {
		t.Fatalf("test %+v", tst)
	}
}

func TestThreeGroups(t *testing.T) {
	y := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12}
	g := []string{"c", "c", "c", "c", "b", "b", "b", "b", "a", "a", "a", "a"}
	res, err := Run(input(y, g), opts())
	if err != nil {
		t.Fatal(err)
	}
	if res.Statistic.Name != "kruskal-wallis" || len(res.Groups) != 3 || res.Groups[0].Level != "a" {
		t.Fatalf("statistic %s groups %+v", res.Statistic.Name, res.Groups)
	}
	if res.Tests[0].Alternative != "greater" {
		t.Fatalf("H must be tested in its upper tail, got %s", res.Tests[0].Alternative)
	}
	if len(res.Autocorrelation.Group) != 3 {
		t.Fatalf("want one Moran's I per group indicator, got %d", len(res.Autocorrelation.Group))
	}
	s := groups.DiffMeans
	o := opts()
	o.Statistic = &s
	var te *TwoGroupError
	if _, err := Run(input(y, g), o); !errors.As(err, &te) || len(te.Levels) != 3 || !strings.Contains(err.Error(), "contrast") {
		t.Fatalf("two-group statistic on three groups: %v", err)
	}
	// With a contrast the third group is left out and counted.
	o.Contrast = []string{"a", "c"}
	res, err = Run(input(y, g), o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Input.Tested != 8 || len(res.Excluded) != 1 || res.Excluded[0].Areas != 4 || res.Statistic.Observed != 8 {
		t.Fatalf("tested %d excluded %+v observed %v", res.Input.Tested, res.Excluded, res.Statistic.Observed)
	}
}

func TestExclusionsAndDataErrors(t *testing.T) {
	y := []float64{1, 2, 3, 4, 5, 6}
	g := []string{"a", "a", "b", "b", "b", ""}
	in := input(y, g)
	in.GroupMissing[5] = true
	in.OutcomeMissing[0] = true
	_, err := Run(in, opts())
	var de *Error
	if !errors.As(err, &de) || !strings.Contains(err.Error(), `"a"`) {
		t.Fatalf("group left with one area: %v", err)
	}
	in.OutcomeMissing[0] = false
	res, err := Run(in, opts())
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Excluded) != 1 || res.Excluded[0].Reason != "missing g" || res.Excluded[0].IDs[0] != "f" {
		t.Fatalf("excluded %+v", res.Excluded)
	}
	if _, err := Run(input(y, []string{"a", "a", "a", "a", "a", "a"}), opts()); err == nil || !strings.Contains(err.Error(), "one level") {
		t.Fatalf("single group: %v", err)
	}
	o := opts()
	o.Contrast = []string{"a", "z"}
	var le *LevelError
	if _, err := Run(input(y, []string{"a", "a", "b", "b", "b", "b"}), o); !errors.As(err, &le) || le.Level != "z" || !strings.Contains(err.Error(), `"z"`) {
		t.Fatalf("unknown contrast level: %v", err)
	}
}

// Strata that each hold a single group cannot move a label: the within-strata
// test is exact with one arrangement and p = 1, and the report says why.
func TestStrataThatCannotMix(t *testing.T) {
	y := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	g := []string{"a", "a", "a", "a", "b", "b", "b", "b"}
	in := input(y, g)
	in.StrataName = "s"
	in.Strata = []string{"x", "x", "x", "x", "z", "z", "z", "z"}
	in.StrataMissing = make([]bool, 8)
	res, err := Run(in, opts())
	if err != nil {
		t.Fatal(err)
	}
	w := res.Tests[1]
	if w.Scheme != "within s" || !w.Exact || w.Permutations != 1 || w.PValue != 1 {
		t.Fatalf("within-strata test %+v", w)
	}
	found := false
	for _, m := range res.Warnings {
		found = found || strings.Contains(m, "cannot move a label")
	}
	if !found {
		t.Fatalf("no warning about strata that cannot mix: %v", res.Warnings)
	}
}

// The clustering warning appears when both outcome and grouping cluster,
// and not when the grouping is scattered.
func TestClusterWarning(t *testing.T) {
	n := 40
	y := make([]float64, n)
	clustered := make([]string, n)
	scattered := make([]string, n)
	for i := range y {
		y[i] = float64(i) + 0.3*math.Sin(float64(i)*7)
		clustered[i] = "a"
		if i >= n/2 {
			clustered[i] = "b"
		}
		scattered[i] = []string{"a", "b"}[i%2]
	}
	o := opts()
	o.Alternative = shuffle.TwoSided
	res, err := Run(input(y, clustered), o)
	if err != nil {
		t.Fatal(err)
	}
	if !res.Autocorrelation.Clustered || !strings.Contains(strings.Join(res.Warnings, " "), "cluster in space") {
		t.Fatalf("no clustering warning: %+v", res.Autocorrelation)
	}
	res, err = Run(input(y, scattered), o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Autocorrelation.Clustered {
		t.Fatalf("alternating groups flagged as clustered: %+v", res.Autocorrelation)
	}
}

// Areas with no neighbour among the tested areas stay in the group test but
// leave the spatial check, which names them.
func TestIslandsLeaveOnlyTheSpatialCheck(t *testing.T) {
	y := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	g := []string{"a", "a", "a", "a", "b", "b", "b", "b"}
	in := input(y, g)
	// A chain a–b–…–g; area h touches nobody.
	var pairs [][2]int32
	for i := 0; i+1 < 7; i++ {
		pairs = append(pairs, [2]int32{int32(i), int32(i + 1)})
	}
	in.Graph, _ = weights.FromLinks(8, pairs, "path")
	// Area b (index 1) has no outcome: a and c lose their link through it,
	// so a becomes an island among the tested areas.
	in.OutcomeMissing[1] = true
	res, err := Run(in, opts())
	if err != nil {
		t.Fatal(err)
	}
	if res.Input.Tested != 7 || res.Groups[0].Areas+res.Groups[1].Areas != 7 {
		t.Fatalf("tested %d, groups %+v", res.Input.Tested, res.Groups)
	}
	if res.Weights.Islands != 2 || res.Weights.IslandIDs[0] != "a" || res.Weights.IslandIDs[1] != "h" {
		t.Fatalf("islands %d %v", res.Weights.Islands, res.Weights.IslandIDs)
	}
	if res.Weights.Pairs != 4 || res.Weights.Links != 8 {
		t.Fatalf("pairs %d links %d, want 4 pairs (c-d-e-f-g)", res.Weights.Pairs, res.Weights.Links)
	}
}

// With KeepIslands the areas without neighbours stay in the spatial check
// with a zero lag: Moran's I then equals the direct formula over all tested
// areas (n/S0 · Σ z_i lag_i / Σ z², islands contributing to n and Σ z² only).
func TestKeepIslands(t *testing.T) {
	y := []float64{1, 2, 3, 4, 5, 6, 7, 9}
	g := []string{"a", "a", "a", "a", "b", "b", "b", "b"}
	in := input(y, g)
	var pairs [][2]int32
	for i := 0; i+1 < 7; i++ {
		pairs = append(pairs, [2]int32{int32(i), int32(i + 1)})
	}
	in.Graph, _ = weights.FromLinks(8, pairs, "path")
	in.KeepIslands = true
	res, err := Run(in, opts())
	if err != nil {
		t.Fatal(err)
	}
	// Row-standardised path of 7 plus an island: S0 = 7; mean of y = 37/8.
	mean := 37.0 / 8
	var num, den float64
	for i := 0; i < 8; i++ {
		z := y[i] - mean
		den += z * z
		var lag float64
		switch {
		case i == 0:
			lag = y[1] - mean
		case i == 6:
			lag = y[5] - mean
		case i < 6:
			lag = (y[i-1] + y[i+1] - 2*mean) / 2
		}
		num += z * lag
	}
	want := 8.0 / 7 * num / den
	if got := res.Autocorrelation.Outcome.MoransI; math.Abs(got-want) > 1e-12 {
		t.Fatalf("I = %v, want %v", got, want)
	}
	if !strings.Contains(strings.Join(res.Warnings, " "), "kept in the spatial check") {
		t.Fatalf("warnings %q", res.Warnings)
	}
}

// With covariates every scheme tests the Freedman–Lane adjusted statistic;
// areas missing a covariate are left out and counted; without strata on a
// layer of 300 or more areas a within-zones scheme is added; the effective
// sample size is reported.
func TestCovariatesZonesAndEffectiveSize(t *testing.T) {
	m := 20
	n := m * m
	y := make([]float64, n)
	cov := make([]float64, n)
	g := make([]string, n)
	ids := make([]string, n)
	for i := range y {
		r, c := i/m, i%m
		cov[i] = float64(r)
		y[i] = 0.5*float64(r) + math.Sin(float64(i)*1.3)
		g[i] = []string{"a", "b"}[(r/5+c/5)%2]
		ids[i] = fmt.Sprint(i)
	}
	graph := weights.Lattice(m, m, weights.Rook)
	in := Input{IDs: ids, OutcomeName: "y", Outcome: y, OutcomeMissing: make([]bool, n), GroupName: "g", Group: g,
		GroupMissing: make([]bool, n), Graph: graph,
		Covariates: []Covariate{{Name: "row", Values: cov, Missing: make([]bool, n)}}}
	in.Covariates[0].Missing[7] = true
	o := opts()
	o.Zones = true
	res, err := Run(in, o)
	if err != nil {
		t.Fatal(err)
	}
	if res.Input.Tested != n-1 || res.Excluded[0].Reason != "missing row" {
		t.Fatalf("tested %d, excluded %+v", res.Input.Tested, res.Excluded)
	}
	if res.Adjusted == nil || res.Adjusted.Statistic != "t of the group effect" {
		t.Fatalf("adjusted %+v", res.Adjusted)
	}
	if len(res.Tests) != 2 || !strings.HasPrefix(res.Tests[1].Scheme, "within ") || !strings.Contains(res.Tests[1].Scheme, "automatic zones, adjusted for row") {
		t.Fatalf("schemes %v", []string{res.Tests[0].Scheme})
	}
	if res.Zones == nil || res.Zones.Zones < 10 || res.Zones.Zones > 40 {
		t.Fatalf("zones %+v", res.Zones)
	}
	// Every scheme's observed value is the adjusted t, the same in each.
	if res.Tests[0].Observed != res.Adjusted.Observed || res.Tests[1].Observed != res.Adjusted.Observed {
		t.Fatalf("observed %v %v, adjusted %v", res.Tests[0].Observed, res.Tests[1].Observed, res.Adjusted.Observed)
	}
	if e := res.EffectiveSampleSize; e == nil || e.Areas != n-1 || e.EffectiveSampleSize > float64(n-1) {
		t.Fatalf("effective sample size %+v", res.EffectiveSampleSize)
	}
}
