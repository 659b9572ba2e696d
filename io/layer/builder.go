package layer

import (
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Builder gathers one column value by value, in area order, and decides its
// Kind by the rules every reader shares, so that a column reads the same
// from GeoJSON, a shapefile's table, a GeoPackage or a CSV:
//
//   - A value that is empty, or one of the missing-value words NA, N/A, NaN
//     and null (any case, spaces trimmed), is missing (AddText), as is a
//     value the format marks as null (AddMissing).
//   - A column is Number while every present value is a number: a value the
//     format types as one (AddNumber), or a text holding a plain decimal
//     number (AddText: optional sign, digits, fraction and exponent; not
//     "Inf", hexadecimal or underscores).
//   - A numeric text with a leading zero ("01001", a county code) is a code,
//     not a number: it turns the column to Text for good, as does any other
//     value that is not a number (a word, a boolean, AddWord).
//   - In a Text column, numbers are kept as written (or in their shortest
//     form) and Column.NotNumber marks the values that are not numbers, so
//     that a column of numbers with a few bad values can be told from text.
type Builder struct {
	name    string
	numeric bool
	num     []float64
	str     []string // nil while no numeric value needs its written form kept
	notNum  []bool   // nil while numeric
	missing []bool
}

// NewBuilder starts the column name with rows missing values, for a column
// first seen after some areas were read.
func NewBuilder(name string, rows int) *Builder {
	b := &Builder{name: name, numeric: true}
	for range rows {
		b.AddMissing()
	}
	return b
}

// Len returns the number of values added.
func (b *Builder) Len() int { return len(b.missing) }

// AddText adds a value given as text: missing, a number, or text (see
// Builder). Invalid UTF-8 is replaced by U+FFFD.
func (b *Builder) AddText(s string) {
	if !utf8.ValidString(s) {
		s = strings.ToValidUTF8(s, "\uFFFD")
	}
	t := strings.TrimSpace(s)
	if t == "" || IsMissingWord(t) {
		b.AddMissing()
		return
	}
	if IsDecimal(t) && !HasLeadingZero(t) {
		if v, err := strconv.ParseFloat(t, 64); err == nil && !math.IsInf(v, 0) {
			text := ""
			if FormatNumber(v) != s {
				text = s // as written, should the column turn to text
			}
			b.AddNumber(v, text)
			return
		}
	}
	b.AddWord(s)
}

// AddNumber adds a value the format types as a number; written, if not
// empty, is how the input wrote it, kept should the column turn to text
// (an integer with more digits than a float64 holds).
func (b *Builder) AddNumber(v float64, written string) {
	if !b.numeric {
		if written == "" {
			written = FormatNumber(v)
		}
		b.str = append(b.str, written)
		b.notNum = append(b.notNum, false)
		b.missing = append(b.missing, false)
		return
	}
	if written != "" && b.str == nil {
		b.str = make([]string, len(b.num), cap(b.num))
	}
	b.num = append(b.num, v)
	if b.str != nil {
		b.str = append(b.str, written)
	}
	b.missing = append(b.missing, false)
}

// AddWord adds a value that is not a number, whatever it looks like (a
// boolean, a JSON object as text); it turns the column to Text.
func (b *Builder) AddWord(s string) {
	if b.numeric {
		b.toText()
	}
	b.str = append(b.str, s)
	b.notNum = append(b.notNum, true)
	b.missing = append(b.missing, false)
}

// AddMissing adds a missing value.
func (b *Builder) AddMissing() {
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
func (b *Builder) toText() {
	if b.str == nil {
		b.str = make([]string, len(b.num), cap(b.num))
	}
	for i, v := range b.num {
		if !b.missing[i] && b.str[i] == "" {
			b.str[i] = FormatNumber(v)
		}
	}
	b.notNum = make([]bool, len(b.num), cap(b.num))
	b.num = nil
	b.numeric = false
}

// Column hands the gathered values over as a column. A column missing in
// every area comes out as a Number column.
func (b *Builder) Column() *Column {
	if b.numeric {
		return &Column{Name: b.name, Kind: Number, Num: b.num, Missing: b.missing}
	}
	return &Column{Name: b.name, Kind: Text, Str: b.str, Missing: b.missing, NotNumber: b.notNum}
}

// IsMissingWord reports the spellings that mark a missing value in text
// files and spreadsheets: NA, N/A, NaN and null, in any case.
func IsMissingWord(t string) bool {
	switch len(t) {
	case 2:
		return strings.EqualFold(t, "na")
	case 3:
		return strings.EqualFold(t, "n/a") || strings.EqualFold(t, "nan")
	case 4:
		return strings.EqualFold(t, "null")
	}
	return false
}

// IsDecimal accepts a plain decimal number, optionally signed, with
// optional fraction and exponent. strconv.ParseFloat alone would also take
// "Inf", hexadecimal and underscores, which in an attribute are words, not
// numbers.
func IsDecimal(t string) bool {
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

// HasLeadingZero spots codes such as "01001" (a county FIPS code), which
// read as numbers would lose their zeros and their meaning.
func HasLeadingZero(t string) bool {
	if len(t) > 0 && (t[0] == '+' || t[0] == '-') {
		t = t[1:]
	}
	return len(t) > 1 && t[0] == '0' && t[1] >= '0' && t[1] <= '9'
}
