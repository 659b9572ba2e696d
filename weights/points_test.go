package weights

import (
	"testing"

	"github.com/paulmach/orb"
)

func TestRepresentativePointsErrors(t *testing.T) {
	if _, err := RepresentativePoints([]orb.MultiPolygon{{{unitSquare(0, 0)}}, {}}, Centroid); err == nil {
		t.Error("an empty geometry was accepted")
	}
	if _, err := RepresentativePoints([]orb.MultiPolygon{{{unitSquare(0, 0)}}}, 7); err == nil {
		t.Error("an unknown point mode was accepted")
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
