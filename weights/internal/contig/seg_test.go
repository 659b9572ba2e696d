package contig

import (
	"math"
	"testing"
)

// Hand-worked cases for the segment predicates (plane geometry).
func TestContigSegShared(t *testing.T) {
	const snap = 1e-6
	cases := []struct {
		name           string
		a, b           [4]float64
		wantLo, wantHi float64
	}{
		{"identical", [4]float64{0, 0, 2, 0}, [4]float64{0, 0, 2, 0}, 2, 2},
		{"reversed", [4]float64{0, 0, 2, 0}, [4]float64{2, 0, 0, 0}, 2, 2},
		{"partial overlap", [4]float64{0, 0, 2, 0}, [4]float64{1, 0, 3, 0}, 1, 1},
		{"one vertex more on one side", [4]float64{0, 0, 2, 0}, [4]float64{0, 0, 0.5, 0}, 0.5, 0.5},
		{"parallel half a snap apart", [4]float64{0, 0, 2, 0}, [4]float64{0, 0.5 * snap, 2, 0.5 * snap}, 2, 2},
		{"parallel two snaps apart", [4]float64{0, 0, 2, 0}, [4]float64{0, 2 * snap, 2, 2 * snap}, 0, 0},
		{"end to end on one line", [4]float64{0, 0, 1, 0}, [4]float64{1, 0, 2, 0}, 0, 0},
		{"corner at a right angle", [4]float64{0, 0, 1, 0}, [4]float64{1, 0, 1, 1}, 0, 0},
		{"corner copies half a snap apart", [4]float64{0, 0, 1, 0}, [4]float64{0.5 * snap, 0, 1, 1}, 0, 0.5 * snap},
		{"crossing at a right angle", [4]float64{0, 0, 2, 0}, [4]float64{1, -1, 1, 1}, 0, 0},
		// A side leaving at a slope of 1e-3 stays within snap of the
		// other for snap/1e-3 = 1e-3 along it, but that stretch ends at
		// no vertex: a corner, not a shared border.
		{"slight angle", [4]float64{0, 0, 1, 0}, [4]float64{0, 0, 1, 1e-3}, 0, 0},
		{"crossing at a slight angle", [4]float64{0, 0, 2, 0}, [4]float64{0, -1e-3, 2, 1e-3}, 0, 0},
		// A side so short that it lies within snap of the other all along
		// counts whole (here 10·snap, at a slope of 1e-3).
		{"short side at a slight angle", [4]float64{0, 0, 1, 0}, [4]float64{0, 0, 10 * snap, 1e-2 * snap}, 10 * snap, 10 * snap},
		{"T-junction along a side", [4]float64{0, 0, 2, 0}, [4]float64{0.5, 0.5 * snap, 1.5, -0.5 * snap}, 1, 1},
		{"far apart", [4]float64{0, 0, 1, 0}, [4]float64{5, 5, 6, 5}, 0, 0},
	}
	for _, c := range cases {
		for _, swap := range []bool{false, true} {
			a, b := c.a, c.b
			if swap {
				a, b = b, a
			}
			got := segShared(a[0], a[1], a[2], a[3], b[0], b[1], b[2], b[3], snap)
			if got < c.wantLo-1e-12 || got > c.wantHi+1e-12 {
				t.Errorf("%s (swapped %v): %g, want %g to %g", c.name, swap, got, c.wantLo, c.wantHi)
			}
		}
	}
}

func TestContigSegNearAndMeet(t *testing.T) {
	const snap = 1e-6
	cases := []struct {
		name               string
		a, b               [4]float64
		near, meet, proper bool
	}{
		{"shared end", [4]float64{0, 0, 1, 0}, [4]float64{1, 0, 1, 1}, true, true, false},
		{"T-junction", [4]float64{0, 0, 2, 0}, [4]float64{1, 0, 1, 1}, true, true, false},
		{"T-junction just short", [4]float64{0, 0, 2, 0}, [4]float64{1, 0.5 * snap, 1, 1}, true, false, false},
		{"crossing", [4]float64{0, 0, 2, 2}, [4]float64{0, 2, 2, 0}, true, true, true},
		{"collinear overlap", [4]float64{0, 0, 2, 0}, [4]float64{1, 0, 3, 0}, true, true, false},
		{"gap of two snaps", [4]float64{0, 0, 1, 0}, [4]float64{1 + 2*snap, 0, 2, 0}, false, false, false},
		{"parallel, far", [4]float64{0, 0, 1, 0}, [4]float64{0, 1, 1, 1}, false, false, false},
	}
	for _, c := range cases {
		a, b := c.a, c.b
		if got := segNear(a[0], a[1], a[2], a[3], b[0], b[1], b[2], b[3], snap*snap); got != c.near {
			t.Errorf("%s: near %v, want %v", c.name, got, c.near)
		}
		if got, proper, _, _ := segMeet(a[0], a[1], a[2], a[3], b[0], b[1], b[2], b[3]); got != c.meet || proper != c.proper {
			t.Errorf("%s: meet %v proper %v, want %v %v", c.name, got, proper, c.meet, c.proper)
		}
	}
	if ok, _, x, y := segMeet(0, 0, 2, 2, 0, 2, 2, 0); !ok || math.Abs(x-1) > 1e-15 || math.Abs(y-1) > 1e-15 {
		t.Errorf("crossing point (%v, %v), want (1, 1)", x, y)
	}
}
