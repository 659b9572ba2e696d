package weights

import (
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

// lattice returns an m×m grid of unit squares, row by row.
func lattice(m int) []orb.MultiPolygon {
	var out []orb.MultiPolygon
	for r := 0; r < m; r++ {
		for c := 0; c < m; c++ {
			x, y := float64(c), float64(r)
			ring := orb.Ring{{x, y}, {x + 1, y}, {x + 1, y + 1}, {x, y + 1}, {x, y}}
			out = append(out, orb.MultiPolygon{orb.Polygon{ring}})
		}
	}
	return out
}

// On an m×m lattice rook contiguity has 2·m·(m−1) neighbour pairs and queen
// adds the 2·(m−1)² diagonal pairs (geometry of the lattice, common knowledge).
func TestLatticeLinkCounts(t *testing.T) {
	for _, m := range []int{1, 2, 3, 5, 10} {
		geoms := lattice(m)
		rook, err := ContiguityGraph(geoms, Rook)
		if err != nil {
			t.Fatal(err)
		}
		queen, err := ContiguityGraph(geoms, Queen)
		if err != nil {
			t.Fatal(err)
		}
		if got, want := rook.Links()/2, 2*m*(m-1); got != want {
			t.Errorf("m=%d rook pairs %d, want %d", m, got, want)
		}
		if got, want := queen.Links()/2, 2*m*(m-1)+2*(m-1)*(m-1); got != want {
			t.Errorf("m=%d queen pairs %d, want %d", m, got, want)
		}
		if m >= 3 {
			centre := m + 1 // row 1, column 1
			if rook.Degree(centre) != 4 || queen.Degree(centre) != 8 || queen.Degree(0) != 3 || rook.Degree(0) != 2 {
				t.Errorf("m=%d degrees: rook %d/%d queen %d/%d", m, rook.Degree(centre), rook.Degree(0), queen.Degree(centre), queen.Degree(0))
			}
		}
	}
}

// A shared edge with an extra vertex on both sides is still one shared
// boundary; the graph must not depend on the direction rings run in.
func TestSharedEdgeBothDirections(t *testing.T) {
	a := orb.Ring{{0, 0}, {1, 0}, {1, 0.5}, {1, 1}, {0, 1}, {0, 0}}
	b := orb.Ring{{1, 0}, {1, 0.5}, {1, 1}, {2, 1}, {2, 0}, {1, 0}} // clockwise
	c := orb.Ring{{5, 5}, {6, 5}, {6, 6}, {5, 5}}                   // an island
	g, err := ContiguityGraph([]orb.MultiPolygon{{{a}}, {{b}}, {{c}}}, Rook)
	if err != nil {
		t.Fatal(err)
	}
	if g.Links() != 2 || g.Degree(2) != 0 {
		t.Fatalf("links %d, island degree %d", g.Links(), g.Degree(2))
	}
	if is := g.Islands(); len(is) != 1 || is[0] != 2 {
		t.Fatalf("islands %v", is)
	}
}

// A hole's boundary counts: an area filling another's hole is its neighbour.
func TestHoleNeighbour(t *testing.T) {
	outer := orb.Ring{{0, 0}, {4, 0}, {4, 4}, {0, 4}, {0, 0}}
	hole := orb.Ring{{1, 1}, {1, 3}, {3, 3}, {3, 1}, {1, 1}}
	inner := orb.Ring{{1, 1}, {3, 1}, {3, 3}, {1, 3}, {1, 1}}
	g, err := ContiguityGraph([]orb.MultiPolygon{{{outer, hole}}, {{inner}}}, Rook)
	if err != nil {
		t.Fatal(err)
	}
	if g.Links() != 2 {
		t.Fatalf("links %d, want 2", g.Links())
	}
}

func TestRowStandardisedAndSubset(t *testing.T) {
	g, _ := ContiguityGraph(lattice(3), Rook)
	rs := g.RowStandardised()
	for i := 0; i < rs.Len(); i++ {
		_, w := rs.Row(i)
		var s float64
		for _, v := range w {
			s += v
		}
		if s < 1-1e-12 || s > 1+1e-12 {
			t.Fatalf("row %d sums to %v", i, s)
		}
	}
	// Keep the corners and the centre: on the rook lattice no two of them
	// touch, so all five become islands.
	sub := g.Subset([]int{0, 2, 4, 6, 8})
	if sub.Len() != 5 || sub.Links() != 0 || len(sub.Islands()) != 5 {
		t.Fatalf("subset: %d areas, %d links", sub.Len(), sub.Links())
	}
	// Keep the middle row: a path 3-4-5.
	sub = g.Subset([]int{5, 3, 4})
	if sub.Links() != 4 || sub.Degree(2) != 2 {
		t.Fatalf("middle row: %d links, centre degree %d", sub.Links(), sub.Degree(2))
	}
}

func TestFromLinksRejectsSelfLinks(t *testing.T) {
	if _, err := FromLinks(2, [][2]int32{{1, 1}}, "x"); err == nil {
		t.Fatal("self-link accepted")
	}
}

// The lattice graph agrees with contiguity built from the square polygons.
func TestLatticeMatchesPolygons(t *testing.T) {
	for _, rule := range []Contiguity{Rook, Queen} {
		want, _ := ContiguityGraph(lattice(6), rule)
		got := Lattice(6, 6, rule)
		if !slices.Equal(got.Offsets, want.Offsets) || !slices.Equal(got.Neighbours, want.Neighbours) {
			t.Fatalf("%v: the lattice graph differs from contiguity of the squares", rule)
		}
	}
}
