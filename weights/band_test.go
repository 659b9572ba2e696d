package weights

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// distMatrix returns all distances by Distance, computed once per test.
func distMatrix(pts []orb.Point, m Metric) [][]float64 {
	D := make([][]float64, len(pts))
	for i := range pts {
		D[i] = make([]float64, len(pts))
		for j := range pts {
			D[i][j] = Distance(m, pts[i], pts[j])
		}
	}
	return D
}

// bruteWithin returns, for every area, the other areas within radius(i)
// by exhaustive search over the distance matrix D, in index order, with their
// distances.
func bruteWithin(D [][]float64, radius func(i int) float64) ([][]int32, [][]float64) {
	rows := make([][]int32, len(D))
	dist := make([][]float64, len(D))
	for i := range D {
		for j, d := range D[i] {
			if j != i && d <= radius(i) {
				rows[i] = append(rows[i], int32(j))
				dist[i] = append(dist[i], d)
			}
		}
	}
	return rows, dist
}

// DistanceBand against exhaustive search (the definition: every pair at
// most d apart), both metrics, for bands from sparse to dense.
func TestDistanceBandAgainstBruteForce(t *testing.T) {
	for _, c := range []struct {
		name  string
		pts   []orb.Point
		m     Metric
		bands []float64
	}{
		{"geographic", randomGeo(1200, 11), Geographic, []float64{50, 300, 1500, 25000}},
		{"planar", randomPlanar(1200, 12), Planar, []float64{500, 3000, 20000}},
	} {
		D := distMatrix(c.pts, c.m)
		for _, d := range c.bands {
			g, err := DistanceBand(c.pts, d, c.m)
			if err != nil {
				t.Fatal(err)
			}
			checkGraph(t, g)
			want, _ := bruteWithin(D, func(int) float64 { return d })
			sameRows(t, c.name+" band "+formatNumber(d), rowsOf(g), want)
		}
	}
	g, err := DistanceBand(gridPoints(4, orb.Point{0, 0}, 1), 1, Planar)
	if err != nil {
		t.Fatal(err)
	}
	// On a lattice with step 1, a band of exactly 1 gives the rook pairs,
	// 2·m·(m−1) of them (common knowledge): the band includes its edge.
	if g.Links() != 2*2*4*3 || g.Kind != "distance band 1 (layer units)" || g.Scaling != "binary" {
		t.Errorf("lattice band 1: %d links, kind %q, transform %q", g.Links(), g.Kind, g.Scaling)
	}
	// 0.1° of latitude is 11.1 km (2πR/3600), so a 12 km band links the
	// north–south pairs of a 0.1° lattice at 50°N and the east–west ones,
	// 0.1°·cos 50° = 7.1 km apart, but no diagonals (12.8 km).
	g, err = DistanceBand(gridPoints(5, orb.Point{10, 50}, 0.1), 12, Geographic)
	if err != nil {
		t.Fatal(err)
	}
	if g.Links() != 2*2*5*4 || g.Kind != "distance band 12 km" {
		t.Errorf("lon/lat lattice: %d links, kind %q", g.Links(), g.Kind)
	}
}

// A band under which no area has a neighbour is a *NoNeighboursError whose
// figures match exhaustive search; a band that leaves only some areas alone
// returns the graph with those areas as islands.
func TestDistanceBandNoNeighbours(t *testing.T) {
	pts := []orb.Point{{0, 0}, {3, 0}, {3, 4}, {20, 0}}
	_, err := DistanceBand(pts, 2.5, Planar)
	var none *NoNeighboursError
	if !errors.As(err, &none) {
		t.Fatalf("error %v, want a *NoNeighboursError", err)
	}
	// Nearest-neighbour distances 3, 3, 4, 17 (Pythagoras).
	if none.Closest != 3 || none.Widest != 17 || none.Threshold != 2.5 {
		t.Errorf("closest %v, widest %v, threshold %v", none.Closest, none.Widest, none.Threshold)
	}
	if !strings.Contains(err.Error(), "closest two areas are 3 (layer units) apart") || !strings.Contains(err.Error(), "within 17 (layer units)") {
		t.Errorf("message %q", err)
	}
	g, err := DistanceBand(pts, 4, Planar)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(g.Islands(), []int{3}) {
		t.Errorf("islands %v, want [3]", g.Islands())
	}
	if g, err = DistanceBand(pts, none.Widest, Planar); err != nil || len(g.Islands()) != 0 {
		t.Errorf("a band of the widest nearest-neighbour distance leaves islands %v (%v)", g.Islands(), err)
	}
}

func TestDistanceBandErrors(t *testing.T) {
	pts := gridPoints(3, orb.Point{0, 0}, 1)
	for _, d := range []float64{0, -1, math.NaN(), math.Inf(1)} {
		if _, err := DistanceBand(pts, d, Planar); err == nil || !strings.Contains(err.Error(), "positive distance") {
			t.Errorf("band %v: error %v", d, err)
		}
	}
	if _, err := DistanceBand(nil, 1, Planar); err == nil {
		t.Error("empty input accepted")
	}
	// A band that links all of 7,200 areas would make 51.8 million links,
	// above MaxLinks; the counting pass stops early.
	_, err := DistanceBand(randomPlanar(7200, 3), 1e9, Planar)
	if err == nil || !strings.Contains(err.Error(), "more than 50,000,000 links") {
		t.Errorf("a band over everything: %v", err)
	}
}

// Inverse-distance weights against exhaustive search and the formula
// w = 1/d^power (definition), with a band and over all pairs.
func TestInverseDistance(t *testing.T) {
	pts := randomGeo(600, 14)
	D := distMatrix(pts, Geographic)
	for _, c := range []struct{ power, band float64 }{{1, 2000}, {2, 500}, {1.5, 0}} {
		g, err := InverseDistance(pts, c.power, c.band, Geographic)
		if err != nil {
			t.Fatal(err)
		}
		checkGraph(t, g)
		band := c.band
		if band == 0 {
			band = math.Inf(1)
		}
		want, dist := bruteWithin(D, func(int) float64 { return band })
		sameRows(t, "inverse distance", rowsOf(g), want)
		for i := range pts {
			_, w := g.Row(i)
			for k := range w {
				if f := 1 / math.Pow(dist[i][k], c.power); relErr(w[k], f) > 1e-14 {
					t.Fatalf("power %v: w[%d][%d] = %v, want 1/d^p = %v", c.power, i, k, w[k], f)
				}
			}
		}
		if g.Scaling != "weighted" {
			t.Errorf("transform %q", g.Scaling)
		}
	}
	for _, c := range []struct {
		power, band float64
		m           Metric
		kind        string
	}{
		{2, 60, Geographic, "inverse distance (power 2, band 60 km)"},
		{1, 0, Planar, "inverse distance (power 1, all pairs)"},
		{0.5, 1e6, Planar, "inverse distance (power 0.5, band 1000000 (layer units))"},
	} {
		g, err := InverseDistance(gridPoints(4, orb.Point{0, 0}, 0.5), c.power, c.band, c.m)
		if err != nil {
			t.Fatal(err)
		}
		if g.Kind != c.kind {
			t.Errorf("kind %q, want %q", g.Kind, c.kind)
		}
	}
}

func TestInverseDistanceErrors(t *testing.T) {
	pts := []orb.Point{{0, 0}, {1, 0}, {2, 0}, {1, 0}, {2, 0}}
	for _, band := range []float64{0, 5} {
		_, err := InverseDistance(pts, 2, band, Planar)
		var co *CoincidentError
		if !errors.As(err, &co) || co.A != 1 || co.B != 3 {
			t.Errorf("band %v: error %v, want areas 1 and 3 coincident", band, err)
		}
	}
	grid := gridPoints(3, orb.Point{0, 0}, 1)
	for _, c := range []struct {
		power, band float64
		want        string
	}{
		{0, 0, "power must be a positive number"},
		{-1, 0, "power must be a positive number"},
		{math.NaN(), 0, "power must be a positive number"},
		{2, -1, "positive distance"},
		{2, math.NaN(), "positive distance"},
		{2000, 0, "beyond floating point"},
	} {
		if _, err := InverseDistance(grid, c.power, c.band, Planar); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("power %v band %v: error %v, want %q", c.power, c.band, err, c.want)
		}
	}
	// All pairs of 7,072 areas exceed MaxLinks: refused before any work.
	_, err := InverseDistance(make([]orb.Point, 7072), 1, 0, Planar)
	if err == nil || !strings.Contains(err.Error(), "give a distance band") {
		t.Errorf("all pairs of 7,072 areas: %v", err)
	}
}

// Distance classes partition the pairs: every pair within k·width falls in
// exactly one class, the one its distance (found by brute force) says.
func TestDistanceClassesPartitionPairs(t *testing.T) {
	var pts []orb.Point
	for i := 0; i < 9; i++ {
		for j := 0; j < 9; j++ {
			pts = append(pts, orb.Point{float64(i) + 0.1*float64(j%3), float64(j)})
		}
	}
	classes, err := DistanceClasses(pts, 1.5, 4, Planar)
	if err != nil {
		t.Fatal(err)
	}
	for a := range pts {
		for b := range pts {
			if a == b {
				continue
			}
			d := Distance(Planar, pts[a], pts[b])
			want := int(math.Ceil(d/1.5)) - 1 // class index, 0-based
			for c, g := range classes {
				if got := weightOf(g, a, int32(b)) > 0; got != (c == want) {
					t.Fatalf("pair %d–%d at %v: in class %d is %v", a, b, d, c+1, got)
				}
			}
		}
	}
	if _, err := DistanceClasses(pts, 0, 3, Planar); err == nil {
		t.Fatal("zero width accepted")
	}
}
