package layer

import (
	"encoding/json"
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// FormatNumber follows encoding/json's rule for floats; json.Marshal is the
// reference.
func TestFormatNumberMatchesJSON(t *testing.T) {
	for _, v := range []float64{0, 1, -1, 48201, 1234567, 1.5, 0.1, 1e-4, 1e-6, 9.99e-7, 1e-7, 1e20, 1e21, 123456789012, 1.0 / 3, -2.5e-7, 1e-300, math.MaxFloat64, math.SmallestNonzeroFloat64} {
		want, err := json.Marshal(v)
		if err != nil {
			t.Fatal(err)
		}
		if got := FormatNumber(v); got != string(want) {
			t.Errorf("%v: FormatNumber %q, json.Marshal %q", v, got, want)
		}
	}
}

func TestNumberWords(t *testing.T) {
	for s, want := range map[string]bool{"1": true, "-1.5": true, "+2": true, ".5": true, "5.": true, "1e5": true, "1E-5": true,
		"": false, "-": false, ".": false, "1e": false, "inf": false, "0x10": false, "1_000": false, "1,5": false, "1 2": false} {
		if got := IsDecimal(s); got != want {
			t.Errorf("IsDecimal(%q) = %v", s, got)
		}
	}
	for s, want := range map[string]bool{"01": true, "-01": true, "00": true, "0": false, "0.5": false, "10": false} {
		if got := HasLeadingZero(s); got != want {
			t.Errorf("HasLeadingZero(%q) = %v", s, got)
		}
	}
}

// TestBuilderRules: the shared column rules, value by value.
func TestBuilderRules(t *testing.T) {
	type add func(*Builder)
	text := func(s string) add { return func(b *Builder) { b.AddText(s) } }
	for _, tc := range []struct {
		name    string
		adds    []add
		kind    Kind
		labels  []string
		missing []bool
	}{
		{"numbers", []add{text("1.5"), text(" 2 "), text("NA"), text("")}, Number, []string{"1.5", "2", "", ""}, []bool{false, false, true, true}},
		{"a code turns text", []add{text("1001"), text("01003")}, Text, []string{"1001", "01003"}, []bool{false, false}},
		{"a word turns text", []add{text("7"), text("n/a"), text("seven")}, Text, []string{"7", "", "seven"}, []bool{false, true, false}},
		{"typed numbers", []add{func(b *Builder) { b.AddNumber(3, "") }, func(b *Builder) { b.AddMissing() }}, Number, []string{"3", ""}, []bool{false, true}},
		{"written form kept", []add{text("1.50"), func(b *Builder) { b.AddWord("true") }}, Text, []string{"1.50", "true"}, []bool{false, false}},
		{"inf is a word", []add{text("Inf")}, Text, []string{"Inf"}, []bool{false}},
	} {
		b := NewBuilder("c", 0)
		for _, a := range tc.adds {
			a(b)
		}
		c := b.Column()
		if c.Kind != tc.kind || b.Len() != len(tc.labels) {
			t.Errorf("%s: kind %v, %d values", tc.name, c.Kind, b.Len())
			continue
		}
		for i, want := range tc.labels {
			if c.Label(i) != want || c.Missing[i] != tc.missing[i] {
				t.Errorf("%s: value %d is %q (missing %v), want %q", tc.name, i, c.Label(i), c.Missing[i], want)
			}
		}
	}
	if c := NewBuilder("late", 2).Column(); c.Kind != Number || c.MissingCount() != 2 {
		t.Errorf("a late column: %+v", c)
	}
}

func TestCheckPolygons(t *testing.T) {
	open := orb.MultiPolygon{{{{0, 0}, {1, 0}, {1, 1}}}, {}}
	closed, empty, err := CheckPolygons(&open)
	if err != nil || closed != 1 || empty || len(open) != 1 || len(open[0][0]) != 4 {
		t.Errorf("closing: %d %v %v %v", closed, empty, err, open)
	}
	short := orb.MultiPolygon{{{{0, 0}, {1, 0}, {0, 0}}}}
	if _, _, err := CheckPolygons(&short); err == nil || err.Error() != "ring 1 has 3 positions; a ring needs at least 4, the last repeating the first" {
		t.Errorf("short ring: %v", err)
	}
	bad := orb.MultiPolygon{{{{0, 0}, {1, 0}, {1, 1}, {0, 0}}}, {{{0, 0}, {math.NaN(), 0}, {1, 1}, {0, 0}}}}
	if _, _, err := CheckPolygons(&bad); err == nil || err.Error() != "ring 1 of part 2 holds the coordinate [NaN, 0], which is not a finite number" {
		t.Errorf("NaN: %v", err)
	}
	none := orb.MultiPolygon{{}}
	if _, empty, err := CheckPolygons(&none); !empty || err != nil {
		t.Errorf("empty: %v %v", empty, err)
	}
	if p, ok := OutsideLonLat(orb.MultiPolygon{{{{10, 10}, {500000, 4e6}}}}); !ok || p != (orb.Point{500000, 4e6}) {
		t.Errorf("OutsideLonLat: %v %v", p, ok)
	}
}

func TestDistances(t *testing.T) {
	usFoot := CRS{Projected: true, Unit: "US survey foot", MetresPerUnit: 1200.0 / 3937}
	for _, tc := range []struct {
		in   string
		crs  CRS
		want float64
	}{
		{"25km", CRS{}, 25},
		{"25", CRS{}, 25},
		{"4000 m", CRS{}, 4},
		{"15mi", CRS{}, 15 * 1.609344},
		{"25KM", CRS{Projected: true, MetresPerUnit: 1}, 25000},
		{"25", CRS{Projected: true, MetresPerUnit: 1}, 25},
		{"1mi", usFoot, 1609.344 / (1200.0 / 3937)}, // 5279.99 US survey feet
		{"7", CRS{Projected: true}, 7},
	} {
		v, unit, err := ParseDistance(tc.in)
		if err != nil {
			t.Errorf("%q: %v", tc.in, err)
			continue
		}
		got, err := tc.crs.InLayerUnits(v, unit)
		if err != nil || math.Abs(got-tc.want) > 1e-9*tc.want {
			t.Errorf("%q on %+v: %v, %v; want %v", tc.in, tc.crs, got, err, tc.want)
		}
	}
	for _, bad := range []string{"", "km", "25 furlongs", "1e", "0x10", "12,5km"} {
		if _, _, err := ParseDistance(bad); err == nil {
			t.Errorf("ParseDistance(%q) accepted", bad)
		}
	}
	if _, err := (CRS{Projected: true}).InLayerUnits(5, "km"); err == nil {
		t.Error("a unit on a layer of unknown unit was converted")
	}
}
