package choice

import (
	"fmt"
	"strings"
)

// Name is one accepted spelling of a value.
type Name[T any] struct {
	Name  string
	Value T
}

// Parse returns the value whose name matches s, ignoring case and
// surrounding space. what names the setting in the error, for example
// "contiguity" gives `contiguity must be queen or rook, not "bishop"`.
// Several names may share a value (aliases); the error lists them all.
func Parse[T any](what, s string, names ...Name[T]) (T, error) {
	key := strings.ToLower(strings.TrimSpace(s))
	for _, n := range names {
		if strings.ToLower(n.Name) == key {
			return n.Value, nil
		}
	}
	var zero T
	return zero, fmt.Errorf("%s must be %s, not %q", what, List(names), s)
}

// List writes the names as "a, b or c".
func List[T any](names []Name[T]) string {
	words := make([]string, len(names))
	for i, n := range names {
		words[i] = n.Name
	}
	switch len(words) {
	case 0:
		return "nothing"
	case 1:
		return words[0]
	}
	return strings.Join(words[:len(words)-1], ", ") + " or " + words[len(words)-1]
}
