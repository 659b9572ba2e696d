package points

import (
	"testing"

	"github.com/paulmach/orb"
)

// Areas that cross the antimeridian, on longitude/latitude: their points
// must lie on the Pacific side, where the area is. Expected centroids are
// worked out on the unwrapped longitudes (west of 180° read as 180° + …) and
// brought back to [-180, 180).
func TestAntimeridianPoints(t *testing.T) {
	east := rect(178, 50, 180, 52)                                              // 4 deg², centre 179
	west := rect(-180, 50, -176, 52)                                            // 8 deg², centre −178 = 182
	across := orb.Ring{{178, 50}, {-176, 50}, {-176, 52}, {178, 52}, {178, 50}} // one ring drawn across: 178…184
	withHole := orb.Polygon{across, rect(-179.5, 50.5, -178.5, 51.5)}           // hole around the centroid
	chain := orb.MultiPolygon{{rect(172, 50, 173, 51)}, {rect(178, 50, 179, 51)},
		{rect(-179, 50, -178, 51)}, {rect(-171, 50, -170, 51)}} // unit islands at 172.5, 178.5, 181.5, 189.5
	inHoled := func(p orb.Point) bool { // in the outer ring and not in the hole
		inOuter := (p[0] >= 178 || p[0] <= -176) && p[1] > 50 && p[1] < 52
		inHole := p[0] > -179.5 && p[0] < -178.5 && p[1] > 50.5 && p[1] < 51.5
		return inOuter && !inHole
	}
	tests := []struct {
		name   string
		mp     orb.MultiPolygon
		inside bool
		want   orb.Point
		ok     func(orb.Point) bool // instead of want, for inside points
	}{
		{"two parts, centroid", orb.MultiPolygon{{east}, {west}}, false, orb.Point{-179, 51}, nil}, // (179·4 + 182·8)/12 = 181
		{"parts listed the other way", orb.MultiPolygon{{west}, {east}}, false, orb.Point{-179, 51}, nil},
		{"one ring across", orb.MultiPolygon{{across}}, false, orb.Point{-179, 51}, nil},
		{"one ring across, inside", orb.MultiPolygon{{across}}, true, orb.Point{-179, 51}, nil},
		{"island chain", chain, false, orb.Point{-179.5, 50.5}, nil}, // mean 180.5
		{"with a hole, inside", orb.MultiPolygon{withHole}, true, orb.Point{}, inHoled},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			pts, missing := Of([]orb.MultiPolygon{tc.mp}, tc.inside, true)
			if missing >= 0 {
				t.Fatal("no vertex")
			}
			p := pts[0]
			if tc.ok != nil && !tc.ok(p) || tc.ok == nil && !near(p, tc.want, 1e-9) {
				t.Errorf("point %v, want %v", p, tc.want)
			}
			if p[0] < -180 || p[0] >= 180 {
				t.Errorf("longitude %v outside [-180, 180)", p[0])
			}
			// Without lonLat (a projected layer) nothing is unwrapped.
			flat, _ := Of([]orb.MultiPolygon{tc.mp}, tc.inside, false)
			if tc.ok == nil && near(flat[0], p, 1) {
				t.Errorf("planar point %v should differ from the unwrapped one", flat[0])
			}
		})
	}
}

// Areas that do not cross the meridian get exactly the same point whether or
// not the layer is read as longitude/latitude, including ones near it.
func TestNoUnwrapBelowHalfTurn(t *testing.T) {
	geoms := []orb.MultiPolygon{
		{{rect(170, 10, 179.9, 12)}},
		{{rect(-179.9, -5, -100, 5)}},
		{{rect(-10, 0, 10, 1)}, {rect(20, 0, 21, 1)}},
	}
	for _, inside := range []bool{false, true} {
		a, _ := Of(geoms, inside, true)
		b, _ := Of(geoms, inside, false)
		for i := range a {
			if a[i] != b[i] {
				t.Errorf("inside=%v area %d: %v with lonLat, %v without", inside, i, a[i], b[i])
			}
		}
	}
}
