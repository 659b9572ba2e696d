package points

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// crossesAntimeridian reports whether the longitudes of mp span more than
// half the globe. An area of that span is, on longitude/latitude data, one
// whose parts (or rings) lie on both sides of the 180° meridian: no
// administrative area is really 180° wide, so taking the planar centroid of
// its longitudes as they are would put it on the far side of the Earth
// (the Aleutians West census area lands in Saskatchewan).
func crossesAntimeridian(mp orb.MultiPolygon) bool {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, poly := range mp {
		for _, ring := range poly {
			for _, p := range ring {
				lo, hi = min(lo, p[0]), max(hi, p[0])
			}
		}
	}
	return hi-lo > 180
}

// unwrap returns a copy of mp whose longitudes run continuously: within a
// ring, a step of more than 180° is taken the short way round (a ring drawn
// across the meridian without being split there); a hole is moved by whole
// turns next to its outer ring; and the parts are moved by whole turns so
// that together they leave the widest possible stretch of longitude empty —
// the cut falls in the largest gap between the parts, which for an area is
// the ocean on the far side of the globe. The result may have longitudes
// beyond ±180; wrapLon brings a point computed from it back.
func unwrap(mp orb.MultiPolygon) orb.MultiPolygon {
	out := make(orb.MultiPolygon, len(mp))
	anchors := make([]float64, 0, len(mp))
	for k, poly := range mp {
		np := make(orb.Polygon, len(poly))
		for r, ring := range poly {
			np[r] = unwrapRing(ring)
			if r > 0 && len(np[r]) > 0 && len(np[0]) > 0 {
				shiftRing(np[r], turnsBetween(np[0][0][0], np[r][0][0]))
			}
		}
		out[k] = np
		if len(np) > 0 && len(np[0]) > 0 {
			anchors = append(anchors, wrapLon(np[0][0][0]))
		} else {
			anchors = append(anchors, math.NaN())
		}
	}
	cut := widestGapCut(anchors)
	for k, poly := range out {
		if a := anchors[k]; !math.IsNaN(a) {
			// Move the part so its anchor lies in (cut-360, cut].
			shift := a - wrapLon(poly[0][0][0]) // the turns unwrapRing added
			if a > cut {
				shift -= 360
			}
			for _, ring := range poly {
				shiftRing(ring, shift)
			}
		}
	}
	return out
}

// unwrapRing copies ring, taking every step of more than 180° in longitude
// the short way round.
func unwrapRing(ring orb.Ring) orb.Ring {
	out := make(orb.Ring, len(ring))
	var shift float64
	for i, p := range ring {
		if i > 0 {
			if d := p[0] + shift - out[i-1][0]; d > 180 {
				shift -= 360
			} else if d < -180 {
				shift += 360
			}
		}
		out[i] = orb.Point{p[0] + shift, p[1]}
	}
	return out
}

// turnsBetween returns the multiple of 360 that brings longitude x within
// 180° of ref.
func turnsBetween(ref, x float64) float64 {
	return -360 * math.Round((x-ref)/360)
}

func shiftRing(ring orb.Ring, by float64) {
	if by == 0 {
		return
	}
	for i := range ring {
		ring[i][0] += by
	}
}

// widestGapCut returns the longitude, in [-180, 180), that starts the
// widest gap between the anchors (NaN ones ignored), going east: anchors
// east of it are moved one turn west, so the parts sit together with the
// gap on the far side.
func widestGapCut(anchors []float64) float64 {
	a := make([]float64, 0, len(anchors))
	for _, x := range anchors {
		if !math.IsNaN(x) {
			a = append(a, x)
		}
	}
	if len(a) == 0 {
		return 180
	}
	slices.Sort(a)
	cut, widest := a[len(a)-1], a[0]+360-a[len(a)-1]
	for k := 0; k+1 < len(a); k++ {
		if g := a[k+1] - a[k]; g > widest {
			cut, widest = a[k], g
		}
	}
	return cut
}

// wrapLon brings a longitude into [-180, 180).
func wrapLon(x float64) float64 {
	x = math.Mod(x+180, 360)
	if x < 0 {
		x += 360
	}
	return x - 180
}
