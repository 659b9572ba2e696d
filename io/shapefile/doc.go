// Package shapefile reads an ESRI shapefile of polygons — the .shp of
// shapes, its .shx index and .dbf table, and the .prj and .cpg when
// present — into a layer.Layer: one area per record, with an id, a
// MultiPolygon geometry and one column per table field. The files may lie
// side by side on disk or in a zip, the way shapefiles are usually sent.
//
// It is written here, to the published description, because no pure-Go
// shapefile module is available to the project, and the part areatest
// needs (polygons and a dBASE table, read only) is small.
//
// Decided behaviours:
//
//   - The .shp, .shx and .dbf are required; a missing one is an error that
//     names it. Siblings are found by the .shp's base name with the
//     extension in any case (.DBF). A record count that differs between
//     the .dbf and the .shx is an error naming both counts; a record that
//     starts or ends beyond the end of the .shp is an error naming it.
//   - Polygon, PolygonZ and PolygonM shapes become orb.MultiPolygon (Z and M
//     are dropped). The description tells shells from holes by winding
//     alone (shells clockwise, holes counter-clockwise, y pointing up): each
//     hole goes to the smallest shell that contains it (bounding boxes
//     first, then a point-in-ring test of a hole vertex not on the shell),
//     and a hole in no shell becomes a shell of its own, with one warning
//     per file. Shells come in file order; rings keep the file's winding.
//     Rings are then checked as for every reader (layer.CheckPolygons):
//     unclosed rings are closed with one warning per file, short rings and
//     non-finite coordinates are errors.
//   - A null shape, or a polygon with no parts, has no geometry: an error
//     marked Error.Skippable, or, with Options.SkipBadGeometry, the record
//     is left out with a warning, as are records of another shape type. A
//     file of points, multipoints, lines or multipatches is an error that
//     names what it holds.
//   - Records marked deleted in the .dbf are left out, with their shapes,
//     and counted in one warning; record numbers in messages stay those of
//     the files.
//   - Columns are built by layer.Builder, so the rules of every reader hold
//     (missing words, numbers, codes with a leading zero). Character (C)
//     fields lose their trailing spaces. Numeric (N, F) fields are read from
//     their text, so a blank is missing, and so is a field of asterisks,
//     which is how dBASE writes a number too wide for its field. Logical (L)
//     fields become true/false (T, t, Y, y / F, f, N, n), "?" or blank
//     missing; dates (D, YYYYMMDD) become YYYY-MM-DD, blank or 00000000
//     missing. Fields of other types (memo, binary) are left out with a
//     warning, as is a second field of the same name.
//   - Text is decoded by the code page the .cpg names (UTF-8, 1252,
//     CP1252, windows-1252, ISO-8859-1, 88591, 850, …), else the one the
//     table's language driver byte gives (0x57 and 0x03 windows-1252, 0x01
//     code page 437, 0x02 code page 850, and the other single-byte pages),
//     else UTF-8. The East Asian double-byte pages (language drivers 0x4D
//     to 0x4F, 0x13, 0x78 to 0x7B) and names not known here are a warning,
//     and text is then read as UTF-8: numbers, which the statistics need,
//     are unaffected, and the message says what to fix. Bytes that are not
//     UTF-8 in a table read as UTF-8 become U+FFFD, with one warning.
//   - Ids come from the column Options.IDColumn (matched exactly, else
//     ignoring case): text trimmed, whole numbers with their digits, other
//     numbers in their shortest form; an empty id or one repeated is an
//     error naming the records. Without it the areas are numbered by
//     record (1, 2, …), Layer.IDColumn "#", with a warning.
//   - The coordinate system comes from the .prj (ESRI's well-known text,
//     read by io/crs). A geographic definition with coordinates beyond
//     longitude/latitude is an error; a .prj that cannot be read is a
//     warning. Without a readable definition, coordinates within
//     longitude/latitude are taken as such, and others as projected in an
//     unknown unit, with a warning.
//   - In a zip the files are found by extension in any folder; folders and
//     macOS resource forks (__MACOSX/, ._name) are passed over. Several .shp
//     files are an error listing them unless Options.Layer names one. What
//     a zip may unpack to is capped at 100 times its size (at least 64 MiB,
//     at most 4 GiB): beyond it the zip is called damaged or hostile.
//   - Every length and count in the files is checked against the file's
//     size before anything is allocated for it, so a hostile header fails
//     with a message; records whose index entries make them share bytes of
//     the .shp beyond its size are an error, and fields of width 0 are left
//     out, so that a small file cannot make a huge layer. Memory grows with
//     the files: they are held whole while the layer is built. Records with
//     many shells and many holes put their shells in a grid first, so that
//     placing the holes stays near linear.
//
// The package never prints: warnings are returned, each one line starting
// with the name of the file it is about, and every error is an *Error
// naming the file (a zip member as "states.zip:states.dbf"), the record,
// its id and the column when known.
//
// Sources: "ESRI Shapefile Technical Description", ESRI White Paper, July
// 1998 (the .shp and .shx headers, records and shape types, the ring
// winding rule); the dBASE III PLUS and dBASE IV file structure as
// published by Ashton-Tate and later dBASE LLC (header, field descriptors,
// records, deletion flag, language driver byte); ESRI's documentation of
// the .cpg code page file.
//
// # Where to start
//
// ReadFile (read.go) finds the files beside a .shp or opens a zip; Read
// takes a zip in memory; both hand a fileSet to read (build.go), where
// reader.open checks the headers and counts and reader.record reads one
// record of the .dbf (dbf.go) and the .shp (shp.go) at a time. The
// assembler (rings.go) groups rings into polygons; codepage.go decodes
// text; zip.go picks the shapefile in a zip.
package shapefile
