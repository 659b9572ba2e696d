package geojson

import (
	"bytes"
	"encoding/json"
	"errors"
	"io"
	"os"
	"strings"

	"github.com/areatest/areatest/internal/numtext"

	"github.com/areatest/areatest/io/layer"
)

// Options adjust how features become areas. The zero value reads ids from the
// feature "id" members and fails on the first feature without polygon
// geometry.
type Options struct {
	// IDColumn, when not empty, names the property whose values become the
	// area ids instead of the feature "id" member. Names are case-sensitive.
	// The property is kept as a column as well.
	IDColumn string
	// SkipBadGeometry leaves out features whose geometry is missing, null,
	// empty or not a Polygon/MultiPolygon, reporting them as warnings,
	// instead of failing on the first one.
	SkipBadGeometry bool
}

// ReadFile reads the GeoJSON file at path; "-" means standard input. The
// layer's Source is the path ("-" for standard input), while messages call
// standard input "stdin".
func ReadFile(path string, opt Options) (*layer.Layer, []string, error) {
	if path == "-" {
		return Read(os.Stdin, "-", opt)
	}
	f, err := os.Open(path)
	if err != nil {
		msg := err.Error()
		var pe *os.PathError
		if errors.As(err, &pe) {
			msg = pe.Err.Error()
		}
		return nil, nil, &Error{Source: path, Msg: "cannot be opened: " + msg, Err: err}
	}
	defer f.Close()
	return Read(f, path, opt)
}

// Read reads one GeoJSON FeatureCollection from r. source names the input in
// the layer and in messages ("-" is shown as "stdin"). On success it returns
// the layer and any warnings, each one line starting with the source name.
// On failure the error is an *Error and the layer is nil; warnings gathered
// so far are still returned.
//
// When r is also an io.Seeker (a file), syntax errors are located by line
// and column, at the cost of reading the input again on that error path.
func Read(r io.Reader, source string, opt Options) (*layer.Layer, []string, error) {
	rd := newReader(r, source, opt)
	lay, err := rd.run()
	if err != nil {
		return nil, rd.warnings, err
	}
	return lay, rd.warnings, nil
}

// reader holds the state of one Read.
type reader struct {
	opt    Options
	source string // as stored in the layer
	name   string // as shown in messages
	dec    *json.Decoder

	// For locating syntax errors by line: the input when it can be reread,
	// where it started, and the length of a byte-order mark skipped there.
	seeker   io.ReadSeeker
	seekBase int64
	bomLen   int64
	head     string // first bytes of the input, to recognise non-JSON formats
	// spaces counts the white space skipped before the first value by
	// skipSpace (bomLen includes it).
	spaces int64

	feat     featureState
	crs      string // name from a legacy "crs" member, "" if none
	warnings []string
}

func newReader(r io.Reader, source string, opt Options) *reader {
	rd := &reader{opt: opt, source: source, name: source}
	if source == "-" {
		rd.name = "stdin"
	} else if source == "" {
		rd.name = "input"
	}
	if s, ok := r.(io.ReadSeeker); ok {
		if pos, err := s.Seek(0, io.SeekCurrent); err == nil {
			rd.seeker, rd.seekBase = s, pos
		}
	}
	// Peek at the first bytes: a UTF-8 byte-order mark is dropped (RFC 8259
	// lets parsers ignore it, and Windows tools write one), and the rest
	// helps name a non-JSON input.
	var head [256]byte
	n, err := io.ReadFull(r, head[:])
	h := head[:n]
	if bytes.HasPrefix(h, []byte("\xef\xbb\xbf")) {
		h = h[3:]
		rd.bomLen = 3
	}
	if err == nil && isSpace(h) {
		// A long run of white space first: skip it here, in fixed chunks,
		// because the JSON decoder would hold all of it in memory while it
		// looks for the first value.
		h, n, err = skipLeadingSpace(r, len(head))
		rd.spaces = int64(n)
		rd.bomLen += rd.spaces
	}
	rd.head = string(h)
	rest := r
	if err != nil {
		// Short input: everything is in head; keep the read error (other than
		// end of input) for the decoder to report.
		rest = errReader{err}
		if err == io.EOF || err == io.ErrUnexpectedEOF {
			rest = strings.NewReader("")
		}
	}
	rd.dec = json.NewDecoder(io.MultiReader(bytes.NewReader(h), rest))
	rd.feat.init(opt)
	return rd
}

// errReader returns its error on every read.
type errReader struct{ err error }

func (e errReader) Read([]byte) (int, error) { return 0, e.err }

// run walks the top-level object and builds the layer.
func (rd *reader) run() (*layer.Layer, error) {
	tok, err := rd.dec.Token()
	if err == io.EOF {
		if rd.spaces > 0 {
			return nil, rd.fail(0, "", "the input holds only white space (%s bytes); expected a GeoJSON FeatureCollection", numtext.Count(rd.spaces))
		}
		return nil, rd.fail(0, "", "the input is empty; expected a GeoJSON FeatureCollection")
	}
	if err != nil {
		return nil, rd.jsonError(err, 0, "", true)
	}
	if d, ok := tok.(json.Delim); !ok || d != '{' {
		if e := rd.notGeoJSON(); e != nil {
			return nil, e
		}
		return nil, rd.fail(0, "", "the input is %s, not a GeoJSON FeatureCollection object", tokenKind(tok))
	}
	var top topLevel
	for rd.dec.More() {
		tok, err := rd.dec.Token()
		if err != nil {
			return nil, rd.jsonError(err, 0, "", true)
		}
		key, _ := tok.(string)
		if err := rd.member(key, &top); err != nil {
			return nil, err
		}
	}
	if err := rd.endTop(top); err != nil {
		return nil, err
	}
	return rd.finish()
}

// topLevel is what the walk has found in the top-level object so far.
type topLevel struct {
	haveType, haveFeatures bool
}

// member reads the value of the top-level member key.
func (rd *reader) member(key string, top *topLevel) error {
	switch key {
	case "type":
		var raw json.RawMessage
		if err := rd.dec.Decode(&raw); err != nil {
			return rd.jsonError(err, 0, "", false)
		}
		var typ string
		if firstByte(raw) != '"' || json.Unmarshal(raw, &typ) != nil {
			return rd.fail(0, "", `the top-level "type" member is %s; expected "FeatureCollection"`, jsonKind(raw))
		}
		top.haveType = true
		if typ != "FeatureCollection" {
			return rd.notCollection(typ)
		}
	case "features":
		if top.haveFeatures {
			return rd.fail(0, "", `the top-level object has two "features" members`)
		}
		top.haveFeatures = true
		return rd.readFeatures()
	case "crs":
		var c crsMember
		if err := rd.dec.Decode(&c); err != nil {
			var te *json.UnmarshalTypeError
			if !errors.As(err, &te) {
				return rd.jsonError(err, 0, "", false)
			}
		}
		rd.crs = c.name()
	default:
		var skip skipValue
		if err := rd.dec.Decode(&skip); err != nil {
			return rd.jsonError(err, 0, "", false)
		}
	}
	return nil
}

// endTop reads the closing brace and checks that nothing follows it and
// that the object was a FeatureCollection with features.
func (rd *reader) endTop(top topLevel) error {
	if _, err := rd.dec.Token(); err != nil { // the closing brace
		return rd.jsonError(err, 0, "", true)
	}
	end := rd.dec.InputOffset() + rd.bomLen
	if _, err := rd.dec.Token(); err != io.EOF {
		return rd.fail(0, "", "there is more data after the top-level object, which ends at byte offset %d; expected one FeatureCollection", end)
	}
	switch {
	case !top.haveType && !top.haveFeatures:
		return rd.fail(0, "", `the top-level object has neither "type" nor "features"; expected a GeoJSON FeatureCollection`)
	case !top.haveType:
		return rd.fail(0, "", `the top-level object has no "type" member; a GeoJSON FeatureCollection needs "type": "FeatureCollection"`)
	case !top.haveFeatures:
		return rd.fail(0, "", `the FeatureCollection has no "features" member`)
	}
	return nil
}

// notCollection explains a top-level object of the wrong type.
func (rd *reader) notCollection(typ string) *Error {
	switch {
	case typ == "Feature":
		return rd.fail(0, "", `the input is a single GeoJSON Feature, not a FeatureCollection; wrap it as {"type": "FeatureCollection", "features": [...]}`)
	case geometryTypes[typ]:
		return rd.fail(0, "", "the input is a bare %s geometry, not a FeatureCollection of features with ids and properties", typ)
	case typ == "Topology":
		return rd.fail(0, "", "the input is TopoJSON, not GeoJSON; convert it to a GeoJSON FeatureCollection first")
	case strings.EqualFold(typ, "FeatureCollection"):
		return rd.fail(0, "", `the top-level "type" is %q; GeoJSON type names are case-sensitive: "FeatureCollection"`, typ)
	}
	return rd.fail(0, "", `the top-level "type" is %q; expected "FeatureCollection"`, typ)
}

var geometryTypes = map[string]bool{
	"Point": true, "MultiPoint": true, "LineString": true, "MultiLineString": true,
	"Polygon": true, "MultiPolygon": true, "GeometryCollection": true,
}

// tokenKind names the kind of a JSON value from the decoder token that starts it.
func tokenKind(tok json.Token) string {
	switch t := tok.(type) {
	case json.Delim:
		if t == '[' {
			return "a JSON array"
		}
		return "a JSON object"
	case string:
		return "a JSON string"
	case float64, json.Number:
		return "a JSON number"
	case bool:
		return "a JSON boolean"
	case nil:
		return "JSON null"
	}
	return "an unexpected JSON value"
}

// readFeatures reads the "features" array, one feature at a time.
func (rd *reader) readFeatures() error {
	tok, err := rd.dec.Token()
	if err != nil {
		return rd.jsonError(err, 0, "", true)
	}
	if d, ok := tok.(json.Delim); !ok || d != '[' {
		if d == '{' {
			return rd.fail(0, "", `"features" is a JSON object; expected an array of Feature objects`)
		}
		return rd.fail(0, "", `"features" is %s; expected an array of Feature objects`, tokenKind(tok))
	}
	for rd.dec.More() {
		if err := rd.readFeature(); err != nil {
			return err
		}
	}
	if _, err := rd.dec.Token(); err != nil { // the closing bracket
		return rd.jsonError(err, 0, "", true)
	}
	return nil
}

// crsMember is the legacy (2008 GeoJSON) coordinate reference member, in its
// "name", "EPSG" and "link" forms.
type crsMember struct {
	Type       string `json:"type"`
	Properties struct {
		Name string          `json:"name"`
		Code json.RawMessage `json:"code"`
		Href string          `json:"href"`
	} `json:"properties"`
}

// name gives the system the member points at as a name crs.FromName
// reads, or "" when it names nothing usable.
func (c crsMember) name() string {
	switch {
	case c.Properties.Name != "":
		return c.Properties.Name
	case len(c.Properties.Code) > 0 && string(c.Properties.Code) != "null":
		return "EPSG:" + strings.Trim(string(c.Properties.Code), `"`)
	}
	return c.Properties.Href
}

// isWGS84 recognises the usual spellings of lon/lat WGS84: OGC CRS84 in URN
// or URL form, and EPSG 4326 (whose official axis order is lat/lon, but
// GeoJSON writers using the name mean lon/lat).
func isWGS84(s string) bool {
	u := strings.ToUpper(strings.TrimSpace(s))
	if strings.Contains(u, "CRS84") || strings.Contains(u, "CRS:84") || strings.Contains(u, "WGS84") || strings.Contains(u, "WGS 84") {
		return true
	}
	if !strings.Contains(u, "EPSG") {
		return false
	}
	i := strings.LastIndexAny(u, ":/")
	return u[i+1:] == "4326"
}

func quote(s string) string {
	b, _ := json.Marshal(s)
	return string(b)
}
