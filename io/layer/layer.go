package layer

import (
	"fmt"
	"math"
	"sort"
	"strconv"

	"github.com/paulmach/orb"
)

// Kind says how a column's values are stored.
type Kind int

const (
	// Number columns hold float64 values with a missing mask.
	Number Kind = iota
	// Text columns hold strings with a missing mask.
	Text
)

// String returns "number" or "text".
func (k Kind) String() string {
	if k == Number {
		return "number"
	}
	return "text"
}

// Column is one attribute across all areas of a layer. Exactly one of Num or
// Str is filled, according to Kind; Missing[i] marks a value that is absent,
// null, empty or a missing-value word, in which case Num[i] (or Str[i]) is
// meaningless (missing numbers are stored as NaN).
type Column struct {
	// Name is the attribute's name as the input spells it (case kept).
	Name string
	// Kind says which of Num and Str holds the values.
	Kind Kind
	// Num holds the values of a Number column, one per area; nil for Text.
	Num []float64
	// Str holds the values of a Text column, one per area; nil for Number.
	Str []string
	// Missing marks, per area, a value the area lacks.
	Missing []bool
}

// MissingCount returns how many areas lack a value in the column.
func (c *Column) MissingCount() int {
	n := 0
	for _, m := range c.Missing {
		if m {
			n++
		}
	}
	return n
}

// Label returns the value of row i as text, whatever the column kind, and
// "" for a missing value. Numbers are written in their shortest exact form.
func (c *Column) Label(i int) string {
	if c.Missing[i] {
		return ""
	}
	if c.Kind == Text {
		return c.Str[i]
	}
	return FormatNumber(c.Num[i])
}

// FormatNumber writes v as JSON would: plain notation for magnitudes from
// 1e-6 to 1e21 (so 1234567 stays 1234567), exponent notation outside.
func FormatNumber(v float64) string {
	if a := math.Abs(v); a == 0 || (a >= 1e-6 && a < 1e21) {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// Layer is a table of areas. IDs are unique. Geoms[i] is the geometry of area
// i (possibly with holes and several parts).
type Layer struct {
	// Source names where the layer came from (a path, or "-" for stdin), for
	// error messages and reports.
	Source string
	// IDs name the areas, one per area, all different.
	IDs []string
	// Geoms holds each area's polygons, in the coordinates of the input.
	Geoms []orb.MultiPolygon
	// Columns are the attributes, in the order the input first names them.
	Columns []*Column
	// IDColumn is the attribute the ids came from; "" when they came from the
	// feature ids, "#" when they are feature positions.
	IDColumn string
}

// Len returns the number of areas.
func (l *Layer) Len() int { return len(l.IDs) }

// Column returns the named column, or an error naming the layer and listing
// the columns it has.
func (l *Layer) Column(name string) (*Column, error) {
	for _, c := range l.Columns {
		if c.Name == name {
			return c, nil
		}
	}
	names := make([]string, len(l.Columns))
	for i, c := range l.Columns {
		names[i] = c.Name
	}
	sort.Strings(names)
	return nil, fmt.Errorf("%s: no column %q (columns: %s)", l.Source, name, joinOrNone(names))
}

// NumericColumn returns the named column, which must hold numbers; role
// says what the caller needs it for ("the outcome", "a covariate"), for the
// error that names the first value that is not a number and its area.
func (l *Layer) NumericColumn(name, role string) (*Column, error) {
	col, err := l.Column(name)
	if err != nil || col.Kind == Number {
		return col, err
	}
	for i, m := range col.Missing {
		if !m {
			return nil, fmt.Errorf("%s: column %q is not numeric (first non-number value %q in area %q); %s must be a number", l.Source, name, col.Label(i), l.IDs[i], role)
		}
	}
	return nil, fmt.Errorf("%s: column %q is not numeric; %s must be a number", l.Source, name, role)
}

// Labels returns every area's value as text (Label), "" where missing.
func (c *Column) Labels() []string {
	out := make([]string, len(c.Missing))
	for i := range out {
		out[i] = c.Label(i)
	}
	return out
}

func joinOrNone(names []string) string {
	if len(names) == 0 {
		return "none"
	}
	s := names[0]
	for _, n := range names[1:] {
		s += ", " + n
	}
	return s
}
