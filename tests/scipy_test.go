package tests

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
)

// scipyRefs mirrors testdata/scipy/refs.json, made by testdata/scipy/make_refs.py
// with Debian's python3-scipy 1.10.1 and python3-statsmodels 0.13.5.
type scipyRefs struct {
	MannWhitney []struct {
		Case, Alternative string
		X, Y              []float64
		Statistic, PValue float64
		N                 int `json:"n_arrangements"`
		CountGE           int `json:"count_ge"`
		CountLE           int `json:"count_le"`
	} `json:"mannwhitneyu_exact"`
	Permutation []struct {
		Case, Alternative string
		Name              string `json:"statistic_name"`
		X, Y              []float64
		Statistic, PValue float64
		Ties              bool
		N                 int `json:"n_arrangements"`
		CountGE           int `json:"count_ge"`
		CountLE           int `json:"count_le"`
	} `json:"permutation_test_exact"`
	Welch []struct {
		X, Y      []float64
		Statistic float64
	} `json:"welch_t"`
	Kruskal []struct {
		Groups    [][]float64
		Statistic float64
	} `json:"kruskal"`
	FOneWay []struct {
		Groups    [][]float64
		Statistic float64
	} `json:"f_oneway"`
	ClopperPearson []struct {
		K, N        int
		Level       float64 `json:"confidence_level"`
		LowPrecise  float64 `json:"low_precise"`
		HighPrecise float64 `json:"high_precise"`
	} `json:"clopper_pearson"`
	Fisher struct {
		Fraction [2]int `json:"pvalue_fraction"`
	} `json:"fisher_tea"`
}

func loadScipy(t *testing.T) *scipyRefs {
	t.Helper()
	var r scipyRefs
	testkit.LoadJSON(t, "scipy/refs.json", &r)
	return &r
}

// twoSample prepares x (group A) and y (group B) for the group statistics.
func twoSample(t *testing.T, x, y []float64) *groups.Data {
	t.Helper()
	return samples(t, [][]float64{x, y})
}

func samples(t *testing.T, gs [][]float64) *groups.Data {
	t.Helper()
	var v []float64
	var lab []int32
	for g, s := range gs {
		for _, e := range s {
			v = append(v, e)
			lab = append(lab, int32(g))
		}
	}
	d, err := groups.Prepare(v, lab, len(gs))
	if err != nil {
		t.Fatal(err)
	}
	return d
}

func alternative(t *testing.T, s string) shuffle.Alternative {
	a, err := shuffle.ParseAlternative(s)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

func exactTest(t *testing.T, d *groups.Data, s groups.Statistic, alt shuffle.Alternative) shuffle.Result {
	t.Helper()
	scale := 1.0
	if s.InOutcomeUnits() {
		scale = d.Y[len(d.Y)-1] - d.Y[0]
	}
	res, err := shuffle.Run(shuffle.Plan{Labels: d.Labels, Permutations: 1, Alternative: alt, Scale: scale}, d.Factory(s))
	if err != nil {
		t.Fatal(err)
	}
	if !res.Exact {
		t.Fatal("expected exact enumeration")
	}
	return res
}

// Exact rank-sum p-values equal scipy.stats.mannwhitneyu(x, y,
// method="exact") on samples without ties, for all three alternatives, and
// the statistic is scipy's U of the first sample.
func TestRankSumExactAgainstScipy(t *testing.T) {
	r := loadScipy(t)
	if len(r.MannWhitney) == 0 {
		t.Fatal("no reference cases")
	}
	for _, c := range r.MannWhitney {
		d := twoSample(t, c.X, c.Y)
		res := exactTest(t, d, groups.RankSum, alternative(t, c.Alternative))
		if res.Observed != c.Statistic {
			t.Errorf("%s: U %v, scipy %v", c.Case, res.Observed, c.Statistic)
		}
		if res.Permutations != c.N || res.AtLeast != c.CountGE || res.AtMost != c.CountLE {
			t.Errorf("%s: counts %d/%d of %d, scipy %d/%d of %d", c.Case, res.AtLeast, res.AtMost, res.Permutations, c.CountGE, c.CountLE, c.N)
		}
		if math.Abs(res.PValue-c.PValue) > 1e-12 {
			t.Errorf("%s %s: p %v, scipy %v", c.Case, c.Alternative, res.PValue, c.PValue)
		}
	}
}

// Exact permutation p-values of the difference in means and in medians (and
// the rank sum with mid-ranks on tied data) equal
// scipy.stats.permutation_test(..., permutation_type="independent",
// n_resamples=inf), including cases with ties where a naive float comparison
// would miscount.
func TestExactPermutationAgainstScipy(t *testing.T) {
	r := loadScipy(t)
	stats := map[string]groups.Statistic{"mean_diff": groups.DiffMeans, "median_diff": groups.DiffMedians, "mann_whitney_u": groups.RankSum}
	if len(r.Permutation) == 0 {
		t.Fatal("no reference cases")
	}
	for _, c := range r.Permutation {
		s, ok := stats[c.Name]
		if !ok {
			t.Fatalf("unknown statistic %q", c.Name)
		}
		d := twoSample(t, c.X, c.Y)
		res := exactTest(t, d, s, alternative(t, c.Alternative))
		if math.Abs(res.Observed-c.Statistic) > 1e-12*math.Max(1, math.Abs(c.Statistic)) {
			t.Errorf("%s %s: statistic %v, scipy %v", c.Case, c.Name, res.Observed, c.Statistic)
		}
		if res.Permutations != c.N || res.AtLeast != c.CountGE || res.AtMost != c.CountLE {
			t.Errorf("%s %s %s: counts %d/%d of %d, scipy %d/%d of %d", c.Case, c.Name, c.Alternative,
				res.AtLeast, res.AtMost, res.Permutations, c.CountGE, c.CountLE, c.N)
		}
		if math.Abs(res.PValue-c.PValue) > 1e-12 {
			t.Errorf("%s %s %s: p %v, scipy %v", c.Case, c.Name, c.Alternative, res.PValue, c.PValue)
		}
	}
}

// Welch's t, Kruskal–Wallis H (tie-corrected) and the one-way F equal
// scipy.stats.ttest_ind(equal_var=False), kruskal and f_oneway.
func TestStatisticsAgainstScipy(t *testing.T) {
	r := loadScipy(t)
	for i, c := range r.Welch {
		d := twoSample(t, c.X, c.Y)
		if got := d.Observed(groups.WelchT); math.Abs(got-c.Statistic) > 1e-12*math.Abs(c.Statistic) {
			t.Errorf("welch %d: %v, scipy %v", i, got, c.Statistic)
		}
	}
	for i, c := range r.Kruskal {
		d := samples(t, c.Groups)
		if got := d.Observed(groups.KruskalWallis); math.Abs(got-c.Statistic) > 1e-12*math.Abs(c.Statistic) {
			t.Errorf("kruskal %d: %v, scipy %v", i, got, c.Statistic)
		}
	}
	for i, c := range r.FOneWay {
		d := samples(t, c.Groups)
		if got := d.Observed(groups.OneWayF); math.Abs(got-c.Statistic) > 1e-12*math.Abs(c.Statistic) {
			t.Errorf("f_oneway %d: %v, scipy %v", i, got, c.Statistic)
		}
	}
	if len(r.Welch) == 0 || len(r.Kruskal) == 0 || len(r.FOneWay) == 0 {
		t.Fatal("missing reference cases")
	}
}

// Clopper–Pearson limits equal the beta quantiles that make_refs.py computed
// with mpmath to 40 digits (and scipy's binomtest(...).proportion_ci(method=
// "exact") to its root-finding accuracy).
func TestClopperPearsonAgainstReference(t *testing.T) {
	r := loadScipy(t)
	if len(r.ClopperPearson) == 0 {
		t.Fatal("no reference cases")
	}
	for _, c := range r.ClopperPearson {
		lo, hi := shuffle.ClopperPearson(c.K, c.N, c.Level)
		if math.Abs(lo-c.LowPrecise) > 1e-9*math.Max(c.LowPrecise, 1e-6) || math.Abs(hi-c.HighPrecise) > 1e-9*c.HighPrecise {
			t.Errorf("k=%d n=%d: [%v, %v], reference [%v, %v]", c.K, c.N, lo, hi, c.LowPrecise, c.HighPrecise)
		}
	}
}

// Fisher's tea-tasting experiment through the group machinery: the outcome
// is the taster's call (1 = "milk first"), the groups are the true pourings.
// All eight called right gives p = 1/70 one-sided (Fisher 1935; scipy's
// fisher_exact agrees).
func TestTeaTastingThroughGroups(t *testing.T) {
	r := loadScipy(t)
	d := twoSample(t, []float64{1, 1, 1, 1}, []float64{0, 0, 0, 0})
	res := exactTest(t, d, groups.DiffMeans, shuffle.Greater)
	want := float64(r.Fisher.Fraction[0]) / float64(r.Fisher.Fraction[1])
	if res.Permutations != 70 || math.Abs(res.PValue-want) > 1e-15 {
		t.Fatalf("p %v over %d arrangements, want %v over 70", res.PValue, res.Permutations, want)
	}
}
