package weights

import (
	"math"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"

	"github.com/areatest/areatest/samples/region"
)

func ptsRect(x0, y0, x1, y1 float64) orb.Ring {
	return orb.Ring{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}, {x0, y0}}
}

func ptsReversed(r orb.Ring) orb.Ring {
	out := slices.Clone(r)
	slices.Reverse(out)
	return out
}

func ptsNear(a, b orb.Point, tol float64) bool {
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
		{"unit square", orb.MultiPolygon{{ptsRect(0, 0, 1, 1)}}, orb.Point{0.5, 0.5}},
		{"unit square, clockwise", orb.MultiPolygon{{ptsReversed(ptsRect(0, 0, 1, 1))}}, orb.Point{0.5, 0.5}},
		{"C shape", orb.MultiPolygon{cShape}, orb.Point{19.0 / 14, 1.5}},
		// [0,4]² with the hole [2,3]×[1,3]: area 14, centroid ((16·2 − 2·2.5)/14, (16·2 − 2·2)/14).
		{"square with a hole", orb.MultiPolygon{{ptsRect(0, 0, 4, 4), ptsRect(2, 1, 3, 3)}}, orb.Point{27.0 / 14, 2}},
		{"hole oriented like the shell", orb.MultiPolygon{{ptsRect(0, 0, 4, 4), ptsReversed(ptsReversed(ptsRect(2, 1, 3, 3)))}}, orb.Point{27.0 / 14, 2}},
		// Parts of area 4 and 1: ((4·1 + 1·10.5)/5, (4·1 + 1·0.5)/5).
		{"two parts", orb.MultiPolygon{{ptsRect(0, 0, 2, 2)}, {ptsRect(10, 0, 11, 1)}}, orb.Point{2.9, 0.9}},
		// Projected-metre magnitudes: the result must not lose the offset.
		{"far from the origin", orb.MultiPolygon{{ptsRect(500000, 4500000, 500010, 4500020)}}, orb.Point{500005, 4500010}},
	}
	for _, c := range cases {
		got, err := RepresentativePoints([]orb.MultiPolygon{c.mp}, Centroid)
		if err != nil {
			t.Fatal(err)
		}
		if !ptsNear(got[0], c.want, 1e-9*max(1, math.Abs(c.want[0]), math.Abs(c.want[1]))) {
			t.Errorf("%s: centroid %v, want %v", c.name, got[0], c.want)
		}
	}
	// orb's planar.CentroidArea on the invented demo region's districts.
	r, err := region.Build(region.DefaultConfig())
	if err != nil {
		t.Fatal(err)
	}
	got, err := RepresentativePoints(r.Geoms, Centroid)
	if err != nil {
		t.Fatal(err)
	}
	for i, mp := range r.Geoms {
		want, _ := planar.CentroidArea(mp)
		if !ptsNear(got[i], want, 1e-9) {
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
	annulus := orb.Polygon{ptsRect(0, 0, 4, 4), ptsRect(1, 1, 3, 3)}
	// Two equal islands: the centroid falls in the sea between them.
	islands := orb.MultiPolygon{{ptsRect(0, 0, 1, 1)}, {ptsRect(5, 0, 7, 1)}}
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
		{"ring, clockwise shell", orb.MultiPolygon{{ptsReversed(annulus[0]), annulus[1]}}, true, 0, false},
		{"islands", islands, true, 1, false},
		{"convex square", orb.MultiPolygon{{ptsRect(0, 0, 2, 1)}}, false, 0, true},
	}
	for _, c := range cases {
		cen, err := RepresentativePoints([]orb.MultiPolygon{c.mp}, Centroid)
		if err != nil {
			t.Fatal(err)
		}
		if planar.MultiPolygonContains(c.mp, cen[0]) == c.centroidOut {
			t.Errorf("%s: the centroid %v should lie %s", c.name, cen[0], map[bool]string{true: "outside", false: "inside"}[c.centroidOut])
		}
		in, err := RepresentativePoints([]orb.MultiPolygon{c.mp}, Inside)
		if err != nil {
			t.Fatal(err)
		}
		p := in[0]
		if !planar.PolygonContains(c.mp[c.wantLargest], p) || !ptsStrictlyInside(c.mp[c.wantLargest], p) {
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
	cen, err := RepresentativePoints(r.Geoms, Centroid)
	if err != nil {
		t.Fatal(err)
	}
	in, err := RepresentativePoints(r.Geoms, Inside)
	if err != nil {
		t.Fatal(err)
	}
	moved := 0
	for i, mp := range r.Geoms {
		if !planar.MultiPolygonContains(mp, in[i]) {
			t.Errorf("district %d: inside point %v is outside", i, in[i])
		}
		if in[i] != cen[i] {
			moved++
			if planar.MultiPolygonContains(mp, cen[i]) && !ptsOnBoundary(mp, cen[i]) {
				t.Errorf("district %d: centroid %v inside but replaced", i, cen[i])
			}
		}
	}
	t.Logf("%d of %d centroids lay outside their district", moved, len(r.Geoms))
}

func ptsOnBoundary(mp orb.MultiPolygon, p orb.Point) bool {
	for _, poly := range mp {
		for _, ring := range poly {
			for i := range len(ring) - 1 {
				if ptsOnSegment(ring[i], ring[i+1], p) {
					return true
				}
			}
		}
	}
	return false
}

func TestRepresentativePointsErrors(t *testing.T) {
	if _, err := RepresentativePoints([]orb.MultiPolygon{{{ptsRect(0, 0, 1, 1)}}, {}}, Centroid); err == nil {
		t.Error("an empty geometry was accepted")
	}
	// A degenerate area (all on a line) gets its bounding-box centre.
	flat := orb.MultiPolygon{{{{0, 0}, {2, 0}, {4, 0}, {0, 0}}}}
	for _, mode := range []PointMode{Centroid, Inside} {
		got, err := RepresentativePoints([]orb.MultiPolygon{flat}, mode)
		if err != nil || got[0] != (orb.Point{2, 0}) {
			t.Errorf("%v of a flat area: %v, %v", mode, got, err)
		}
	}
	for s, want := range map[string]PointMode{"centroid": Centroid, "Inside": Inside} {
		if got, err := ParsePointMode(s); err != nil || got != want {
			t.Errorf("ParsePointMode(%q) = %v, %v", s, got, err)
		}
	}
	if _, err := ParsePointMode("middle"); err == nil {
		t.Error("unknown point mode accepted")
	}
}

func BenchmarkRepresentativePoints250000(b *testing.B) {
	cfg := region.DefaultConfig()
	cfg.Areas = 250000
	r, err := region.Build(cfg)
	if err != nil {
		b.Fatal(err)
	}
	for _, mode := range []PointMode{Centroid, Inside} {
		b.Run(mode.String(), func(b *testing.B) {
			for b.Loop() {
				if _, err := RepresentativePoints(r.Geoms, mode); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
