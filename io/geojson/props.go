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
	return layer.FormatNumber(v), v, true
}

// isWhole reports whether a number literal is an integer value.
func isWhole(raw []byte, v float64) bool {
	return isPlainInt(raw) || v == math.Trunc(v)
}

// colBuilder gathers one property across the features, by the rules all
// readers share (layer.Builder).
type colBuilder struct {
	*layer.Builder
	// last is the position, among the current feature's properties, of the
	// last cell with this key (featureState.addRow).
	last int
}

func newColBuilder(name string, rows int) *colBuilder {
	return &colBuilder{Builder: layer.NewBuilder(name, rows)}
}

// set stores the value of the next row, a raw JSON value.
func (b *colBuilder) set(raw []byte) {
	if len(raw) == 0 {
		b.AddMissing()
		return
	}
	switch raw[0] {
	case 'n':
		b.AddMissing()
	case 't':
		b.AddWord("true")
	case 'f':
		b.AddWord("false")
	case '"':
		b.AddText(unquote(raw))
	case '{', '[':
		var buf bytes.Buffer
		if json.Compact(&buf, raw) != nil {
			b.AddWord(string(raw))
			return
		}
		b.AddWord(buf.String())
	default:
		v, err := strconv.ParseFloat(string(raw), 64)
		if err != nil || math.IsInf(v, 0) {
			b.AddWord(string(raw)) // beyond float64: keep the digits as text
			return
		}
		var text string
		if isPlainInt(raw) && len(raw) > 15 {
			var buf [32]byte
			if !bytes.Equal(layer.AppendNumber(buf[:0], v), raw) {
				text = string(raw) // too many digits for a float64
			}
		}
		b.AddNumber(v, text)
	}
}
