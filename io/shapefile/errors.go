package shapefile

import (
	"fmt"
	"strconv"
	"strings"
)

// Error is what Read and ReadFile return for input they cannot turn into a
// layer. Its text is one line naming the file (a member of a zip as
// "file.zip:states.dbf"), the record and column when the problem lies in
// one, and what is wrong, so a command can print it as is.
type Error struct {
	// Source is the file the problem is in, as named in messages.
	Source string
	// Record is the 1-based record number (the same in the .shp and the
	// .dbf), or 0 when the problem is not in one record.
	Record int
	// ID is the record's id, when it was known at the time of the error.
	ID string
	// Column is the table column the problem is in, if any.
	Column string
	// Msg says what is wrong, without the source, record and column.
	Msg string
	// Skippable says the record has no polygon geometry (a null shape, no
	// parts, or a shape of another type): Options.SkipBadGeometry would
	// have left it out, with a warning, instead of failing. Broken geometry
	// is not skippable.
	Skippable bool
	// Layers lists the shapefiles of a zip when the problem is which of
	// them to read (several, and none or an unknown one named): a caller
	// can say how to name one (Options.Layer).
	Layers []string
	// Err is the underlying cause (a read error, a bad zip), if any.
	Err error
}

// Error gives the one-line message.
func (e *Error) Error() string {
	at := recordLabel(e.Record, e.ID)
	if e.Column != "" {
		col := "column " + strconv.Quote(e.Column)
		if at != "" {
			col = at + ", " + col
		}
		at = col
	}
	if at != "" {
		at += ": "
	}
	// Messages quote bytes from the files, which may hold line breaks; the
	// promise is one line per error.
	return e.Source + ": " + at + strings.Join(strings.Fields(e.Msg), " ")
}

// Unwrap gives errors.Is and errors.As access to the cause.
func (e *Error) Unwrap() error { return e.Err }

// recordLabel names a record by number and, when known, id.
func recordLabel(rec int, id string) string {
	switch {
	case rec <= 0:
		return ""
	case id == "":
		return fmt.Sprintf("record %d", rec)
	}
	return fmt.Sprintf("record %d (id %q)", rec, id)
}

// errorf builds an error about a file (record 0) or one of its records.
func errorf(source string, rec int, format string, args ...any) *Error {
	return &Error{Source: source, Record: rec, Msg: fmt.Sprintf(format, args...)}
}

// wrapf is errorf with an underlying cause, which the message also quotes.
func wrapf(err error, source string, format string, args ...any) *Error {
	e := errorf(source, 0, format, args...)
	e.Msg += ": " + err.Error()
	e.Err = err
	return e
}

// listNames quotes up to max names for a message, counting the rest.
func listNames(names []string, max int) string {
	var b strings.Builder
	for i, n := range names {
		if i == max {
			fmt.Fprintf(&b, " and %d more", len(names)-max)
			break
		}
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(strconv.Quote(n))
	}
	return b.String()
}
