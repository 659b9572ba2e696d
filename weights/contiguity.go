package weights

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/weights/internal/contig"
)

// Contiguity says which shared boundary makes two areas neighbours.
type Contiguity int

const (
	// Queen makes areas neighbours when their boundaries meet at least at
	// one point (a corner is enough).
	Queen Contiguity = iota
	// Rook makes areas neighbours only when their boundaries share a stretch
	// of positive length.
	Rook
)

func (c Contiguity) String() string {
	if c == Rook {
		return "rook"
	}
	return "queen"
}

var contiguityNames = []choice.Name[Contiguity]{{Name: "queen", Value: Queen}, {Name: "rook", Value: Rook}}

// ParseContiguity reads "queen" or "rook" (any case).
func ParseContiguity(s string) (Contiguity, error) {
	return choice.Parse("contiguity", s, contiguityNames...)
}

// ContiguityOptions says how BuildContiguity decides that two areas touch.
type ContiguityOptions struct {
	// Rule is Queen or Rook.
	Rule Contiguity
	// Snap is the distance, in the layer's coordinate units, below which two
	// boundary points count as the same point. 0 means DefaultSnap(geoms).
	Snap float64
	// IDs, when not nil, names the areas (one per geometry) in errors and
	// warnings; without it areas are named by their 0-based index.
	IDs []string
	// Projected says the coordinates are not longitude/latitude even where
	// they fall in its range, so longitudes +180 and −180 are not one line.
	Projected bool
}

// RookMinShared is the shortest stretch, in multiples of the snap distance,
// that two boundaries must run together for the areas to be rook neighbours.
// A point contact blurred by the tolerance on both sides can look like a
// stretch of up to about 2·Snap (two corners digitised up to Snap apart), so
// the threshold sits just above that.
const RookMinShared = contig.RookMinShared

// DefaultSnap returns the snap distance used when ContiguityOptions.Snap is
// 0: 2·10⁻⁹ of the layer's coordinate scale, the larger of its bounding-box
// diagonal and its largest absolute coordinate, but at most 1/100 of the
// median boundary segment length.
//
// The scale includes the magnitude of the coordinates, not only the extent,
// because what puts the two copies of a shared border apart is rounding —
// of float64 and of the decimals a file keeps — and rounding is relative to
// the values. The result is about 1–8·10⁻⁷ degrees (1–8 cm) for longitude and
// latitude, and 2 mm to 4 cm for projected metres. The cap keeps the
// tolerance far below the size of the areas themselves when they are tiny
// next to their coordinates. Non-finite coordinates are ignored; a layer
// without any boundary segment gets 0.
func DefaultSnap(geoms []orb.MultiPolygon) float64 { return contig.DefaultSnap(geoms) }

// BuildContiguity builds the binary contiguity graph of the areas geoms, with
// boundaries compared up to the tolerance opt.Snap:
//
//   - Queen links two areas whose boundaries come within Snap of each other
//     anywhere: a shared corner (the two copies up to Snap apart), a corner
//     of one lying on a side of the other (a T-junction), or crossing sides.
//   - Rook links two areas when a side of one and a side of the other run
//     together over more than RookMinShared·Snap — a shared stretch of
//     border, even where the two copies have their vertices in different
//     places. The stretch runs between vertices of the two sides that lie
//     within Snap of the other side, so two areas that only meet at a
//     corner are never rook neighbours, however narrow the angle between
//     their sides there (sides leaving a corner at an angle θ stay within
//     Snap of each other for Snap/tan θ, which a length threshold alone
//     would take for a border when θ is small). The copies of a shared
//     border must therefore lie within Snap of each other at their
//     vertices. The stretch is looked for one pair of sides at a time, so a
//     border made only of sides shorter than RookMinShared·Snap is missed.
//
// On a longitude/latitude layer (DetectMetric says Geographic and
// opt.Projected is false), boundaries on longitude +180 and on −180 are the
// same line on the globe: areas split there, as RFC 7946 asks, are linked
// across it by the same rules (within Snap in latitude for Queen, a shared
// stretch longer than RookMinShared·Snap for Rook).
//
// All rings count, holes included: an area filling another's hole is its
// neighbour. Cost grows as n log n in the number of boundary segments: a
// uniform grid over the segments, with cells about the median segment length,
// pairs only segments that share a cell.
//
// Errors, naming the area: no polygon, a polygon without rings, a ring
// without positions, a ring that is not closed (first and last positions
// differ), a coordinate that is NaN or infinite, or a bad Snap. Geometry
// problems do not stop the build; every one is returned (see
// GeometrySummary for the few lines a report shows):
//
//   - SliverRing: a ring whose signed area is at most Snap times half its
//     perimeter, so a mean width of at most Snap, and no two of its sides
//     crossing, adds nothing of its own to the search: a part without area
//     is not land an area could touch another through. NoRingWithArea: an
//     area with only sliver rings gets no neighbour. (A ring whose sides
//     cross, like a bow-tie, can have a signed area of zero while enclosing
//     land; it is kept.)
//   - RingMeetsItself: a ring that crosses or touches itself (two
//     non-consecutive sides meeting, found exactly, without tolerance),
//     once per area; its sides are still used.
//
// The graph depends only on the geometry and the options, not on the number
// of cores used.
func BuildContiguity(geoms []orb.MultiPolygon, opt ContiguityOptions) (*Graph, []GeometryProblem, error) {
	if opt.Rule != Queen && opt.Rule != Rook {
		return nil, nil, fmt.Errorf("weights: unknown contiguity rule %d", opt.Rule)
	}
	if opt.IDs != nil && len(opt.IDs) != len(geoms) {
		return nil, nil, fmt.Errorf("weights: %d ids for %d areas", len(opt.IDs), len(geoms))
	}
	if math.IsNaN(opt.Snap) || math.IsInf(opt.Snap, 0) || opt.Snap < 0 {
		return nil, nil, fmt.Errorf("weights: the snap distance must be a finite number not below 0, got %v", opt.Snap)
	}
	if len(geoms) > math.MaxInt32 {
		return nil, nil, fmt.Errorf("weights: %d areas are more than contiguity can index", len(geoms))
	}
	pairs, problems, err := contig.Find(geoms, contig.Options{Rook: opt.Rule == Rook, Snap: opt.Snap, IDs: opt.IDs})
	if err != nil {
		return nil, nil, err
	}
	if !opt.Projected && DetectMetric(geoms) == Geographic {
		snap := opt.Snap
		if snap == 0 {
			snap = DefaultSnap(geoms)
		}
		pairs = append(pairs, meridianLinks(geoms, snap, opt.Rule == Rook)...)
	}
	g, err := FromLinks(len(geoms), pairs, opt.Rule.String()+" contiguity")
	if err != nil {
		return nil, nil, err
	}
	return g, geometryProblems(problems, opt.IDs), nil
}

// ContiguityGraph builds a binary contiguity graph with the default snap
// distance and drops the geometry problems; see BuildContiguity.
func ContiguityGraph(geoms []orb.MultiPolygon, rule Contiguity) (*Graph, error) {
	g, _, err := BuildContiguity(geoms, ContiguityOptions{Rule: rule})
	return g, err
}
