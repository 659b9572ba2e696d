// Package geojson reads a GeoJSON FeatureCollection (RFC 7946) of polygon
// features into a layer.Layer: one area per feature, with an id, a
// MultiPolygon geometry and one column per property.
//
// The reader streams: it walks the top-level object token by token and
// decodes one feature at a time, so memory grows with the layer it builds,
// not with the size of the file. Members of the top-level object may come in
// any order; members it has no use for are skipped. Member names and type
// names are matched exactly, as RFC 7946 spells them. A leading UTF-8
// byte-order mark is ignored.
//
// Decided behaviours:
//
//   - Ids come from the feature "id" member (string or number), or from the
//     property named by Options.IDColumn. When no feature has an id and no
//     IDColumn is given, areas are numbered 1, 2, … by their position in the
//     "features" array, with a warning; when only some features have one,
//     that is an error naming the first feature without.
//   - Numbers used as ids, or rendered as text, are written in their shortest
//     exact form (48201, not 4.8201e+04); integer literals too long for a
//     float64 keep their digits.
//   - Polygon and MultiPolygon become orb.MultiPolygon (a Polygon is one
//     part); holes are kept and rings are kept in the order and winding
//     given. A ring whose last position differs from its first is closed,
//     with one warning for the whole file. A ring with fewer than 4 positions
//     after closing is an error. Positions may carry a third value
//     (altitude), which is dropped.
//   - Coordinates: RFC 7946 has them in longitude/latitude, but GDAL and
//     older tools write projected coordinates with a legacy (2008 GeoJSON)
//     "crs" member, which may come before or after "features"; the reader
//     records the first position outside [-180, 180] × [-90, 90] and
//     decides at the end. A "crs" member that io/crs places as a projected
//     system ("urn:ogc:def:crs:EPSG::5070") sets Layer.CRS, with one
//     warning naming the system, and no range is checked. Otherwise
//     coordinates all in range are lon/lat (a member naming another
//     system then gives a warning, as RFC 7946 has lon/lat WGS84 always);
//     with a coordinate out of range, a member naming a geographic system
//     (CRS84, EPSG:4326) is an error — the file contradicts itself —, while
//     no member, or one naming a system io/crs does not know, makes the
//     layer projected with unknown unit (CRS{Projected: true}, the name
//     kept), with a warning quoting the first such position and its
//     feature. Both messages add that the positions may be written
//     [latitude, longitude] when every position would fit that order.
//   - With Options.SkipBadGeometry, features whose geometry is missing, null,
//     empty, or of a type other than Polygon/MultiPolygon are left out with
//     warnings; without it, the error for such a feature is marked
//     Error.Skippable, so that a caller can say how to get past it. Broken
//     geometry (short rings, bad nesting, non-finite coordinates) is always
//     an error.
//   - Property values that are absent, null, empty, or one of NA, N/A, NaN,
//     null (any case, spaces trimmed) are missing. A column is Number when all
//     its other values are JSON numbers or strings holding a finite number,
//     except that a numeric string with a leading zero ("01001") marks the
//     column as codes, so it stays Text. Otherwise the column is Text:
//     booleans as true/false, numbers in shortest form, and objects or arrays
//     as compact JSON text; its Column.NotNumber marks the values that are
//     not numbers (words, codes with a leading zero, booleans, objects,
//     numbers beyond float64), so that a caller can tell numbers with a few
//     bad values from text.
//   - A key repeated within one feature's properties: the last value wins,
//     and only it counts towards the column's kind.
//
// The package never prints; warnings are returned to the caller, and every
// error Read returns is an *Error with the source, the feature, its id and,
// for a JSON syntax error in a file, the line and column.
//
// # Where to start
//
// Read (read.go) is the entry point; ReadFile opens a file for it. The
// reader walks the top-level object (reader.run), streams the "features"
// array through readFeature (feature.go), which checks each feature in a
// fixed order and hands its geometry to geomParser (geometry.go) and its
// properties to the column builders (props.go); finish turns what was
// gathered into the layer, with the coordinate system decided by
// coordinateSystem (crs.go). errors.go builds the messages. Write and
// AppendGeometry (write.go) go the other way, a layer and result columns
// out as GeoJSON.
package geojson
