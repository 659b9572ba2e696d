package gpkg

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

// maxSkipNotes is how many left-out records are named one by one.
const maxSkipNotes = 5

// records gathers what the rows of the feature table give.
type records struct {
	pos       int // records read so far, left out or not
	ids       []string
	geoms     []orb.MultiPolygon
	cols      []*layer.Builder
	seen      map[string]int // id → record
	nClosed   int            // records with rings closed
	closedAt  string         // the first of them, for the warning
	nSkipped  int
	skipNotes []string
	out       *outside // the first position outside lon/lat range
}

// quoteIdent quotes an SQL identifier; names come from the file.
func quoteIdent(s string) string { return `"` + strings.ReplaceAll(s, `"`, `""`) + `"` }

// query selects the key, the geometry and the attributes of every record.
// The attributes are selected as +column, which SQLite gives as stored but
// without the declared type, so that the driver hands over what the file
// holds (text in a DATE column stays text).
func (rd *reader) query() string {
	var b strings.Builder
	b.WriteString("SELECT ")
	if rd.pk != "" {
		b.WriteString(quoteIdent(rd.pk))
	} else {
		b.WriteString("NULL")
	}
	b.WriteString(", " + quoteIdent(rd.geomCol))
	for _, a := range rd.attrs {
		b.WriteString(", +" + quoteIdent(a.name))
	}
	b.WriteString(" FROM " + quoteIdent(rd.table))
	if rd.pk != "" {
		b.WriteString(" ORDER BY " + quoteIdent(rd.pk))
	}
	return b.String()
}

// readRecords reads the table row by row.
func (rd *reader) readRecords() error {
	rec := &rd.rec
	rec.seen = make(map[string]int)
	rec.cols = make([]*layer.Builder, len(rd.attrs))
	for i, a := range rd.attrs {
		rec.cols[i] = layer.NewBuilder(strings.ToValidUTF8(a.name, "\uFFFD"), 0)
	}
	rows, err := rd.db.Query(rd.query())
	if err != nil {
		return rd.cause(err, "cannot be read: %v", err)
	}
	defer rows.Close()
	vals := make([]any, 2+len(rd.attrs))
	ptrs := make([]any, len(vals))
	for i := range vals {
		ptrs[i] = &vals[i]
	}
	for rows.Next() {
		if err := rows.Scan(ptrs...); err != nil {
			return rd.cause(err, "record %d cannot be read: %v", rec.pos+1, err)
		}
		if err := rd.record(vals); err != nil {
			return err
		}
	}
	if err := rows.Err(); err != nil {
		return rd.cause(err, "cannot be read after record %d: %v", rec.pos, err)
	}
	return nil
}

// record checks one row and adds it as an area, or leaves it out. The
// checks come in a fixed order — geometry, then id — as in io/geojson.
func (rd *reader) record(vals []any) error {
	rec := &rd.rec
	rec.pos++
	pos := rec.pos
	id, idCol, idMsg := rd.recordID(pos, vals)
	mp, bad := rd.geometry(vals[1])
	if bad == nil {
		closed, empty, err := layer.CheckPolygons(&mp)
		switch {
		case err != nil:
			bad = broken("%v", err)
		case empty:
			bad = notArea("the geometry is empty; areas must be Polygon or MultiPolygon")
		case closed > 0:
			if rec.nClosed == 0 {
				rec.closedAt = recordLabel(pos, id)
			}
			rec.nClosed++
		}
	}
	if bad != nil {
		return rd.badGeometry(pos, id, bad)
	}
	if idMsg != "" {
		return rd.fail(rd.table, pos, "", idCol, "%s", idMsg)
	}
	if prev, dup := rec.seen[id]; dup {
		return rd.fail(rd.table, pos, id, idCol, "has the same id as record %d; ids must be unique", prev)
	}
	rec.seen[id] = pos
	if err := rd.checkRange(pos, id, mp); err != nil {
		return err
	}
	rec.ids = append(rec.ids, id)
	rec.geoms = append(rec.geoms, mp)
	for i, a := range rd.attrs {
		addValue(rec.cols[i], vals[2+i], a.boolean)
	}
	return nil
}

// recordLabel names a record as messages do.
func recordLabel(pos int, id string) string {
	if id == "" {
		return fmt.Sprintf("record %d", pos)
	}
	return fmt.Sprintf("record %d (id %q)", pos, id)
}

// recordID gives the id of a record: from the id column, the primary key,
// or the position. When it cannot, msg says why and column where.
func (rd *reader) recordID(pos int, vals []any) (id, column, msg string) {
	switch {
	case rd.idAttr >= 0:
		column = rd.attrs[rd.idAttr].name
		id, msg = idFromValue(vals[2+rd.idAttr])
	case rd.pk != "":
		column = rd.pk
		id, msg = idFromValue(vals[0])
	default:
		id = strconv.Itoa(pos)
	}
	return id, column, msg
}

// idFromValue turns a stored value into an id: text as it is, whole
// numbers in their shortest form.
func idFromValue(v any) (string, string) {
	switch v := v.(type) {
	case nil:
		return "", "the id is NULL; every area needs an id"
	case int64:
		return strconv.FormatInt(v, 10), ""
	case float64:
		if v != math.Trunc(v) || math.IsInf(v, 0) {
			return "", fmt.Sprintf("the id is %v, not a whole number", v)
		}
		return layer.FormatNumber(v), ""
	case string:
		if strings.TrimSpace(v) == "" {
			return "", "the id is an empty text; every area needs an id"
		}
		return strings.ToValidUTF8(v, "\uFFFD"), ""
	case []byte:
		return "", fmt.Sprintf("the id is a blob of %d bytes; ids must be text or whole numbers", len(v))
	}
	return "", fmt.Sprintf("the id is %v (%T); ids must be text or whole numbers", v, v)
}

// geometry decodes the value of the geometry column.
func (rd *reader) geometry(v any) (orb.MultiPolygon, *badGeom) {
	switch v := v.(type) {
	case nil:
		return nil, notArea("has no geometry (NULL); areas must be Polygon or MultiPolygon")
	case []byte:
		return decodeBlob(v)
	case string:
		return nil, broken("the geometry column holds text, not a GeoPackage geometry blob")
	}
	return nil, broken("the geometry column holds a number, not a GeoPackage geometry blob")
}

// badGeometry reports a record whose geometry makes no area, or leaves it
// out with a warning when the problem is one Options.SkipBadGeometry
// passes over and the option is set.
func (rd *reader) badGeometry(pos int, id string, bad *badGeom) error {
	rec := &rd.rec
	if !bad.skippable || !rd.opt.SkipBadGeometry {
		e := rd.fail(rd.table, pos, id, rd.geomCol, "%s", bad.msg)
		e.Skippable = bad.skippable
		return e
	}
	rec.nSkipped++
	if len(rec.skipNotes) < maxSkipNotes {
		e := rd.fail(rd.table, pos, id, rd.geomCol, "left out: %s", bad.msg)
		rec.skipNotes = append(rec.skipNotes, e.Error())
	}
	return nil
}

// checkRange applies the coordinate rule: in a table whose system is
// geographic, positions outside longitude/latitude range are an error;
// with no usable definition, the first such position is noted for finish.
func (rd *reader) checkRange(pos int, id string, mp orb.MultiPolygon) error {
	if rd.crsKnown && rd.crs.Projected || rd.rec.out != nil {
		return nil
	}
	p, ok := layer.OutsideLonLat(mp)
	if !ok {
		return nil
	}
	if rd.crsKnown {
		return rd.fail(rd.table, pos, id, rd.geomCol, "the position [%v, %v] is outside longitude/latitude range, but the table's coordinate system %s is geographic (degrees)", p[0], p[1], crsLabel(rd.crs))
	}
	rd.rec.out = &outside{record: pos, id: id, p: p}
	return nil
}

// crsLabel names a coordinate system for messages.
func crsLabel(c layer.CRS) string {
	switch {
	case c.Name != "" && c.EPSG != 0:
		return fmt.Sprintf("%q (EPSG:%d)", c.Name, c.EPSG)
	case c.EPSG != 0:
		return fmt.Sprintf("EPSG:%d", c.EPSG)
	}
	return strconv.Quote(c.Name)
}

// addValue adds a stored value to its column by the shared rules.
func addValue(b *layer.Builder, v any, boolean bool) {
	switch v := v.(type) {
	case nil:
		b.AddMissing()
	case int64:
		switch {
		case boolean && (v == 0 || v == 1):
			b.AddWord(strconv.FormatBool(v == 1))
		case v > 1<<53 || v < -(1<<53):
			b.AddWord(strconv.FormatInt(v, 10)) // beyond what a float64 holds exactly
		default:
			b.AddNumber(float64(v), "")
		}
	case float64:
		if math.IsInf(v, 0) || math.IsNaN(v) {
			b.AddWord(layer.FormatNumber(v))
		} else {
			b.AddNumber(v, "")
		}
	case string:
		b.AddText(v)
	case []byte:
		b.AddWord(fmt.Sprintf("<blob, %d bytes>", len(v)))
	default:
		b.AddWord(fmt.Sprint(v))
	}
}

// finish turns what was gathered into the layer.
func (rd *reader) finish() (*layer.Layer, error) {
	rec := &rd.rec
	if rec.nClosed > 0 {
		rd.warn("table %q: %d record(s) had rings whose last position differs from the first; they were closed (first: %s)", rd.table, rec.nClosed, rec.closedAt)
	}
	rd.warnings = append(rd.warnings, rec.skipNotes...)
	if rec.nSkipped > len(rec.skipNotes) {
		rd.warn("table %q: %d more records left out for lacking polygon geometry (%d in all)", rd.table, rec.nSkipped-len(rec.skipNotes), rec.nSkipped)
	}
	n := len(rec.ids)
	if n == 0 {
		if rec.pos == 0 {
			return nil, rd.fail(rd.table, 0, "", "", "has no records")
		}
		return nil, rd.fail(rd.table, 0, "", "", "all %d records were left out for lacking polygon geometry; no areas remain", rec.pos)
	}
	idCol := ""
	switch {
	case rd.idAttr >= 0:
		idCol = rd.attrs[rd.idAttr].name
	case rd.pk == "":
		idCol = "#"
		rd.warn("table %q has no integer primary key; the areas are numbered by their position (1 to %d)", rd.table, rec.pos)
	}
	c := rd.crs
	if !rd.crsKnown && rec.out != nil {
		c = layer.CRS{Projected: true}
		rd.warn("table %q has no coordinate system definition and its coordinates are not longitude/latitude (%s has [%v, %v]); distances will be in the layer's own units",
			rd.table, recordLabel(rec.out.record, rec.out.id), rec.out.p[0], rec.out.p[1])
	}
	cols := make([]*layer.Column, len(rec.cols))
	for i, b := range rec.cols {
		cols[i] = b.Column()
	}
	return &layer.Layer{Source: rd.source, IDs: rec.ids, Geoms: rec.geoms, Columns: cols, IDColumn: idCol, CRS: c}, nil
}
