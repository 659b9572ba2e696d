// Package points computes the point that stands for each polygon area in
// the distance-based graphs of package weights: the area-weighted centroid,
// or a point surely inside the area. Of is the entry point; the rule is
// documented at weights.RepresentativePoints, which checks the mode and
// names an area without vertices.
package points
