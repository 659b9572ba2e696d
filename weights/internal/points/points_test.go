package points

import (
	"math"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"

	"github.com/areatest/areatest/samples/region"
)

// of is Of for layers whose areas all have vertices.
func of(t *testing.T, geoms []orb.MultiPolygon, inside bool) []orb.Point {
	t.Helper()
	pts, missing := Of(geoms, inside, false)
	if missing >= 0 {
		t.Fatalf("area %d has no vertex", missing)
	}
	return pts
}

func rect(x0, y0, x1, y1 float64) orb.Ring {
	return orb.Ring{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}, {x0, y0}}
}

func reversed(r orb.Ring) orb.Ring {
	out := slices.Clone(r)
	slices.Reverse(out)
	return out
}

func near(a, b orb.Point, tol float64) bool {
	return math.Abs(a[0]-b[0]) <= tol && math.Abs(a[1]-b[1]) <= tol
}

// Centroids against values worked out by hand from the decomposition into
// rectangles (centroid = area-weighted mean of the rectangles' centres), and
// against orb's planar.CentroidArea, an outside implementation.
func TestCentroids(t *testing.T) {
	// C shape: the square [0,3]² less [1,3]×[1,2]; area 7, centroid
	// ((9·1.5 − 2·2)/7, (9·1.5 − 2·1.5)/7) = (19/14, 1.5).
	cShape := orb.Polygon{{{0, 0}, {3, 0}, {3, 1}, {1, 1}, {1, 2}, {3, 2}, {3, 3}, {0, 3}, {0, 0}}}
	cases := []struct {
		name string
		mp   orb.MultiPolygon
		want orb.Point
	}{
		{"unit square", orb.MultiPolygon{{rect(0, 0, 1, 1)}}, orb.Point{0.5, 0.5}},
		{"unit square, clockwise", orb.MultiPolygon{{reversed(rect(0, 0, 1, 1))}}, orb.Point{0.5, 0.5}},
		{"C shape", orb.MultiPolygon{cShape}, orb.Point{19.0 / 14, 1.5}},
		// [0,4]² with the hole [2,3]×[1,3]: area 14, centroid ((16·2 − 2·2.5)/14, (16·2 − 2·2)/14).
		{"square with a hole", orb.MultiPolygon{{rect(0, 0, 4, 4), rect(2, 1, 3, 3)}}, orb.Point{27.0 / 14, 2}},
		{"hole oriented like the shell", orb.MultiPolygon{{rect(0, 0, 4, 4), reversed(reversed(rect(2, 1, 3, 3)))}}, orb.Point{27.0 / 14, 2}},
		// Parts of area 4 and 1: ((4·1 + 1·10.5)/5, (4·1 + 1·0.5)/5).
		{"two parts", orb.MultiPolygon{{rect(0, 0, 2, 2)}, {rect(10, 0, 11, 1)}}, orb.Point{2.9, 0.9}},
		// Projected-metre magnitudes: the result must not lose the offset.
		{"far from the origin", orb.MultiPolygon{{rect(500000, 4500000, 500010, 4500020)}}, orb.Point{500005, 4500010}},
	}
	for _, c := range cases {
		got := of(t, []orb.MultiPolygon{c.mp}, false)
		if !near(got[0], c.want, 1e-9*max(1, math.Abs(c.want[0]), math.Abs(c.want[1]))) {
			t.Errorf("%s: centroid %v, want %v", c.name, got[0], c.want)
		}
	}
	// orb's planar.CentroidArea on the invented demo region's districts.
	r, err := region.Build(region.DefaultConfig())
	if err != nil {
		t.Fatal(err)
	}
	got := of(t, r.Geoms, false)
	for i, mp := range r.Geoms {
		want, _ := planar.CentroidArea(mp)
		if !near(got[i], want, 1e-9) {
			t.Errorf("district %d: centroid %v, orb %v", i, got[i], want)
		}
	}
}

// Inside points lie inside, checked with orb's planar.MultiPolygonContains
// (an outside implementation) and away from every hole, on shapes whose
// centroid lies outside them.
func TestInsidePoints(t *testing.T) {
	cShape := orb.Polygon{{{0, 0}, {3, 0}, {3, 1}, {1, 1}, {1, 2}, {3, 2}, {3, 3}, {0, 3}, {0, 0}}}
	// A thin L: arms of width 0.2 and length 2; its centroid is near (0.6, 0.6), outside.
	thinL := orb.Polygon{{{0, 0}, {2, 0}, {2, 0.2}, {0.2, 0.2}, {0.2, 2}, {0, 2}, {0, 0}}}
	// A thin crescent: the left half of the unit circle, closed by a flattened
	// arc of the same width shifted right by 0.1.
	var crescent orb.Ring
	for k := 0; k <= 64; k++ {
		a := math.Pi/2 + math.Pi*float64(k)/64 // the left half of the outer circle
		crescent = append(crescent, orb.Point{math.Cos(a), math.Sin(a)})
	}
	for k := 64; k >= 0; k-- {
		a := math.Pi/2 + math.Pi*float64(k)/64
		crescent = append(crescent, orb.Point{0.1 + math.Cos(a), 0.98 * math.Sin(a)})
	}
	crescent = append(crescent, crescent[0])
	// A ring-shaped area: the square [0,4]² with the hole [1,3]²; the
	// centroid (2, 2) is the middle of the hole.
	annulus := orb.Polygon{rect(0, 0, 4, 4), rect(1, 1, 3, 3)}
	// Two equal islands: the centroid falls in the sea between them.
	islands := orb.MultiPolygon{{rect(0, 0, 1, 1)}, {rect(5, 0, 7, 1)}}
	cases := []struct {
		name         string
		mp           orb.MultiPolygon
		centroidOut  bool
		wantLargest  int // the part the point must lie in
		centroidKept bool
	}{
		{"C shape", orb.MultiPolygon{cShape}, true, 0, false},
		{"thin L", orb.MultiPolygon{thinL}, true, 0, false},
		{"crescent", orb.MultiPolygon{{crescent}}, true, 0, false},
		{"ring with a hole", orb.MultiPolygon{annulus}, true, 0, false},
		{"ring, clockwise shell", orb.MultiPolygon{{reversed(annulus[0]), annulus[1]}}, true, 0, false},
		{"islands", islands, true, 1, false},
		{"convex square", orb.MultiPolygon{{rect(0, 0, 2, 1)}}, false, 0, true},
	}
	for _, c := range cases {
		cen := of(t, []orb.MultiPolygon{c.mp}, false)
		if planar.MultiPolygonContains(c.mp, cen[0]) == c.centroidOut {
			t.Errorf("%s: the centroid %v should lie %s", c.name, cen[0], map[bool]string{true: "outside", false: "inside"}[c.centroidOut])
		}
		in := of(t, []orb.MultiPolygon{c.mp}, true)
		p := in[0]
		if !planar.PolygonContains(c.mp[c.wantLargest], p) || !strictlyInside(c.mp[c.wantLargest], p) {
			t.Errorf("%s: inside point %v is not inside part %d", c.name, p, c.wantLargest)
		}
		for _, hole := range c.mp[c.wantLargest][1:] {
			if planar.RingContains(hole, p) {
				t.Errorf("%s: inside point %v lies in a hole", c.name, p)
			}
		}
		if c.centroidKept && p != cen[0] {
			t.Errorf("%s: inside point %v, want the centroid %v", c.name, p, cen[0])
		}
	}
}

// On every district of a large invented region, inside points lie inside
// (orb's planar.MultiPolygonContains), and centroids that lie inside are kept.
func TestInsidePointsOnRegion(t *testing.T) {
	cfg := region.DefaultConfig()
	cfg.Areas = 3000
	r, err := region.Build(cfg)
	if err != nil {
		t.Fatal(err)
	}
	cen := of(t, r.Geoms, false)
	in := of(t, r.Geoms, true)
	moved := 0
	for i, mp := range r.Geoms {
		if !planar.MultiPolygonContains(mp, in[i]) {
			t.Errorf("district %d: inside point %v is outside", i, in[i])
		}
		if in[i] != cen[i] {
			moved++
			if planar.MultiPolygonContains(mp, cen[i]) && !onBoundary(mp, cen[i]) {
				t.Errorf("district %d: centroid %v inside but replaced", i, cen[i])
			}
		}
	}
	t.Logf("%d of %d centroids lay outside their district", moved, len(r.Geoms))
}

func onBoundary(mp orb.MultiPolygon, p orb.Point) bool {
	for _, poly := range mp {
		for _, ring := range poly {
			for i := range len(ring) - 1 {
				if onSegment(ring[i], ring[i+1], p) {
					return true
				}
			}
		}
	}
	return false
}

// An area whose rings enclose no area (all on a line) gets its
// bounding-box centre; one without vertices is named.
func TestDegenerateAreas(t *testing.T) {
	if _, missing := Of([]orb.MultiPolygon{{{rect(0, 0, 1, 1)}}, {}}, false, false); missing != 1 {
		t.Errorf("an empty geometry: missing %d, want 1", missing)
	}
	flat := orb.MultiPolygon{{{{0, 0}, {2, 0}, {4, 0}, {0, 0}}}}
	for _, inside := range []bool{false, true} {
		if got := of(t, []orb.MultiPolygon{flat}, inside); got[0] != (orb.Point{2, 0}) {
			t.Errorf("inside %v, a flat area: %v", inside, got)
		}
	}
}

func BenchmarkRepresentativePoints250000(b *testing.B) {
	cfg := region.DefaultConfig()
	cfg.Areas = 250000
	r, err := region.Build(cfg)
	if err != nil {
		b.Fatal(err)
	}
	for _, inside := range []bool{false, true} {
		b.Run(map[bool]string{false: "centroid", true: "inside"}[inside], func(b *testing.B) {
			for b.Loop() {
				if _, missing := Of(r.Geoms, inside, false); missing >= 0 {
					b.Fatalf("area %d has no vertex", missing)
				}
			}
		})
	}
}
