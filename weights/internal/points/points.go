package points

import (
	"slices"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/internal/parallel"
)

// block is the number of areas a worker takes at a time.
const block = 1024

// Of returns one point per area: the area-weighted centroid, or with inside
// a point inside the area (see weights.RepresentativePoints for the rule).
// With lonLat the coordinates are longitude/latitude, and an area whose
// longitudes span more than 180° is taken to cross the antimeridian: its
// point is computed on its unwrapped copy (see unwrap) and brought back to
// [-180, 180). missing is the first area with no vertex at all, or −1 when
// there is none.
func Of(geoms []orb.MultiPolygon, inside, lonLat bool) (pts []orb.Point, missing int) {
	pts = make([]orb.Point, len(geoms))
	bad := make([]bool, len(geoms))
	parallel.ForRanges(len(geoms), block, 0, func(lo, hi int) {
		var sc scan
		for i := lo; i < hi; i++ {
			mp, wrapped := geoms[i], lonLat && crossesAntimeridian(geoms[i])
			if wrapped {
				mp = unwrap(mp)
			}
			p, ok := sc.represent(mp, inside)
			if wrapped {
				p[0] = wrapLon(p[0])
			}
			pts[i], bad[i] = p, !ok
		}
	})
	for i, b := range bad {
		if b {
			return nil, i
		}
	}
	return pts, -1
}

// scan holds one worker's scratch space for inside points.
type scan struct {
	ys, xs []float64
}

// represent returns the centroid of mp, or with inside a point inside it; ok is false when mp has no
// vertex at all.
func (sc *scan) represent(mp orb.MultiPolygon, inside bool) (orb.Point, bool) {
	origin, ok := firstVertex(mp)
	if !ok {
		return orb.Point{}, false
	}
	var area, mx, my float64
	largest, largestArea := -1, 0.0
	for k, poly := range mp {
		a, x, y := polygonMoments(poly, origin)
		area += a
		mx += x
		my += y
		if a > largestArea {
			largest, largestArea = k, a
		}
	}
	if !(area > 0) {
		return boundCentre(mp), true
	}
	c := orb.Point{origin[0] + mx/area, origin[1] + my/area}
	if !inside {
		return c, true
	}
	for _, poly := range mp {
		if strictlyInside(poly, c) {
			return c, true
		}
	}
	if largest < 0 {
		return boundCentre(mp), true
	}
	if p, ok := sc.insidePoint(mp[largest], origin); ok {
		return p, true
	}
	return c, true
}

func firstVertex(mp orb.MultiPolygon) (orb.Point, bool) {
	for _, poly := range mp {
		for _, ring := range poly {
			if len(ring) > 0 {
				return ring[0], true
			}
		}
	}
	return orb.Point{}, false
}

func boundCentre(mp orb.MultiPolygon) orb.Point {
	return mp.Bound().Center()
}

// ringMoments returns the signed area of ring and its first moments about
// origin (area times centroid, relative to origin). Taking coordinates
// relative to a nearby origin keeps the shoelace products small, so the sums
// do not lose the area to cancellation when coordinates are large (projected
// metres) compared with the polygon.
func ringMoments(ring orb.Ring, origin orb.Point) (a, mx, my float64) {
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

// polygonMoments returns the area of poly (outer ring minus holes, by
// absolute values, so ring orientation does not matter) and its first moments.
func polygonMoments(poly orb.Polygon, origin orb.Point) (a, mx, my float64) {
	for k, ring := range poly {
		ra, rx, ry := ringMoments(ring, origin)
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

// crossingX returns where the edge p→q meets the horizontal line at y, and
// whether it does under the half-open rule (an edge counts when its ends lie
// on different sides of y, the upper end inclusive). The same expression serves
// the point-in-polygon test and the scan lines, so a point the scan line
// finds inside is also inside for the test.
func crossingX(p, q orb.Point, y float64) (float64, bool) {
	if (p[1] > y) == (q[1] > y) {
		return 0, false
	}
	return p[0] + (y-p[1])*(q[0]-p[0])/(q[1]-p[1]), true
}

// strictlyInside reports whether c lies inside poly (even–odd over all
// its rings, so not in a hole) and on none of its edges.
func strictlyInside(poly orb.Polygon, c orb.Point) bool {
	in := false
	for _, ring := range poly {
		n := len(ring)
		for i := range n {
			p, q := ring[i], ring[(i+1)%n]
			if onSegment(p, q, c) {
				return false
			}
			if x, ok := crossingX(p, q, c[1]); ok && c[0] < x {
				in = !in
			}
		}
	}
	return in
}

func onSegment(p, q, c orb.Point) bool {
	if c[0] < min(p[0], q[0]) || c[0] > max(p[0], q[0]) || c[1] < min(p[1], q[1]) || c[1] > max(p[1], q[1]) {
		return false
	}
	return (q[0]-p[0])*(c[1]-p[1])-(q[1]-p[1])*(c[0]-p[0]) == 0
}

// insidePoint finds a point inside poly by the scan lines described at
// weights.RepresentativePoints; ok is false when poly has no height.
func (sc *scan) insidePoint(poly orb.Polygon, origin orb.Point) (orb.Point, bool) {
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
	a, _, my := polygonMoments(poly, origin)
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
				if x, ok := crossingX(ring[i], ring[(i+1)%n], y); ok {
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
