package weights

import (
	"fmt"
	"slices"
	"strings"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/internal/parallel"
)

// PointMode says which point stands for an area in distance-based weights.
type PointMode int

const (
	// Centroid is the area-weighted centroid of all parts, holes subtracted.
	// For a C-shaped area or a scatter of islands it can lie outside the area.
	Centroid PointMode = iota
	// Inside is a point guaranteed to lie inside the area: the centroid when
	// it does, otherwise a point in the area's largest part (see
	// RepresentativePoints).
	Inside
)

// String returns "centroid" or "inside", the words ParsePointMode reads.
func (p PointMode) String() string {
	if p == Inside {
		return "inside"
	}
	return "centroid"
}

// ParsePointMode reads "centroid" or "inside" (any case).
func ParsePointMode(s string) (PointMode, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "centroid":
		return Centroid, nil
	case "inside":
		return Inside, nil
	}
	return Centroid, fmt.Errorf("point mode must be centroid or inside, not %q", s)
}

// RepresentativePoints returns one point per area.
//
// Centroid is the area-weighted centroid of the whole geometry: every part's
// outer ring counts positively and every hole negatively, whatever the
// rings' orientation. Inside keeps that centroid when it lies strictly inside
// the area (inside some part and in none of its holes); otherwise it takes the
// area's largest part (by area, holes subtracted) and three horizontal lines
// across it — through the part's centroid, through the middle of its bounding
// box, and through the middle of the tallest band between consecutive vertex
// heights — each moved to halfway between the two vertex heights around it so
// it passes through no vertex. Along each line the part's rings cut out the
// stretches that lie inside the part (even–odd rule, so holes are skipped);
// the point is the midpoint of the widest stretch found on the three lines.
//
// Coordinates are used as they are, as planar: for longitude/latitude layers
// the computation happens in the plane of degrees. At the size of
// administrative areas the difference from a centroid on the sphere is a
// small fraction of the area's width, which does not matter for choosing
// neighbours; it does for areas spanning tens of degrees, and geometries
// that cross the antimeridian must be split there (as RFC 7946 asks).
//
// An area with no vertex is an error naming it. An area whose rings enclose
// no area (all points on a line) has no centroid or inside; it gets the centre
// of its vertices' bounding box.
func RepresentativePoints(geoms []orb.MultiPolygon, mode PointMode) ([]orb.Point, error) {
	if mode != Centroid && mode != Inside {
		return nil, fmt.Errorf("weights: unknown point mode %d", mode)
	}
	out := make([]orb.Point, len(geoms))
	bad := make([]bool, len(geoms))
	parallel.ForRanges(len(geoms), kdBlock, 0, func(lo, hi int) {
		var sc ptsScan
		for i := lo; i < hi; i++ {
			p, ok := sc.represent(geoms[i], mode)
			out[i], bad[i] = p, !ok
		}
	})
	for i, b := range bad {
		if b {
			return nil, fmt.Errorf("weights: area %d has no vertices, so no representative point", i)
		}
	}
	return out, nil
}

// ptsScan holds one worker's scratch space for inside points.
type ptsScan struct {
	ys, xs []float64
}

// represent returns the point of mp for mode; ok is false when mp has no
// vertex at all.
func (sc *ptsScan) represent(mp orb.MultiPolygon, mode PointMode) (orb.Point, bool) {
	origin, ok := ptsFirstVertex(mp)
	if !ok {
		return orb.Point{}, false
	}
	var area, mx, my float64
	largest, largestArea := -1, 0.0
	for k, poly := range mp {
		a, x, y := ptsPolygonMoments(poly, origin)
		area += a
		mx += x
		my += y
		if a > largestArea {
			largest, largestArea = k, a
		}
	}
	if !(area > 0) {
		return ptsBoundCentre(mp), true
	}
	c := orb.Point{origin[0] + mx/area, origin[1] + my/area}
	if mode == Centroid {
		return c, true
	}
	for _, poly := range mp {
		if ptsStrictlyInside(poly, c) {
			return c, true
		}
	}
	if largest < 0 {
		return ptsBoundCentre(mp), true
	}
	if p, ok := sc.insidePoint(mp[largest], origin); ok {
		return p, true
	}
	return c, true
}

func ptsFirstVertex(mp orb.MultiPolygon) (orb.Point, bool) {
	for _, poly := range mp {
		for _, ring := range poly {
			if len(ring) > 0 {
				return ring[0], true
			}
		}
	}
	return orb.Point{}, false
}

func ptsBoundCentre(mp orb.MultiPolygon) orb.Point {
	return mp.Bound().Center()
}

// ptsRingMoments returns the signed area of ring and its first moments about
// origin (area times centroid, relative to origin). Taking coordinates
// relative to a nearby origin keeps the shoelace products small, so the sums
// do not lose the area to cancellation when coordinates are large (projected
// metres) compared with the polygon.
func ptsRingMoments(ring orb.Ring, origin orb.Point) (a, mx, my float64) {
	n := len(ring)
	if n < 3 {
		return 0, 0, 0
	}
	for i := range n {
		p, q := ring[i], ring[(i+1)%n]
		x0, y0 := p[0]-origin[0], p[1]-origin[1]
		x1, y1 := q[0]-origin[0], q[1]-origin[1]
		cross := x0*y1 - x1*y0
		a += cross
		mx += (x0 + x1) * cross
		my += (y0 + y1) * cross
	}
	return a / 2, mx / 6, my / 6
}

// ptsPolygonMoments returns the area of poly (outer ring minus holes, by
// absolute values, so ring orientation does not matter) and its first moments.
func ptsPolygonMoments(poly orb.Polygon, origin orb.Point) (a, mx, my float64) {
	for k, ring := range poly {
		ra, rx, ry := ptsRingMoments(ring, origin)
		sign := 1.0
		if (ra < 0) != (k > 0) {
			sign = -1
		}
		a += sign * ra
		mx += sign * rx
		my += sign * ry
	}
	return a, mx, my
}

// ptsCrossingX returns where the edge p→q meets the horizontal line at y, and
// whether it does under the half-open rule (an edge counts when its ends lie
// on different sides of y, the upper end inclusive). The same expression serves
// the point-in-polygon test and the scan lines, so a point the scan line
// finds inside is also inside for the test.
func ptsCrossingX(p, q orb.Point, y float64) (float64, bool) {
	if (p[1] > y) == (q[1] > y) {
		return 0, false
	}
	return p[0] + (y-p[1])*(q[0]-p[0])/(q[1]-p[1]), true
}

// ptsStrictlyInside reports whether c lies inside poly (even–odd over all
// its rings, so not in a hole) and on none of its edges.
func ptsStrictlyInside(poly orb.Polygon, c orb.Point) bool {
	in := false
	for _, ring := range poly {
		n := len(ring)
		for i := range n {
			p, q := ring[i], ring[(i+1)%n]
			if ptsOnSegment(p, q, c) {
				return false
			}
			if x, ok := ptsCrossingX(p, q, c[1]); ok && c[0] < x {
				in = !in
			}
		}
	}
	return in
}

func ptsOnSegment(p, q, c orb.Point) bool {
	if c[0] < min(p[0], q[0]) || c[0] > max(p[0], q[0]) || c[1] < min(p[1], q[1]) || c[1] > max(p[1], q[1]) {
		return false
	}
	return (q[0]-p[0])*(c[1]-p[1])-(q[1]-p[1])*(c[0]-p[0]) == 0
}

// insidePoint finds a point inside poly by the scan lines described at
// RepresentativePoints; ok is false when poly has no height.
func (sc *ptsScan) insidePoint(poly orb.Polygon, origin orb.Point) (orb.Point, bool) {
	sc.ys = sc.ys[:0]
	for _, ring := range poly {
		for _, p := range ring {
			sc.ys = append(sc.ys, p[1])
		}
	}
	slices.Sort(sc.ys)
	sc.ys = slices.Compact(sc.ys)
	ys := sc.ys
	if len(ys) < 2 {
		return orb.Point{}, false
	}
	// gapAt returns the band between consecutive vertex heights holding y.
	gapAt := func(y float64) int {
		k, _ := slices.BinarySearch(ys, y)
		return min(max(k-1, 0), len(ys)-2)
	}
	a, _, my := ptsPolygonMoments(poly, origin)
	tallest := 0
	for k := 1; k+1 < len(ys); k++ {
		if ys[k+1]-ys[k] > ys[tallest+1]-ys[tallest] {
			tallest = k
		}
	}
	gaps := [3]int{tallest, gapAt((ys[0] + ys[len(ys)-1]) / 2), tallest}
	if a > 0 {
		gaps[2] = gapAt(origin[1] + my/a)
	}
	best, bestWidth := orb.Point{}, -1.0
	for t, g := range gaps {
		if slices.Contains(gaps[:t], g) {
			continue
		}
		y := ys[g] + (ys[g+1]-ys[g])/2
		if !(y > ys[g] && y < ys[g+1]) {
			continue // the band is too thin to hold a line between its edges
		}
		sc.xs = sc.xs[:0]
		for _, ring := range poly {
			n := len(ring)
			for i := range n {
				if x, ok := ptsCrossingX(ring[i], ring[(i+1)%n], y); ok {
					sc.xs = append(sc.xs, x)
				}
			}
		}
		slices.Sort(sc.xs)
		for k := 0; k+1 < len(sc.xs); k += 2 {
			x0, x1 := sc.xs[k], sc.xs[k+1]
			mid := x0 + (x1-x0)/2
			if x1-x0 > bestWidth && mid > x0 && mid < x1 {
				best, bestWidth = orb.Point{mid, y}, x1-x0
			}
		}
	}
	return best, bestWidth > 0
}
