package tests

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/rates"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// ratesRefs are the values of testdata/scipy/make_rates_refs.py (numpy,
// written independently from the published formulas) for the engineers
// of the 49 linked states, as counted and shrunk 2,000-fold.
type ratesRefs struct {
	IDs        []string    `json:"ids"`
	Group      []int32     `json:"group"`
	QueenPairs [][2]string `json:"queen_pairs"`
	States     ratesCase   `json:"states"`
	Small      ratesCase   `json:"small"`
}

type ratesCase struct {
	Events, Population, Raw []float64
	Pooled                  []rates.Pooled
	Ratio, Difference       float64
	MapRate                 float64   `json:"map_rate"`
	Between                 float64   `json:"between_variance"`
	GlobalEB                []float64 `json:"global_eb"`
	SpatialEB               []float64 `json:"spatial_eb"`
	EBScores                []float64 `json:"eb_scores"`
}

// Pooled rates, their ratio and difference, the global and spatial
// empirical-Bayes smoothed rates (Marshall 1991) and the standardised
// rates (Assunção & Reis 1999) of spatial/rates equal numpy's on real
// state counts, to 1e-12 relative, for large counts and for small ones
// (where the shrinkage shows).
func TestRatesAgainstNumpy(t *testing.T) {
	var ref ratesRefs
	testkit.LoadJSON(t, "scipy/rates_refs.json", &ref)
	at := map[string]int32{}
	for k, id := range ref.IDs {
		at[id] = int32(k)
	}
	var pairs [][2]int32
	for _, p := range ref.QueenPairs {
		pairs = append(pairs, [2]int32{at[p[0]], at[p[1]]})
	}
	g, err := weights.FromLinks(len(ref.IDs), pairs, "queen contiguity")
	if err != nil {
		t.Fatal(err)
	}
	for name, c := range map[string]ratesCase{"states": ref.States, "small": ref.Small} {
		raw, err := rates.Raw(c.Events, c.Population)
		if err != nil {
			t.Fatal(err)
		}
		closeAll(t, name+" raw", raw, c.Raw)
		pooled, err := rates.Pool(c.Events, c.Population, ref.Group, 2)
		if err != nil {
			t.Fatal(err)
		}
		for k := range pooled {
			if pooled[k].Areas != c.Pooled[k].Areas || pooled[k].Events != c.Pooled[k].Events || !relClose(pooled[k].Rate, c.Pooled[k].Rate, 1e-12) {
				t.Errorf("%s: pooled %d = %+v, numpy %+v", name, k, pooled[k], c.Pooled[k])
			}
		}
		if r, d := rates.Ratio(pooled[0], pooled[1]), rates.Difference(pooled[0], pooled[1]); !relClose(r, c.Ratio, 1e-12) || !relClose(d, c.Difference, 1e-12) {
			t.Errorf("%s: ratio %v difference %v, numpy %v %v", name, r, d, c.Ratio, c.Difference)
		}
		global, err := rates.GlobalEB(c.Events, c.Population)
		if err != nil {
			t.Fatal(err)
		}
		closeAll(t, name+" global EB", global, c.GlobalEB)
		spatial, alone, err := rates.SpatialEB(c.Events, c.Population, g)
		if err != nil || len(alone) != 0 {
			t.Fatal(err, alone)
		}
		closeAll(t, name+" spatial EB", spatial, c.SpatialEB)
		eb, err := rates.EBStandardise(c.Events, c.Population)
		if err != nil {
			t.Fatal(err)
		}
		closeAll(t, name+" EB scores", eb.Scores, c.EBScores)
		if !relClose(eb.Mean, c.MapRate, 1e-12) || !relClose(eb.Between, c.Between, 1e-12) {
			t.Errorf("%s: b %v a %v, numpy %v %v", name, eb.Mean, eb.Between, c.MapRate, c.Between)
		}
	}
	// The small counts shrink visibly: the smallest state's smoothed rate
	// moves towards the map's rate.
	if d := math.Abs(ref.Small.GlobalEB[0] - ref.Small.Raw[0]); d < 1e-4 {
		t.Errorf("little shrinkage in the small case: %v", d)
	}
}

func closeAll(t *testing.T, what string, got, want []float64) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%s: %d values, numpy %d", what, len(got), len(want))
	}
	for i := range want {
		if !relClose(got[i], want[i], 1e-12) {
			t.Errorf("%s[%d] = %.17g, numpy %.17g", what, i, got[i], want[i])
			return
		}
	}
}
