package weights

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/geo"

	"github.com/areatest/areatest/internal/numtext"
)

// relErr is the relative difference of got from want.
func relErr(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

// Great-circle distances on the sphere of the IUGG mean radius R1 =
// 6,371.0088 km (Moritz 2000, Geodetic Reference System 1980, J. Geodesy
// 74:128–133). On a sphere the distance along a meridian, and along the
// equator, is R·θ: one degree is 2πR/360 = 111.19508 km. Along the parallel at
// latitude φ one degree is 111.19508·cos φ km; the great circle between two
// points on that parallel is slightly shorter, by the factor
// 2·asin(cos φ·sin(½°)) / (cos φ·1°), which differs from one by less than
// 1e-5, so the parallel values hold to 1e-5 and the closed form to 1e-12.
func TestGreatCircleReferenceValues(t *testing.T) {
	R := 6371.0088
	deg := 2 * math.Pi * R / 360 // 111.19508… km
	onParallel := func(phi float64) float64 {
		return 2 * R * math.Asin(math.Cos(phi*math.Pi/180)*math.Sin(0.5*math.Pi/180))
	}
	cases := []struct {
		name   string
		a, b   orb.Point
		want   float64
		relTol float64
		source string
	}{
		{"1° latitude at the equator", orb.Point{0, 0}, orb.Point{0, 1}, deg, 1e-12, "2πR/360, arc length on the sphere"},
		{"1° latitude at 45°N", orb.Point{10, 45}, orb.Point{10, 46}, deg, 1e-12, "2πR/360, arc length on the sphere"},
		{"1° latitude in the south", orb.Point{-70, -33.5}, orb.Point{-70, -34.5}, deg, 1e-12, "2πR/360"},
		{"1° longitude at the equator", orb.Point{0, 0}, orb.Point{1, 0}, deg, 1e-12, "2πR/360 (the equator is a great circle)"},
		{"1° longitude at 45°", orb.Point{20, 45}, orb.Point{21, 45}, deg * math.Cos(math.Pi/4), 1e-5, "111.195·cos 45° = 78.626 km"},
		{"1° longitude at 60°", orb.Point{-120, 60}, orb.Point{-119, 60}, deg / 2, 1e-5, "111.195·cos 60° = 55.598 km"},
		{"1° longitude at 45°, closed form", orb.Point{20, 45}, orb.Point{21, 45}, onParallel(45), 1e-12, "2R·asin(cos φ·sin ½°)"},
		{"1° longitude at 60°, closed form", orb.Point{-120, 60}, orb.Point{-119, 60}, onParallel(60), 1e-12, "2R·asin(cos φ·sin ½°)"},
		{"across the antimeridian", orb.Point{179.5, 0}, orb.Point{-179.5, 0}, deg, 1e-12, "2πR/360: the short way round"},
		{"antipodes on the equator", orb.Point{0, 0}, orb.Point{180, 0}, math.Pi * R, 1e-12, "half a great circle, πR = 20,015.087 km"},
		{"antipodes off the equator", orb.Point{30, 40}, orb.Point{-150, -40}, math.Pi * R, 1e-12, "πR"},
		{"pole to pole", orb.Point{0, 90}, orb.Point{77, -90}, math.Pi * R, 1e-12, "πR"},
		{"quarter circle", orb.Point{0, 0}, orb.Point{0, 90}, math.Pi * R / 2, 1e-12, "πR/2"},
	}
	for _, c := range cases {
		got := Distance(Geographic, c.a, c.b)
		if relErr(got, c.want) > c.relTol {
			t.Errorf("%s: %v km, want %v km (rel. tol. %g; %s)", c.name, got, c.want, c.relTol, c.source)
		}
	}
}

// Points 1e-7° apart (about 1 cm) are far below the scale where the sphere's
// curvature matters, so the flat-earth (equirectangular) distance
// R·√(Δφ² + (cos φ·Δλ)²) is exact to well below 1e-9 there (its error is of
// the order of the squared angle); a formula that loses precision to
// cancellation (the spherical law of cosines) would be off by percent.
func TestTinyDistanceAgainstFlatEarth(t *testing.T) {
	R := 6371.0088
	rad := math.Pi / 180
	for _, c := range []struct{ lon, lat, dlon, dlat float64 }{
		{0, 0, 0, 1e-7},
		{0, 0, 1e-7, 0},
		{10, 45, 1e-7, 1e-7},
		{-100, 60, 1e-7, -1e-7},
		{179.99999995, -30, 1e-7, 0}, // crosses the antimeridian
	} {
		a := orb.Point{c.lon, c.lat}
		b := orb.Point{c.lon + c.dlon, c.lat + c.dlat}
		if b[0] > 180 {
			b[0] -= 360
		}
		// The differences as the floats actually hold them.
		dlat := b[1] - a[1]
		dlon := math.Remainder(b[0]-a[0], 360)
		flat := R * rad * math.Hypot(dlat, math.Cos(c.lat*rad)*dlon)
		got := Distance(Geographic, a, b)
		if relErr(got, flat) > 1e-9 {
			t.Errorf("%v→%v: %.12g km, flat-earth %.12g km", a, b, got, flat)
		}
	}
}

// orb's geo.DistanceHaversine (an outside implementation, on its own radius
// orb.EarthRadius in metres) agrees once rescaled to R, away from antipodes.
func TestDistanceAgainstOrbHaversine(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 7))
	for range 2000 {
		a := orb.Point{rng.Float64()*360 - 180, rng.Float64()*170 - 85}
		b := orb.Point{a[0] + rng.Float64()*20 - 10, max(-89, min(89, a[1]+rng.Float64()*20-10))}
		if b[0] > 180 {
			b[0] -= 360
		} else if b[0] < -180 {
			b[0] += 360
		}
		want := geo.DistanceHaversine(a, b) / orb.EarthRadius * EarthRadiusKm
		got := Distance(Geographic, a, b)
		if relErr(got, want) > 1e-9 {
			t.Fatalf("%v→%v: %v, orb %v", a, b, got, want)
		}
		if got != Distance(Geographic, b, a) {
			t.Fatalf("%v→%v not symmetric to the last bit", a, b)
		}
	}
}

func TestPlanarDistance(t *testing.T) {
	// 3-4-5 right triangle (Pythagoras), also at projected-metre magnitudes.
	for _, o := range []orb.Point{{0, 0}, {500000, 4500000}, {-3e6, 1e6}} {
		a, b := o, orb.Point{o[0] + 3, o[1] + 4}
		if got := Distance(Planar, a, b); got != 5 {
			t.Errorf("Planar %v→%v = %v, want 5", a, b, got)
		}
	}
}

func TestDetectMetric(t *testing.T) {
	square := func(x, y, s float64) orb.MultiPolygon {
		return orb.MultiPolygon{{{{x, y}, {x + s, y}, {x + s, y + s}, {x, y + s}, {x, y}}}}
	}
	cases := []struct {
		name  string
		geoms []orb.MultiPolygon
		want  Metric
	}{
		{"lon/lat", []orb.MultiPolygon{square(-180, -90, 1), square(179, 89, 1)}, Geographic},
		{"projected metres", []orb.MultiPolygon{square(500000, 4500000, 1000)}, Planar},
		{"one projected vertex", []orb.MultiPolygon{square(0, 0, 1), square(170, 80, 20)}, Planar},
		{"empty", nil, Geographic},
	}
	for _, c := range cases {
		if got := DetectMetric(c.geoms); got != c.want {
			t.Errorf("%s: %v, want %v", c.name, got, c.want)
		}
	}
}

func TestPointErrors(t *testing.T) {
	cases := []struct {
		name string
		pts  []orb.Point
		m    Metric
	}{
		{"empty", nil, Planar},
		{"one area", []orb.Point{{0, 0}}, Planar},
		{"NaN", []orb.Point{{0, 0}, {math.NaN(), 1}}, Planar},
		{"infinite", []orb.Point{{0, 0}, {1, math.Inf(1)}}, Geographic},
		{"latitude out of range", []orb.Point{{0, 0}, {10, 91}}, Geographic},
	}
	for _, c := range cases {
		if _, err := KNearest(c.pts, 1, c.m, false); err == nil {
			t.Errorf("%s: KNearest accepted it", c.name)
		}
		if _, err := DistanceBand(c.pts, 1, c.m); err == nil {
			t.Errorf("%s: DistanceBand accepted it", c.name)
		}
		if _, err := NearestDistances(c.pts, c.m); err == nil {
			t.Errorf("%s: NearestDistances accepted it", c.name)
		}
	}
}

func TestCount(t *testing.T) {
	for n, want := range map[int64]string{0: "0", 999: "999", 1000: "1,000", 50000000: "50,000,000", -1234567: "-1,234,567"} {
		if got := numtext.Count(n); got != want {
			t.Errorf("numtext.Count(%d) = %q, want %q", n, got, want)
		}
	}
}

func TestRound(t *testing.T) {
	for _, c := range []struct {
		v    float64
		up   bool
		want float64
	}{
		{31.41592, true, 31.42},
		{31.41592, false, 31.42},
		{31.41192, true, 31.42},
		{31.41192, false, 31.41},
		{0.000123456, true, 0.0001235},
		{123456, true, 123500},
	} {
		if got := roundSignificant(c.v, c.up); got != c.want {
			t.Errorf("roundSignificant(%v, %v) = %v, want %v", c.v, c.up, got, c.want)
		}
	}
}
