package gpkg

import (
	"fmt"
	"strings"
)

// Error is what ReadFile and Write return for input they cannot handle. Its
// text is one line naming the file, the feature table, the record and the
// column, as far as the problem lies in one, and what is wrong, so that a
// command can print it as is:
//
//	states.gpkg: table "states", record 3 (id "04"), column "geom": the geometry is a Point; areas must be Polygon or MultiPolygon
type Error struct {
	// Source is the file as named in messages.
	Source string
	// Table is the feature table the problem lies in; "" for the file.
	Table string
	// Record is the 1-based position of the record in the table (in the
	// order of its primary key), or 0 when the problem is not in one record.
	Record int
	// ID is the record's id when it was known at the time of the error.
	ID string
	// Column is the column the problem lies in, when it lies in one.
	Column string
	// Msg is the problem itself, the text after the location.
	Msg string
	// Skippable marks a record whose geometry is NULL, empty or not a
	// polygon, which Options.SkipBadGeometry leaves out with a warning;
	// broken geometry never is.
	Skippable bool
	// Layers lists the feature tables when the problem is which of them to
	// read (several, or an unknown one named): a caller can say how to
	// name one (Options.Layer).
	Layers []string
	// Err is the cause reported by SQLite or the file system, if any.
	Err error
}

// Error gives the one-line message.
func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.Source)
	var where []string
	if e.Table != "" {
		where = append(where, fmt.Sprintf("table %q", e.Table))
	}
	if e.Record > 0 {
		r := fmt.Sprintf("record %d", e.Record)
		if e.ID != "" {
			r += fmt.Sprintf(" (id %q)", e.ID)
		}
		where = append(where, r)
	}
	if e.Column != "" {
		where = append(where, fmt.Sprintf("column %q", e.Column))
	}
	if len(where) > 0 {
		b.WriteString(", ")
		b.WriteString(strings.Join(where, ", "))
	}
	b.WriteString(": ")
	// Table and column names and SQLite's messages come from the file and
	// may hold line breaks; the promise is one line per error.
	b.WriteString(strings.Join(strings.Fields(e.Msg), " "))
	return b.String()
}

// Unwrap gives errors.Is and errors.As access to the cause.
func (e *Error) Unwrap() error { return e.Err }
