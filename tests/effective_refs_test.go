package tests

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/effective"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// effModifiedRef is one modified t-test computed by
// testdata/scipy/make_effective_refs.py with dense numpy matrices from the
// published expressions (Clifford, Richardson & Hémon 1989; Dutilleul 1993).
type effModifiedRef struct {
	Case     string     `json:"case"`
	N        int        `json:"n"`
	Edges    [][2]int32 `json:"edges"`
	IDs      []string   `json:"ids"`
	Y        []float64  `json:"y"`
	X        []float64  `json:"x"`
	MaxOrder int        `json:"max_order"`
	Orders   []struct {
		Order   int
		Pairs   int64
		Outcome float64
		Group   float64
	} `json:"orders"`
	Correlation  float64 `json:"correlation"`
	Variance     float64 `json:"correlation_variance"`
	NEff         float64 `json:"effective_sample_size"`
	Capped       bool    `json:"capped"`
	T            float64 `json:"t"`
	DF           float64 `json:"df"`
	PTwoSided    float64 `json:"p_two_sided"`
	PGreater     float64 `json:"p_greater"`
	OrdinaryT    float64 `json:"ordinary_t"`
	OrdinaryPTwo float64 `json:"ordinary_p_two_sided"`
}

type effRefs struct {
	Versions map[string]string `json:"versions"`
	Modified []effModifiedRef  `json:"modified_t"`
	States   effModifiedRef    `json:"states_modified_t"`
	PartialF []struct {
		Case       string      `json:"case"`
		Y          []float64   `json:"y"`
		Covariates [][]float64 `json:"covariates"`
		Labels     []int32     `json:"labels"`
		K          int         `json:"k"`
		F          float64     `json:"f"`
		P          float64     `json:"p"`
		DFGroups   int         `json:"df_groups"`
		DFResidual int         `json:"df_residual"`
		T          *float64    `json:"t"`
		TP         float64     `json:"t_p_two_sided"`
	} `json:"partial_f"`
}

func loadEffRefs(t *testing.T) *effRefs {
	t.Helper()
	var r effRefs
	testkit.LoadJSON(t, "scipy/effective_refs.json", &r)
	return &r
}

// effCheck runs the modified t-test on a reference case and compares every
// number: the correlogram to 1e-12, σ²_r, n_eff, t and df to relative
// 1e-10, p-values to 1e-12.
func effCheck(t *testing.T, c effModifiedRef, g *weights.Graph) {
	t.Helper()
	for _, alt := range []shuffle.Alternative{shuffle.TwoSided, shuffle.Greater} {
		res, err := effective.Test(c.Y, c.X, g, effective.Options{MaxOrder: c.MaxOrder, Alternative: alt})
		if err != nil {
			t.Fatal(err)
		}
		if len(res.Orders) != len(c.Orders) {
			t.Fatalf("%d orders, reference %d", len(res.Orders), len(c.Orders))
		}
		for k, o := range c.Orders {
			got := res.Orders[k]
			if got.Order != o.Order || got.Pairs != o.Pairs || math.Abs(got.Outcome-o.Outcome) > 1e-12 || math.Abs(got.Group-o.Group) > 1e-12 {
				t.Fatalf("order %d: %+v, reference %+v", o.Order, got, o)
			}
		}
		want := c.PTwoSided
		if alt == shuffle.Greater {
			want = c.PGreater
		}
		if !relClose(res.CorrelationVariance, c.Variance, 1e-10) || !relClose(res.EffectiveSampleSize, c.NEff, 1e-10) ||
			res.Capped != c.Capped || !relClose(res.T, c.T, 1e-10) || !relClose(res.DF, c.DF, 1e-10) ||
			math.Abs(res.PValue-want) > 1e-12 || math.Abs(res.Correlation-c.Correlation) > 1e-13 ||
			!relClose(res.OrdinaryT, c.OrdinaryT, 1e-12) {
			t.Fatalf("%v: got n_eff %.12g σ² %.12g t %.12g df %.12g p %.12g capped %v r %.15g;\nreference n_eff %.12g σ² %.12g t %.12g df %.12g p %.12g capped %v r %.15g",
				alt, res.EffectiveSampleSize, res.CorrelationVariance, res.T, res.DF, res.PValue, res.Capped, res.Correlation,
				c.NEff, c.Variance, c.T, c.DF, want, c.Capped, c.Correlation)
		}
		if alt == shuffle.TwoSided && math.Abs(res.OrdinaryPValue-c.OrdinaryPTwo) > 1e-12 {
			t.Fatalf("ordinary p %v, reference %v", res.OrdinaryPValue, c.OrdinaryPTwo)
		}
	}
}

// The modified t-test against numpy/scipy computations of the published
// expressions: lattice, irregular graph with an island and two groups of
// linked areas, a capped case.
func TestModifiedTTestAgainstNumpy(t *testing.T) {
	r := loadEffRefs(t)
	for _, c := range r.Modified {
		t.Run(c.Case, func(t *testing.T) {
			g, err := weights.FromLinks(c.N, c.Edges, c.Case)
			if err != nil {
				t.Fatal(err)
			}
			effCheck(t, c, g)
		})
	}
}

// Real open data: the share of each state's population working as
// engineers (vega-datasets, US government data) against "centroid north of
// 39°", on the queen graph of the 49 states with a neighbour — built by
// areatest from the Census Bureau boundaries and checked against the pairs
// the reference script found by shared vertices.
func TestModifiedTTestStatesAgainstNumpy(t *testing.T) {
	r := loadEffRefs(t)
	c := r.States
	g := statesQueen(t, loadAutocorrRefs(t))
	if g.Len() != c.N {
		t.Fatalf("%d states, reference %d", g.Len(), c.N)
	}
	ref, err := weights.FromLinks(c.N, c.Edges, "reference")
	if err != nil {
		t.Fatal(err)
	}
	if !contigSameLinks(g, ref) {
		t.Fatal("the queen graph differs from the reference pairs")
	}
	effCheck(t, c, g)
	res, _ := effective.Test(c.Y, c.X, g, effective.Options{})
	t.Logf("states: r = %.3f, n_eff = %.1f of 49 over %d orders, p = %.3f (ordinary %.3f)",
		res.Correlation, res.EffectiveSampleSize, len(res.Orders), res.PValue, res.OrdinaryPValue)
}

// The classical partial F (and t) that Freedman–Lane's observed statistic
// and its classical p-value reproduce, against statsmodels OLS fits.
func TestPartialFAgainstStatsmodels(t *testing.T) {
	r := loadEffRefs(t)
	for _, c := range r.PartialF {
		t.Run(c.Case, func(t *testing.T) {
			fl, err := shuffle.NewFreedmanLane(c.Y, c.Covariates, c.Labels, c.K)
			if err != nil {
				t.Fatal(err)
			}
			F, p := fl.PartialF()
			dg, dr := fl.DF()
			if !relClose(F, c.F, 1e-10) || math.Abs(p-c.P) > 1e-12 || dg != c.DFGroups || dr != c.DFResidual {
				t.Fatalf("F = %.15g p = %.15g df (%d, %d); statsmodels F = %.15g p = %.15g df (%d, %d)", F, p, dg, dr, c.F, c.P, c.DFGroups, c.DFResidual)
			}
			if c.T == nil {
				return
			}
			tv, tp, err := fl.ClassicalT(shuffle.TwoSided)
			if err != nil {
				t.Fatal(err)
			}
			if !relClose(tv, *c.T, 1e-10) || math.Abs(tp-c.TP) > 1e-12 {
				t.Fatalf("t = %.15g p = %.15g; statsmodels t = %.15g p = %.15g", tv, tp, *c.T, c.TP)
			}
			tf, _ := fl.TFactory()
			if obs := tf()(fl.Labels()); !relClose(obs, *c.T, 1e-10) {
				t.Fatalf("evaluator's observed t %v, statsmodels %v", obs, *c.T)
			}
		})
	}
}
