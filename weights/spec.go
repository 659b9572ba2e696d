package weights

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/areatest/areatest/internal/numtext"

	"github.com/paulmach/orb"
)

// Spec says how to build a neighbour graph from a layer's geometry. Exactly
// one rule applies: k nearest neighbours when KNN > 0, else a kernel when
// Kernel is set, else inverse distance when IDWPower > 0 (within Band when
// it is set), else a distance band when Band > 0, else contiguity.
type Spec struct {
	// Contiguity and its snapping tolerance (0: DefaultSnap).
	Rule Contiguity
	Snap float64
	// KNN is the number of nearest neighbours; Symmetrise links i and j
	// when either is among the other's nearest.
	KNN        int
	Symmetrise bool
	// Band is a distance: the band of a binary distance graph, or the
	// cut-off of inverse-distance weights.
	Band float64
	// IDWPower > 0 asks for weights 1/d^power.
	IDWPower float64
	// Kernel names a kernel ("triangular", "bisquare", "gaussian") with a
	// fixed Bandwidth or, when AdaptiveK > 0, a bandwidth per area equal to
	// the distance to its AdaptiveK-th nearest neighbour.
	Kernel    string
	Bandwidth float64
	AdaptiveK int
	// Points chooses the representative point of each area for the
	// distance-based rules; Planar forces planar distances on a lon/lat
	// layer.
	Points PointMode
	Planar bool
	// Projected says the layer's coordinate system is projected: distances
	// are planar, in Unit, the short name of the coordinates' unit ("m",
	// "US ft"; "" names them "layer units"), even where every coordinate
	// happens to fall in the range of longitude and latitude.
	Projected bool
	Unit      string
	// Order > 1 replaces the graph by its neighbours of that order (all
	// orders up to it when Cumulative).
	Order      int
	Cumulative bool
}

// PointBased reports whether the spec measures distances between points.
func (s Spec) PointBased() bool {
	return s.KNN > 0 || s.Kernel != "" || s.IDWPower > 0 || s.Band > 0
}

// Build makes the graph the spec describes for geoms, ids naming the areas
// in messages. The geometry problems contiguity works around are returned
// for the caller to show (none for the point-based rules).
func (s Spec) Build(geoms []orb.MultiPolygon, ids []string) (*Graph, []GeometryProblem, error) {
	if len(geoms) == 0 {
		return nil, nil, errors.New("the layer has no areas")
	}
	var g *Graph
	var problems []GeometryProblem
	var err error
	if !s.PointBased() {
		g, problems, err = BuildContiguity(geoms, ContiguityOptions{Rule: s.Rule, Snap: s.Snap, IDs: ids, Projected: s.Projected})
		if err != nil {
			return nil, nil, err
		}
	} else {
		pts, metric, err := s.Locate(geoms)
		if err != nil {
			return nil, nil, err
		}
		switch {
		case s.KNN > 0:
			g, err = KNearest(pts, s.KNN, metric, s.Symmetrise)
		case s.Kernel != "":
			var kind KernelKind
			if kind, err = ParseKernelKind(s.Kernel); err == nil {
				g, err = Kernel(pts, kind, s.Bandwidth, s.AdaptiveK, metric)
			}
		case s.IDWPower > 0:
			g, err = InverseDistance(pts, s.IDWPower, s.Band, metric)
		default:
			g, err = DistanceBand(pts, s.Band, metric)
		}
		if err != nil {
			var none *NoNeighboursError
			if u := s.planarUnit(); errors.As(err, &none) && metric == Planar && u != "layer units" {
				none.Unit = u
			}
			return nil, nil, err
		}
		g.Kind = s.named(g.Kind)
	}
	if g, err = s.orders(g); err != nil {
		return nil, problems, err
	}
	return g, problems, nil
}

// ReadEdgeList reads a graph from an edge list (see the package function
// ReadEdgeList) and applies the spec's order to it, as Build does to the
// graphs it makes; the spec's rule is not used.
func (s Spec) ReadEdgeList(r io.Reader, source string, ids []string) (*Graph, error) {
	g, err := ReadEdgeList(r, source, ids)
	if err != nil {
		return nil, err
	}
	return s.orders(g)
}

// orders replaces g by its neighbours of the spec's order, when above 1.
func (s Spec) orders(g *Graph) (*Graph, error) {
	if s.Order > 1 {
		return g.HigherOrder(s.Order, s.Cumulative)
	}
	return g, nil
}

// Locate returns the representative point of each area and the metric
// distances between them are measured in, as the spec's point-based rules
// use them: the one place that chooses both.
func (s Spec) Locate(geoms []orb.MultiPolygon) ([]orb.Point, Metric, error) {
	metric := DetectMetric(geoms)
	if s.Planar || s.Projected {
		metric = Planar
	}
	pts, err := representativePoints(geoms, s.Points, metric == Geographic)
	if err != nil {
		return nil, 0, err
	}
	return pts, metric, nil
}

// planarUnit names the unit of planar distances: the layer's, or "layer
// units" when it is unknown or the plane is forced on a lon/lat layer.
func (s Spec) planarUnit() string {
	if s.Projected && s.Unit != "" {
		return s.Unit
	}
	return "layer units"
}

// named puts the layer's unit in place of "(layer units)" in a graph's
// description, when the unit is known.
func (s Spec) named(kind string) string {
	if u := s.planarUnit(); u != "layer units" {
		return strings.ReplaceAll(kind, " (layer units)", " "+u)
	}
	return kind
}

// DistanceClasses cuts the distances between the areas' representative
// points (chosen as for the spec's point-based rules) into k classes of the
// given width: the graphs of a correlogram over distance (see the package
// function DistanceClasses).
func (s Spec) DistanceClasses(geoms []orb.MultiPolygon, width float64, k int) ([]*Graph, error) {
	pts, metric, err := s.Locate(geoms)
	if err != nil {
		return nil, err
	}
	gs, err := DistanceClasses(pts, width, k, metric)
	for _, g := range gs {
		g.Kind = s.named(g.Kind)
	}
	return gs, err
}

// Units names the distance units of the spec's rule for a layer: kilometres
// on a lon/lat layer, the layer's unit (Unit, or "layer units") otherwise.
func (s Spec) Units(geoms []orb.MultiPolygon) string {
	if !s.Planar && !s.Projected && DetectMetric(geoms) == Geographic {
		return "km"
	}
	return s.planarUnit()
}

// Describe says in words how the spec's rule measures contact or distance
// on a layer, for reports: the snap distance of contiguity (the default one
// when Snap is 0), or the distances and points of the point-based rules.
func (s Spec) Describe(geoms []orb.MultiPolygon) string {
	if s.PointBased() {
		metric := "great-circle distances in km"
		if u := s.Units(geoms); u != "km" {
			metric = "planar distances in " + u
		}
		return metric + " between " + s.Points.String() + " points of the areas"
	}
	snap, note := s.Snap, ""
	if snap == 0 {
		snap, note = DefaultSnap(geoms), ", the default for these coordinates"
	}
	units := s.planarUnit()
	if !s.Projected && DetectMetric(geoms) == Geographic {
		units = "degrees"
	}
	return fmt.Sprintf("boundary points within %s %s count as shared%s", numtext.Length(snap), units, note)
}

// Restricted is a graph cut down to the areas a statistic uses.
type Restricted struct {
	// Graph links the used areas, with the scaling applied.
	Graph *Graph
	// Binary is the same links before the scaling.
	Binary *Graph
	// Used[k] is the index, among the areas passed to Restrict, of area k
	// of Graph.
	Used []int
	// Areas[k] is the index in the whole graph (the layer) of area k of
	// Graph: keep[Used[k]].
	Areas []int
	// Summary describes the graph among all the areas passed (islands
	// included), with the scaling the statistic uses.
	Summary Summary
}

// Present lists the areas 0..n−1 where none of the masks is set (a nil
// mask sets none): the areas with every value a statistic needs, to pass to
// Restrict.
func Present(n int, masks ...[]bool) []int {
	var keep []int
outer:
	for i := range n {
		for _, m := range masks {
			if m != nil && m[i] {
				continue outer
			}
		}
		keep = append(keep, i)
	}
	return keep
}

// Pick returns the values of v, a column of the whole layer, at the areas
// of Graph, in its order; nil for a nil column.
func (r *Restricted) Pick(v []float64) []float64 {
	if v == nil {
		return nil
	}
	out := make([]float64, len(r.Areas))
	for k, i := range r.Areas {
		out[k] = v[i]
	}
	return out
}

// Restrict cuts g down to the areas keep (indices into g), as every
// statistic does after leaving out areas without data. Areas that have no
// neighbour among the kept ones are left out too (the tool-wide islands
// policy) unless keepIslands, in which case they stay with a spatial lag of
// zero. ids name g's areas.
func Restrict(g *Graph, keep []int, ids []string, t Scaling, keepIslands bool) (*Restricted, error) {
	sub := g.Subset(keep)
	kept := make([]string, len(keep))
	for k, i := range keep {
		kept[k] = ids[i]
	}
	if t == "" {
		t = RowStandardised
	}
	r := &Restricted{Summary: Summarise(sub, kept)}
	r.Summary.Scaling = string(t)
	for k := 0; k < sub.Len(); k++ {
		if sub.Degree(k) > 0 || keepIslands {
			r.Used = append(r.Used, k)
			r.Areas = append(r.Areas, keep[k])
		}
	}
	r.Binary = sub.Subset(r.Used)
	var err error
	r.Graph, err = r.Binary.Scaled(t)
	return r, err
}
