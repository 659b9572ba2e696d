package tests

import (
	"math"
	"testing"

	gspatial "gonum.org/v1/gonum/stat/spatial"

	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// The eigenbasis of the states' queen graph (49 states with a neighbour:
// the 48 contiguous and DC) against numpy.linalg.eigh of M W* M
// (testdata/scipy/make_autocorr_refs.py, Debian's python3-numpy 1.24.2):
// the largest and smallest eigenvalues, scaled by n/S0, are the bounds of
// Moran's I the script stored (de Jong, Sprenger & van Veen 1984), for
// binary and row-standardised weights, to 1e-10.
func TestSurrogateStatesEigenvaluesAgainstNumpy(t *testing.T) {
	r := loadAutocorrRefs(t)
	g := statesQueen(t, r)
	for name, w := range map[string]*weights.Graph{"binary": g, "row": g.RowStandardised()} {
		b, err := surrogate.NewBasis(w, surrogate.Options{})
		if err != nil {
			t.Fatal(err)
		}
		v := b.Values()
		lo, hi := b.MoranScale()*v[len(v)-1], b.MoranScale()*v[0]
		want := r.Bounds[name]
		if !relClose(lo, want.Min, 1e-10) || !relClose(hi, want.Max, 1e-10) {
			t.Errorf("%s: eigenvalues give [%v, %v], numpy [%v, %v]", name, lo, hi, want.Min, want.Max)
		}
		if info := b.Info(); info.Method != "dense" || info.Vectors != 48 || info.Islands != 0 {
			t.Errorf("%s: %+v", name, info)
		}
	}
}

// Moran's I of every spectral surrogate of the states' centroid latitude,
// computed by gonum's stat/spatial.GlobalMoransI (an outside
// implementation of Moran 1950), equals the latitude's own to 1e-9 (Wagner &
// Dray 2015), and the mean and variance hold to 1e-12; binary and
// row-standardised weights.
func TestSurrogateStatesMoranAgainstGonum(t *testing.T) {
	r := loadAutocorrRefs(t)
	g := statesQueen(t, r)
	x := r.CentroidLat
	n := len(x)
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		d := testkit.Dense(w.Offsets, w.Neighbours, w.Weights)
		want, _, _ := gspatial.GlobalMoransI(x, nil, d)
		b, err := surrogate.NewBasis(w, surrogate.Options{})
		if err != nil {
			t.Fatal(err)
		}
		o, err := b.Prepare(x)
		if err != nil {
			t.Fatal(err)
		}
		m0, v0 := testkit.MeanVar(x)
		s := b.NewScratch()
		y := make([]float64, n)
		rng := shuffle.NewStream(7, 7, 0)
		var worst float64
		for k := 0; k < 100; k++ {
			o.Draw(&rng, y, s)
			got, _, _ := gspatial.GlobalMoransI(y, nil, d)
			worst = math.Max(worst, math.Abs(got-want))
			m, v := testkit.MeanVar(y)
			if math.Abs(m-m0) > 1e-12*math.Abs(m0) || math.Abs(v-v0) > 1e-12*v0 {
				t.Fatalf("%s: draw %d has mean %v and variance %v, the latitude %v and %v", w.Scaling, k, m, v, m0, v0)
			}
		}
		if worst > 1e-9 {
			t.Errorf("%s: Moran's I of the latitude %v (gonum); surrogates differ by up to %g", w.Scaling, want, worst)
		}
		t.Logf("%s: Moran's I %.6f (gonum), worst surrogate difference %.2g", w.Scaling, want, worst)
	}
}

// wholeStates is the setup shared by the tests on the whole layer (the
// states, DC and five territories): its row-standardised queen graph, the
// spectral basis of that graph, and the centroid latitude prepared in it.
type wholeStates struct {
	l     *layer.Layer
	queen *weights.Graph
	b     *surrogate.Basis
	lat   []float64
	o     *surrogate.Outcome
}

func prepareWholeStates(t *testing.T) wholeStates {
	t.Helper()
	l := loadStates(t)
	queen, err := weights.ContiguityGraph(l.Geoms, weights.Queen)
	if err != nil {
		t.Fatal(err)
	}
	lat, err := l.Column("centroid_lat")
	if err != nil {
		t.Fatal(err)
	}
	b, err := surrogate.NewBasis(queen.RowStandardised(), surrogate.Options{})
	if err != nil {
		t.Fatal(err)
	}
	o, err := b.Prepare(lat.Num)
	if err != nil {
		t.Fatal(err)
	}
	return wholeStates{l: l, queen: queen, b: b, lat: lat.Num, o: o}
}

// On the whole layer Alaska, Hawaii and the territories have no neighbour
// (common knowledge, no source): the basis sets them apart, and a
// surrogate gives them their own values in a random order.
func TestSurrogateStatesIslands(t *testing.T) {
	ws := prepareWholeStates(t)
	l, b, o, y := ws.l, ws.b, ws.o, ws.lat
	isl := map[string]bool{}
	for _, i := range b.Islands() {
		isl[l.IDs[i]] = true
	}
	if len(isl) != len(ws.queen.Islands()) || !isl["02"] || !isl["15"] {
		t.Fatalf("islands %v, want Alaska (02), Hawaii (15) and the graph's other islands", isl)
	}
	own := map[float64]int{}
	for _, i := range b.Islands() {
		own[y[i]]++
	}
	s := b.NewScratch()
	out := make([]float64, len(y))
	rng := shuffle.NewStream(3, 3, 0)
	moved := 0
	for k := 0; k < 200; k++ {
		o.Draw(&rng, out, s)
		got := map[float64]int{}
		for _, i := range b.Islands() {
			got[out[i]]++
			if out[i] != y[i] {
				moved++
			}
		}
		if len(got) != len(own) {
			t.Fatalf("islands got %v, not their own values %v", got, own)
		}
		for v, c := range own {
			if got[v] != c {
				t.Fatalf("islands got %v, not their own values %v", got, own)
			}
		}
	}
	if moved == 0 {
		t.Error("island values never move")
	}
}

// The spectral test of the difference in mean latitude between east and
// west on the whole layer runs through the shuffle machinery, and its null
// is wider than the free shuffle's: latitude clusters, and so does any
// grouping drawn on the map.
func TestSurrogateStatesEastWest(t *testing.T) {
	ws := prepareWholeStates(t)
	o, y := ws.o, ws.lat
	lon, err := ws.l.Column("centroid_lon")
	if err != nil {
		t.Fatal(err)
	}
	// Grouping: east of 95° W (A) and west of it, the Pacific
	// territories (east longitudes) with the west; outcome: latitude.
	lab := make([]int32, len(y))
	for i, v := range lon.Num {
		if v < -95 || v > 0 {
			lab[i] = 1
		}
	}
	d, err := groups.Prepare(y, lab, 2)
	if err != nil {
		t.Fatal(err)
	}
	observed := d.Observed(groups.DiffMeans)
	scale := d.Y[len(d.Y)-1] - d.Y[0]
	free, err := shuffle.Run(shuffle.Plan{Scheme: "free", Labels: d.Labels, Permutations: 9999, Seed: 1, Purpose: 1, Scale: scale}, d.Factory(groups.DiffMeans))
	if err != nil {
		t.Fatal(err)
	}
	gs, err := compare.NewGroupStatistic(groups.DiffMeans, lab, 2)
	if err != nil {
		t.Fatal(err)
	}
	if v := gs.Value(y); v != observed {
		t.Fatalf("surrogate evaluator %v, groups %v", v, observed)
	}
	spec, err := compare.GroupTest(o, gs, observed, shuffle.SurrogatePlan{Scheme: "spectral", Draws: 999, Seed: 1, Purpose: 3, Scale: scale})
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("east − west mean latitude %.3f°: free p %.4f, spectral p %.4f (null sd %.3f vs %.3f)", observed, free.PValue, spec.PValue, spec.NullSD, free.NullSD)
	if !(spec.NullSD > free.NullSD) {
		t.Errorf("spectral null sd %v not above the free shuffle's %v", spec.NullSD, free.NullSD)
	}
}
