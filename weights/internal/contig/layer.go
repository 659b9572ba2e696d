package contig

import (
	"fmt"
	"math"
	"slices"

	"github.com/areatest/areatest/internal/numtext"

	"github.com/paulmach/orb"
)

// bounds is a bounding box grown point by point.
type bounds struct{ minx, miny, maxx, maxy float64 }

func (b *bounds) reset() {
	b.minx, b.miny = math.Inf(1), math.Inf(1)
	b.maxx, b.maxy = math.Inf(-1), math.Inf(-1)
}

// add takes a point in; non-finite coordinates are ignored (they are
// reported elsewhere).
func (b *bounds) add(x, y float64) {
	if math.IsNaN(x) || math.IsNaN(y) || math.IsInf(x, 0) || math.IsInf(y, 0) {
		return
	}
	b.minx = min(b.minx, x)
	b.maxx = max(b.maxx, x)
	b.miny = min(b.miny, y)
	b.maxy = max(b.maxy, y)
}

func (b *bounds) ok() bool { return b.minx <= b.maxx }

// namer names areas in messages: by id when ids were given, by 0-based
// index otherwise.
type namer struct{ ids []string }

func (n namer) area(i int) string {
	if n.ids != nil {
		return fmt.Sprintf("area %q", n.ids[i])
	}
	return fmt.Sprintf("area index %d", i)
}

// ringName says which ring of an area is meant, in the words a reader
// of the file would use: parts and holes counted from 1.
func ringName(part, k int) string {
	if k == 0 {
		return fmt.Sprintf("the outer ring of part %d", part+1)
	}
	return fmt.Sprintf("hole %d of part %d", k, part+1)
}

// check finds the geometry errors that make contiguity meaningless —
// missing parts, rings or positions, unclosed rings, non-finite coordinates
// — and returns the bounds of all positions. The first error in area order
// is returned, so the message does not depend on anything but the input.
func check(geoms []orb.MultiPolygon, names namer) (bounds, error) {
	var b bounds
	b.reset()
	for a, mp := range geoms {
		if len(mp) == 0 {
			return b, fmt.Errorf("weights: %s has no polygon", names.area(a))
		}
		for part, poly := range mp {
			if len(poly) == 0 {
				return b, fmt.Errorf("weights: %s: part %d has no rings", names.area(a), part+1)
			}
			for k, ring := range poly {
				if len(ring) == 0 {
					return b, fmt.Errorf("weights: %s: %s has no positions", names.area(a), ringName(part, k))
				}
				for v, p := range ring {
					if math.IsNaN(p[0]) || math.IsNaN(p[1]) || math.IsInf(p[0], 0) || math.IsInf(p[1], 0) {
						return b, fmt.Errorf("weights: %s: position %d of %s is not a finite number: (%v, %v)",
							names.area(a), v+1, ringName(part, k), p[0], p[1])
					}
					b.add(p[0], p[1])
				}
				if first, last := ring[0], ring[len(ring)-1]; first != last {
					return b, fmt.Errorf("weights: %s: %s is not closed: it starts at (%v, %v) and ends at (%v, %v)",
						names.area(a), ringName(part, k), first[0], first[1], last[0], last[1])
				}
			}
		}
	}
	return b, nil
}

// medianSegment returns the median length of the boundary segments of
// geoms, from an evenly spaced sample of at most about 65,536 of them so
// that the cost stays a small part of the whole. Zero-length and non-finite
// segments are skipped; 0 means there was none left.
func medianSegment(geoms []orb.MultiPolygon) float64 {
	var n int
	for _, mp := range geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				n += max(0, len(ring)-1)
			}
		}
	}
	stride := max(1, n/65536)
	sample := make([]float64, 0, min(n, 65536)+1)
	var k int
	for _, mp := range geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				for v := 0; v+1 < len(ring); v++ {
					if k%stride == 0 {
						l := math.Hypot(ring[v+1][0]-ring[v][0], ring[v+1][1]-ring[v][1])
						if l > 0 && !math.IsInf(l, 0) && !math.IsNaN(l) {
							sample = append(sample, l)
						}
					}
					k++
				}
			}
		}
	}
	if len(sample) == 0 {
		return 0
	}
	slices.Sort(sample)
	return sample[len(sample)/2]
}

// layer holds every boundary segment of a layer in flat arrays. The
// vertices of each ring are stored one after another, closing vertex
// included, so that the segment starting at vertex v ends at vertex v+1;
// segments are named by their starting vertex.
//
// What the search reads about a segment sits together in memory (points
// interleaved, one record of numbers per vertex) because it reads segments
// in cell order, not in the order they are stored.
type layer struct {
	pts []orb.Point
	// seg holds a record per vertex, and one more at the end.
	seg []segment
	// ringStart is the first vertex of each ring, with len(x) appended.
	ringStart []int32
	// ringPart and ringHole say where each ring sits in its area, for
	// messages: part index, and 0 for the outer ring or k for hole k.
	ringPart, ringHole []int32
	// ringMaybe marks rings whose signed area is about zero but which have
	// sides enough to cross themselves: such a ring is a sliver unless it
	// does, since crossing lobes of opposite turn cancel in the signed area.
	// Their contacts count only once the search has shown a crossing.
	ringMaybe []bool
	// slivers lists the near-zero-area rings in area order; solid counts
	// each area's other rings.
	slivers []sliverRing
	solid   []int32
	b       bounds
}

// segment describes the segment starting at a vertex.
type segment struct {
	// area is the area of the segment, or -1 at the last vertex of a ring,
	// where no segment starts.
	area int32
	// ring is the ring the vertex belongs to.
	ring int32
	// first is the first piece of the segment (see layer.cut); the
	// pieces of the segment at v are seg[v].first … seg[v+1].first-1.
	first int32
}

// sliverRing is a ring with about zero signed area: ring is its number
// in the layer when it was kept as a candidate, -1 when it was left out.
type sliverRing struct{ area, part, hole, ring int32 }

// Kind says what is wrong with an area's rings.
type Kind int

const (
	// Sliver is a ring of about zero area, left out of the search.
	Sliver Kind = iota
	// NoArea is an area left with no ring of positive area: it gets no
	// neighbour.
	NoArea
	// MeetsItself is a ring that crosses or touches itself; its sides are
	// still used.
	MeetsItself
)

// Problem is one geometry problem of one area, found on the way: never
// fatal, reported to the user.
type Problem struct {
	Kind Kind
	// Area is the area's index in the layer.
	Area int
	// Text says what is wrong, the area and ring named.
	Text string
}

// String returns the problem's text.
func (p Problem) String() string { return p.Text }

// flatten copies the boundaries of geoms (already checked by
// check) into a layer, dropping repeated consecutive positions.
// Rings of about zero area are left out, or kept as candidates when they
// have four sides or more (fewer cannot cross themselves).
func flatten(geoms []orb.MultiPolygon, snap float64) (*layer, error) {
	var nv int
	for _, mp := range geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				nv += len(ring)
			}
		}
	}
	if nv >= math.MaxInt32 {
		return nil, fmt.Errorf("weights: %d boundary positions are more than contiguity can index", nv)
	}
	l := &layer{
		pts:   make([]orb.Point, 0, nv),
		seg:   make([]segment, 0, nv+1),
		solid: make([]int32, len(geoms)),
	}
	l.b.reset()
	for a, mp := range geoms {
		for part, poly := range mp {
			for k, ring := range poly {
				start := len(l.pts)
				r := int32(len(l.ringStart))
				for v, p := range ring {
					if v > 0 && p == ring[v-1] {
						continue
					}
					l.pts = append(l.pts, p)
					l.seg = append(l.seg, segment{area: int32(a), ring: r})
				}
				maybe := isSliver(l.pts[start:], snap)
				if maybe && len(l.pts)-start < 5 {
					l.pts, l.seg = l.pts[:start], l.seg[:start]
					l.slivers = append(l.slivers, sliverRing{int32(a), int32(part), int32(k), -1})
					continue
				}
				if maybe {
					l.slivers = append(l.slivers, sliverRing{int32(a), int32(part), int32(k), r})
				} else {
					l.solid[a]++
				}
				l.seg[len(l.seg)-1].area = -1
				for _, p := range l.pts[start:] {
					l.b.add(p[0], p[1])
				}
				l.ringStart = append(l.ringStart, int32(start))
				l.ringPart = append(l.ringPart, int32(part))
				l.ringHole = append(l.ringHole, int32(k))
				l.ringMaybe = append(l.ringMaybe, maybe)
			}
		}
	}
	l.ringStart = append(l.ringStart, int32(len(l.pts)))
	l.seg = append(l.seg, segment{area: -1, ring: -1})
	return l, nil
}

// sliverProblems reports the sliver rings — those of about zero area that
// the search did not find crossing themselves — and the areas left with no
// ring of positive area, each kind in area order.
func (l *layer) sliverProblems(crossed []bool, snap float64, names namer) []Problem {
	var slivers, empty []Problem
	solid := l.solid
	for _, s := range l.slivers {
		if s.ring >= 0 && crossed[s.ring] {
			solid[s.area]++
			continue
		}
		slivers = append(slivers, Problem{Sliver, int(s.area), fmt.Sprintf("%s: %s has no area (its mean width is at most the snap distance %s); it is left out of the neighbour search",
			names.area(int(s.area)), ringName(int(s.part), int(s.hole)), numtext.Length(snap))})
	}
	for _, s := range l.slivers {
		if solid[s.area] == 0 {
			solid[s.area] = -1 // one problem per area
			empty = append(empty, Problem{NoArea, int(s.area), fmt.Sprintf("%s has no ring with an area; it gets no neighbour", names.area(int(s.area)))})
		}
	}
	return append(slivers, empty...)
}

// isSliver reports whether a closed ring (given by its vertices, the
// closing one included) has a mean width, twice its signed area over its
// perimeter, of at most snap. The area is summed relative to the first
// vertex so that large coordinates do not swamp it.
func isSliver(pts []orb.Point, snap float64) bool {
	if len(pts) < 4 {
		return true
	}
	var area2, perim float64
	x0, y0 := pts[0][0], pts[0][1]
	for v := 0; v+1 < len(pts); v++ {
		ax, ay := pts[v][0]-x0, pts[v][1]-y0
		bx, by := pts[v+1][0]-x0, pts[v+1][1]-y0
		area2 += ax*by - bx*ay
		perim += math.Hypot(bx-ax, by-ay)
	}
	return math.Abs(area2) <= snap*perim
}
