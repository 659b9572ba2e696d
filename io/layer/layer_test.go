package layer

import (
	"errors"
	"slices"
	"strings"
	"testing"

	_ "github.com/areatest/areatest/tests/testkit" // its -update flag, for go test ./... -update
)

func testLayer() *Layer {
	return &Layer{Source: "t.geojson", IDs: []string{"a", "b", "c"}, Columns: []*Column{
		{Name: "rate", Kind: Number, Num: []float64{1.5, 0, 3}, Missing: []bool{false, true, false}},
		{Name: "zone", Kind: Text, Str: []string{"", "north", "south"}, Missing: []bool{true, false, false}},
	}}
}

func TestColumns(t *testing.T) {
	l := testLayer()
	if c, err := l.NumericColumn("rate", "the outcome"); err != nil || c.Name != "rate" {
		t.Fatalf("rate: %v, %v", c, err)
	}
	for _, c := range []struct{ name, want string }{
		// A column a program built (no NotNumber): every present value
		// counts as not a number; the first is named, with its area.
		{"zone", `t.geojson: column "zone" is not numeric (2 of its 2 values are not numbers: "north" in area "b", "south" in area "c"); the outcome must be a number`},
		{"income", `t.geojson: no column "income" (columns: rate, zone)`},
	} {
		if _, err := l.NumericColumn(c.name, "the outcome"); err == nil || err.Error() != c.want {
			t.Errorf("%s: %v, want %q", c.name, err, c.want)
		}
	}
	zone, _ := l.Column("zone")
	if got := zone.Labels(); !slices.Equal(got, []string{"", "north", "south"}) {
		t.Errorf("labels %q", got)
	}
	rate, _ := l.Column("rate")
	if got := strings.Join(rate.Labels(), ","); got != "1.5,,3" {
		t.Errorf("number labels %q", got)
	}
}

// TestNotNumeric: a column named as numbers names the values that are not
// numbers, not merely the first value of the column, with a hint for a
// decimal comma; whether most values are numbers picks the wording.
func TestNotNumeric(t *testing.T) {
	ids := []string{"a", "b", "c", "d", "e", "f"}
	text := func(vals []string, notNumber []bool) *Layer {
		return &Layer{Source: "t.geojson", IDs: ids, Columns: []*Column{{Name: "v", Kind: Text, Str: vals,
			Missing: []bool{false, false, false, false, false, vals[5] == ""}, NotNumber: notNumber}}}
	}
	for _, c := range []struct {
		name      string
		vals      []string
		notNumber []bool
		want      string
		mostly    bool
	}{
		{"decimal comma and an object", []string{"1", "12,5", "3", `{"k":1}`, "5", ""}, []bool{false, true, false, true, false, false},
			`t.geojson: column "v" is not numeric: it holds numbers except for 2 of its 5 values: "12,5" in area "b" (a decimal comma? numbers take a decimal point: 12.5), {"k":1} in area "d"; the outcome must be a number`, true},
		{"thousands or decimal", []string{"1", "2", "1,250", "4", "5", "6"}, []bool{false, false, true, false, false, false},
			`t.geojson: column "v" is not numeric: it holds numbers except for 1 of its 6 values: "1,250" in area "c" (a decimal comma or a thousands separator? write 1.250 or 1250); the outcome must be a number`, true},
		// The first value of the column is a number; the first that is
		// not ("yes", area "b") is the one named.
		{"text", []string{"7", "yes", "no", "no", "01001", "1e999"}, []bool{false, true, true, true, true, true},
			`t.geojson: column "v" is not numeric (5 of its 6 values are not numbers: "yes" in area "b", "no" in area "c", "no" in area "d" and 2 more); the outcome must be a number`, false},
		{"line break", []string{"{\n", "2", "3", "4", "5", "6"}, []bool{true, false, false, false, false, false},
			`t.geojson: column "v" is not numeric: it holds numbers except for 1 of its 6 values: "{\n" in area "a"; the outcome must be a number`, true},
		{"codes and range", []string{"01001", "1e999", "x", "y", "z", "w"}, []bool{true, true, true, true, true, true},
			`t.geojson: column "v" is not numeric (6 of its 6 values are not numbers: "01001" in area "a" (a code with a leading zero), "1e999" in area "b" (beyond the range of numbers), "x" in area "c" and 3 more); the outcome must be a number`, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			l := text(c.vals, c.notNumber)
			_, err := l.NumericColumn("v", "the outcome")
			if err == nil || err.Error() != c.want || !errors.Is(err, ErrNotNumeric) {
				t.Errorf("got  %v\nwant %s", err, c.want)
			}
			if got := l.Columns[0].MostlyNumbers(); got != c.mostly {
				t.Errorf("MostlyNumbers %v, want %v", got, c.mostly)
			}
		})
	}
}
