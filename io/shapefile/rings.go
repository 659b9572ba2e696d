package shapefile

import (
	"math"
	"sort"

	"github.com/paulmach/orb"
)

// assembler groups the rings of a record into polygons. A shapefile
// polygon is a flat list of rings; which are shells and which are holes is
// said only by winding: shells clockwise, holes counter-clockwise (with y
// pointing up). Its slices are reused from record to record.
type assembler struct {
	area   []float64 // signed, positive counter-clockwise
	box    []orb.Bound
	outer  []bool
	host   []int // for a hole, the shell it lies in; -1 for none
	polyOf []int // the output polygon each shell (or orphan hole) starts
	cands  []int
	grid   *shellGrid // for records with many shells and holes, else nil
}

// assemble returns the record's polygons: each shell with the holes that
// lie in it, shells in file order, and the number of holes that lie in no
// shell, which become shells of their own. Each hole goes to the smallest
// shell that contains it, so that a hole in an island inside a lake of a
// larger shell finds the island.
func (a *assembler) assemble(rings []orb.Ring) (orb.MultiPolygon, int) {
	if len(rings) == 1 {
		return orb.MultiPolygon{{rings[0]}}, 0
	}
	n := len(rings)
	a.area, a.box, a.outer = a.area[:0], a.box[:0], a.outer[:0]
	holes := 0
	for _, r := range rings {
		ar := signedArea(r)
		a.area = append(a.area, ar)
		a.box = append(a.box, r.Bound())
		a.outer = append(a.outer, ar <= 0)
		if ar > 0 {
			holes++
		}
	}
	if holes == 0 {
		mp := make(orb.MultiPolygon, n)
		for k, r := range rings {
			mp[k] = orb.Polygon{r}
		}
		return mp, 0
	}
	a.host = resize(a.host, n)
	a.grid = nil
	if shells := n - holes; shells*holes > gridFrom {
		a.grid = newShellGrid(a.box, a.outer, shells)
	}
	orphans := 0
	for k := range rings {
		a.host[k] = -1
		if !a.outer[k] {
			a.host[k] = a.findShell(rings, k)
			if a.host[k] < 0 {
				orphans++
			}
		}
	}
	return a.build(rings), orphans
}

// findShell returns the smallest shell containing hole k, or -1. Shells
// whose bounding box does not hold the hole's are passed over before any
// point is tested.
func (a *assembler) findShell(rings []orb.Ring, k int) int {
	a.cands = a.cands[:0]
	if a.grid != nil {
		cell, wide := a.grid.near(a.box[k])
		for _, list := range [][]int{cell, wide} {
			for _, s := range list {
				if holds(a.box[s], a.box[k]) {
					a.cands = append(a.cands, s)
				}
			}
		}
	} else {
		for s := range rings {
			if a.outer[s] && holds(a.box[s], a.box[k]) {
				a.cands = append(a.cands, s)
			}
		}
	}
	if len(a.cands) > 1 {
		sort.Slice(a.cands, func(i, j int) bool { // by area, then file order
			ai, aj := math.Abs(a.area[a.cands[i]]), math.Abs(a.area[a.cands[j]])
			return ai < aj || ai == aj && a.cands[i] < a.cands[j]
		})
	}
	for _, s := range a.cands {
		if ringInside(rings[k], rings[s]) {
			return s
		}
	}
	return -1
}

// build lays out the polygons: every shell, and every hole in no shell, in
// file order, then each hole appended to its shell in file order.
func (a *assembler) build(rings []orb.Ring) orb.MultiPolygon {
	a.polyOf = resize(a.polyOf, len(rings))
	var mp orb.MultiPolygon
	for k, r := range rings {
		if a.outer[k] || a.host[k] < 0 {
			a.polyOf[k] = len(mp)
			mp = append(mp, orb.Polygon{r})
		}
	}
	for k, r := range rings {
		if !a.outer[k] && a.host[k] >= 0 {
			p := a.polyOf[a.host[k]]
			mp[p] = append(mp[p], r)
		}
	}
	return mp
}

func resize(s []int, n int) []int {
	if cap(s) < n {
		return make([]int, n)
	}
	return s[:n]
}

// signedArea is twice the area of a ring (the shoelace sum), positive for
// counter-clockwise winding. Coordinates are taken relative to the first
// point, which keeps the products small for projected coordinates in the
// millions.
func signedArea(r orb.Ring) float64 {
	if len(r) < 3 {
		return 0
	}
	x0, y0 := r[0][0], r[0][1]
	var s float64
	for i := 1; i+1 < len(r); i++ {
		s += (r[i][0]-x0)*(r[i+1][1]-y0) - (r[i+1][0]-x0)*(r[i][1]-y0)
	}
	return s
}

// holds reports whether bound outer contains bound inner.
func holds(outer, inner orb.Bound) bool {
	return outer.Min[0] <= inner.Min[0] && outer.Min[1] <= inner.Min[1] &&
		outer.Max[0] >= inner.Max[0] && outer.Max[1] >= inner.Max[1]
}

// ringInside reports whether ring h lies inside ring s, judged by the
// first vertex of h that is not on the boundary of s (holes often touch
// their shell at a vertex). A ring all on the boundary counts as inside.
func ringInside(h, s orb.Ring) bool {
	for _, p := range h {
		switch pointInRing(p, s) {
		case 1:
			return true
		case -1:
			return false
		}
	}
	return true
}

// pointInRing returns 1 when p lies inside ring r, -1 outside, 0 on its
// boundary, by counting the edges a ray from p to the right crosses. The
// ring may be closed or not.
func pointInRing(p orb.Point, r orb.Ring) int {
	in := false
	for i, j := 0, len(r)-1; i < len(r); j, i = i, i+1 {
		a, b := r[j], r[i]
		if a == p {
			return 0
		}
		if (a[1] > p[1]) != (b[1] > p[1]) {
			x := a[0] + (p[1]-a[1])*(b[0]-a[0])/(b[1]-a[1])
			if x == p[0] {
				return 0
			}
			if p[0] < x {
				in = !in
			}
		} else if a[1] == p[1] && b[1] == p[1] && min(a[0], b[0]) <= p[0] && p[0] <= max(a[0], b[0]) {
			return 0 // on a horizontal edge
		}
	}
	if in {
		return 1
	}
	return -1
}
