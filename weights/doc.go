// Package weights builds the neighbour graph of a layer's areas and holds it
// in one compact sparse form (compressed rows, Graph) that every statistic
// reads. It takes geometries, never files; the edge list reads and writes
// through an io.Reader or io.Writer.
//
// Where to start: Spec.Build makes the graph a set of options describes —
// contiguity (BuildContiguity), k nearest neighbours (KNearest), a distance
// band (DistanceBand), inverse distance (InverseDistance) or kernel weights
// (Kernel) between representative points (RepresentativePoints). Graph is
// the result, with its scalings (Scaled) and higher orders
// (HigherOrder); Restrict cuts it down to the areas a statistic uses, under
// the tool-wide islands policy, and Summarise describes it for reports.
//
// The heavy lifting sits in internal packages: weights/internal/contig finds
// touching boundaries up to a snap distance, weights/internal/kdtree answers
// nearest-neighbour and radius queries, weights/internal/points computes
// centroids and inside points. This package checks the options, measures
// distances (Distance: one formula for every builder) and turns what those
// find into graphs, with the errors and their facts.
//
// Checks against outside references: contiguity of the US states from the
// Census Bureau's cartographic boundaries against known borders in
// tests/contiguity_test.go and tests/states_test.go; great-circle distances
// against values worked out by hand and against orb's haversine
// (distance_test.go); centroids and inside points against orb's planar
// package (internal/points).
package weights
