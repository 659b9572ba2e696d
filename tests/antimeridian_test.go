package tests

import (
	"math"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"

	"github.com/areatest/areatest/weights"
)

// Alaska's parts lie on both sides of the 180° meridian (the western
// Aleutians reach 172°E). Its centroid and inside point must lie in Alaska —
// about 64°N, 150°W for the mainland; the Census Bureau's internal point,
// kept in the file, is at 64.5°N, 152.7°W — and its nearest states must be
// the ones of the Pacific north-west, not the Great Plains.
func TestAlaskaAcrossTheAntimeridian(t *testing.T) {
	l := loadStates(t)
	ak := -1
	for i, id := range l.IDs {
		if id == "02" {
			ak = i
		}
	}
	if ak < 0 {
		t.Fatal("no Alaska (02) in the layer")
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, poly := range l.Geoms[ak] {
		for _, p := range poly[0] {
			lo, hi = min(lo, p[0]), max(hi, p[0])
		}
	}
	if !(lo < -179 && hi > 179) {
		t.Fatalf("Alaska spans %v…%v: the fixture no longer crosses the meridian", lo, hi)
	}
	// The reference: orb's planar centroid of Alaska with its eastern-hemisphere
	// islands moved one turn west, all of Alaska then lying west of 180°.
	west := orb.Clone(l.Geoms[ak]).(orb.MultiPolygon)
	for _, poly := range west {
		for _, ring := range poly {
			for v := range ring {
				if ring[v][0] > 0 {
					ring[v][0] -= 360
				}
			}
		}
	}
	ref, _ := planar.CentroidArea(west)
	for _, mode := range []weights.PointMode{weights.Centroid, weights.Inside} {
		spec := weights.Spec{KNN: 3, Points: mode}
		pts, metric, err := spec.Locate(l.Geoms)
		if err != nil {
			t.Fatal(err)
		}
		p := pts[ak]
		if math.Abs(p[0]-ref[0]) > 1e-9 || math.Abs(p[1]-ref[1]) > 1e-9 {
			t.Errorf("%v: Alaska's point %v, the unwrapped centroid is %v", mode, p, ref)
		}
		// Within about 300 km of the Census Bureau's point.
		if d := weights.Distance(metric, p, [2]float64{-152.69, 64.50}); d > 300 {
			t.Errorf("%v: Alaska's point %v is %.0f km from 64.5°N 152.7°W", mode, p, d)
		}
		g, _, err := spec.Build(l.Geoms, l.IDs)
		if err != nil {
			t.Fatal(err)
		}
		nb := neighbourSet(g, l.IDs, "02")
		for _, want := range []string{"53", "41"} { // Washington, Oregon
			if !nb[want] {
				t.Errorf("%v: Alaska's 3 nearest are %v, want Washington and Oregon among them", mode, nb)
			}
		}
	}
}
