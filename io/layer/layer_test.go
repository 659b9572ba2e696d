package layer

import (
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
		// The first value present is named, with its area.
		{"zone", `t.geojson: column "zone" is not numeric (first non-number value "north" in area "b"); the outcome must be a number`},
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
