package contig

import "math"

// Segment predicates for contiguity, written by hand rather than taken from
// a general geometry library: the search needs three narrow questions
// answered with one tolerance (do two sides come within snap; over what
// length do they run together, between vertices within snap of the other
// side; do two sides of a ring meet exactly), and each is a handful of multiplications. All differences are
// taken before any product, so coordinates of any magnitude keep the
// precision of their differences.

// segPointDist2 returns the squared distance from p to the segment a–b.
func segPointDist2(px, py, ax, ay, bx, by float64) float64 {
	dx, dy := bx-ax, by-ay
	qx, qy := px-ax, py-ay
	l2 := dx*dx + dy*dy
	var t float64
	if l2 > 0 {
		t = (qx*dx + qy*dy) / l2
		t = min(max(t, 0), 1)
	}
	ex, ey := qx-t*dx, qy-t*dy
	return ex*ex + ey*ey
}

// segOrient is twice the signed area of the triangle a, b, c: positive when
// c lies to the left of a→b.
func segOrient(ax, ay, bx, by, cx, cy float64) float64 {
	return (bx-ax)*(cy-ay) - (by-ay)*(cx-ax)
}

func segOpposite(u, v float64) bool { return (u > 0 && v < 0) || (u < 0 && v > 0) }

// segCross reports whether the interiors of a–b and c–d cross at a single
// point, each passing strictly from one side of the other to the other.
func segCross(ax, ay, bx, by, cx, cy, dx, dy float64) bool {
	return segOpposite(segOrient(ax, ay, bx, by, cx, cy), segOrient(ax, ay, bx, by, dx, dy)) &&
		segOpposite(segOrient(cx, cy, dx, dy, ax, ay), segOrient(cx, cy, dx, dy, bx, by))
}

// segNear reports whether segments a–b and c–d come within snap of each
// other (snap2 is its square): an endpoint of one near the other, or a
// crossing.
func segNear(ax, ay, bx, by, cx, cy, dx, dy, snap2 float64) bool {
	return segPointDist2(cx, cy, ax, ay, bx, by) <= snap2 ||
		segPointDist2(dx, dy, ax, ay, bx, by) <= snap2 ||
		segPointDist2(ax, ay, cx, cy, dx, dy) <= snap2 ||
		segPointDist2(bx, by, cx, cy, dx, dy) <= snap2 ||
		segCross(ax, ay, bx, by, cx, cy, dx, dy)
}

// segShared returns the length along which segments a–b and c–d run
// together: measured on the longer one, the stretch between the vertices of
// either side that lie within snap of the other side (0 when fewer than two
// do). Between two such vertices both sides stay within snap of each other,
// distance to a segment being convex. Sides that lie along one another give
// the length of their overlap, whether or not their vertices coincide; sides
// that only meet — at a shared corner, however narrow the angle between
// them, or crossing — give at most about the snap distance: the stretch
// where a side leaving a corner at an angle θ is still within snap of the
// other (snap/tan θ, long for small θ) ends at no vertex and does not count.
// Only a side short enough to lie within snap of the other over its whole
// length counts whole.
func segShared(ax, ay, bx, by, cx, cy, dx, dy, snap float64) float64 {
	ux, uy := bx-ax, by-ay
	vx, vy := dx-cx, dy-cy
	if ux*ux+uy*uy < vx*vx+vy*vy {
		ax, ay, bx, by, cx, cy, dx, dy = cx, cy, dx, dy, ax, ay, bx, by
		ux, uy = vx, vy
	}
	l := math.Hypot(ux, uy)
	if l == 0 {
		return 0
	}
	ux, uy = ux/l, uy/l
	snap2 := snap * snap
	// Positions along a–b, from a, of the vertices within snap of the
	// other side.
	lo, hi := math.Inf(1), math.Inf(-1)
	if segPointDist2(ax, ay, cx, cy, dx, dy) <= snap2 {
		lo, hi = 0, 0
	}
	if segPointDist2(bx, by, cx, cy, dx, dy) <= snap2 {
		lo, hi = min(lo, l), l
	}
	if segPointDist2(cx, cy, ax, ay, bx, by) <= snap2 {
		s := min(max((cx-ax)*ux+(cy-ay)*uy, 0), l)
		lo, hi = min(lo, s), max(hi, s)
	}
	if segPointDist2(dx, dy, ax, ay, bx, by) <= snap2 {
		s := min(max((dx-ax)*ux+(dy-ay)*uy, 0), l)
		lo, hi = min(lo, s), max(hi, s)
	}
	if hi <= lo {
		return 0
	}
	return hi - lo
}

// segMeet says whether segments a–b and c–d have any point in common,
// exactly (no tolerance), and gives one such point. It serves the check for
// rings that cross or touch themselves; proper is true when the interiors
// cross at a single point.
func segMeet(ax, ay, bx, by, cx, cy, dx, dy float64) (meet, proper bool, x, y float64) {
	d1 := segOrient(ax, ay, bx, by, cx, cy)
	d2 := segOrient(ax, ay, bx, by, dx, dy)
	d3 := segOrient(cx, cy, dx, dy, ax, ay)
	d4 := segOrient(cx, cy, dx, dy, bx, by)
	if segOpposite(d1, d2) && segOpposite(d3, d4) {
		t := d3 / (d3 - d4)
		return true, true, ax + t*(bx-ax), ay + t*(by-ay)
	}
	switch {
	case d1 == 0 && segWithin(ax, ay, bx, by, cx, cy):
		return true, false, cx, cy
	case d2 == 0 && segWithin(ax, ay, bx, by, dx, dy):
		return true, false, dx, dy
	case d3 == 0 && segWithin(cx, cy, dx, dy, ax, ay):
		return true, false, ax, ay
	case d4 == 0 && segWithin(cx, cy, dx, dy, bx, by):
		return true, false, bx, by
	}
	return false, false, 0, 0
}

// segWithin reports whether p, known to be collinear with a–b, lies on it.
func segWithin(ax, ay, bx, by, px, py float64) bool {
	return min(ax, bx) <= px && px <= max(ax, bx) && min(ay, by) <= py && py <= max(ay, by)
}
