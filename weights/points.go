package weights

import (
	"fmt"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/weights/internal/points"
)

// PointMode says which point stands for an area in distance-based weights.
type PointMode int

const (
	// Centroid is the area-weighted centroid of all parts, holes subtracted.
	// For a C-shaped area or a scatter of islands it can lie outside the area.
	Centroid PointMode = iota
	// Inside is a point guaranteed to lie inside the area: the centroid when
	// it does, otherwise a point in the area's largest part (see
	// RepresentativePoints).
	Inside
)

// String returns "centroid" or "inside", the words ParsePointMode reads.
func (p PointMode) String() string {
	if p == Inside {
		return "inside"
	}
	return "centroid"
}

var pointModeNames = []choice.Name[PointMode]{{Name: "centroid", Value: Centroid}, {Name: "inside", Value: Inside}}

// ParsePointMode reads "centroid" or "inside" (any case).
func ParsePointMode(s string) (PointMode, error) {
	return choice.Parse("point mode", s, pointModeNames...)
}

// RepresentativePoints returns one point per area.
//
// Centroid is the area-weighted centroid of the whole geometry: every part's
// outer ring counts positively and every hole negatively, whatever the
// rings' orientation. Inside keeps that centroid when it lies strictly inside
// the area (inside some part and in none of its holes); otherwise it takes the
// area's largest part (by area, holes subtracted) and three horizontal lines
// across it — through the part's centroid, through the middle of its bounding
// box, and through the middle of the tallest band between consecutive vertex
// heights — each moved to halfway between the two vertex heights around it so
// it passes through no vertex. Along each line the part's rings cut out the
// stretches that lie inside the part (even–odd rule, so holes are skipped);
// the point is the midpoint of the widest stretch found on the three lines.
//
// Coordinates are used as planar: for longitude/latitude layers the
// computation happens in the plane of degrees. At the size of
// administrative areas the difference from a centroid on the sphere is a
// small fraction of the area's width, which does not matter for choosing
// neighbours; it does for areas spanning tens of degrees.
//
// On a longitude/latitude layer (DetectMetric says Geographic), an area
// whose longitudes span more than 180° is taken to cross the antimeridian
// (parts on both sides of 180°, as RFC 7946 asks such areas to be split, or
// a ring drawn across it): its longitudes are first unwrapped — steps of
// more than 180° within a ring taken the short way round, holes and parts
// moved by whole turns so that the largest gap between the parts falls on
// the far side of the globe — and the point found on that copy is brought
// back into [-180, 180). The Aleutians and Alaska thus get points in the
// North Pacific and in Alaska, not across the continent.
//
// An area with no vertex is an error naming it. An area whose rings enclose
// no area (all points on a line) has no centroid or inside; it gets the centre
// of its vertices' bounding box.
func RepresentativePoints(geoms []orb.MultiPolygon, mode PointMode) ([]orb.Point, error) {
	return representativePoints(geoms, mode, DetectMetric(geoms) == Geographic)
}

// representativePoints is RepresentativePoints with the metric chosen by
// the caller: lonLat unwraps areas that cross the antimeridian.
func representativePoints(geoms []orb.MultiPolygon, mode PointMode, lonLat bool) ([]orb.Point, error) {
	if mode != Centroid && mode != Inside {
		return nil, fmt.Errorf("weights: unknown point mode %d", mode)
	}
	pts, missing := points.Of(geoms, mode == Inside, lonLat)
	if missing >= 0 {
		return nil, fmt.Errorf("weights: area %d has no vertices, so no representative point", missing)
	}
	return pts, nil
}
