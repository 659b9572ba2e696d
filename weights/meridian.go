package weights

import (
	"cmp"
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// meridianStretch is a piece of an area's boundary lying on the 180°
// meridian: latitudes lo…hi (equal for a single vertex), on its east side
// (longitude +180) or its west side (−180).
type meridianStretch struct {
	lo, hi float64
	area   int32
}

// meridianLinks returns the pairs of areas that meet across the 180°
// meridian of a longitude/latitude layer: one with a boundary stretch at
// longitude +180 and another with one at −180 (the same line on the globe,
// written twice, as RFC 7946 asks areas that cross it to be split). Queen
// links areas whose stretches (single vertices included) come within snap of
// each other in latitude; rook asks them to overlap over more than
// RookMinShared·snap, as elsewhere. Points within snap of ±180 count as on
// it. Pairs are (lower, higher) area index, possibly with repeats; areas
// that have parts on both sides and meet themselves there are not linked.
func meridianLinks(geoms []orb.MultiPolygon, snap float64, rook bool) [][2]int32 {
	east, west := meridianStretches(geoms, snap, 180), meridianStretches(geoms, snap, -180)
	if len(east) == 0 || len(west) == 0 {
		return nil
	}
	byLo := func(a, b meridianStretch) int { return cmp.Compare(a.lo, b.lo) }
	slices.SortFunc(east, byLo)
	slices.SortFunc(west, byLo)
	// Stretches are few (only sides on the meridian), so every east stretch
	// is compared with the west ones up to its end.
	var pairs [][2]int32
	for _, e := range east {
		for _, w := range west {
			if w.lo > e.hi+snap {
				break
			}
			overlap := min(e.hi, w.hi) - max(e.lo, w.lo) // negative: the gap between them
			meet := overlap >= -snap
			if rook {
				meet = overlap > RookMinShared*snap
			}
			if meet && e.area != w.area {
				pairs = append(pairs, [2]int32{min(e.area, w.area), max(e.area, w.area)})
			}
		}
	}
	return pairs
}

// meridianStretches returns the boundary stretches of geoms lying within
// snap of longitude x (±180): every side with both ends there, and for
// queen contacts every vertex there.
func meridianStretches(geoms []orb.MultiPolygon, snap, x float64) []meridianStretch {
	var out []meridianStretch
	on := func(p orb.Point) bool { return math.Abs(p[0]-x) <= snap }
	for a, mp := range geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				for v, p := range ring {
					if !on(p) {
						continue
					}
					out = append(out, meridianStretch{p[1], p[1], int32(a)})
					if v+1 < len(ring) && on(ring[v+1]) {
						q := ring[v+1]
						out = append(out, meridianStretch{min(p[1], q[1]), max(p[1], q[1]), int32(a)})
					}
				}
			}
		}
	}
	return out
}
