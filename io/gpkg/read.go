package gpkg

import (
	"bytes"
	"database/sql"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	_ "modernc.org/sqlite" // the pure-Go SQLite driver, registered as "sqlite"

	"github.com/areatest/areatest/io/crs"
	"github.com/areatest/areatest/io/layer"
)

// Options control ReadFile.
type Options struct {
	// IDColumn names the column that holds the area ids; "" takes the
	// table's primary key (fid).
	IDColumn string
	// SkipBadGeometry leaves out records whose geometry is NULL, empty or
	// not a Polygon/MultiPolygon, reporting them as warnings, instead of
	// failing on the first.
	SkipBadGeometry bool
	// Layer names the feature table to read; "" reads the only one.
	Layer string
}

// sqliteMagic starts every SQLite 3 database file (and so every
// GeoPackage).
const sqliteMagic = "SQLite format 3\x00"

// Sniff reports whether head, the first bytes of a file, starts an SQLite
// database, as a GeoPackage does. 16 bytes are enough to tell.
func Sniff(head []byte) bool { return bytes.HasPrefix(head, []byte(sqliteMagic)) }

// ReadFile reads the feature table of the GeoPackage at path into a layer.
// It returns the layer and any warnings, each one line starting with the
// path. On failure the error is an *Error and the layer is nil. The file is
// opened read-only and nothing is written beside it.
func ReadFile(path string, opt Options) (*layer.Layer, []string, error) {
	rd := &reader{source: path, opt: opt}
	lay, err := rd.read()
	if err != nil {
		return nil, rd.warnings, err
	}
	return lay, rd.warnings, nil
}

// reader holds the state of one ReadFile.
type reader struct {
	source   string
	opt      Options
	db       *sql.DB
	warnings []string

	table    string
	geomCol  string
	srsID    int64
	pk       string    // the integer primary key column, "" if none
	attrs    []attrCol // every other column, in declared order
	idAttr   int       // index in attrs of Options.IDColumn, -1 for none
	crs      layer.CRS // from the definition, when crsKnown
	crsKnown bool

	rec records
}

// attrCol is an attribute column as the table declares it.
type attrCol struct {
	name    string
	boolean bool // declared BOOLEAN: integers 0 and 1 are false and true
}

func (rd *reader) read() (*layer.Layer, error) {
	dsn, err := rd.openName()
	if err != nil {
		return nil, err
	}
	db, err := sql.Open("sqlite", dsn)
	if err != nil {
		return nil, rd.cause(err, "cannot be opened as an SQLite database: %v", err)
	}
	defer db.Close()
	db.SetMaxOpenConns(1)
	rd.db = db
	if err := rd.findTable(); err != nil {
		return nil, err
	}
	if err := rd.findColumns(); err != nil {
		return nil, err
	}
	rd.readCRS()
	if err := rd.readRecords(); err != nil {
		return nil, err
	}
	return rd.finish()
}

// openName checks that the file is an SQLite database and gives the name
// to open it by: a file: URI, read-only. A database in write-ahead-log
// mode with no log beside it is opened immutable, since SQLite would
// otherwise create its shared-memory file next to the input.
func (rd *reader) openName() (string, error) {
	f, err := os.Open(rd.source)
	if err != nil {
		return "", rd.cause(err, "cannot be opened: %v", unwrapPath(err))
	}
	head := make([]byte, 100)
	n, err := io.ReadFull(f, head)
	f.Close()
	if err != nil && !errors.Is(err, io.ErrUnexpectedEOF) && !errors.Is(err, io.EOF) {
		return "", rd.cause(err, "cannot be read: %v", unwrapPath(err))
	}
	head = head[:n]
	switch {
	case n == 0:
		return "", rd.fail("", 0, "", "", "the file is empty; expected a GeoPackage")
	case !Sniff(head):
		return "", rd.fail("", 0, "", "", "not a GeoPackage: the file does not start as an SQLite database does")
	}
	abs, err := filepath.Abs(rd.source)
	if err != nil {
		return "", rd.cause(err, "cannot be opened: %v", err)
	}
	name := "file:" + uriEscaper.Replace(filepath.ToSlash(abs)) + "?mode=ro"
	wal := n >= 20 && (head[18] == 2 || head[19] == 2)
	if _, err := os.Stat(rd.source + "-wal"); wal && err != nil {
		name += "&immutable=1"
	}
	return name, nil
}

// uriEscaper escapes the characters that end or quote the path of an
// SQLite file: URI.
var uriEscaper = strings.NewReplacer("%", "%25", "?", "%3F", "#", "%23")

// unwrapPath drops the path that *os.PathError repeats, since the message
// already starts with it.
func unwrapPath(err error) error {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// findTable settles the feature table to read, from gpkg_contents.
func (rd *reader) findTable() error {
	var n int
	err := rd.db.QueryRow(`SELECT count(*) FROM sqlite_master WHERE type IN ('table', 'view') AND name = 'gpkg_contents' COLLATE NOCASE`).Scan(&n)
	if err != nil {
		return rd.cause(err, "cannot be read as an SQLite database: %v", err)
	}
	if n == 0 {
		return rd.fail("", 0, "", "", "is an SQLite database but not a GeoPackage (it has no gpkg_contents table)")
	}
	tables, err := rd.queryTexts(`SELECT CAST(table_name AS TEXT) FROM gpkg_contents WHERE lower(data_type) = 'features' AND table_name IS NOT NULL ORDER BY 1`)
	if err != nil {
		return rd.cause(err, "gpkg_contents cannot be read: %v", err)
	}
	switch {
	case len(tables) == 0:
		return rd.fail("", 0, "", "", "has no feature table (gpkg_contents lists no table of data_type 'features')")
	case rd.opt.Layer != "":
		for _, exact := range []bool{true, false} {
			for _, t := range tables {
				if t == rd.opt.Layer || !exact && strings.EqualFold(t, rd.opt.Layer) {
					rd.table = t
					return nil
				}
			}
		}
		e := rd.fail("", 0, "", "", "has no feature table %q; its feature tables: %s", rd.opt.Layer, quoteList(tables))
		e.Layers = tables
		return e
	case len(tables) > 1:
		e := rd.fail("", 0, "", "", "has several feature tables: %s", quoteList(tables))
		e.Layers = tables
		return e
	}
	rd.table = tables[0]
	return nil
}

// queryTexts runs a query of one text column.
func (rd *reader) queryTexts(query string, args ...any) ([]string, error) {
	rows, err := rd.db.Query(query, args...)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	var out []string
	for rows.Next() {
		var s sql.NullString
		if err := rows.Scan(&s); err != nil {
			return nil, err
		}
		out = append(out, s.String)
	}
	return out, rows.Err()
}

// findColumns reads the geometry column and its srs_id from
// gpkg_geometry_columns and the table's columns in declared order.
func (rd *reader) findColumns() error {
	var col sql.NullString
	var srs sql.NullInt64
	err := rd.db.QueryRow(`SELECT CAST(column_name AS TEXT), CAST(srs_id AS INTEGER) FROM gpkg_geometry_columns WHERE table_name = ? COLLATE NOCASE`, rd.table).Scan(&col, &srs)
	switch {
	case errors.Is(err, sql.ErrNoRows) || err == nil && !col.Valid:
		return rd.fail(rd.table, 0, "", "", "has no entry in gpkg_geometry_columns, so its geometry column is unknown")
	case err != nil:
		return rd.cause(err, "gpkg_geometry_columns cannot be read: %v", err)
	}
	rd.geomCol, rd.srsID = col.String, srs.Int64
	rows, err := rd.db.Query(`SELECT name, upper(type), pk FROM pragma_table_info(?)`, rd.table)
	if err != nil {
		return rd.cause(err, "the columns of table %q cannot be read: %v", rd.table, err)
	}
	defer rows.Close()
	var names []string
	var pks []string
	geomFound := false
	for rows.Next() {
		var name, typ string
		var pk int
		if err := rows.Scan(&name, &typ, &pk); err != nil {
			return rd.cause(err, "the columns of table %q cannot be read: %v", rd.table, err)
		}
		names = append(names, name)
		switch {
		case strings.EqualFold(name, rd.geomCol):
			geomFound, rd.geomCol = true, name
		default:
			if pk > 0 {
				pks = append(pks, name)
				if strings.Contains(typ, "INT") {
					rd.pk = name
				}
			}
			rd.attrs = append(rd.attrs, attrCol{name: name, boolean: typ == "BOOLEAN"})
		}
	}
	if err := rows.Err(); err != nil {
		return rd.cause(err, "the columns of table %q cannot be read: %v", rd.table, err)
	}
	if len(names) == 0 {
		return rd.fail(rd.table, 0, "", "", "is listed in gpkg_contents, but the database has no such table")
	}
	if !geomFound {
		return rd.fail(rd.table, 0, "", "", "has no column %q, its geometry column in gpkg_geometry_columns (its columns: %s)", rd.geomCol, quoteList(names))
	}
	if len(pks) != 1 {
		rd.pk = ""
	}
	rd.dropKey()
	return rd.findIDColumn(names)
}

// dropKey removes the integer primary key from the attributes: it is the
// format's own feature id, not data.
func (rd *reader) dropKey() {
	if rd.pk == "" {
		return
	}
	for i, a := range rd.attrs {
		if a.name == rd.pk {
			rd.attrs = append(rd.attrs[:i], rd.attrs[i+1:]...)
			return
		}
	}
}

// findIDColumn places Options.IDColumn among the attributes. Naming the
// primary key is the same as naming none.
func (rd *reader) findIDColumn(names []string) error {
	rd.idAttr = -1
	want := rd.opt.IDColumn
	if want == "" || want == rd.pk {
		return nil
	}
	for i, a := range rd.attrs {
		if a.name == want {
			rd.idAttr = i
			return nil
		}
	}
	return rd.fail(rd.table, 0, "", "", "has no column %q to take the ids from (its columns: %s)", want, quoteList(names))
}

// readCRS reads the table's coordinate system: the definition through
// io/crs, else an EPSG code through crs.Lookup. srs_id -1 and 0 are
// GeoPackage's undefined systems; what cannot be read is a warning, and
// then the coordinates decide (finish).
func (rd *reader) readCRS() {
	if rd.srsID == -1 || rd.srsID == 0 {
		return
	}
	var name, org, def sql.NullString
	var code sql.NullInt64
	err := rd.db.QueryRow(`SELECT CAST(srs_name AS TEXT), CAST(organization AS TEXT), CAST(organization_coordsys_id AS INTEGER), CAST(definition AS TEXT) FROM gpkg_spatial_ref_sys WHERE srs_id = ?`, rd.srsID).Scan(&name, &org, &code, &def)
	if err != nil {
		why := "it has no row in gpkg_spatial_ref_sys"
		if !errors.Is(err, sql.ErrNoRows) {
			why = fmt.Sprintf("gpkg_spatial_ref_sys cannot be read: %v", err)
		}
		rd.warn("the coordinate system (srs_id %d) of table %q cannot be read: %s", rd.srsID, rd.table, why)
		return
	}
	c, werr := crs.FromWKT(def.String)
	if werr == nil {
		if c.EPSG == 0 && strings.EqualFold(org.String, "EPSG") {
			c.EPSG = int(code.Int64)
		}
	} else if strings.EqualFold(org.String, "EPSG") {
		var known bool
		if c, known = crs.Lookup(int(code.Int64)); known {
			werr = nil
		}
	}
	if werr != nil {
		why := fmt.Sprintf("its definition cannot be read (%v)", werr)
		if strings.EqualFold(strings.TrimSpace(def.String), "undefined") {
			why = fmt.Sprintf("its definition is \"undefined\" and %s %d is not a code this program knows", org.String, code.Int64)
		}
		rd.warn("the coordinate system %q (srs_id %d) of table %q: %s", name.String, rd.srsID, rd.table, why)
		return
	}
	if c.Name == "" {
		c.Name = name.String
	}
	rd.crs, rd.crsKnown = c, true
}

// fail builds an error; table, record, id and column locate it as far as
// known.
func (rd *reader) fail(table string, record int, id, column, format string, args ...any) *Error {
	return &Error{Source: rd.source, Table: table, Record: record, ID: id, Column: column, Msg: fmt.Sprintf(format, args...)}
}

// cause builds an error about the file (or the table, once known) with an
// underlying cause.
func (rd *reader) cause(err error, format string, args ...any) *Error {
	e := rd.fail(rd.table, 0, "", "", format, args...)
	e.Err = err
	return e
}

func (rd *reader) warn(format string, args ...any) {
	rd.warnings = append(rd.warnings, rd.source+": "+fmt.Sprintf(format, args...))
}

// quoteList quotes names for a message, at most 20 of them.
func quoteList(names []string) string {
	q := make([]string, 0, min(len(names), 21))
	for i, n := range names {
		if i == 20 {
			q = append(q, fmt.Sprintf("and %d more", len(names)-20))
			break
		}
		q = append(q, strconv.Quote(n))
	}
	return strings.Join(q, ", ")
}

// outside is the first position found outside longitude/latitude range.
type outside struct {
	record int
	id     string
	p      orb.Point
}
