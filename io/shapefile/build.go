package shapefile

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/crs"
	"github.com/areatest/areatest/io/layer"
)

// maxSkipNotes is how many left-out records are named one by one.
const maxSkipNotes = 5

// reader holds the state of one read: the files, the columns being built
// and what the warnings will say.
type reader struct {
	opt    Options
	source string // the layer's Source
	fs     *fileSet
	idx    index
	tab    *table
	dec    *textDecoder
	cs     layer.CRS
	hasCRS bool // the .prj was read

	idField  int // index into tab.fields; -1 without Options.IDColumn
	builders []*layer.Builder
	ids      []string
	geoms    []orb.MultiPolygon
	seen     map[string]int // id → record
	asm      assembler

	warnings  []string
	skipNotes []string
	nSkipped  int
	nDeleted  int
	nClosed   int       // records with rings that were closed
	nOrphans  int       // records with holes in no shell
	firstOf   [2]string // the first record closed, with orphans
	outside   *Error    // the first record with coordinates beyond lon/lat
	decoded   int       // bytes of .shp content read so far
}

// read turns the files of one shapefile into a layer.
func read(fs *fileSet, source string, opt Options) (*layer.Layer, []string, error) {
	rd := &reader{opt: opt, source: source, fs: fs, idField: -1, seen: make(map[string]int)}
	lay, err := rd.run()
	if err != nil {
		return nil, rd.warnings, err
	}
	return lay, rd.warnings, nil
}

func (rd *reader) run() (*layer.Layer, error) {
	if err := rd.open(); err != nil {
		return nil, err
	}
	for i := range rd.idx.n {
		if err := rd.record(i); err != nil {
			return nil, err
		}
	}
	return rd.finish()
}

// open checks the three files a shapefile needs, that they agree on the
// number of records, and reads the code page, the coordinate system and
// the id column.
func (rd *reader) open() error {
	fs := rd.fs
	for _, m := range []struct {
		m    member
		what string
	}{{fs.shx, "index"}, {fs.dbf, "table"}} {
		if !m.m.ok {
			return errorf(fs.shp.name, 0, "the %s %s is missing %s; a shapefile needs its %s", m.what, baseName(m.m.name), fs.where, extOf(m.m.name))
		}
	}
	t, err := checkHeader(fs.shp, "main file (.shp)")
	if err != nil {
		return err
	}
	if err := checkShapeType(fs.shp, t); err != nil {
		return err
	}
	if _, err := checkHeader(fs.shx, "index (.shx)"); err != nil {
		return err
	}
	if rd.idx, err = newIndex(fs.shx); err != nil {
		return err
	}
	rd.chooseDecoder()
	tab, warns, err := openTable(fs.dbf, rd.dec)
	if err != nil {
		return err
	}
	rd.tab = tab
	rd.warnings = append(rd.warnings, warns...)
	if tab.count != rd.idx.n {
		return errorf(fs.dbf.name, 0, "holds %d records, while the index %s lists %d shapes; the files do not belong together, or one is cut short", tab.count, baseName(fs.shx.name), rd.idx.n)
	}
	rd.readPrj()
	for _, f := range tab.fields {
		rd.builders = append(rd.builders, layer.NewBuilder(f.name, 0))
	}
	return rd.findIDField()
}

// chooseDecoder settles the code page of the table's text: the .cpg, else
// the language driver byte, else UTF-8.
func (rd *reader) chooseDecoder() {
	fs := rd.fs
	const fallback = "; its text is read as UTF-8, any bytes that are not UTF-8 shown as \uFFFD"
	rd.dec = newDecoder("UTF-8", nil)
	if fs.cpg.ok {
		if d, ok := cpgDecoder(string(fs.cpg.data)); ok {
			rd.dec = d
		} else {
			rd.warn(fs.cpg.name, "names the code page %q, which is not read%s", strings.TrimSpace(string(fs.cpg.data)), fallback)
		}
		return
	}
	if len(fs.dbf.data) <= 29 {
		return
	}
	ldid := fs.dbf.data[29]
	page, known := driverPages[ldid]
	switch d, ok := pageDecoder(page); {
	case ldid == 0:
	case ok:
		rd.dec = d
	case known:
		rd.warn(fs.dbf.name, "its language driver byte 0x%02X says the East Asian code page %d, which is not read%s", ldid, page, fallback)
	default:
		rd.warn(fs.dbf.name, "its language driver byte 0x%02X names no code page known here%s", ldid, fallback)
	}
}

// readPrj reads the coordinate system definition, if any; one io/crs
// cannot read is a warning, and the layer is then placed as one without.
func (rd *reader) readPrj() {
	prj := rd.fs.prj
	if !prj.ok {
		return
	}
	def := strings.TrimSpace(strings.TrimPrefix(string(prj.data), "\ufeff"))
	if def == "" {
		rd.warn(prj.name, "is empty; the layer is read as having no coordinate system definition")
		return
	}
	c, err := crs.FromWKT(def)
	if err != nil {
		rd.warn(prj.name, "cannot be read (%v); the layer is read as having no coordinate system definition", err)
		return
	}
	rd.cs, rd.hasCRS = c, true
}

// findIDField finds the column Options.IDColumn names: exactly, or else
// the one column that matches it ignoring case.
func (rd *reader) findIDField() error {
	want := rd.opt.IDColumn
	if want == "" {
		return nil
	}
	fold := -1
	names := make([]string, len(rd.tab.fields))
	for i, f := range rd.tab.fields {
		names[i] = f.name
		switch {
		case f.name == want:
			rd.idField = i
			return nil
		case strings.EqualFold(f.name, want):
			if fold >= 0 {
				fold = -2 // two candidates: take neither
			} else if fold == -1 {
				fold = i
			}
		}
	}
	if fold >= 0 {
		rd.idField = fold
		return nil
	}
	if len(names) == 0 {
		return errorf(rd.fs.dbf.name, 0, "has no column %q to take the ids from; the table has no columns", want)
	}
	return errorf(rd.fs.dbf.name, 0, "has no column %q to take the ids from (its columns: %s)", want, listNames(names, 12))
}

// record reads record i (0-based) of both files: it becomes an area, is
// left out (deleted in the table, or without polygon geometry when
// Options.SkipBadGeometry says so), or stops the read.
func (rd *reader) record(i int) error {
	rec := rd.tab.record(i)
	num := i + 1
	if rec[0] == deletedRec {
		rd.nDeleted++
		return nil
	}
	id, idCell, err := rd.recordID(rec, num)
	if err != nil {
		return err
	}
	label := ""
	if rd.idField >= 0 {
		label = id
	}
	mp, err := rd.geometry(i, label)
	if err != nil || mp == nil {
		return err
	}
	if prev, dup := rd.seen[id]; dup {
		e := errorf(rd.fs.dbf.name, num, "has the same id as record %d; ids must be unique", prev)
		e.ID, e.Column = id, rd.tab.fields[rd.idField].name
		return e
	}
	rd.seen[id] = num
	rd.ids = append(rd.ids, id)
	rd.geoms = append(rd.geoms, mp)
	for k := range rd.tab.fields {
		if k == rd.idField { // decoded once, so that a bad byte counts once
			add(rd.builders[k], idCell.s, idCell.kind)
			continue
		}
		s, kind := rd.tab.cell(rec, num, &rd.tab.fields[k], rd.dec)
		add(rd.builders[k], s, kind)
	}
	return nil
}

// cellValue is a decoded table value.
type cellValue struct {
	s    string
	kind cellKind
}

// recordID is the id a record's area gets: the id column's value (text
// trimmed, numbers in their shortest form), or the record number. It
// returns the id column's value as well.
func (rd *reader) recordID(rec []byte, num int) (string, cellValue, error) {
	if rd.idField < 0 {
		return strconv.Itoa(num), cellValue{}, nil
	}
	f := &rd.tab.fields[rd.idField]
	var c cellValue
	c.s, c.kind = rd.tab.cell(rec, num, f, rd.dec)
	s := strings.TrimSpace(c.s)
	if c.kind == cellMissing || s == "" {
		e := errorf(rd.fs.dbf.name, num, "is empty; every area needs an id")
		e.Column = f.name
		return "", c, e
	}
	// Whole numbers keep their digits (a float64 would round those beyond
	// 2^53); other numbers are written in their shortest form.
	if (f.typ == 'N' || f.typ == 'F') && !isInteger(s) && layer.IsDecimal(s) {
		if v, err := strconv.ParseFloat(s, 64); err == nil {
			s = layer.FormatNumber(v)
		}
	}
	return strings.TrimPrefix(s, "+"), c, nil
}

// isInteger reports digits with an optional sign.
func isInteger(s string) bool {
	if s != "" && (s[0] == '-' || s[0] == '+') {
		s = s[1:]
	}
	return s != "" && allDigits([]byte(s))
}

// geometry reads the shape of record i (0-based) into polygons. It returns
// nil without error for a record left out under Options.SkipBadGeometry.
func (rd *reader) geometry(i int, id string) (orb.MultiPolygon, error) {
	num := i + 1
	fail := func(msg string, skippable bool) *Error {
		e := errorf(rd.fs.shp.name, num, "%s", msg)
		e.ID, e.Skippable = id, skippable
		return e
	}
	c, msg := content(rd.fs.shp, rd.idx, i)
	if msg != "" {
		return nil, fail(msg, false)
	}
	// An index that points many records at the same bytes would make a
	// small file decode into a huge layer.
	if rd.decoded += 8 + len(c); rd.decoded > len(rd.fs.shp.data)-headerSize {
		return nil, fail(fmt.Sprintf("overlaps other records: by the index %s the records' contents add up to more than the .shp holds; the index is damaged", baseName(rd.idx.m.name)), false)
	}
	rings, skippable, msg := shape(c)
	if msg != "" {
		if !skippable || !rd.opt.SkipBadGeometry {
			return nil, fail(msg, skippable)
		}
		rd.nSkipped++
		if len(rd.skipNotes) < maxSkipNotes {
			rd.skipNotes = append(rd.skipNotes, fail("left out: "+msg, true).Error())
		}
		return nil, nil
	}
	mp, orphans := rd.asm.assemble(rings)
	closed, _, err := layer.CheckPolygons(&mp)
	if err != nil {
		e := fail(err.Error(), false)
		e.Err = err
		return nil, e
	}
	rd.note(0, closed > 0, num, id)
	rd.note(1, orphans > 0, num, id)
	if rd.outside == nil {
		if p, out := layer.OutsideLonLat(mp); out {
			rd.outside = fail(fmt.Sprintf("has the coordinate [%v, %v]", p[0], p[1]), false)
		}
	}
	return mp, nil
}

// note counts a record with closed rings (k = 0) or holes in no shell
// (k = 1), remembering the first, for one warning per file.
func (rd *reader) note(k int, happened bool, num int, id string) {
	if !happened {
		return
	}
	counts := [2]*int{&rd.nClosed, &rd.nOrphans}
	if *counts[k] == 0 {
		rd.firstOf[k] = recordLabel(num, id)
	}
	*counts[k]++
}

// finish gathers the warnings, places the coordinates and builds the layer.
func (rd *reader) finish() (*layer.Layer, error) {
	shp := rd.fs.shp.name
	if rd.nClosed > 0 {
		rd.warn(shp, "%d record(s) had rings whose last point differs from the first; they were closed (first: %s)", rd.nClosed, rd.firstOf[0])
	}
	if rd.nOrphans > 0 {
		rd.warn(shp, "%d record(s) had rings wound as holes that lie in no outer ring; they were read as outer rings (first: %s)", rd.nOrphans, rd.firstOf[1])
	}
	if rd.dec.bad > 0 {
		rd.warn(rd.fs.dbf.name, "%d value(s) are not valid UTF-8, which the table's code page says it holds; the bad bytes are shown as \uFFFD (first: %s)", rd.dec.bad, rd.dec.first)
	}
	if rd.nDeleted > 0 {
		rd.warn(rd.fs.dbf.name, "%d record(s) are marked deleted; they were left out", rd.nDeleted)
	}
	rd.warnings = append(rd.warnings, rd.skipNotes...)
	if rd.nSkipped > len(rd.skipNotes) {
		rd.warn(shp, "%d more records left out for lacking polygon geometry (%d in all)", rd.nSkipped-len(rd.skipNotes), rd.nSkipped)
	}
	if len(rd.ids) == 0 {
		switch {
		case rd.idx.n == 0:
			return nil, errorf(shp, 0, "holds no records; the layer is empty")
		case rd.nSkipped == 0:
			return nil, errorf(shp, 0, "all %d records are marked deleted in the table; no areas remain", rd.idx.n)
		}
		return nil, errorf(shp, 0, "all %d records were left out (deleted, or lacking polygon geometry); no areas remain", rd.idx.n)
	}
	if err := rd.placeCRS(); err != nil {
		return nil, err
	}
	idCol := "#"
	if rd.idField >= 0 {
		idCol = rd.tab.fields[rd.idField].name
	} else {
		rd.warn(shp, "no id column was named; the areas are numbered by their record in the file (1 to %d)", rd.idx.n)
	}
	cols := make([]*layer.Column, len(rd.builders))
	for k, b := range rd.builders {
		cols[k] = b.Column()
	}
	return &layer.Layer{Source: rd.source, IDs: rd.ids, Geoms: rd.geoms, Columns: cols, IDColumn: idCol, CRS: rd.cs}, nil
}

// placeCRS applies the coordinate system rule: a geographic definition
// with coordinates beyond longitude/latitude is an error; without a
// definition, coordinates within range are lon/lat and others projected in
// an unknown unit.
func (rd *reader) placeCRS() error {
	switch {
	case rd.outside == nil:
		return nil
	case rd.hasCRS && !rd.cs.Projected:
		e := rd.outside
		e.Msg += fmt.Sprintf(", which is not a longitude/latitude, though %s defines the geographic system %q", baseName(rd.fs.prj.name), rd.cs.Name)
		return e
	case !rd.hasCRS:
		rd.cs = layer.CRS{Projected: true}
		rd.warn(rd.fs.shp.name, "has no coordinate system definition and its coordinates are not longitude/latitude; distances will be in the layer's own units")
	}
	return nil
}

func (rd *reader) warn(source, format string, args ...any) {
	rd.warnings = append(rd.warnings, source+": "+fmt.Sprintf(format, args...))
}

// baseName is the last element of a file name or zip member name.
func baseName(name string) string {
	return name[strings.LastIndexAny(name, `/\:`)+1:]
}

// extOf is a file name's extension in lower case.
func extOf(name string) string {
	b := baseName(name)
	if i := strings.LastIndexByte(b, '.'); i >= 0 {
		return strings.ToLower(b[i:])
	}
	return ""
}
