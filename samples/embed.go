package samples

import _ "embed"

//go:generate go run ./makeregion -o region.geojson

// RegionFile is the name of the demo file in this directory.
const RegionFile = "region.geojson"

// RegionGeoJSON is the content of RegionFile: an RFC 7946 FeatureCollection
// with one feature per district, written by region.Build(region.DefaultConfig()).
//
//go:embed region.geojson
var RegionGeoJSON []byte
