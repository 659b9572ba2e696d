package tests

import (
	"encoding/json"
	"math"
	"testing"

	gspatial "gonum.org/v1/gonum/stat/spatial"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// localRefs mirrors testdata/scipy/local_refs.json, made by
// testdata/scipy/make_local_refs.py with Debian's python3-numpy 1.24.2
// (testdata/README-local.md).
type localRefs struct {
	Tiny struct {
		Pairs   [][2]int32                               `json:"pairs"`
		X       []float64                                `json:"x"`
		Y       []float64                                `json:"y"`
		Weights map[string]map[string][]exactConditional `json:"weights"`
	} `json:"tiny"`
	States struct {
		IDs         []string                              `json:"ids"`
		CentroidLat []float64                             `json:"centroid_lat"`
		EBRates     []float64                             `json:"eb_rates"`
		Weights     map[string]map[string]json.RawMessage `json:"weights"`
	} `json:"states"`
}

type exactConditional struct {
	Observed  float64 `json:"observed"`
	Fillings  int     `json:"fillings"`
	Ordered   bool    `json:"ordered"`
	AtLeast   int     `json:"at_least"`
	AtMost    int     `json:"at_most"`
	Mean      float64 `json:"mean"`
	SD        float64 `json:"sd"`
	PFolded   float64 `json:"p_folded"`
	PGreater  float64 `json:"p_greater"`
	PLess     float64 `json:"p_less"`
	PTwoSided float64 `json:"p_two_sided"`
}

func loadLocalRefs(t *testing.T) *localRefs {
	t.Helper()
	var r localRefs
	testkit.LoadJSON(t, "scipy/local_refs.json", &r)
	return &r
}

var refKinds = map[string]local.Kind{
	"moran": local.Moran, "bivariate": local.CrossMoran, "geary": local.Geary,
	"gi": local.Gi, "gistar": local.GiStar,
}

func localClose(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}

// On the US states layer (the 49 states with a queen neighbour; centroid
// latitude, and the empirical-Bayes engineer rate as the second variable of
// the cross form), every local statistic equals numpy's dense
// computation from the published formulas (testdata/scipy/local_refs.json),
// and Σ_i I_i = S0 · I (Anselin 1995, the sum identity after eq. 12) with I
// from gonum's stat/spatial.GlobalMoransI, for binary and
// row-standardised weights.
func TestLocalStatesAgainstNumpy(t *testing.T) {
	ac := loadAutocorrRefs(t)
	lr := loadLocalRefs(t)
	b := statesQueen(t, ac)
	x, y := lr.States.CentroidLat, lr.States.EBRates
	if len(x) != b.Len() || len(y) != b.Len() {
		t.Fatalf("%d and %d values for %d states", len(x), len(y), b.Len())
	}
	for name, g := range map[string]*weights.Graph{"binary": b, "row": b.RowStandardised()} {
		refs := lr.States.Weights[name]
		for key, kind := range refKinds {
			var want []float64
			if err := json.Unmarshal(refs[key], &want); err != nil {
				t.Fatal(err)
			}
			var yy []float64
			if kind == local.CrossMoran {
				yy = y
			}
			got, err := local.Statistic(kind, x, yy, g)
			if err != nil {
				t.Fatal(err)
			}
			for i := range got {
				if !localClose(got[i], want[i], 1e-11) {
					t.Errorf("%s %s: %s %v, numpy %v", name, kind, ac.IDs[i], got[i], want[i])
				}
			}
		}
		li, _ := local.Statistic(local.Moran, x, nil, g)
		var sum, s0 float64
		for _, v := range li {
			sum += v
		}
		for _, v := range g.Weights {
			s0 += v
		}
		n := g.Len()
		d := testkit.Dense(g.Offsets, g.Neighbours, g.Weights)
		I, _, _ := gspatial.GlobalMoransI(x, nil, d)
		if !localClose(sum, s0*I, 1e-12) {
			t.Errorf("%s: Σ I_i %v, S0·I %v (S0 %v)", name, sum, s0*I, s0)
		}
		if name == "row" && !localClose(s0, float64(n), 1e-12) {
			t.Errorf("row-standardised S0 %v, want n = %d", s0, n)
		}
	}
}

// Per-state Gi* z-scores of the centroid latitude equal gonum's
// stat/spatial.GetisOrdGStar with 1 added on the diagonal of the binary
// queen locality matrix (Ord & Getis 1995: Gi* counts the area in its own
// neighbourhood), and autocorr.GiStar.
func TestLocalStatesGiStarAgainstGonum(t *testing.T) {
	ac := loadAutocorrRefs(t)
	g := statesQueen(t, ac)
	x := ac.CentroidLat
	got, err := local.Statistic(local.GiStar, x, nil, g)
	if err != nil {
		t.Fatal(err)
	}
	ours, err := autocorr.GiStar(x, g)
	if err != nil {
		t.Fatal(err)
	}
	d := testkit.Dense(g.Offsets, g.Neighbours, g.Weights)
	for i := 0; i < g.Len(); i++ {
		d.Set(i, i, 1)
	}
	for i := range got {
		want := gspatial.GetisOrdGStar(i, x, nil, d)
		if !localClose(got[i], want, 1e-12) || !localClose(got[i], ours[i], 1e-12) {
			t.Errorf("Gi* of %s %v, gonum %v, autocorr %v", ac.IDs[i], got[i], want, ours[i])
		}
	}
	// Latitude is smooth: the northernmost states sit in a high cluster.
	res, err := local.Run(local.GiStar, x, nil, g, local.Options{Permutations: 999, Seed: 1, Alternative: shuffle.Folded})
	if err != nil {
		t.Fatal(err)
	}
	for i, r := range res {
		if ac.IDs[i] == "38" && r.Category != local.HighCluster { // North Dakota
			t.Errorf("North Dakota: %q (Gi* %v, p %v)", r.Category, r.Statistic, r.P)
		}
	}
}

// On the eight-area layer, areatest's exact conditional enumeration gives
// numpy/itertools' counts, mean, standard deviation and p-values under
// every alternative (testdata/scipy/local_refs.json), for every kind and
// for binary, row-standardised and unequal weights (the last enumerated
// over ordered fillings).
func TestLocalExactAgainstNumpy(t *testing.T) {
	lr := loadLocalRefs(t)
	b, err := weights.FromLinks(len(lr.Tiny.X), lr.Tiny.Pairs, "tiny")
	if err != nil {
		t.Fatal(err)
	}
	var links []weights.Link
	for i := 0; i < b.Len(); i++ {
		nb, _ := b.Row(i)
		for _, j := range nb {
			links = append(links, weights.Link{From: int32(i), To: j, Weight: 1 / (1 + math.Abs(float64(i-int(j))))})
		}
	}
	u, err := weights.FromEntries(b.Len(), links, "tiny", "unequal")
	if err != nil {
		t.Fatal(err)
	}
	graphs := map[string]*weights.Graph{"binary": b, "row": b.RowStandardised(), "unequal": u}
	alts := []shuffle.Alternative{shuffle.Folded, shuffle.Greater, shuffle.Less, shuffle.TwoSided}
	for name, g := range graphs {
		for key, kind := range refKinds {
			refs := lr.Tiny.Weights[name][key]
			var y []float64
			if kind == local.CrossMoran {
				y = lr.Tiny.Y
			}
			for _, alt := range alts {
				res, err := local.Run(kind, lr.Tiny.X, y, g, local.Options{Alternative: alt})
				if err != nil {
					t.Fatal(err)
				}
				for i, r := range res {
					ref := refs[i]
					want := map[shuffle.Alternative]float64{shuffle.Folded: ref.PFolded, shuffle.Greater: ref.PGreater,
						shuffle.Less: ref.PLess, shuffle.TwoSided: ref.PTwoSided}[alt]
					if !r.Exact || r.Permutations != ref.Fillings || !localClose(r.P, want, 1e-14) ||
						!localClose(r.Statistic, ref.Observed, 1e-12) ||
						!localClose(r.Expected, ref.Mean, 1e-12) || !localClose(r.SD, ref.SD, 1e-10) {
						t.Errorf("%s %s %s area %d: exact %v over %d, stat %v p %v mean %v sd %v; numpy %d, %v, %v, %v, %v",
							name, kind, alt.String(), i, r.Exact, r.Permutations, r.Statistic, r.P,
							r.Expected, r.SD, ref.Fillings, ref.Observed, want, ref.Mean, ref.SD)
					}
				}
			}
		}
	}
}
