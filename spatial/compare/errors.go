package compare

import (
	"errors"
	"fmt"
	"strconv"
	"strings"
)

// Error is a problem with the data that the user must fix; it names the
// column concerned. Err is the error it passes on, if any.
type Error struct {
	Msg string
	Err error
}

func (e *Error) Error() string { return e.Msg }

// Unwrap returns the error passed on.
func (e *Error) Unwrap() error { return e.Err }

// dataErr formats an *Error as fmt.Errorf does, keeping an error wrapped
// with %w.
func dataErr(format string, a ...any) error {
	e := fmt.Errorf(format, a...)
	return &Error{Msg: e.Error(), Err: errors.Unwrap(e)}
}

// The errors below concern a setting of the caller's, so each gives its
// facts apart (Facts) for a caller that names the setting in its own terms.

// ContrastError is a contrast (Options.Contrast) that does not name two
// different levels.
type ContrastError struct {
	// Column is the group column.
	Column string
}

func (e *ContrastError) Error() string { return "the contrast " + e.Facts() }

// Facts says what is wrong: "needs two different levels of COLUMN, as A,B".
func (e *ContrastError) Facts() string {
	return fmt.Sprintf("needs two different levels of %s, as A,B", e.Column)
}

// LevelError is a contrast level that no area with data has.
type LevelError struct {
	Level, Column string
	// Present are the levels of the column among the areas with data (a
	// value of every column the comparison needs), contrast or not, in
	// natural order (numbers by value, then text).
	Present []string
}

func (e *LevelError) Error() string { return "contrast " + e.Facts() }

// Facts says what is wrong: `level "X" is not a level of COLUMN …`.
func (e *LevelError) Facts() string {
	return fmt.Sprintf("level %q is not a level of %s among the areas with data (levels: %s)", e.Level, e.Column, strings.Join(quoteAll(e.Present), ", "))
}

// TwoGroupError is a two-group statistic asked for on a column with more
// than two levels among the tested areas.
type TwoGroupError struct {
	Statistic fmt.Stringer
	Column    string
	Levels    []string
	// Instead names the statistics that take any number of groups.
	Instead string
}

func (e *TwoGroupError) Error() string {
	return e.Facts() + "; use " + e.Instead + ", or pick two levels as the contrast"
}

// Facts says what is wrong, without the advice.
func (e *TwoGroupError) Facts() string {
	return fmt.Sprintf("the %s compares two groups, but %s has %d levels (%s)",
		e.Statistic, e.Column, len(e.Levels), strings.Join(quoteAll(e.Levels), ", "))
}

func quoteAll(s []string) []string {
	out := make([]string, len(s))
	for i, v := range s {
		out[i] = strconv.Quote(v)
	}
	return out
}
