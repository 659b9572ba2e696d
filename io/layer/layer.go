package layer

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode"

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
	// NotNumber marks, per area, a value of a Text column that is not a
	// number: a word, a code with a leading zero ("01001"), a boolean, an
	// object, or a number beyond the range of float64. Numbers ("12.5", 7)
	// and missing values are false. Readers fill it so that a column of
	// numbers with a few bad values can be told from a column of text
	// (NumericColumn, MostlyNumbers); nil, as in a column a program builds,
	// counts every present value as not a number. Always nil in a Number
	// column.
	NotNumber []bool
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

// FormatNumber writes v in its shortest exact form, in plain notation
// between 1e-6 and 1e21 and in exponent notation outside, the rule of
// encoding/json (and of JavaScript), so that a number reads as JSON writers
// print it: 1234567, not 1.234567e+06; 1e-7, not 1e-07. -0 is written 0.
func FormatNumber(v float64) string {
	var buf [32]byte
	return string(AppendNumber(buf[:0], v))
}

// AppendNumber appends FormatNumber(v) to dst.
func AppendNumber(dst []byte, v float64) []byte {
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
	// CRS says what the coordinates are; the zero value is longitude and
	// latitude in degrees, as GeoJSON has them.
	CRS CRS
}

// CRS describes a layer's coordinate system as far as the statistics need
// it: geographic (longitude/latitude in degrees, distances measured on the
// sphere) or projected (planar coordinates in a linear unit, distances
// measured in the plane). Nothing is ever reprojected.
type CRS struct {
	// Projected is true for planar coordinates, false for degrees.
	Projected bool `json:"projected"`
	// Unit names the linear unit of projected coordinates ("metre",
	// "US survey foot"); "" when the input does not say (then distances
	// are in "layer units").
	Unit string `json:"unit,omitempty"`
	// MetresPerUnit converts projected coordinates to metres; 0 when the
	// unit is unknown.
	MetresPerUnit float64 `json:"metres_per_unit,omitempty"`
	// Name is the system as the input names it ("NAD83 / Conus Albers",
	// "EPSG:5070"); "" when it names none.
	Name string `json:"name,omitempty"`
	// EPSG is the system's EPSG code when the input gives one, else 0.
	EPSG int `json:"epsg,omitempty"`
}

// DistanceUnit names the unit distances are measured in on this layer:
// "km" on geographic layers, the projected unit's short name ("m", "ft",
// "US ft") or "layer units" when the unit is unknown.
func (c CRS) DistanceUnit() string {
	if !c.Projected {
		return "km"
	}
	switch c.MetresPerUnit {
	case 1:
		return "m"
	case 1000:
		return "km"
	case 0.3048:
		return "ft"
	case 1200.0 / 3937:
		return "US ft"
	}
	if c.Unit != "" {
		return c.Unit
	}
	return "layer units"
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
// says what the caller needs it for ("the outcome", "a covariate"). The
// rule: every present value of a column the user names as a number must be
// a number. A Text column is a *NotNumericError naming its first values
// that are not numbers and their areas, so that a column of numbers with a
// few bad values ("12,5" with a decimal comma) is found and fixed rather
// than read as text.
func (l *Layer) NumericColumn(name, role string) (*Column, error) {
	col, err := l.Column(name)
	if err != nil || col.Kind == Number {
		return col, err
	}
	return nil, l.NotNumeric(col, role)
}

// NotNumeric describes why col, a Text column, cannot be read as numbers:
// the values that are not numbers (the first MaxBadValues of them) and
// their areas. role is as for NumericColumn.
func (l *Layer) NotNumeric(col *Column, role string) *NotNumericError {
	e := &NotNumericError{Source: l.Source, Column: col.Name, Role: role, Mostly: col.MostlyNumbers()}
	for i, m := range col.Missing {
		if m {
			continue
		}
		e.Present++
		if col.NotNumber == nil || col.NotNumber[i] {
			if len(e.Bad) < MaxBadValues {
				e.Bad = append(e.Bad, BadValue{ID: l.IDs[i], Value: col.Label(i)})
			}
			e.BadCount++
		}
	}
	return e
}

// MaxBadValues is how many values that are not numbers a NotNumericError
// names; it counts the rest.
const MaxBadValues = 3

// ErrNotNumeric is matched (errors.Is) by every *NotNumericError.
var ErrNotNumeric = errors.New("column is not numeric")

// NotNumericError says that a column needed as numbers holds values that
// are not numbers, naming the first few with their areas.
type NotNumericError struct {
	// Source is the layer's source, Column the column's name, and Role
	// what the caller needs the column for ("the outcome").
	Source, Column, Role string
	// Present counts the values present, BadCount those that are not
	// numbers; Bad holds the first of them (at most MaxBadValues).
	Present, BadCount int
	Bad               []BadValue
	// Mostly says that most values are numbers (Column.MostlyNumbers):
	// numbers with a few bad values rather than text.
	Mostly bool
}

// BadValue is a value that is not a number, with its area's id.
type BadValue struct{ ID, Value string }

// Is makes errors.Is(err, ErrNotNumeric) true.
func (e *NotNumericError) Is(target error) bool { return target == ErrNotNumeric }

func (e *NotNumericError) Error() string {
	return fmt.Sprintf("%s: column %q %s; %s must be a number", e.Source, e.Column, e.Detail(), e.Role)
}

// Detail says what the column holds, without the source, the column and
// the role: "is not numeric: it holds numbers except for 2 of its 200
// values: …" when most values are numbers, "is not numeric (…)" otherwise.
func (e *NotNumericError) Detail() string {
	var b strings.Builder
	switch {
	case len(e.Bad) == 0:
		b.WriteString("is not numeric")
	case e.Mostly:
		fmt.Fprintf(&b, "is not numeric: it holds numbers except for %d of its %d values: ", e.BadCount, e.Present)
		e.writeBad(&b)
	default:
		fmt.Fprintf(&b, "is not numeric (%d of its %d values are not numbers: ", e.BadCount, e.Present)
		e.writeBad(&b)
		b.WriteString(")")
	}
	return b.String()
}

// writeBad lists the bad values, each with its area and a hint.
func (e *NotNumericError) writeBad(b *strings.Builder) {
	for k, v := range e.Bad {
		if k > 0 {
			b.WriteString(", ")
		}
		fmt.Fprintf(b, "%s in area %q%s", quoteValue(v.Value), v.ID, valueHint(v.Value))
	}
	if more := e.BadCount - len(e.Bad); more > 0 {
		fmt.Fprintf(b, " and %d more", more)
	}
}

// quoteValue quotes a value for a message, cut to 40 characters; JSON
// objects and arrays (as readers render them) are shown as they are, unless
// they hold control characters, which would break the message's line.
func quoteValue(s string) string {
	if r := []rune(s); len(r) > 40 {
		s = string(r[:37]) + "..."
	}
	if (strings.HasPrefix(s, "{") || strings.HasPrefix(s, "[")) && strings.IndexFunc(s, unicode.IsControl) < 0 {
		return s
	}
	return strconv.Quote(s)
}

// valueHint guesses, for a message only, why a value is not a number: a
// decimal comma ("12,5"; with three digits after it, perhaps a thousands
// separator), a code with a leading zero, or a number too large for a
// float64.
func valueHint(s string) string {
	t := strings.TrimSpace(s)
	if i := strings.IndexByte(t, ','); i > 0 && strings.Count(t, ",") == 1 {
		whole, frac := strings.TrimLeft(t[:i], "+-"), t[i+1:]
		if allDigits(whole) && allDigits(frac) {
			if len(frac) == 3 {
				return fmt.Sprintf(" (a decimal comma or a thousands separator? write %s.%s or %s%s)", t[:i], frac, t[:i], frac)
			}
			return fmt.Sprintf(" (a decimal comma? numbers take a decimal point: %s.%s)", t[:i], frac)
		}
	}
	_, err := strconv.ParseFloat(t, 64)
	u := strings.TrimLeft(t, "+-")
	switch {
	case errors.Is(err, strconv.ErrRange):
		return " (beyond the range of numbers)"
	case err == nil && len(u) > 1 && u[0] == '0' && allDigits(u[1:2]):
		return " (a code with a leading zero)"
	}
	return ""
}

func allDigits(s string) bool {
	for _, c := range s {
		if c < '0' || c > '9' {
			return false
		}
	}
	return s != ""
}

// MostlyNumbers reports a Text column more than half of whose present
// values are numbers (NotNumber): numbers with some bad values, not a
// column of categories. Number columns report false.
func (c *Column) MostlyNumbers() bool {
	if c.Kind == Number || c.NotNumber == nil {
		return false
	}
	present, numbers := 0, 0
	for i, m := range c.Missing {
		if !m {
			present++
			if !c.NotNumber[i] {
				numbers++
			}
		}
	}
	return 2*numbers > present
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
