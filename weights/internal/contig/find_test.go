package contig

import (
	"testing"

	"github.com/paulmach/orb"
)

// degrees counts the neighbours of each of n areas in pairs.
func degrees(n int, pairs [][2]int32) []int {
	d := make([]int, n)
	for _, p := range pairs {
		d[p[0]]++
		d[p[1]]++
	}
	return d
}

// On an m×m lattice rook contiguity has 2·m·(m−1) neighbour pairs and queen
// adds the 2·(m−1)² diagonal pairs (geometry of the lattice, common knowledge).
func TestLatticeLinkCounts(t *testing.T) {
	for _, m := range []int{1, 2, 3, 5, 10} {
		geoms := lattice(m, false)
		queen, _ := build(t, geoms, rules[0])
		rook, _ := build(t, geoms, rules[1])
		if got, want := len(rook), 2*m*(m-1); got != want {
			t.Errorf("m=%d rook pairs %d, want %d", m, got, want)
		}
		if got, want := len(queen), 2*m*(m-1)+2*(m-1)*(m-1); got != want {
			t.Errorf("m=%d queen pairs %d, want %d", m, got, want)
		}
		if m >= 3 {
			centre := m + 1 // row 1, column 1
			rd, qd := degrees(len(geoms), rook), degrees(len(geoms), queen)
			if rd[centre] != 4 || qd[centre] != 8 || qd[0] != 3 || rd[0] != 2 {
				t.Errorf("m=%d degrees: rook %d/%d queen %d/%d", m, rd[centre], rd[0], qd[centre], qd[0])
			}
		}
	}
}

// A shared edge with an extra vertex on both sides is still one shared
// boundary; the pairs must not depend on the direction rings run in.
func TestSharedEdgeBothDirections(t *testing.T) {
	a := orb.Ring{{0, 0}, {1, 0}, {1, 0.5}, {1, 1}, {0, 1}, {0, 0}}
	b := orb.Ring{{1, 0}, {1, 0.5}, {1, 1}, {2, 1}, {2, 0}, {1, 0}} // clockwise
	c := orb.Ring{{5, 5}, {6, 5}, {6, 6}, {5, 5}}                   // an island
	pairs, _ := build(t, []orb.MultiPolygon{{{a}}, {{b}}, {{c}}}, rules[1])
	if d := pairsDiff(pairs, [][2]int32{{0, 1}}); d != "" {
		t.Fatal(d)
	}
}

// A hole's boundary counts: an area filling another's hole is its neighbour.
func TestHoleNeighbour(t *testing.T) {
	outer := orb.Ring{{0, 0}, {4, 0}, {4, 4}, {0, 4}, {0, 0}}
	hole := orb.Ring{{1, 1}, {1, 3}, {3, 3}, {3, 1}, {1, 1}}
	inner := orb.Ring{{1, 1}, {3, 1}, {3, 3}, {1, 3}, {1, 1}}
	pairs, _ := build(t, []orb.MultiPolygon{{{outer, hole}}, {{inner}}}, rules[1])
	if d := pairsDiff(pairs, [][2]int32{{0, 1}}); d != "" {
		t.Fatal(d)
	}
}
