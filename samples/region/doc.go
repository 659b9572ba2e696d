// Package region builds Halvaren, an invented coastal region divided into
// districts, as demo data for areatest: polygons that tile the land exactly and
// a table of attributes with the traits that make naive tests of area data
// mislead — an outcome that clusters in space, a policy adopted by groups of
// neighbours, and only a weak link between the two.
//
// Nothing here describes a real place. The data exist to show the tool at
// work and must never be used to check a statistic.
//
// The same Config always yields the same bytes from WriteGeoJSON, on any
// machine: every random number comes from a seeded PCG stream through code in
// this package; no floating-point routine with platform-specific assembly
// (math.Exp, math.Log, …) is used on the way to the output; and every product
// that feeds a sum is rounded explicitly with float64(…), so no compiler can
// fuse it into a multiply–add, which some architectures would otherwise do.
//
// To get the demo region at another size, start from DefaultConfig:
//
//	cfg := region.DefaultConfig()
//	cfg.Areas = 3000
//	r, err := region.Build(cfg)
//
// Build (region.go) runs the stages in order, each on a random stream of its
// own: the jittered lattice, the coast and the growth of districts from
// seeds (grid.go), the islands (islands.go), the provinces and attributes
// (attrs.go, on the smooth fields of field.go), the numbering and the names
// (region.go, names.go). random.go holds the only random numbers,
// geojson.go the writer.
package region
