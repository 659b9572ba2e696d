package contig

import "math"

// Segment predicates for contiguity, written by hand rather than taken from
// a general geometry library: the search needs three narrow questions
// answered with one tolerance (do two sides come within snap; over what
// length do they run within snap of each other; do two sides of a ring meet
// exactly), and each is a handful of multiplications. All differences are
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

// segShared returns the length along which segments a–b and c–d run within
// snap of each other: measured on the longer one, the stretch of it that
// the other projects onto while lying within snap of its line. Sides that
// merely cross, or meet end to end at an angle, give a length of the order
// of snap or less; sides that lie along one another give the length of
// their overlap, whether or not their vertices coincide.
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
	// The other side, c + τ(d−c) for τ in [0, 1], in coordinates along
	// (s) and across (h) the line of the longer one, from a.
	s0 := (cx-ax)*ux + (cy-ay)*uy
	s1 := (dx-ax)*ux + (dy-ay)*uy
	h0 := (cy-ay)*ux - (cx-ax)*uy
	h1 := (dy-ay)*ux - (dx-ax)*uy
	lo, hi := segClip(0, 1, s0, s1-s0, 0, l)
	lo, hi = segClip(lo, hi, h0, h1-h0, -snap, snap)
	if hi <= lo {
		return 0
	}
	return (hi - lo) * math.Abs(s1-s0)
}

// segClip narrows [lo, hi] to the τ where m ≤ c + d·τ ≤ M; an empty result
// has hi ≤ lo.
func segClip(lo, hi, c, d, m, M float64) (float64, float64) {
	if d == 0 {
		if c < m || c > M {
			return 1, 0
		}
		return lo, hi
	}
	t1, t2 := (m-c)/d, (M-c)/d
	if t1 > t2 {
		t1, t2 = t2, t1
	}
	return max(lo, t1), min(hi, t2)
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
