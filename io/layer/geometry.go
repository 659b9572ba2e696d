package layer

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// CheckPolygons applies the geometry rules every reader shares to one
// area's polygons, in place: a ring whose last position differs from its
// first is closed (closed counts them, for the reader's one warning per
// file); a ring with fewer than 4 positions after closing, or a coordinate
// that is not a finite number, is an error whose text names the ring ("ring
// 2 of part 1 has 3 positions; …") for the reader to put after the file and
// the record. Parts without rings are dropped; an area left with no part is
// reported by empty, so that the reader can treat it as it treats a null
// geometry.
func CheckPolygons(mp *orb.MultiPolygon) (closed int, empty bool, err error) {
	parts := (*mp)[:0]
	for pi, poly := range *mp {
		if len(poly) == 0 {
			continue
		}
		for ri, ring := range poly {
			for _, p := range ring {
				if math.IsNaN(p[0]) || math.IsInf(p[0], 0) || math.IsNaN(p[1]) || math.IsInf(p[1], 0) {
					return closed, false, fmt.Errorf("%s holds the coordinate [%v, %v], which is not a finite number", ringLabel(len(*mp), pi, ri), p[0], p[1])
				}
			}
			if n := len(ring); n > 0 && ring[0] != ring[n-1] {
				ring = append(ring, ring[0])
				poly[ri] = ring
				closed++
			}
			if len(ring) < 4 {
				return closed, false, fmt.Errorf("%s has %d positions; a ring needs at least 4, the last repeating the first", ringLabel(len(*mp), pi, ri), len(ring))
			}
		}
		parts = append(parts, poly)
	}
	*mp = parts
	return closed, len(parts) == 0, nil
}

// ringLabel names ring ri (0-based) of part pi as messages do: "ring 1" in
// a single polygon, "ring 1 of part 2" in a multipart one.
func ringLabel(parts, pi, ri int) string {
	if parts == 1 {
		return fmt.Sprintf("ring %d", ri+1)
	}
	return fmt.Sprintf("ring %d of part %d", ri+1, pi+1)
}

// OutsideLonLat returns the first position of mp outside the range of
// longitude and latitude, [-180, 180] × [-90, 90], for readers to tell
// degrees from projected coordinates; ok is false when every position lies
// inside.
func OutsideLonLat(mp orb.MultiPolygon) (p orb.Point, ok bool) {
	for _, poly := range mp {
		for _, ring := range poly {
			for _, q := range ring {
				if !(math.Abs(q[0]) <= 180 && math.Abs(q[1]) <= 90) {
					return q, true
				}
			}
		}
	}
	return orb.Point{}, false
}
