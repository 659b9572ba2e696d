// Package gpkg reads the polygon feature table of an OGC GeoPackage into a
// layer.Layer, one area per record, and writes a layer with result columns
// out as a GeoPackage that desktop GIS programs open as they are.
//
// A GeoPackage is an SQLite database; the package reads it through the
// pure-Go driver modernc.org/sqlite and decodes geometries with go-geom's
// WKB decoder. SQLite needs a file, so there is no reader form: a caller
// holding standard input copies it to a temporary file first.
//
// Decided behaviours when reading:
//
//   - The file is opened read-only (an SQLite file: URI with mode=ro, and
//     immutable=1 for a database in write-ahead-log mode with no log beside
//     it), so reading never writes a journal, -wal or -shm file next to the
//     input.
//   - The feature tables are the rows of gpkg_contents with data_type
//     'features'. One is read; with several, Options.Layer names the one to
//     read (exactly, or else ignoring case) and without it the error lists
//     them, as it does for a name that is not among them. An SQLite file
//     without gpkg_contents is "an SQLite database but not a GeoPackage".
//   - The geometry column is the table's row of gpkg_geometry_columns. Its
//     declared type is not trusted: every record's blob is checked for
//     itself, so a GEOMETRY or MULTISURFACE table of plain polygons reads.
//     Polygon and MultiPolygon, with Z, M or both (dropped), in either
//     byte order, become orb.MultiPolygon; a Polygon is one part; rings
//     keep their order and winding. A NULL geometry, the blob's empty flag,
//     an empty polygon, a point, a line, a collection or an extended type
//     is an error marked Error.Skippable, and with Options.SkipBadGeometry
//     such records are left out with one warning each (the first five named,
//     the rest counted). A MultiSurface whose parts are Polygons reads as a
//     MultiPolygon; a CurvePolygon or a curved part is an error naming the
//     type, not skippable: it is an area, which this reader cannot draw with
//     straight segments. Broken geometry — a blob
//     shorter than its header and envelope, a count larger than the bytes
//     that follow, an unknown WKB type, short rings, non-finite
//     coordinates — is always an error. Every count is checked against the
//     blob's length before go-geom decodes it, so a hostile blob allocates
//     no more than its own size.
//   - A ring whose last position differs from its first is closed, with one
//     warning for the file (layer.CheckPolygons).
//   - Ids come from the column Options.IDColumn (text as it is, whole
//     numbers in their shortest form; the column is kept as an attribute),
//     else from the integer primary key (fid), with Layer.IDColumn "".
//     Naming the primary key as IDColumn is the same as naming none. A table
//     with no integer primary key is numbered by position ("#"), with a
//     warning. A NULL, empty, fractional or blob id, and an id met twice,
//     are errors naming the record (and the earlier one).
//   - Attributes are every other column, in the table's declared order:
//     INTEGER and REAL values are numbers (integers beyond ±2^53 are kept as
//     text, and the column becomes Text), TEXT goes through the shared rules
//     of layer.Builder (missing words, codes with a leading zero), NULL is
//     missing, integers 0 and 1 in a column declared BOOLEAN are "false"
//     and "true", and a BLOB value is the text "<blob, N bytes>" (it is not
//     a number, and a binary value has no other honest text). Values come
//     as stored: text in a DATE column stays text.
//   - The coordinate system is the table's srs_id in gpkg_spatial_ref_sys:
//     its definition through io/crs.FromWKT, else (a definition that is
//     "undefined" or unreadable) the organization's EPSG code through
//     io/crs.Lookup. srs_id -1 and 0 are GeoPackage's undefined systems.
//     With no usable system, coordinates within longitude/latitude range
//     are degrees; beyond it the layer is projected in unknown units, with
//     a warning. What cannot be read is a warning, never an error. A
//     geographic system with coordinates beyond longitude/latitude range is
//     an error naming the first such record.
//   - A table with no records, or none left, is an error.
//
// Writing (Write) makes a GeoPackage 1.3: application_id 'GPKG',
// user_version 10300, gpkg_spatial_ref_sys with its three required rows
// (EPSG:4326 with its definition, -1 and 0) plus the layer's system,
// gpkg_contents with the layer's extent, gpkg_geometry_columns, and one
// feature table: fid INTEGER PRIMARY KEY AUTOINCREMENT, geom (blobs with a
// little-endian header, the xy envelope and ISO WKB MultiPolygon), the
// ids as TEXT, the layer's columns and the result columns (Number as REAL,
// Text as TEXT, missing as NULL). The layer model keeps a system's name,
// EPSG code and unit but not its definition, so an EPSG system is written
// as organization 'EPSG' with its code and the definition 'undefined',
// which GDAL and this reader resolve from the code; a projected system
// known only by its unit becomes a LOCAL_CS in that unit (srs_id 100000),
// and one with no unit the undefined Cartesian system. No spatial index is
// written (GeoPackage makes it optional). gpkg_contents.last_change holds
// the time of writing, so two writes of one layer differ in those bytes.
//
// The package never prints; warnings are returned to the caller, and every
// error ReadFile returns is an *Error naming the file, the table, the
// record (1-based, in the order of the primary key) with its id, and the
// column. Text in the layer (values, ids, column names) is UTF-8: invalid
// bytes become U+FFFD.
//
// Source: "OGC GeoPackage Encoding Standard", OGC 12-128r18, version 1.3.1
// (2021): gpkg_contents, gpkg_geometry_columns, gpkg_spatial_ref_sys
// (clauses 1.1.2, 1.1.3, 2.1.5, Annex C) and the geometry blob (clause
// 2.1.3); version 1.2 files are the same in all of these. The WKB geometry
// codes are those of ISO 13249-3 (SQL/MM Spatial) as the standard cites.
//
// # Where to start
//
// ReadFile (read.go) opens the file (openName), settles the table
// (findTable) and its columns (findColumns), reads the coordinate system
// (readCRS), then walks the records (records.go: readRecords, record) and
// builds the layer (finish). blob.go checks and decodes geometry blobs
// (decodeBlob, checkWKB) and encodes them (appendBlob). Write (write.go)
// plans the table's columns (planTable) and builds the database in a
// temporary file (build). errors.go has the error type.
package gpkg
