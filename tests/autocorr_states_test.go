package tests

import (
	"math"
	"testing"

	gspatial "gonum.org/v1/gonum/stat/spatial"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/rates"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// autocorrRefs mirrors testdata/scipy/autocorr_refs.json, made by
// testdata/scipy/make_autocorr_refs.py with Debian's python3-numpy 1.24.2
// from the states layer and the vega-datasets copy of per-state population
// and engineer counts (testdata/README-autocorr.md).
type autocorrRefs struct {
	IDs         []string    `json:"ids"`
	QueenPairs  [][2]string `json:"queen_pairs"`
	CentroidLat []float64   `json:"centroid_lat"`
	EB          struct {
		Events, Population, Rates, Scores []float64
		MeanRate                          float64 `json:"mean_rate"`
		Between                           float64 `json:"between_variance"`
		Floored                           []int
		MoranBinary                       float64 `json:"moran_binary"`
		MoranRow                          float64 `json:"moran_row"`
		MoranRawRow                       float64 `json:"moran_raw_rates_row"`
	} `json:"eb"`
	Stats map[string]struct {
		GearysC   float64 `json:"gearys_c"`
		GearyVarN float64 `json:"geary_var_normality"`
		GearyVarR float64 `json:"geary_var_randomisation"`
		G         float64 `json:"general_g"`
		GExpected float64 `json:"general_g_expected"`
		GVariance float64 `json:"general_g_variance"`
		MoransI   float64 `json:"morans_i"`
	} `json:"stats"`
	Joins struct {
		North             []int32
		Joins, BB, WW, BW int
		BBExpected        float64 `json:"bb_expected"`
		BBVariance        float64 `json:"bb_variance"`
		WWExpected        float64 `json:"ww_expected"`
		WWVariance        float64 `json:"ww_variance"`
		BWExpected        float64 `json:"bw_expected"`
		BWVariance        float64 `json:"bw_variance"`
	} `json:"joins"`
	Bounds map[string]struct{ Min, Max float64 } `json:"bounds"`
}

func loadAutocorrRefs(t *testing.T) *autocorrRefs {
	t.Helper()
	var r autocorrRefs
	testkit.LoadJSON(t, "scipy/autocorr_refs.json", &r)
	return &r
}

func relClose(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(math.Abs(b), 1e-300)
}

// Empirical-Bayes standardised Moran's I (Assunção & Reis 1999) of the
// share of each state's population working as engineers (real open data:
// population and engineer share per state from the npm package
// vega-datasets 3.2.1, US government data), against a direct numpy
// computation of the published formulas, binary and row-standardised queen
// weights, to 1e-12.
func TestStatesEBMoranAgainstNumpy(t *testing.T) {
	r := loadAutocorrRefs(t)
	g := statesQueen(t, r)
	for _, c := range []struct {
		w    *weights.Graph
		want float64
	}{{g, r.EB.MoranBinary}, {g.RowStandardised(), r.EB.MoranRow}} {
		res, err := autocorr.EBMoran(r.EB.Events, r.EB.Population, c.w, shuffle.Plan{Permutations: 999, Seed: 1, Alternative: shuffle.Greater})
		if err != nil {
			t.Fatal(err)
		}
		if !relClose(res.Moran.MoransI, c.want, 1e-12) {
			t.Errorf("%s: EB Moran %v, numpy %v", c.w.Scaling, res.Moran.MoransI, c.want)
		}
		if !relClose(res.Mean, r.EB.MeanRate, 1e-13) || !relClose(res.Between, r.EB.Between, 1e-12) || len(res.Floored) != len(r.EB.Floored) {
			t.Errorf("b %v (numpy %v), a %v (numpy %v), floored %v (numpy %v)", res.Mean, r.EB.MeanRate, res.Between, r.EB.Between, res.Floored, r.EB.Floored)
		}
		for i := range res.Scores {
			if !relClose(res.Scores[i], r.EB.Scores[i], 1e-12) || !relClose(res.Rates[i], r.EB.Rates[i], 1e-14) {
				t.Errorf("%s: score %v numpy %v, rate %v numpy %v", r.IDs[i], res.Scores[i], r.EB.Scores[i], res.Rates[i], r.EB.Rates[i])
			}
		}
		if n := float64(c.w.Len()); res.Moran.Expected != -1/(n-1) {
			t.Errorf("E[I] %v", res.Moran.Expected)
		}
		t.Logf("%s: EB Moran %.6f, one-sided permutation p %.4f", c.w.Scaling, res.Moran.MoransI, res.Moran.Permutation.PValue)
	}
	raw, err := rates.Raw(r.EB.Events, r.EB.Population)
	if err != nil {
		t.Fatal(err)
	}
	if i, _ := autocorr.MoransI(raw, g.RowStandardised()); !relClose(i, r.EB.MoranRawRow, 1e-12) {
		t.Errorf("raw rates: I %v, numpy %v", i, r.EB.MoranRawRow)
	}
}

// Geary's C with both variances, General G with its moments, and Moran's I
// of the centroid latitude of the states against dense numpy computations
// of the published formulas (Geary 1954; Cliff & Ord 1981; Getis & Ord
// 1992); the bounds of Moran's I against numpy.linalg.eigh of M W* M
// (de Jong, Sprenger & van Veen 1984).
func TestStatesGlobalStatisticsAgainstNumpy(t *testing.T) {
	r := loadAutocorrRefs(t)
	g := statesQueen(t, r)
	x := r.CentroidLat
	for name, w := range map[string]*weights.Graph{"binary": g, "row": g.RowStandardised()} {
		want := r.Stats[name]
		gt, err := autocorr.RunGeary(x, w, shuffle.Plan{Permutations: 999, Seed: 2, Alternative: shuffle.Less})
		if err != nil {
			t.Fatal(err)
		}
		if !relClose(gt.GearysC, want.GearysC, 1e-12) || !relClose(gt.VarianceNormality, want.GearyVarN, 1e-12) || !relClose(gt.VarianceRandomisation, want.GearyVarR, 1e-12) {
			t.Errorf("%s: Geary %v %v %v, numpy %v %v %v", name, gt.GearysC, gt.VarianceNormality, gt.VarianceRandomisation, want.GearysC, want.GearyVarN, want.GearyVarR)
		}
		if gt.Permutation.PValue != 1.0/1000 {
			t.Errorf("%s: latitude C %v p %v, expected strong clustering", name, gt.GearysC, gt.Permutation.PValue)
		}
		gg, err := autocorr.RunGeneralG(x, w, shuffle.Plan{Permutations: 99, Seed: 3})
		if err != nil {
			t.Fatal(err)
		}
		if !relClose(gg.G, want.G, 1e-12) || !relClose(gg.Expected, want.GExpected, 1e-13) || !relClose(gg.VarianceRandomisation, want.GVariance, 1e-11) {
			t.Errorf("%s: G %v %v %v, numpy %v %v %v", name, gg.G, gg.Expected, gg.VarianceRandomisation, want.G, want.GExpected, want.GVariance)
		}
		if i, _ := autocorr.MoransI(x, w); !relClose(i, want.MoransI, 1e-12) {
			t.Errorf("%s: I %v numpy %v", name, i, want.MoransI)
		}
		b, err := autocorr.MoranBounds(w)
		if err != nil {
			t.Fatal(err)
		}
		wb := r.Bounds[name]
		if !relClose(b.Min, wb.Min, 1e-10) || !relClose(b.Max, wb.Max, 1e-10) {
			t.Errorf("%s: bounds [%v, %v], numpy [%v, %v]", name, b.Min, b.Max, wb.Min, wb.Max)
		}
	}
}

// Join counts of "centroid north of 39°" on the states' queen joins, with
// their moments under sampling without replacement, against numpy and the
// two-colour formulas of Cliff & Ord (1981) in their S0/S1/S2 form (a route
// independent of ours, itself checked by brute force in the script).
func TestStatesJoinCountsAgainstNumpy(t *testing.T) {
	r := loadAutocorrRefs(t)
	g := statesQueen(t, r)
	j := r.Joins
	res, err := autocorr.RunJoins(j.North, g.RowStandardised(), shuffle.Plan{Permutations: 999, Seed: 4, Alternative: shuffle.Less})
	if err != nil {
		t.Fatal(err)
	}
	if res.Joins != j.Joins || res.Same[1].Joins != j.BB || res.Same[0].Joins != j.WW || res.Different.Joins != j.BW {
		t.Fatalf("joins %d BB %d WW %d BW %d; numpy %d %d %d %d", res.Joins, res.Same[1].Joins, res.Same[0].Joins, res.Different.Joins, j.Joins, j.BB, j.WW, j.BW)
	}
	for _, c := range []struct {
		name       string
		s          autocorr.JoinStat
		mean, vari float64
	}{
		{"BB", res.Same[1].JoinStat, j.BBExpected, j.BBVariance},
		{"WW", res.Same[0].JoinStat, j.WWExpected, j.WWVariance},
		{"BW", res.Different, j.BWExpected, j.BWVariance},
	} {
		if !relClose(c.s.Expected, c.mean, 1e-12) || !relClose(c.s.Variance, c.vari, 1e-12) {
			t.Errorf("%s: moments %v %v, numpy %v %v", c.name, c.s.Expected, c.s.Variance, c.mean, c.vari)
		}
	}
	// North and south are each contiguous blocks: far fewer BW joins than
	// chance.
	if res.Different.Permutation.PValue != 1.0/1000 {
		t.Errorf("BW p %v", res.Different.Permutation.PValue)
	}
}

// Per-state Gi* z-scores (Ord & Getis 1995, self-weight 1) of the centroid
// latitude equal gonum's stat/spatial.GetisOrdGStar with the identity
// added to the queen locality matrix; and Moran's I of the same column
// equals gonum's GlobalMoransI (its variance is not compared: it lacks the
// factor n in the kurtosis term of Cliff & Ord's randomisation variance,
// see spatial/autocorr/moran_test.go).
func TestStatesGiStarAgainstGonum(t *testing.T) {
	r := loadAutocorrRefs(t)
	g := statesQueen(t, r)
	x := r.CentroidLat
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		got, err := autocorr.GiStar(x, w)
		if err != nil {
			t.Fatal(err)
		}
		n := w.Len()
		d := testkit.Dense(w.Offsets, w.Neighbours, w.Weights)
		wantI, _, _ := gspatial.GlobalMoransI(x, nil, d)
		if i, _ := autocorr.MoransI(x, w); math.Abs(i-wantI) > 1e-12 {
			t.Errorf("%s: I %v gonum %v", w.Scaling, i, wantI)
		}
		for i := 0; i < n; i++ {
			d.Set(i, i, 1)
		}
		for i := range got {
			want := gspatial.GetisOrdGStar(i, x, nil, d)
			if math.Abs(got[i]-want) > 1e-12 {
				t.Errorf("%s: Gi* of %s %v, gonum %v", w.Scaling, r.IDs[i], got[i], want)
			}
		}
	}
}

// The correlogram of latitude over contiguity orders 1–4: strongly
// positive at order 1 and falling with every order, each order's I inside
// the de Jong bounds of its own graph, and the four p-values adjusted by
// Holm stay at or above the raw ones.
func TestStatesCorrelogram(t *testing.T) {
	r := loadAutocorrRefs(t)
	g := statesQueen(t, r)
	graphs, err := autocorr.LagGraphs(g, 4, weights.RowStandardised)
	if err != nil {
		t.Fatal(err)
	}
	lags, err := autocorr.Correlogram(r.CentroidLat, graphs, shuffle.Plan{Permutations: 999, Seed: 5})
	if err != nil {
		t.Fatal(err)
	}
	if lags[0].Pairs != 109 { // testdata/README.md: 109 queen pairs
		t.Errorf("order 1 has %d pairs", lags[0].Pairs)
	}
	var p []float64
	for k, l := range lags {
		b, err := autocorr.MoranBounds(graphs[k])
		if err != nil {
			t.Fatal(err)
		}
		if l.MoransI < b.Min || l.MoransI > b.Max {
			t.Errorf("order %d: I %v outside [%v, %v]", l.Order, l.MoransI, b.Min, b.Max)
		}
		if k > 0 && l.MoransI >= lags[k-1].MoransI {
			t.Errorf("order %d: I %v not below order %d's %v", l.Order, l.MoransI, k, lags[k-1].MoransI)
		}
		p = append(p, l.Permutation.PValue)
		t.Logf("order %d: %d pairs, I %.4f, p %.4f", l.Order, l.Pairs, l.MoransI, l.Permutation.PValue)
	}
	if lags[0].MoransI < 0.6 {
		t.Errorf("order 1 I %v", lags[0].MoransI)
	}
	for k, a := range shuffle.Adjust(p, shuffle.Holm) {
		if a < p[k] {
			t.Errorf("adjusted %v below raw %v", a, p[k])
		}
	}
}
