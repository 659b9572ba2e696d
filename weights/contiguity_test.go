package weights

import (
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// lattice returns an m×m grid of unit squares, row by row.
func lattice(m int) []orb.MultiPolygon {
	var out []orb.MultiPolygon
	for r := 0; r < m; r++ {
		for c := 0; c < m; c++ {
			out = append(out, orb.MultiPolygon{{unitSquare(float64(c), float64(r))}})
		}
	}
	return out
}

// unitSquare is the square of side 1 with lower-left corner (x, y).
func unitSquare(x, y float64) orb.Ring {
	return orb.Ring{{x, y}, {x + 1, y}, {x + 1, y + 1}, {x, y + 1}, {x, y}}
}

// BuildContiguity checks its options before the engine sees them.
func TestBuildContiguityBadOptions(t *testing.T) {
	geoms := []orb.MultiPolygon{{{unitSquare(0, 0)}}, {{unitSquare(1, 0)}}}
	for _, c := range []struct {
		name string
		opt  ContiguityOptions
		want string
	}{
		{"negative snap", ContiguityOptions{Snap: -1}, "snap distance"},
		{"NaN snap", ContiguityOptions{Snap: math.NaN()}, "snap distance"},
		{"infinite snap", ContiguityOptions{Snap: math.Inf(1)}, "snap distance"},
		{"ids of another length", ContiguityOptions{IDs: []string{"a"}}, "1 ids for 2 areas"},
		{"unknown rule", ContiguityOptions{Rule: 7}, "unknown contiguity rule"},
	} {
		if _, _, err := BuildContiguity(geoms, c.opt); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one mentioning %q", c.name, err, c.want)
		}
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
