package table

import (
	"fmt"
	"strings"
)

// Error is what ReadFile, Read and Join return for input they cannot use.
// Its text is one line naming the source, the line and the column when the
// problem lies in them, and what is wrong, so that a command can print it
// as is.
type Error struct {
	// Source names the input: the table's path, or for a key the join
	// cannot find in the layer, the layer's source.
	Source string
	// Line is the 1-based line of the file, as an editor numbers it, where
	// the problem lies; 0 when it lies in no one line.
	Line int
	// Column is the name of the column at fault, "" when none is.
	Column string
	// Msg says what is wrong, without the source, line and column.
	Msg string
	// Err is the underlying cause (a read error, a CSV syntax error), if any.
	Err error
}

// Error gives the one-line message: source, line, column and what is wrong.
func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.Source)
	b.WriteString(": ")
	if e.Line > 0 {
		fmt.Fprintf(&b, "line %d", e.Line)
		if e.Column != "" {
			fmt.Fprintf(&b, ", column %q", e.Column)
		}
		b.WriteString(": ")
	} else if e.Column != "" {
		fmt.Fprintf(&b, "column %q: ", e.Column)
	}
	// Messages quote values from the file, which may hold line breaks;
	// the promise is one line per error.
	b.WriteString(strings.Join(strings.Fields(e.Msg), " "))
	return b.String()
}

// Unwrap gives errors.Is and errors.As access to the cause.
func (e *Error) Unwrap() error { return e.Err }

func errorf(source string, line int, column, format string, args ...any) *Error {
	return &Error{Source: source, Line: line, Column: column, Msg: fmt.Sprintf(format, args...)}
}

// quoteValue quotes a value from the file for a message, cut to 40
// characters.
func quoteValue(s string) string {
	if r := []rune(s); len(r) > 40 {
		s = string(r[:37]) + "..."
	}
	return fmt.Sprintf("%q", s)
}

// listFirst joins the first n of names for a message, saying how many more
// there are.
func listFirst(names []string, n int) string {
	if len(names) == 0 {
		return "none"
	}
	if len(names) <= n {
		return strings.Join(names, ", ")
	}
	return fmt.Sprintf("%s and %d more", strings.Join(names[:n], ", "), len(names)-n)
}
