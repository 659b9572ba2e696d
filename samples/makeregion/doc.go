// Command makeregion writes the invented demo region as GeoJSON:
//
//	go run ./samples/makeregion -o samples/region.geojson
//
// With no flags but -o it writes exactly the file shipped in samples/, which a
// test in samples/region holds it to. -areas and -seed make other regions of
// the same kind, e.g. larger ones for timing.
package main
