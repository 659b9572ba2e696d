package gpkg

import (
	"database/sql"
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

// The GeoPackage identity (OGC 12-128r18, requirements 2 and 3): the
// SQLite application_id 'GPKG' and user_version 10300 for version 1.3.
const (
	applicationID = 0x47504B47
	userVersion   = 10300
)

// wgs84 is the definition of EPSG:4326 that GeoPackage requires in every
// gpkg_spatial_ref_sys (requirement 11), in the first edition of
// well-known text.
const wgs84 = `GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],AUTHORITY["EPSG","4326"]]`

// schema is the core of a GeoPackage: the tables OGC 12-128r18 requires
// (clauses 1.1.2, 1.1.3 and 2.1.5), as its Annex C defines them, with the
// three spatial reference systems it requires.
var schema = []string{
	`CREATE TABLE gpkg_spatial_ref_sys (srs_name TEXT NOT NULL, srs_id INTEGER PRIMARY KEY, organization TEXT NOT NULL, organization_coordsys_id INTEGER NOT NULL, definition TEXT NOT NULL, description TEXT)`,
	`CREATE TABLE gpkg_contents (table_name TEXT NOT NULL PRIMARY KEY, data_type TEXT NOT NULL, identifier TEXT UNIQUE, description TEXT DEFAULT '', last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')), min_x DOUBLE, min_y DOUBLE, max_x DOUBLE, max_y DOUBLE, srs_id INTEGER, CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id))`,
	`CREATE TABLE gpkg_geometry_columns (table_name TEXT NOT NULL, column_name TEXT NOT NULL, geometry_type_name TEXT NOT NULL, srs_id INTEGER NOT NULL, z TINYINT NOT NULL, m TINYINT NOT NULL, CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name), CONSTRAINT uk_gc_table_name UNIQUE (table_name), CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name), CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id))`,
	`INSERT INTO gpkg_spatial_ref_sys VALUES ('WGS 84 geodetic', 4326, 'EPSG', 4326, '` + wgs84 + `', 'longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid')`,
	`INSERT INTO gpkg_spatial_ref_sys VALUES ('Undefined cartesian SRS', -1, 'NONE', -1, 'undefined', 'undefined cartesian coordinate reference system')`,
	`INSERT INTO gpkg_spatial_ref_sys VALUES ('Undefined geographic SRS', 0, 'NONE', 0, 'undefined', 'undefined geographic coordinate reference system')`,
}

// customSRS is the srs_id given to a projected system known by its unit
// only, written as a local (engineering) system.
const customSRS = 100000

// srsRow is the layer's row of gpkg_spatial_ref_sys; id 4326 and -1 are
// among the required rows already.
type srsRow struct {
	id         int
	name, org  string
	definition string
}

// srsFor chooses the system to write. The layer model keeps a system's
// name, EPSG code and unit, not its definition: an EPSG system is written
// by organization and code with the definition "undefined", which
// readers resolve from the code; a projected system known only by its
// unit becomes a local system in that unit; one with no unit is
// GeoPackage's undefined Cartesian system.
func srsFor(c layer.CRS) srsRow {
	switch {
	case !c.Projected && (c.EPSG == 0 || c.EPSG == 4326):
		return srsRow{id: 4326}
	case c.EPSG > 0:
		name := c.Name
		if name == "" {
			name = fmt.Sprintf("EPSG:%d", c.EPSG)
		}
		return srsRow{id: c.EPSG, name: name, org: "EPSG", definition: "undefined"}
	case c.Unit != "" && c.MetresPerUnit > 0:
		name := c.Name
		if name == "" {
			name = "planar coordinates in " + c.Unit
		}
		def := fmt.Sprintf(`LOCAL_CS[%s,UNIT[%s,%s]]`, wktQuote(name), wktQuote(c.Unit), layer.FormatNumber(c.MetresPerUnit))
		return srsRow{id: customSRS, name: name, org: "NONE", definition: def}
	}
	return srsRow{id: -1}
}

// wktQuote quotes a text for well-known text, doubling inner quotes.
func wktQuote(s string) string { return `"` + strings.ReplaceAll(s, `"`, `""`) + `"` }

// Write writes l as a GeoPackage 1.3 to w: one feature table named table
// ("areas" if empty) with fid, the geometry column geom (MULTIPOLYGON),
// the ids, the layer's columns and then extra, each holding one value per
// area. The ids go in a TEXT column named after Layer.IDColumn when that is
// one of the layer's columns (which is then not written twice), else "id".
// Numbers become REAL, text TEXT, missing values NULL; a name already taken
// (SQLite names are case-insensitive) gets the suffix "_2", "_3", ….
//
// SQLite needs a file: the database is built in a temporary file, which is
// copied to w and removed. Errors are plain errors starting "gpkg: ", as
// the output's name is the caller's to add.
func Write(w io.Writer, l *layer.Layer, extra []*layer.Column, table string) error {
	if table == "" {
		table = "areas"
	}
	plan, err := planTable(l, extra, table)
	if err != nil {
		return err
	}
	tmp, err := os.CreateTemp("", "areatest-*.gpkg")
	if err != nil {
		return fmt.Errorf("gpkg: cannot create a temporary file for the GeoPackage: %w", err)
	}
	name := tmp.Name()
	tmp.Close()
	defer os.Remove(name)
	defer os.Remove(name + "-journal")
	if err := build(name, l, plan); err != nil {
		return fmt.Errorf("gpkg: cannot build the GeoPackage of %s: %w", l.Source, err)
	}
	f, err := os.Open(name)
	if err != nil {
		return fmt.Errorf("gpkg: cannot read back the GeoPackage built: %w", err)
	}
	defer f.Close()
	if _, err := io.Copy(w, f); err != nil {
		return fmt.Errorf("gpkg: cannot write the GeoPackage: %w", err)
	}
	return nil
}

// tablePlan is what Write puts in the feature table.
type tablePlan struct {
	table  string
	idName string
	cols   []*layer.Column // written after the ids, in order
	names  []string        // their column names, made unique
	srs    srsRow
}

// planTable checks the layer and names the columns.
func planTable(l *layer.Layer, extra []*layer.Column, table string) (*tablePlan, error) {
	n := l.Len()
	if len(l.Geoms) != n {
		return nil, fmt.Errorf("gpkg: the layer %s has %d ids but %d geometries", l.Source, n, len(l.Geoms))
	}
	p := &tablePlan{table: table, srs: srsFor(l.CRS)}
	taken := map[string]bool{"fid": true, "geom": true}
	unique := func(name string) string {
		if name == "" {
			name = "column"
		}
		u := name
		for k := 2; taken[strings.ToLower(u)]; k++ {
			u = fmt.Sprintf("%s_%d", name, k)
		}
		taken[strings.ToLower(u)] = true
		return u
	}
	idFrom := ""
	if l.IDColumn != "" && l.IDColumn != "#" {
		if _, err := l.Column(l.IDColumn); err == nil {
			idFrom = l.IDColumn
		}
	}
	p.idName = unique(cmpOr(idFrom, "id"))
	for _, c := range l.Columns {
		if c.Name == idFrom {
			continue
		}
		p.cols, p.names = append(p.cols, c), append(p.names, unique(c.Name))
	}
	for _, c := range extra {
		p.cols, p.names = append(p.cols, c), append(p.names, unique(c.Name))
	}
	for _, c := range p.cols {
		if len(c.Missing) != n || c.Kind == layer.Number && len(c.Num) != n || c.Kind == layer.Text && len(c.Str) != n {
			return nil, fmt.Errorf("gpkg: column %q has %d values for %d areas", c.Name, len(c.Missing), n)
		}
	}
	return p, nil
}

func cmpOr(a, b string) string {
	if a != "" {
		return a
	}
	return b
}

// build writes the database at path: the schema, then the areas in one
// transaction through one prepared statement.
func build(path string, l *layer.Layer, p *tablePlan) (err error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return err
	}
	db, err := sql.Open("sqlite", "file:"+uriEscaper.Replace(filepath.ToSlash(abs)))
	if err != nil {
		return err
	}
	defer func() {
		if cerr := db.Close(); err == nil {
			err = cerr
		}
	}()
	db.SetMaxOpenConns(1)
	// The file is private until copied out: no journal, no syncs.
	stmts := []string{
		fmt.Sprintf("PRAGMA application_id = %d", applicationID),
		fmt.Sprintf("PRAGMA user_version = %d", userVersion),
		"PRAGMA journal_mode = OFF",
		"PRAGMA synchronous = OFF",
	}
	for _, s := range append(stmts, schema...) {
		if _, err := db.Exec(s); err != nil {
			return err
		}
	}
	if err := p.writeMeta(db, l); err != nil {
		return err
	}
	return p.writeRows(db, l)
}

// writeMeta registers the system, the table and its geometry column, and
// creates the table.
func (p *tablePlan) writeMeta(db *sql.DB, l *layer.Layer) error {
	if p.srs.org != "" {
		if _, err := db.Exec(`INSERT INTO gpkg_spatial_ref_sys VALUES (?, ?, ?, ?, ?, NULL)`, p.srs.name, p.srs.id, p.srs.org, p.srs.id, p.srs.definition); err != nil {
			return err
		}
	}
	var ext []any
	if b, ok := bounds(l.Geoms); ok {
		ext = []any{b.Min[0], b.Min[1], b.Max[0], b.Max[1]}
	} else {
		ext = []any{nil, nil, nil, nil}
	}
	now := time.Now().UTC().Format("2006-01-02T15:04:05.000Z")
	args := append([]any{p.table, p.table, now}, ext...)
	if _, err := db.Exec(`INSERT INTO gpkg_contents (table_name, data_type, identifier, last_change, min_x, min_y, max_x, max_y, srs_id) VALUES (?, 'features', ?, ?, ?, ?, ?, ?, ?)`, append(args, p.srs.id)...); err != nil {
		return err
	}
	if _, err := db.Exec(`INSERT INTO gpkg_geometry_columns VALUES (?, 'geom', 'MULTIPOLYGON', ?, 0, 0)`, p.table, p.srs.id); err != nil {
		return err
	}
	var b strings.Builder
	fmt.Fprintf(&b, `CREATE TABLE %s (fid INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, geom MULTIPOLYGON, %s TEXT`, quoteIdent(p.table), quoteIdent(p.idName))
	for i, c := range p.cols {
		typ := "REAL"
		if c.Kind == layer.Text {
			typ = "TEXT"
		}
		fmt.Fprintf(&b, ", %s %s", quoteIdent(p.names[i]), typ)
	}
	b.WriteString(")")
	_, err := db.Exec(b.String())
	return err
}

// bounds is the extent of every geometry; ok is false when there is none.
func bounds(geoms []orb.MultiPolygon) (b orb.Bound, ok bool) {
	for _, g := range geoms {
		if len(g) == 0 {
			continue
		}
		if gb := g.Bound(); !ok {
			b, ok = gb, true
		} else {
			b = b.Union(gb)
		}
	}
	return b, ok
}

// writeRows inserts the areas.
func (p *tablePlan) writeRows(db *sql.DB, l *layer.Layer) (err error) {
	tx, err := db.Begin()
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			err = errors.Join(err, tx.Rollback())
		}
	}()
	marks := strings.TrimSuffix(strings.Repeat("?, ", len(p.cols)+2), ", ")
	stmt, err := tx.Prepare(fmt.Sprintf("INSERT INTO %s (geom, %s%s) VALUES (%s)", quoteIdent(p.table), quoteIdent(p.idName), columnList(p.names), marks))
	if err != nil {
		return err
	}
	defer stmt.Close()
	args := make([]any, len(p.cols)+2)
	var blob []byte
	for i, id := range l.IDs {
		args[0] = nil
		if len(l.Geoms[i]) > 0 {
			blob = appendBlob(blob[:0], l.Geoms[i], int32(p.srs.id))
			args[0] = blob
		}
		args[1] = id
		for k, c := range p.cols {
			args[k+2] = cellValue(c, i)
		}
		if _, err := stmt.Exec(args...); err != nil {
			return fmt.Errorf("area %d (id %q): %w", i+1, id, err)
		}
	}
	return tx.Commit()
}

// columnList is ", a, b" for the column names.
func columnList(names []string) string {
	var b strings.Builder
	for _, n := range names {
		b.WriteString(", ")
		b.WriteString(quoteIdent(n))
	}
	return b.String()
}

// cellValue is the value row i of c stores: REAL, TEXT or NULL. SQLite
// stores NaN as NULL; infinities are kept.
func cellValue(c *layer.Column, i int) any {
	switch {
	case c.Missing[i]:
		return nil
	case c.Kind == layer.Text:
		return c.Str[i]
	case math.IsNaN(c.Num[i]):
		return nil
	}
	return c.Num[i]
}
