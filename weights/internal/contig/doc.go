// Package contig is the contiguity engine of package weights: it finds
// which areas' boundaries touch, up to a snap distance, and what is wrong
// with rings along the way. Find is the entry point; weights.BuildContiguity
// checks the options, calls it and turns the pairs into a graph.
//
// The work runs in three steps: check and flatten the boundaries into flat
// arrays (layer.go), index every boundary segment in a uniform grid and test
// only segments that share a cell (index.go), with hand-written segment
// predicates that take one tolerance (seg.go).
package contig
