// Package layer is the data model of areatest: the in-memory table of areas
// that every reader produces and every command reads. A Layer has one row
// per area — a unique id, a polygon geometry (orb.MultiPolygon, holes and
// several parts allowed) — and attribute columns, each a Column of numbers
// or of text with a mask of missing values.
//
// It lives under io/ because it is the form the readers there give the
// data (io/geojson reads it and writes it out again with result columns),
// and it parses and computes nothing itself. Neither the drawing nor the
// statistics import it: cmd/areatest takes the columns and geometries out
// of a Layer and hands io/figure, spatial/ and weights/ plain slices.
//
// Start with Layer and its Column method, then Column (Kind, Missing,
// Label).
package layer
