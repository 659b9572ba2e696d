package weights

import (
	"cmp"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// randomGeo returns n lon/lat points: most uniform on the sphere (so near
// the poles too), a cluster straddling the antimeridian and one round the
// north pole, where lon/lat searches go wrong if they are careless.
func randomGeo(n int, seed uint64) []orb.Point {
	rng := rand.New(rand.NewPCG(seed, 1))
	pts := make([]orb.Point, n)
	for i := range pts {
		switch i % 5 {
		case 0: // antimeridian cluster
			lon := 180 + rng.NormFloat64()*0.5
			if lon > 180 {
				lon -= 360
			}
			pts[i] = orb.Point{lon, rng.NormFloat64() * 0.5}
		case 1: // polar cap
			pts[i] = orb.Point{rng.Float64()*360 - 180, 90 - math.Abs(rng.NormFloat64())}
		default:
			pts[i] = orb.Point{rng.Float64()*360 - 180, math.Asin(2*rng.Float64()-1) * 180 / math.Pi}
		}
	}
	return pts
}

// randomPlanar returns n points at projected-metre magnitudes, with
// clumps so that density varies.
func randomPlanar(n int, seed uint64) []orb.Point {
	rng := rand.New(rand.NewPCG(seed, 2))
	pts := make([]orb.Point, n)
	for i := range pts {
		if i%3 == 0 {
			pts[i] = orb.Point{500000 + rng.NormFloat64()*2000, 4500000 + rng.NormFloat64()*2000}
		} else {
			pts[i] = orb.Point{400000 + rng.Float64()*200000, 4400000 + rng.Float64()*200000}
		}
	}
	return pts
}

// gridPoints returns an m×m lattice with step s from o, row by row: area r·m+c
// sits at (o + c·s, o + r·s).
func gridPoints(m int, o orb.Point, s float64) []orb.Point {
	pts := make([]orb.Point, 0, m*m)
	for r := range m {
		for c := range m {
			pts = append(pts, orb.Point{o[0] + float64(c)*s, o[1] + float64(r)*s})
		}
	}
	return pts
}

type cand struct {
	j int32
	d float64
}

// bruteRanked returns the k other areas of i that come first when all
// are ranked by (Distance, index): the definition KNearest must follow, by
// exhaustive search.
func bruteRanked(pts []orb.Point, i, k int, m Metric) []cand {
	out := make([]cand, 0, k+1)
	for j := range pts {
		if j == i {
			continue
		}
		c := cand{int32(j), Distance(m, pts[i], pts[j])}
		if len(out) == k && cmp.Compare(c.d, out[k-1].d) >= 0 {
			continue // ties go to the lower index, which came first
		}
		at, _ := slices.BinarySearchFunc(out, c, func(a, b cand) int {
			return cmp.Or(cmp.Compare(a.d, b.d), cmp.Compare(a.j, b.j))
		})
		out = slices.Insert(out, at, c)
		if len(out) > k {
			out = out[:k]
		}
	}
	return out
}

// bruteTop returns the first k of every area's ranking.
func bruteTop(pts []orb.Point, k int, m Metric) [][]cand {
	top := make([][]cand, len(pts))
	for i := range pts {
		top[i] = bruteRanked(pts, i, k, m)
	}
	return top
}

// topRows cuts the rankings to k and puts each row in index order.
func topRows(top [][]cand, k int) [][]int32 {
	rows := make([][]int32, len(top))
	for i := range top {
		for _, c := range top[i][:k] {
			rows[i] = append(rows[i], c.j)
		}
		slices.Sort(rows[i])
	}
	return rows
}

// bruteKNN returns the k nearest of every area, each row in index order.
func bruteKNN(pts []orb.Point, k int, m Metric) [][]int32 {
	return topRows(bruteTop(pts, k, m), k)
}

func rowsOf(g *Graph) [][]int32 {
	rows := make([][]int32, g.Len())
	for i := range rows {
		nb, _ := g.Row(i)
		rows[i] = slices.Clone(nb)
	}
	return rows
}

func sameRows(t *testing.T, what string, got, want [][]int32) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("%s: %d rows, want %d", what, len(got), len(want))
	}
	bad := 0
	for i := range got {
		if !slices.Equal(got[i], want[i]) {
			if bad < 5 {
				t.Errorf("%s: row %d = %v, want %v", what, i, got[i], want[i])
			}
			bad++
		}
	}
	if bad > 0 {
		t.Errorf("%s: %d rows differ", what, bad)
	}
}

// checkGraph checks the Graph invariants: rows sorted, no self-links, no
// repeats, weights positive and finite.
func checkGraph(t *testing.T, g *Graph) {
	t.Helper()
	for i := range g.Len() {
		nb, w := g.Row(i)
		for k, j := range nb {
			if int(j) == i || (k > 0 && nb[k-1] >= j) || !(w[k] > 0) || math.IsInf(w[k], 0) {
				t.Fatalf("row %d breaks the graph invariants: %v %v", i, nb, w)
			}
		}
	}
}

// KNearest against exhaustive search (the definition: rank by Distance, then
// index) on a few thousand random points, both metrics, several k.
func TestKNearestAgainstBruteForce(t *testing.T) {
	for _, c := range []struct {
		name string
		pts  []orb.Point
		m    Metric
	}{
		{"geographic", randomGeo(2000, 1), Geographic},
		{"planar", randomPlanar(2000, 2), Planar},
	} {
		top := bruteTop(c.pts, 17, c.m)
		for _, k := range []int{1, 4, 8, 17} {
			g, err := KNearest(c.pts, k, c.m, false)
			if err != nil {
				t.Fatal(err)
			}
			checkGraph(t, g)
			sameRows(t, fmt.Sprintf("%s k=%d", c.name, k), rowsOf(g), topRows(top, k))
		}
	}
}

// On a lattice many neighbours are equally far (four at distance 1, four at
// √2): the k-th place goes to the lower index. For interior site (r, c) of an
// m×m lattice the four rook neighbours are nearest; with k = 5 the fifth is
// the lowest-indexed diagonal, (r−1, c−1); with k = 6 also (r−1, c+1)
// (geometry of the lattice, common knowledge; brute force agrees).
func TestKNearestTiesOnLattice(t *testing.T) {
	const m = 30
	pts := gridPoints(m, orb.Point{0, 0}, 1)
	top := bruteTop(pts, 9, Planar)
	for _, k := range []int{4, 5, 6, 8, 9} {
		g, err := KNearest(pts, k, Planar, false)
		if err != nil {
			t.Fatal(err)
		}
		sameRows(t, fmt.Sprintf("lattice k=%d", k), rowsOf(g), topRows(top, k))
		r, c := 10, 10
		id := func(r, c int) int32 { return int32(r*m + c) }
		want := []int32{id(r-1, c), id(r, c-1), id(r, c+1), id(r+1, c)}
		switch k {
		case 5:
			want = append(want, id(r-1, c-1))
		case 6:
			want = append(want, id(r-1, c-1), id(r-1, c+1))
		case 8:
			want = append(want, id(r-1, c-1), id(r-1, c+1), id(r+1, c-1), id(r+1, c+1))
		case 9:
			want = append(want, id(r-1, c-1), id(r-1, c+1), id(r+1, c-1), id(r+1, c+1), id(r-2, c))
		}
		slices.Sort(want)
		if nb, _ := g.Row(int(id(r, c))); !slices.Equal(nb, want) {
			t.Errorf("k=%d: interior site has %v, want %v", k, nb, want)
		}
	}
	// A lon/lat lattice: east and west neighbours are equally far to the last
	// bit (the haversine only sees Δλ²), north and south are not.
	geo := gridPoints(40, orb.Point{179, -1}, 0.05)
	for i := range geo {
		if geo[i][0] > 180 {
			geo[i][0] -= 360
		}
	}
	top = bruteTop(geo, 5, Geographic)
	for _, k := range []int{1, 3, 5} {
		g, err := KNearest(geo, k, Geographic, false)
		if err != nil {
			t.Fatal(err)
		}
		sameRows(t, fmt.Sprintf("lon/lat lattice k=%d", k), rowsOf(g), topRows(top, k))
	}
	// Points piled in a few places: whole piles tie at distance zero, and
	// the search must stay fast.
	same := make([]orb.Point, 600)
	for i := range same {
		same[i] = orb.Point{float64(i % 3), 0}
	}
	g, err := KNearest(same, 3, Planar, false)
	if err != nil {
		t.Fatal(err)
	}
	sameRows(t, "coincident points", rowsOf(g), bruteKNN(same, 3, Planar))
}

// The symmetrised graph is the union of the plain one and its transpose:
// symmetric, containing every plain link, and nothing else.
func TestKNearestSymmetrised(t *testing.T) {
	pts := randomGeo(2000, 3)
	plain, err := KNearest(pts, 6, Geographic, false)
	if err != nil {
		t.Fatal(err)
	}
	sym, err := KNearest(pts, 6, Geographic, true)
	if err != nil {
		t.Fatal(err)
	}
	checkGraph(t, sym)
	want := make([]map[int32]bool, len(pts))
	for i := range want {
		want[i] = map[int32]bool{}
	}
	for i := range pts {
		nb, _ := plain.Row(i)
		for _, j := range nb {
			want[i][j] = true
			want[j][int32(i)] = true
		}
	}
	wantRows := make([][]int32, len(pts))
	for i, set := range want {
		for j := range set {
			wantRows[i] = append(wantRows[i], j)
		}
		slices.Sort(wantRows[i])
	}
	sameRows(t, "symmetrised", rowsOf(sym), wantRows)
	if sym.Kind != "6 nearest neighbours (symmetrised)" || plain.Kind != "6 nearest neighbours" || sym.Scaling != "binary" {
		t.Errorf("kinds %q, %q, transform %q", plain.Kind, sym.Kind, sym.Scaling)
	}
}

// Results must not depend on the number of workers.
func TestKNearestWorkersDoNotMatter(t *testing.T) {
	pts := randomPlanar(5000, 4)
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(1))
	one, err := KNearest(pts, 5, Planar, true)
	if err != nil {
		t.Fatal(err)
	}
	runtime.GOMAXPROCS(4)
	four, err := KNearest(pts, 5, Planar, true)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(one.Offsets, four.Offsets) || !slices.Equal(one.Neighbours, four.Neighbours) {
		t.Error("graphs differ between 1 and 4 workers")
	}
}

func TestKNearestErrors(t *testing.T) {
	pts := gridPoints(3, orb.Point{0, 0}, 1)
	for _, c := range []struct {
		k    int
		want string
	}{
		{0, "at least 1"},
		{-2, "at least 1"},
		{9, "k must be at most n−1 = 8"},
		{100, "k must be at most n−1 = 8"},
	} {
		_, err := KNearest(pts, c.k, Planar, false)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("k=%d: error %v, want one containing %q", c.k, err, c.want)
		}
	}
	if _, err := KNearest(make([]orb.Point, 7072), 7071, Planar, false); err == nil || !strings.Contains(err.Error(), "more than 50,000,000") {
		t.Errorf("n·k above MaxLinks: %v", err)
	}
	if g, err := KNearest(pts, 8, Planar, false); err != nil || g.Links() != 72 || g.Kind != "8 nearest neighbours" {
		t.Errorf("k = n−1: %v", err)
	}
	if g, err := KNearest(pts, 1, Planar, false); err != nil || g.Kind != "1 nearest neighbour" {
		t.Errorf("k = 1: %v", err)
	}
}

// NearestDistances against exhaustive search.
func TestNearestDistances(t *testing.T) {
	pts := randomGeo(1000, 5)
	d, err := NearestDistances(pts, Geographic)
	if err != nil {
		t.Fatal(err)
	}
	for i := range pts {
		if want := bruteRanked(pts, i, 1, Geographic)[0].d; d[i] != want {
			t.Fatalf("area %d: %v, want %v", i, d[i], want)
		}
	}
}

// benchPoints are uniform random lon/lat points in a box the size of a
// large country (fixed seed).
func benchPoints(n int) []orb.Point {
	rng := rand.New(rand.NewPCG(42, 42))
	pts := make([]orb.Point, n)
	for i := range pts {
		pts[i] = orb.Point{-10 + 30*rng.Float64(), 35 + 25*rng.Float64()}
	}
	return pts
}

func benchKNearest(b *testing.B, n int) {
	pts := benchPoints(n)
	b.ResetTimer()
	for b.Loop() {
		if _, err := KNearest(pts, 8, Geographic, false); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkKNearest8_62500(b *testing.B)  { benchKNearest(b, 62500) }
func BenchmarkKNearest8_250000(b *testing.B) { benchKNearest(b, 250000) }

func BenchmarkKNearest8Planar_250000(b *testing.B) {
	pts := randomPlanar(250000, 9)
	b.ResetTimer()
	for b.Loop() {
		if _, err := KNearest(pts, 8, Planar, true); err != nil {
			b.Fatal(err)
		}
	}
}
