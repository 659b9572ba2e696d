package main

import (
	"fmt"

	"github.com/areatest/areatest/io/layer"
)

// numericColumn returns the named column, which must be numeric; role
// says what it is for, in the error.
func numericColumn(lay *layer.Layer, name, role string) (*layer.Column, error) {
	col, err := lay.Column(name)
	if err != nil {
		return nil, err
	}
	if col.Kind != layer.Number {
		return nil, fmt.Errorf("%s: column %q is not numeric (first non-number value %q in area %s); %s must be a number", lay.Source, name, firstValue(col), firstID(lay, col), role)
	}
	return col, nil
}

// labels are the column's values as text, one per area.
func labels(c *layer.Column) []string {
	out := make([]string, len(c.Missing))
	for i := range out {
		out[i] = c.Label(i)
	}
	return out
}

// firstValue is the column's first value present, for messages.
func firstValue(c *layer.Column) string {
	for i, m := range c.Missing {
		if !m {
			return c.Label(i)
		}
	}
	return ""
}

// firstID is the quoted id of the first area with a value, for messages.
func firstID(l *layer.Layer, c *layer.Column) string {
	for i, m := range c.Missing {
		if !m {
			return fmt.Sprintf("%q", l.IDs[i])
		}
	}
	return "?"
}
