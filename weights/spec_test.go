package weights

import (
	"errors"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// squares is an r×c grid of unit squares whose corners have coordinates
// within the range of longitude and latitude, scaled by size.
func squares(r, c int, size float64) []orb.MultiPolygon {
	var out []orb.MultiPolygon
	for i := range r {
		for j := range c {
			x, y := float64(j)*size, float64(i)*size
			out = append(out, orb.MultiPolygon{{{{x, y}, {x + size, y}, {x + size, y + size}, {x, y + size}, {x, y}}}})
		}
	}
	return out
}

// A projected layer whose coordinates all fall in the lon/lat range is
// still measured in the plane, in its own unit, and every description
// names that unit.
func TestSpecOnAProjectedLayer(t *testing.T) {
	geoms := squares(3, 3, 10) // 10 m squares: centroids 10 m apart
	s := Spec{Band: 10.5, Projected: true, Unit: "m"}
	g, _, err := s.Build(geoms, nil)
	if err != nil {
		t.Fatal(err)
	}
	if g.Links() != 2*12 || g.Kind != "distance band 10.5 m" {
		t.Errorf("band graph: %d links, kind %q", g.Links(), g.Kind)
	}
	if d := s.Describe(geoms); d != "planar distances in m between centroid points of the areas" {
		t.Errorf("Describe: %q", d)
	}
	if u := s.Units(geoms); u != "m" {
		t.Errorf("Units: %q", u)
	}
	// The same layer read as lon/lat measures great-circle km: a band of
	// 10.5 km links nothing 10° apart.
	_, _, err = Spec{Band: 10.5}.Build(geoms, nil)
	var none *NoNeighboursError
	if !errors.As(err, &none) || !strings.Contains(err.Error(), "km") {
		t.Errorf("as lon/lat: %v", err)
	}
	_, _, err = Spec{Band: 5, Projected: true, Unit: "m"}.Build(geoms, nil)
	if !errors.As(err, &none) || !strings.Contains(err.Error(), "distance band 5 m gives no area a neighbour: the closest two areas are 10 m apart") {
		t.Errorf("no neighbours: %v", err)
	}
	if d := (Spec{Projected: true}).Describe(geoms); !strings.Contains(d, "layer units") {
		t.Errorf("unknown unit: %q", d)
	}
}
