package tests

import (
	"math"
	"testing"

	gspatial "gonum.org/v1/gonum/stat/spatial"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// Facts of common knowledge, no source: Arizona and Colorado meet only at
// the Four Corners point, as do Utah and New Mexico, so they are queen but not
// rook neighbours; Missouri and Tennessee each border eight states; Maine
// borders one (New Hampshire); Alaska and Hawaii border none.
func TestStatesContiguity(t *testing.T) {
	l := loadStates(t)
	queen, err := weights.ContiguityGraph(l.Geoms, weights.Queen)
	if err != nil {
		t.Fatal(err)
	}
	rook, err := weights.ContiguityGraph(l.Geoms, weights.Rook)
	if err != nil {
		t.Fatal(err)
	}
	const az, co, ut, nm, mo, tn, me, nh, ak, hi = "04", "08", "49", "35", "29", "47", "23", "33", "02", "15"
	for _, pair := range [][2]string{{az, co}, {ut, nm}} {
		if !neighbourSet(queen, l.IDs, pair[0])[pair[1]] {
			t.Errorf("%s–%s should be queen neighbours", pair[0], pair[1])
		}
		if neighbourSet(rook, l.IDs, pair[0])[pair[1]] {
			t.Errorf("%s–%s should not be rook neighbours", pair[0], pair[1])
		}
	}
	for _, g := range []*weights.Graph{queen, rook} {
		for _, c := range []struct {
			id   string
			want int
		}{{mo, 8}, {tn, 8}, {me, 1}, {ak, 0}, {hi, 0}} {
			if got := len(neighbourSet(g, l.IDs, c.id)); got != c.want {
				t.Errorf("%s: %s has %d neighbours, want %d", g.Kind, c.id, got, c.want)
			}
		}
		if !neighbourSet(g, l.IDs, me)[nh] {
			t.Errorf("%s: Maine's neighbour should be New Hampshire", g.Kind)
		}
		islands := map[string]bool{}
		for _, i := range g.Islands() {
			islands[l.IDs[i]] = true
		}
		if !islands[ak] || !islands[hi] {
			t.Errorf("%s: Alaska and Hawaii should be islands, got %v", g.Kind, islands)
		}
	}
	// Exactly the two Four Corners pairs separate queen from rook here.
	if d := queen.Links()/2 - rook.Links()/2; d != 2 {
		t.Errorf("queen has %d more pairs than rook, want 2", d)
	}
}

// Moran's I of a real variable on a real layer (the latitude of each state's
// centroid, lower 48 and DC, queen contiguity) equals gonum's
// stat/spatial.GlobalMoransI for binary and row-standardised weights.
func TestStatesMoranAgainstGonum(t *testing.T) {
	l := loadStates(t)
	queen, keep := linkedStates(t, l)
	if len(keep) != 49 {
		t.Fatalf("%d states with neighbours, want 49 (48 contiguous and DC)", len(keep))
	}
	col, err := l.Column("centroid_lat")
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, len(keep))
	for k, i := range keep {
		x[k] = col.Num[i]
	}
	g := queen.Subset(keep)
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		got, err := autocorr.MoransI(x, w)
		if err != nil {
			t.Fatal(err)
		}
		d := testkit.Dense(w.Offsets, w.Neighbours, w.Weights)
		want, _, _ := gspatial.GlobalMoransI(x, nil, d)
		if math.Abs(got-want) > 1e-12 {
			t.Errorf("%s: I %v, gonum %v", w.Scaling, got, want)
		}
		// Latitude is smooth across states: strongly positive I.
		if got < 0.5 {
			t.Errorf("%s: I of latitude %v, expected strong clustering", w.Scaling, got)
		}
	}
}
