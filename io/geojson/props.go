package geojson

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/areatest/areatest/io/layer"
)

// cell is one property of a feature, its value still raw JSON. Both slices
// point into the feature's bytes, which live until the next feature.
type cell struct {
	key []byte
	raw []byte
}

// errMalformed should not happen: the decoder checks every feature's JSON
// before the hand-written scanners see it.
var errMalformed = errors.New("not well-formed JSON")

// scanObject splits the JSON object in b into key/value cells, appended in
// order. The bytes were already checked as JSON by the decoder, so this only
// finds boundaries; it still checks every index so that bad bytes give an
// error rather than a panic. Scanning by hand keeps the order of keys, which
// a map would lose, matches keys exactly (encoding/json would match "ID" to
// an "id" field), and costs no allocation.
func scanObject(b []byte, cells []cell) ([]cell, error) {
	i := skipSpace(b, 0)
	if i >= len(b) || b[i] != '{' {
		return cells, errMalformed
	}
	i = skipSpace(b, i+1)
	if i < len(b) && b[i] == '}' {
		return cells, nil
	}
	for {
		if i >= len(b) || b[i] != '"' {
			return cells, errMalformed
		}
		end, esc := stringEnd(b, i)
		if end < 0 {
			return cells, errMalformed
		}
		key := b[i+1 : end-1]
		if esc {
			key = []byte(unquote(b[i:end]))
		}
		i = skipSpace(b, end)
		if i >= len(b) || b[i] != ':' {
			return cells, errMalformed
		}
		i = skipSpace(b, i+1)
		vend := valueEnd(b, i)
		if vend < 0 {
			return cells, errMalformed
		}
		cells = append(cells, cell{key: key, raw: b[i:vend]})
		i = skipSpace(b, vend)
		if i >= len(b) {
			return cells, errMalformed
		}
		if b[i] == '}' {
			return cells, nil
		}
		if b[i] != ',' {
			return cells, errMalformed
		}
		i = skipSpace(b, i+1)
	}
}

func skipSpace(b []byte, i int) int {
	for i < len(b) && (b[i] == ' ' || b[i] == '\t' || b[i] == '\n' || b[i] == '\r') {
		i++
	}
	return i
}

// stringEnd returns the index just past the string starting at b[i] (a
// quote), or -1, and whether the string holds escapes.
func stringEnd(b []byte, i int) (int, bool) {
	esc := false
	for j := i + 1; j < len(b); j++ {
		switch b[j] {
		case '\\':
			esc = true
			j++
		case '"':
			return j + 1, esc
		}
	}
	return -1, esc
}

// valueEnd returns the index just past the JSON value starting at b[i], or -1.
func valueEnd(b []byte, i int) int {
	if i >= len(b) {
		return -1
	}
	switch b[i] {
	case '"':
		end, _ := stringEnd(b, i)
		return end
	case '{', '[':
		depth := 0
		for j := i; j < len(b); j++ {
			switch b[j] {
			case '"':
				end, _ := stringEnd(b, j)
				if end < 0 {
					return -1
				}
				j = end - 1
			case '{', '[':
				depth++
			case '}', ']':
				depth--
				if depth == 0 {
					return j + 1
				}
			}
		}
		return -1
	}
	j := i
	for j < len(b) {
		switch b[j] {
		case ',', '}', ']', ' ', '\t', '\n', '\r':
			return j
		}
		j++
	}
	return j
}

// unquote decodes a JSON string literal. Invalid UTF-8 becomes U+FFFD, as
// encoding/json does.
func unquote(raw []byte) string {
	if len(raw) < 2 {
		return ""
	}
	inner := raw[1 : len(raw)-1]
	if bytes.IndexByte(inner, '\\') < 0 {
		if utf8.Valid(inner) {
			return string(inner)
		}
		return strings.ToValidUTF8(string(inner), "\uFFFD")
	}
	var s string
	if err := json.Unmarshal(raw, &s); err != nil {
		return string(inner)
	}
	return s
}

// isMissingWord reports the spellings that mark a missing value in text
// files and spreadsheets.
func isMissingWord(t []byte) bool {
	switch len(t) {
	case 2:
		return bytes.EqualFold(t, []byte("na"))
	case 3:
		return bytes.EqualFold(t, []byte("n/a")) || bytes.EqualFold(t, []byte("nan"))
	case 4:
		return bytes.EqualFold(t, []byte("null"))
	}
	return false
}

// isDecimal accepts a plain decimal number, optionally signed, with
// optional fraction and exponent. strconv.ParseFloat alone would also take
// "Inf", hexadecimal and underscores, which in a property are words, not
// numbers.
func isDecimal(t []byte) bool {
	i := 0
	if i < len(t) && (t[i] == '+' || t[i] == '-') {
		i++
	}
	digits := 0
	for i < len(t) && t[i] >= '0' && t[i] <= '9' {
		i++
		digits++
	}
	if i < len(t) && t[i] == '.' {
		i++
		for i < len(t) && t[i] >= '0' && t[i] <= '9' {
			i++
			digits++
		}
	}
	if digits == 0 {
		return false
	}
	if i < len(t) && (t[i] == 'e' || t[i] == 'E') {
		i++
		if i < len(t) && (t[i] == '+' || t[i] == '-') {
			i++
		}
		start := i
		for i < len(t) && t[i] >= '0' && t[i] <= '9' {
			i++
		}
		if i == start {
			return false
		}
	}
	return i == len(t)
}

// hasLeadingZero spots codes such as "01001" (a county FIPS code), which
// read as numbers would lose their zeros and their meaning.
func hasLeadingZero(t []byte) bool {
	if len(t) > 0 && (t[0] == '+' || t[0] == '-') {
		t = t[1:]
	}
	return len(t) > 1 && t[0] == '0' && t[1] >= '0' && t[1] <= '9'
}

// isPlainInt reports an integer literal: optional minus, digits only.
func isPlainInt(raw []byte) bool {
	if len(raw) > 0 && raw[0] == '-' {
		raw = raw[1:]
	}
	if len(raw) == 0 {
		return false
	}
	for _, c := range raw {
		if c < '0' || c > '9' {
			return false
		}
	}
	return true
}

// appendNumber writes v in its shortest exact form, in plain notation
// between 1e-6 and 1e21 and in exponent notation outside, the rule of
// encoding/json (and of JavaScript), so that a number reads as JSON writers
// print it: 1234567, not 1.234567e+06. -0 is written 0.
func appendNumber(dst []byte, v float64) []byte {
	if v == 0 {
		return append(dst, '0')
	}
	if a := math.Abs(v); a >= 1e-6 && a < 1e21 {
		return strconv.AppendFloat(dst, v, 'f', -1, 64)
	}
	dst = strconv.AppendFloat(dst, v, 'e', -1, 64)
	if n := len(dst); n >= 4 && dst[n-4] == 'e' && dst[n-3] == '-' && dst[n-2] == '0' {
		dst[n-2] = dst[n-1] // e-07 → e-7
		dst = dst[:n-1]
	}
	return dst
}

func formatNumber(v float64) string {
	var buf [32]byte
	return string(appendNumber(buf[:0], v))
}

// numberText renders a JSON number literal as text: integer literals keep
// their digits (they may not fit a float64 exactly), others take their
// shortest form. ok is false for literals beyond the float64 range.
func numberText(raw []byte) (s string, v float64, ok bool) {
	v, err := strconv.ParseFloat(string(raw), 64)
	if err != nil || math.IsInf(v, 0) {
		return "", 0, false
	}
	if isPlainInt(raw) {
		if v == 0 {
			return "0", 0, true
		}
		return string(raw), v, true
	}
	return formatNumber(v), v, true
}

// isWhole reports whether a number literal is an integer value.
func isWhole(raw []byte, v float64) bool {
	return isPlainInt(raw) || v == math.Trunc(v)
}

// colBuilder gathers one property across the features. While every value
// seen is numeric it keeps floats, and text only for values whose written
// form differs from the float's shortest form; at the first non-numeric
// value it turns into a text column for good, and from then on notNum
// marks the values that are not numbers (layer.Column.NotNumber).
type colBuilder struct {
	name    string
	numeric bool
	num     []float64
	str     []string // nil while no numeric value needs its written form kept
	notNum  []bool   // nil while numeric
	missing []bool
	// last is the position, among the current feature's properties, of the
	// last cell with this key (featureState.addRow).
	last int
}

func newColBuilder(name string, rows int) *colBuilder {
	b := &colBuilder{name: name, numeric: true}
	for range rows {
		b.addMissing()
	}
	return b
}

// set stores the value of the next row.
func (b *colBuilder) set(raw []byte) {
	if len(raw) == 0 {
		b.addMissing()
		return
	}
	switch raw[0] {
	case 'n':
		b.addMissing()
	case 't':
		b.addText("true")
	case 'f':
		b.addText("false")
	case '"':
		b.addString(raw)
	case '{', '[':
		var buf bytes.Buffer
		if json.Compact(&buf, raw) != nil {
			b.addText(string(raw))
			return
		}
		b.addText(buf.String())
	default:
		v, err := strconv.ParseFloat(string(raw), 64)
		if err != nil || math.IsInf(v, 0) {
			b.addText(string(raw)) // beyond float64: keep the digits as text
			return
		}
		var text string
		if isPlainInt(raw) && len(raw) > 15 {
			var buf [32]byte
			if !bytes.Equal(appendNumber(buf[:0], v), raw) {
				text = string(raw) // too many digits for a float64
			}
		}
		b.addNumber(v, text)
	}
}

// addString stores a JSON string value: missing, a number, or text. A
// string holding a number is a number in a text column too, so that the
// column keeps count of its numbers.
func (b *colBuilder) addString(raw []byte) {
	inner := raw[1 : len(raw)-1]
	if bytes.IndexByte(inner, '\\') >= 0 {
		inner = []byte(unquote(raw))
	}
	t := bytes.TrimSpace(inner)
	if len(t) == 0 || isMissingWord(t) {
		b.addMissing()
		return
	}
	if isDecimal(t) && !hasLeadingZero(t) {
		if v, err := strconv.ParseFloat(string(t), 64); err == nil && !math.IsInf(v, 0) {
			var buf [32]byte
			var text string
			if !bytes.Equal(appendNumber(buf[:0], v), inner) {
				text = string(inner) // as written, should the column turn to text
			}
			b.addNumber(v, text)
			return
		}
	}
	if utf8.Valid(inner) {
		b.addText(string(inner))
	} else {
		b.addText(strings.ToValidUTF8(string(inner), "\uFFFD"))
	}
}

// addNumber stores a number; text, if not empty, is how it was written.
func (b *colBuilder) addNumber(v float64, text string) {
	if !b.numeric {
		if text == "" {
			text = formatNumber(v)
		}
		b.str = append(b.str, text)
		b.notNum = append(b.notNum, false)
		b.missing = append(b.missing, false)
		return
	}
	if text != "" && b.str == nil {
		b.str = make([]string, len(b.num), cap(b.num))
	}
	b.num = append(b.num, v)
	if b.str != nil {
		b.str = append(b.str, text)
	}
	b.missing = append(b.missing, false)
}

// addText stores a value that is not a number.
func (b *colBuilder) addText(s string) {
	if b.numeric {
		b.toText()
	}
	b.str = append(b.str, s)
	b.notNum = append(b.notNum, true)
	b.missing = append(b.missing, false)
}

func (b *colBuilder) addMissing() {
	if b.numeric {
		b.num = append(b.num, math.NaN())
	} else {
		b.notNum = append(b.notNum, false)
	}
	if !b.numeric || b.str != nil {
		b.str = append(b.str, "")
	}
	b.missing = append(b.missing, true)
}

// toText renders the numbers stored so far and drops the floats; every
// row so far was a number or missing.
func (b *colBuilder) toText() {
	if b.str == nil {
		b.str = make([]string, len(b.num), cap(b.num))
	}
	for i, v := range b.num {
		if !b.missing[i] && b.str[i] == "" {
			b.str[i] = formatNumber(v)
		}
	}
	b.notNum = make([]bool, len(b.num), cap(b.num))
	b.num = nil
	b.numeric = false
}

// column hands the gathered values over as a layer column. A property that
// is missing in every feature comes out as a Number column.
func (b *colBuilder) column() *layer.Column {
	if b.numeric {
		return &layer.Column{Name: b.name, Kind: layer.Number, Num: b.num, Missing: b.missing}
	}
	return &layer.Column{Name: b.name, Kind: layer.Text, Str: b.str, Missing: b.missing, NotNumber: b.notNum}
}
