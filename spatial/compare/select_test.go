package compare

import (
	"errors"
	"reflect"
	"strings"
	"testing"
)

// A layer on which no area has both an outcome and a group value is a data
// error that counts the areas by what they lack, not a panic; the same
// with a contrast, whose level check would otherwise list no levels.
func TestNoAreaCanBeTested(t *testing.T) {
	y := []float64{1, 2, 3, 4, 5, 6}
	g := []string{"a", "a", "b", "b", "b", "a"}
	cases := []struct {
		name           string
		outcome, group []int // areas missing the outcome, the group
		contrast       []string
		strata         bool
		want           string
	}{
		{"every outcome missing", []int{0, 1, 2, 3, 4, 5}, nil, nil, false,
			"none of the 6 areas has a value of y and g (6 missing y)"},
		{"outcome and group apart", []int{0, 1, 2}, []int{3, 4, 5}, nil, false,
			"none of the 6 areas has a value of y and g (3 missing y, 3 missing g)"},
		{"with a contrast", []int{0, 1, 2}, []int{3, 4, 5}, []string{"a", "b"}, false,
			"(3 missing y, 3 missing g)"},
		{"with strata", []int{0, 1, 2, 3}, nil, nil, true,
			"none of the 6 areas has a value of every column the comparison needs (4 missing y, 2 missing s)"},
	}
	for _, c := range cases {
		in := input(y, g)
		for _, i := range c.outcome {
			in.OutcomeMissing[i] = true
		}
		for _, i := range c.group {
			in.GroupMissing[i] = true
		}
		if c.strata {
			in.StrataName, in.Strata = "s", make([]string, 6)
			in.StrataMissing = []bool{false, false, false, false, true, true}
		}
		o := opts()
		o.Contrast = c.contrast
		_, err := Run(in, o)
		var de *Error
		if !errors.As(err, &de) || !strings.Contains(err.Error(), "no area can be tested") || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want an *Error with %q", c.name, err, c.want)
		}
	}
}

// A contrast level that no area with data has lists every level the column
// has among the areas with data — not only the other contrast level, and
// not nothing when neither is there.
func TestContrastLevelListsTheColumnsLevels(t *testing.T) {
	y := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	g := []string{"10", "10", "b", "b", "2", "2", "zz", "gone"}
	cases := []struct {
		contrast []string
		level    string
		present  []string
	}{
		{[]string{"b", "x"}, "x", []string{"2", "10", "b", "zz"}},
		{[]string{"x", "y"}, "x", []string{"2", "10", "b", "zz"}},
		{[]string{"gone", "b"}, "gone", []string{"2", "10", "b", "zz"}},
	}
	for _, c := range cases {
		in := input(y, g)
		in.OutcomeMissing[7] = true // "gone" has no area with data
		o := opts()
		o.Contrast = c.contrast
		_, err := Run(in, o)
		var le *LevelError
		if !errors.As(err, &le) || le.Level != c.level || !reflect.DeepEqual(le.Present, c.present) {
			t.Errorf("contrast %v: %v (%+v), want level %q with levels %v", c.contrast, err, le, c.level, c.present)
			continue
		}
		if want := `(levels: "2", "10", "b", "zz")`; !strings.Contains(err.Error(), want) {
			t.Errorf("contrast %v: %q lacks %s", c.contrast, err, want)
		}
	}
}
