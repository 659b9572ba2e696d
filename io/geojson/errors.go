package geojson

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strings"
)

// Error is what Read returns for input it cannot turn into a layer. Its
// text is one line naming the source, the feature (when the problem lies in
// one) and what is wrong, so a command can print it as is.
type Error struct {
	// Source is the input as named in messages ("stdin" for standard input).
	Source string
	// Feature is the 1-based position of the feature in the "features"
	// array, or 0 when the problem is not in one feature.
	Feature int
	// ID is the feature's id when it was known at the time of the error.
	ID string
	// Line and Column locate a JSON syntax error in the input (1-based,
	// columns in characters) when the input could be read again to count
	// them; 0 otherwise.
	Line, Column int
	// Msg says what is wrong, without the source and feature prefix.
	Msg string
	// Skippable says the feature has no polygon geometry (none, null, empty
	// or of another type): Options.SkipBadGeometry would have left it out,
	// with a warning, instead of failing. Broken geometry is not skippable.
	Skippable bool
	// Delimited says the input looks like a table of delimited text (a
	// CSV), not GeoJSON: a caller can say where such a table goes.
	Delimited bool
	// Err is the underlying cause (a JSON syntax error, a read error), if any.
	Err error
}

// Error gives the one-line message: source, feature and what is wrong.
func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.Source)
	b.WriteString(": ")
	if e.Feature > 0 {
		b.WriteString(featureLabel(e.Feature, e.ID))
		b.WriteString(": ")
	}
	// Messages are built from JSON text that may hold line breaks; the
	// promise is one line per error.
	b.WriteString(strings.Join(strings.Fields(e.Msg), " "))
	return b.String()
}

// featureLabel names a feature by position and, when known, id.
func featureLabel(pos int, id string) string {
	if id == "" {
		return fmt.Sprintf("feature %d", pos)
	}
	return fmt.Sprintf("feature %d (id %q)", pos, id)
}

// Unwrap gives errors.Is and errors.As access to the cause.
func (e *Error) Unwrap() error { return e.Err }

// fail builds an error about the current feature (feature 0: the file).
func (rd *reader) fail(feature int, id, format string, args ...any) *Error {
	return &Error{Source: rd.name, Feature: feature, ID: id, Msg: fmt.Sprintf(format, args...)}
}

// jsonError turns an error from the JSON decoder into a one-line message.
// fromToken says whether it came from Decoder.Token, whose syntax errors
// carry the absolute offset of the bad byte; errors from Decoder.Decode do
// not, so their position is found by scanning the value again. An input
// that fails on its first byte and looks like another format (notGeoJSON)
// is called what it looks like instead.
func (rd *reader) jsonError(err error, feature int, id string, fromToken bool) *Error {
	var se *json.SyntaxError
	switch {
	case errors.As(err, &se):
		if feature == 0 && rd.dec.InputOffset() <= 1 {
			if e := rd.notGeoJSON(); e != nil {
				e.Err = err
				return e
			}
		}
		idx := rd.syntaxOffset(se, fromToken)
		line, col, ok := rd.lineColumn(idx)
		at := fmt.Sprintf("byte offset %d", idx)
		if ok {
			at = fmt.Sprintf("line %d, column %d", line, col)
		}
		msg := se.Error()
		if c := badChar(msg); c == "N" || c == "I" {
			msg += " (NaN and Infinity are not JSON numbers)"
		}
		e := rd.fail(feature, id, "not valid JSON at %s: %s", at, msg)
		e.Err = err
		if ok {
			e.Line, e.Column = line, col
		}
		return e
	case errors.Is(err, io.ErrUnexpectedEOF):
		e := rd.fail(feature, id, "the input ends inside a JSON value (is the file cut short?)")
		e.Err = err
		return e
	default:
		e := rd.fail(feature, id, "cannot be read: %v", err)
		e.Err = err
		return e
	}
}

// badChar picks the character out of "invalid character 'x' ...".
func badChar(msg string) string {
	const p = "invalid character '"
	i := strings.Index(msg, p)
	if i < 0 {
		return ""
	}
	rest := msg[i+len(p):]
	j := strings.IndexByte(rest, '\'')
	if j < 0 {
		return ""
	}
	return rest[:j]
}

// notGeoJSON recognises a few common formats by the first bytes of the
// input, which a JSON syntax error alone would leave a puzzle: compressed
// files and archives, databases, shapefiles, XML (KML, GML) and delimited
// text (CSV: a first line with commas, semicolons or tabs that does not
// start a JSON object or array). It returns nil for anything else.
func (rd *reader) notGeoJSON() *Error {
	const prefix = "not GeoJSON: the input looks "
	h := rd.head
	switch {
	case strings.HasPrefix(h, "\x1f\x8b"):
		return rd.fail(0, "", prefix+"gzip-compressed; decompress it first")
	case strings.HasPrefix(h, "PK"):
		return rd.fail(0, "", prefix+"like a ZIP archive; unpack it first")
	case strings.HasPrefix(h, "SQLite format"):
		return rd.fail(0, "", prefix+"like a GeoPackage/SQLite database; export the layer as a GeoJSON FeatureCollection")
	case strings.HasPrefix(h, "\x00\x00\x27\x0a"):
		return rd.fail(0, "", prefix+"like a shapefile; export the layer as a GeoJSON FeatureCollection")
	}
	first := strings.TrimSpace(h)
	if i := strings.IndexByte(first, '\n'); i >= 0 {
		first = strings.TrimSpace(first[:i])
	}
	switch {
	case first == "" || first[0] == '{' || first[0] == '[':
		return nil
	case first[0] == '<':
		return rd.fail(0, "", prefix+"like XML (KML or GML?); convert it to a GeoJSON FeatureCollection")
	case strings.ContainsAny(first, ",;\t"):
		e := rd.fail(0, "", prefix+"like a table of delimited text (CSV), its first line %s; a table without geometry is joined by key onto a layer of the areas, not read as one", quoteLine(first))
		e.Delimited = true
		return e
	}
	return nil
}

// quoteLine quotes the start of a line for a message, cut to 60 bytes.
func quoteLine(s string) string {
	if len(s) > 60 {
		s = strings.ToValidUTF8(s[:57], "") + "..."
	}
	return quote(s)
}

// syntaxOffset finds the byte offset of a syntax error in the input.
func (rd *reader) syntaxOffset(se *json.SyntaxError, fromToken bool) int64 {
	base := rd.dec.InputOffset()
	var idx int64
	if fromToken && se.Offset == base {
		idx = base
	} else {
		// The failed value starts at InputOffset and its bytes up to the
		// error are still buffered; a fresh decoder over them reports the
		// offset within the value.
		var skip skipValue
		err := json.NewDecoder(rd.dec.Buffered()).Decode(&skip)
		var se2 *json.SyntaxError
		if errors.As(err, &se2) && se2.Offset > 0 {
			idx = base + se2.Offset - 1
		} else {
			idx = se.Offset
		}
	}
	return idx + rd.bomLen
}

// lineColumn counts lines up to byte idx by reading the input again; only
// possible when it is seekable (a file, not a pipe).
func (rd *reader) lineColumn(idx int64) (line, col int, ok bool) {
	if rd.seeker == nil {
		return 0, 0, false
	}
	if _, err := rd.seeker.Seek(rd.seekBase, io.SeekStart); err != nil {
		return 0, 0, false
	}
	buf := make([]byte, 64<<10)
	line, col = 1, 1
	var done int64
	for done < idx {
		n, err := rd.seeker.Read(buf[:min(int64(len(buf)), idx-done)])
		for _, c := range buf[:n] {
			if c == '\n' {
				line++
				col = 1
			} else if c&0xC0 != 0x80 { // count characters, not UTF-8 continuation bytes
				col++
			}
		}
		done += int64(n)
		if err != nil {
			break
		}
	}
	return line, col, done == idx
}

// skipValue is a decoding target that accepts any JSON value and keeps
// nothing, for members the reader does not use.
type skipValue struct{}

func (*skipValue) UnmarshalJSON([]byte) error { return nil }

// firstByte returns the first byte of a JSON value, 0 for none (a member
// that is absent).
func firstByte(raw []byte) byte {
	for _, c := range raw {
		if c != ' ' && c != '\t' && c != '\r' && c != '\n' {
			return c
		}
	}
	return 0
}

// jsonKind names the kind of a JSON value, for messages.
func jsonKind(raw []byte) string {
	switch firstByte(raw) {
	case 0:
		return "absent"
	case '{':
		return "a JSON object"
	case '[':
		return "a JSON array"
	case '"':
		return "a JSON string"
	case 't', 'f':
		return "a JSON boolean"
	case 'n':
		return "JSON null"
	}
	return "a JSON number"
}
