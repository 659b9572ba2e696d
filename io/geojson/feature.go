package geojson

import (
	"encoding/json"
	"fmt"
	"strconv"
	"strings"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

// maxSkipNotes is how many left-out features are named one by one.
const maxSkipNotes = 5

// featureState gathers the layer while the features stream past.
type featureState struct {
	opt   Options
	pos   int // 1-based position of the feature being read
	ids   []string
	geoms []orb.MultiPolygon

	cols   []*colBuilder
	colIdx map[string]int
	seen   map[string]int // id → position of the feature that has it

	// Without IDColumn, ids are all from "id" or all positions; these
	// remember the first feature of each kind to report a mix.
	firstWith, firstWithout int
	firstWithID             string

	skipNotes []string
	nSkipped  int

	nUnclosed     int
	firstUnclosed string

	// outside is the first position outside longitude/latitude range, as
	// written ("" while none), and outsidePos and outsideID the feature
	// that has it, for the decision at the end (coordinateSystem).
	outside    string
	outsidePos int
	outsideID  string

	// Scratch reused from feature to feature: the feature's bytes and the
	// cells that point into them.
	raw      json.RawMessage
	members  []cell
	gmembers []cell
	cells    []cell
	builders []*colBuilder // the column of each cell of the feature
	geom     geomParser
}

func (fs *featureState) init(opt Options) {
	fs.opt = opt
	fs.colIdx = make(map[string]int)
	fs.seen = make(map[string]int)
}

// readFeature decodes the next element of "features" and adds it to the
// layer, leaves it out, or reports why it cannot be read. The checks come
// in a fixed order — the feature's type, its id, its properties, its
// geometry, then the id it gets — so a feature with several faults is
// reported for the same one every time.
func (rd *reader) readFeature() error {
	fs := &rd.feat
	fs.pos++
	pos := fs.pos
	fm, err := rd.decodeFeature(pos)
	if err != nil {
		return err
	}
	featureID, idErr := parseFeatureID(fm.id)
	if err := rd.checkFeatureType(pos, featureID, fm.typ); err != nil {
		return err
	}
	if idErr != "" {
		return rd.fail(pos, "", "%s", idErr)
	}
	cells, err := rd.properties(pos, featureID, fm.props)
	if err != nil {
		return err
	}
	// The label in messages is the id the area would get, when known.
	id, label := featureID, featureID
	var colErr string
	if fs.opt.IDColumn != "" {
		id, colErr = idFromCells(cells, fs.opt.IDColumn)
		if id != "" {
			label = id
		}
	}
	mp, skippable, msg := fs.geometry(fm.geom, pos, label)
	if msg != "" {
		return rd.badGeometry(pos, label, msg, skippable)
	}
	if colErr != "" {
		return rd.fail(pos, featureID, "%s", colErr)
	}
	if id, err = rd.areaID(pos, id, featureID); err != nil {
		return err
	}
	fs.addRow(id, mp, cells)
	return nil
}

// featureMembers are the members of a Feature object the reader uses, as
// raw JSON; nil when absent.
type featureMembers struct{ typ, id, geom, props []byte }

// decodeFeature reads the next feature's bytes and picks out its members.
func (rd *reader) decodeFeature(pos int) (featureMembers, error) {
	fs := &rd.feat
	var fm featureMembers
	if err := rd.dec.Decode(&fs.raw); err != nil {
		return fm, rd.jsonError(err, pos, "", false)
	}
	if firstByte(fs.raw) != '{' {
		return fm, rd.fail(pos, "", "is %s, not a Feature object", jsonKind(fs.raw))
	}
	members, err := scanObject(fs.raw, fs.members[:0])
	fs.members = members
	if err != nil {
		e := rd.fail(pos, "", "%v", err)
		e.Err = err
		return fm, e
	}
	for _, m := range members {
		switch string(m.key) {
		case "type":
			fm.typ = m.raw
		case "id":
			fm.id = m.raw
		case "geometry":
			fm.geom = m.raw
		case "properties":
			fm.props = m.raw
		}
	}
	return fm, nil
}

// checkFeatureType checks that the "type" member says "Feature", and
// recognises the usual slips.
func (rd *reader) checkFeatureType(pos int, featureID string, typ []byte) error {
	if typ == nil {
		return rd.fail(pos, featureID, `has no "type" member; a feature needs "type": "Feature"`)
	}
	if typ[0] != '"' {
		return rd.fail(pos, featureID, `member "type" is %s; a feature needs "type": "Feature"`, jsonKind(typ))
	}
	t := unquote(typ)
	switch {
	case t == "Feature":
		return nil
	case geometryTypes[t]:
		return rd.fail(pos, featureID, `is a bare %s geometry, not a Feature; wrap it as {"type": "Feature", "geometry": ..., "properties": ...}`, t)
	case strings.EqualFold(t, "Feature"):
		return rd.fail(pos, featureID, `has type %q; GeoJSON type names are case-sensitive: "Feature"`, t)
	}
	return rd.fail(pos, featureID, `has type %q; expected "Feature"`, t)
}

// properties splits the "properties" member into cells; absent and null
// give none.
func (rd *reader) properties(pos int, featureID string, raw []byte) ([]cell, error) {
	fs := &rd.feat
	switch firstByte(raw) {
	case 0, 'n':
		return nil, nil
	case '{':
		cells, err := scanObject(raw, fs.cells[:0])
		fs.cells = cells
		if err != nil {
			e := rd.fail(pos, featureID, `"properties" is %v`, err)
			e.Err = err
			return nil, e
		}
		return cells, nil
	}
	return nil, rd.fail(pos, featureID, `"properties" is %s; expected an object or null`, jsonKind(raw))
}

// badGeometry reports a feature whose geometry makes no area, or leaves it
// out with a warning when the problem is one Options.SkipBadGeometry
// passes over and the option is set.
func (rd *reader) badGeometry(pos int, label, msg string, skippable bool) error {
	fs := &rd.feat
	if !skippable || !fs.opt.SkipBadGeometry {
		e := rd.fail(pos, label, "%s", msg)
		e.Skippable = skippable
		return e
	}
	fs.nSkipped++
	if len(fs.skipNotes) < maxSkipNotes {
		fs.skipNotes = append(fs.skipNotes, (&Error{Source: rd.name, Feature: pos, ID: label, Msg: "left out: " + msg}).Error())
	}
	return nil
}

// areaID settles the id of the area a feature becomes: from the id column
// (id), from the "id" member (featureID), or its position when no feature
// has an id, never a mix of the last two; ids are unique.
func (rd *reader) areaID(pos int, id, featureID string) (string, error) {
	fs := &rd.feat
	const mixed = `has no "id", while feature %d has one (id %q); give every feature an id, or take the ids from a property`
	switch {
	case fs.opt.IDColumn != "":
	case featureID == "":
		if fs.firstWith != 0 {
			return "", rd.fail(pos, "", mixed, fs.firstWith, fs.firstWithID)
		}
		if fs.firstWithout == 0 {
			fs.firstWithout = pos
		}
		id = strconv.Itoa(pos)
	default:
		if fs.firstWithout != 0 {
			return "", rd.fail(fs.firstWithout, "", mixed, pos, featureID)
		}
		if fs.firstWith == 0 {
			fs.firstWith, fs.firstWithID = pos, featureID
		}
	}
	if prev, dup := fs.seen[id]; dup {
		if fs.opt.IDColumn != "" {
			return "", rd.fail(pos, id, "has the same %q value as feature %d; ids must be unique", fs.opt.IDColumn, prev)
		}
		return "", rd.fail(pos, id, "has the same id as feature %d; ids must be unique", prev)
	}
	fs.seen[id] = pos
	return id, nil
}

// addRow appends an area: its id, its geometry and its properties, with
// every column it lacks marked missing. Of a key repeated within the
// properties only the last value is stored, so it alone decides, with the
// other rows, whether the column holds numbers.
func (fs *featureState) addRow(id string, mp orb.MultiPolygon, cells []cell) {
	row := len(fs.ids)
	fs.ids = append(fs.ids, id)
	fs.geoms = append(fs.geoms, mp)
	fs.builders = fs.builders[:0]
	for i := range cells {
		b := fs.column(cells[i].key, row)
		b.last = i
		fs.builders = append(fs.builders, b)
	}
	for i, b := range fs.builders {
		if b.last == i {
			b.set(cells[i].raw)
		}
	}
	for _, b := range fs.cols {
		if b.Len() == row {
			b.AddMissing()
		}
	}
}

// geometry checks a feature's geometry member and converts it. skippable
// says whether the problem in msg is one that Options.SkipBadGeometry passes
// over.
func (fs *featureState) geometry(raw []byte, pos int, label string) (mp orb.MultiPolygon, skippable bool, msg string) {
	switch firstByte(raw) {
	case 0, 'n':
		return nil, true, "has no geometry (null or missing); areas must be Polygon or MultiPolygon"
	case '{':
	default:
		return nil, false, fmt.Sprintf(`"geometry" is %s; expected a geometry object or null`, jsonKind(raw))
	}
	members, err := scanObject(raw, fs.gmembers[:0])
	fs.gmembers = members
	if err != nil {
		return nil, false, `"geometry" is ` + err.Error()
	}
	var typRaw, coords []byte
	for _, m := range members {
		switch string(m.key) {
		case "type":
			typRaw = m.raw
		case "coordinates":
			coords = m.raw
		}
	}
	var typ string
	switch firstByte(typRaw) {
	case 0, 'n':
	case '"':
		typ = unquote(typRaw)
	default:
		return nil, false, fmt.Sprintf(`the geometry's "type" is %s; expected a name such as "Polygon"`, jsonKind(typRaw))
	}
	var multi bool
	switch typ {
	case "Polygon":
	case "MultiPolygon":
		multi = true
	case "":
		return nil, true, `geometry has no "type"; areas must be Polygon or MultiPolygon`
	default:
		if geometryTypes[typ] {
			return nil, true, fmt.Sprintf("geometry is a %s; areas must be Polygon or MultiPolygon", typ)
		}
		for t := range geometryTypes {
			if strings.EqualFold(t, typ) {
				return nil, true, fmt.Sprintf("geometry type %q is not a GeoJSON type (names are case-sensitive: %q)", typ, t)
			}
		}
		return nil, true, fmt.Sprintf("geometry type %q is not a GeoJSON type; areas must be Polygon or MultiPolygon", typ)
	}
	if c := firstByte(coords); c == 0 || c == 'n' {
		return nil, true, fmt.Sprintf("%s geometry has no coordinates", typ)
	}
	mp, unclosed, gerr := fs.geom.parse(coords, multi)
	if gerr != nil {
		return nil, false, gerr.msg
	}
	if fs.outside == "" && fs.geom.outside != "" {
		fs.outside, fs.outsidePos, fs.outsideID = fs.geom.outside, pos, label
	}
	if len(mp) == 0 {
		return nil, true, fmt.Sprintf("%s geometry is empty", typ)
	}
	if unclosed {
		if fs.nUnclosed == 0 {
			fs.firstUnclosed = featureLabel(pos, label)
		}
		fs.nUnclosed++
	}
	return mp, false, ""
}

// column returns the builder for a property, creating it (missing in all
// earlier rows) the first time the name is seen.
func (fs *featureState) column(key []byte, row int) *colBuilder {
	if i, ok := fs.colIdx[string(key)]; ok {
		return fs.cols[i]
	}
	name := string(key)
	b := newColBuilder(name, row)
	fs.colIdx[name] = len(fs.cols)
	fs.cols = append(fs.cols, b)
	return b
}

// parseFeatureID reads the "id" member: "" when absent or null, else the
// string, or the number in shortest form. The second result is an error
// message.
func parseFeatureID(raw []byte) (string, string) {
	if len(raw) == 0 {
		return "", ""
	}
	switch raw[0] {
	case 'n':
		return "", ""
	case '"':
		s := unquote(raw)
		if strings.TrimSpace(s) == "" {
			return "", `"id" is an empty string`
		}
		return s, ""
	case '{', '[', 't', 'f':
		return "", fmt.Sprintf(`"id" is %s; ids must be strings or numbers`, jsonKind(raw))
	}
	s, _, ok := numberText(raw)
	if !ok {
		return "", fmt.Sprintf(`"id" %s is not a finite number`, raw)
	}
	return s, ""
}

// idFromCells finds the id property among a feature's properties. The
// second result is an error message.
func idFromCells(cells []cell, name string) (string, string) {
	var raw []byte
	found := false
	for i := range cells {
		if string(cells[i].key) == name {
			raw, found = cells[i].raw, true // the last of repeated keys wins, as for columns
		}
	}
	if !found {
		return "", fmt.Sprintf("has no property %q to take the id from%s", name, propertyList(cells))
	}
	switch raw[0] {
	case 'n':
		return "", fmt.Sprintf("property %q (the id column) is null", name)
	case '"':
		s := unquote(raw)
		if strings.TrimSpace(s) == "" {
			return "", fmt.Sprintf("property %q (the id column) is an empty string", name)
		}
		return s, ""
	case '{', '[', 't', 'f':
		return "", fmt.Sprintf("property %q (the id column) is %s; ids must be strings or whole numbers", name, jsonKind(raw))
	}
	s, v, ok := numberText(raw)
	if !ok || !isWhole(raw, v) {
		return "", fmt.Sprintf("property %q (the id column) is %s, not a whole number", name, raw)
	}
	return s, ""
}

// propertyList names a few of the properties a feature does have, to help
// spot a misspelt id column.
func propertyList(cells []cell) string {
	if len(cells) == 0 {
		return " (the feature has no properties)"
	}
	var names []string
	for i := range cells {
		if len(names) == 8 {
			names = append(names, "...")
			break
		}
		names = append(names, strconv.Quote(string(cells[i].key)))
	}
	return " (its properties: " + strings.Join(names, ", ") + ")"
}

// finish checks the gathered features and turns them into the layer.
func (rd *reader) finish() (*layer.Layer, error) {
	fs := &rd.feat
	if fs.nUnclosed > 0 {
		rd.warn("%d feature(s) had rings whose last position differs from the first; they were closed (first: %s)", fs.nUnclosed, fs.firstUnclosed)
	}
	rd.warnings = append(rd.warnings, fs.skipNotes...)
	if fs.nSkipped > len(fs.skipNotes) {
		rd.warn("%d more features left out for lacking polygon geometry (%d in all)", fs.nSkipped-len(fs.skipNotes), fs.nSkipped)
	}
	n := len(fs.ids)
	if n == 0 {
		if fs.pos == 0 {
			return nil, rd.fail(0, "", "the FeatureCollection has no features")
		}
		return nil, rd.fail(0, "", "all %d features were left out for lacking polygon geometry; no areas remain", fs.pos)
	}
	system, err := rd.coordinateSystem()
	if err != nil {
		return nil, err
	}
	idCol := fs.opt.IDColumn
	if idCol == "" && fs.firstWith == 0 {
		idCol = "#"
		rd.warn(`no feature has an "id"; the areas are numbered by their position in the file (1 to %d)`, fs.pos)
	}
	cols := make([]*layer.Column, len(fs.cols))
	for i, b := range fs.cols {
		cols[i] = b.Column()
	}
	return &layer.Layer{
		Source:   rd.source,
		IDs:      fs.ids,
		Geoms:    fs.geoms,
		Columns:  cols,
		IDColumn: idCol,
		CRS:      system,
	}, nil
}

func (rd *reader) warn(format string, args ...any) {
	rd.warnings = append(rd.warnings, rd.name+": "+fmt.Sprintf(format, args...))
}
