package table

import (
	"math"
	"reflect"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/tests/testkit"
)

// states reads the GeoJSON the CSV fixture was made from.
func states(t *testing.T) *layer.Layer {
	t.Helper()
	l, _, err := geojson.ReadFile(testkit.Testdata(t, "us-states.geojson"), geojson.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return l
}

func statesTable(t *testing.T) *Table {
	t.Helper()
	tab, _, err := ReadFile(testkit.Testdata(t, "formats/states-attrs.csv"))
	if err != nil {
		t.Fatal(err)
	}
	return tab
}

// snapshot copies what Join must not change in a layer.
func snapshot(l *layer.Layer) layer.Layer {
	s := *l
	s.IDs = append([]string(nil), l.IDs...)
	s.Columns = append([]*layer.Column(nil), l.Columns...)
	return s
}

// The fixture's keys lost their leading zeros (1 for Alabama's 01); joined
// onto the bare states layer, by the ids or by the layer's fips column, it
// gives back the GeoJSON's own attributes, values and kinds.
func TestJoinFixture(t *testing.T) {
	full := states(t)
	bare := &layer.Layer{Source: full.Source, IDs: full.IDs, Geoms: full.Geoms, Columns: []*layer.Column{mustColumn(t, full, "fips")}}
	tab := statesTable(t)
	for _, opt := range []JoinOptions{{}, {LayerKey: "fips"}, {TableKey: "fips"}, {LayerKey: "fips", TableKey: "fips"}} {
		before := snapshot(bare)
		got, rep, warns, err := Join(bare, tab, opt)
		if err != nil {
			t.Fatalf("%+v: %v", opt, err)
		}
		if !reflect.DeepEqual(snapshot(bare), before) {
			t.Errorf("%+v: the input layer changed", opt)
		}
		if &got.IDs[0] != &bare.IDs[0] || &got.Geoms[0] != &bare.Geoms[0] {
			t.Errorf("%+v: ids or geometry copied, not shared", opt)
		}
		want := JoinReport{Table: tab.Source, LayerKey: opt.LayerKey, TableKey: "fips", Areas: 56, Rows: 56, Matched: 56, Padded: 7, PadWidth: 2,
			Columns: []string{"usps", "name", "centroid_lon", "centroid_lat"}}
		if !reflect.DeepEqual(*rep, want) {
			t.Errorf("%+v: report\n%+v, want\n%+v", opt, *rep, want)
		}
		if len(warns) != 1 || !strings.HasPrefix(warns[0], tab.Source+": 7 key(s) matched only once padded with leading zeros to 2 digits") || !strings.Contains(warns[0], `table "1" ↔ layer "01"`) {
			t.Errorf("%+v: warnings %q", opt, warns)
		}
		for _, name := range []string{"name", "centroid_lon", "centroid_lat", "fips"} {
			if !reflect.DeepEqual(mustColumn(t, got, name), mustColumn(t, full, name)) {
				t.Errorf("%+v: column %s differs from the GeoJSON's", opt, name)
			}
		}
		if usps := mustColumn(t, got, "usps"); usps.Kind != layer.Text || usps.Str[0] != "AL" || usps.Str[55] != "VI" {
			t.Errorf("%+v: usps %q", opt, usps.Str)
		}
	}

	// Onto the full layer, the table's columns replace the layer's of the
	// same name, in place, with one warning.
	got, rep, warns, err := Join(full, tab, JoinOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, c := range got.Columns {
		names = append(names, c.Name)
	}
	if !reflect.DeepEqual(names, []string{"name", "fips", "centroid_lon", "centroid_lat", "usps"}) || !reflect.DeepEqual(rep.Replaced, []string{"name", "centroid_lon", "centroid_lat"}) {
		t.Errorf("columns %q, replaced %q", names, rep.Replaced)
	}
	if len(warns) != 2 || !strings.Contains(warns[1], `column(s) "name", "centroid_lon", "centroid_lat" replace the layer's`) {
		t.Errorf("warnings %q", warns)
	}
	if full.Columns[0] == got.Columns[0] || full.Columns[1] != got.Columns[1] {
		t.Errorf("replaced columns not new, or kept columns not shared")
	}
}

func mustColumn(t *testing.T, l *layer.Layer, name string) *layer.Column {
	t.Helper()
	c, err := l.Column(name)
	if err != nil {
		t.Fatal(err)
	}
	return c
}

// areas builds a layer of unit squares with the given ids and one text
// column "code" holding codes.
func areas(ids []string, codes ...string) *layer.Layer {
	l := &layer.Layer{Source: "areas.geojson", IDs: ids}
	sq := orb.MultiPolygon{{{{0, 0}, {1, 0}, {1, 1}, {0, 0}}}}
	b := layer.NewBuilder("code", 0)
	for i := range ids {
		l.Geoms = append(l.Geoms, sq)
		if i < len(codes) {
			b.AddText(codes[i])
		} else {
			b.AddMissing()
		}
	}
	l.Columns = []*layer.Column{b.Column()}
	return l
}

func tableOf(t *testing.T, doc string) *Table {
	t.Helper()
	tab, _ := mustRead(t, doc)
	return tab
}

func TestJoinMatches(t *testing.T) {
	// Areas without a row get missing values; rows without an area are
	// counted; the kind of a column is the whole table's.
	l := areas([]string{"a", "b", "c", "d"})
	tab := tableOf(t, "key,v,w\r\nb,2,x\r\na,1,7\r\nz,9,y\r\nq,8,y\r\n")
	got, rep, warns, err := Join(l, tab, JoinOptions{})
	if err != nil {
		t.Fatal(err)
	}
	v, w := mustColumn(t, got, "v"), mustColumn(t, got, "w")
	if v.Kind != layer.Number || v.Num[0] != 1 || v.Num[1] != 2 || !v.Missing[2] || !v.Missing[3] || !math.IsNaN(v.Num[3]) {
		t.Errorf("v: %+v", v)
	}
	if w.Kind != layer.Text || w.Str[0] != "7" || w.NotNumber[0] || w.Str[1] != "x" || !w.NotNumber[1] || !w.Missing[2] {
		t.Errorf("w: %+v", w)
	}
	if rep.Matched != 2 || rep.Unmatched != 2 || !reflect.DeepEqual(rep.UnmatchedFirst, []string{"c", "d"}) || rep.Unused != 2 || !reflect.DeepEqual(rep.UnusedFirst, []string{"z", "q"}) {
		t.Errorf("report %+v", rep)
	}
	if len(warns) != 2 || !strings.Contains(warns[0], `2 of 4 areas have no row ("c", "d"); their joined values are missing`) || !strings.Contains(warns[1], `2 of 4 rows match no area (keys "z", "q")`) {
		t.Errorf("warnings %q", warns)
	}

	// Several areas may share a key; keys are trimmed.
	l = areas([]string{"1", "2", "3"}, " AL", "AL ", "AK")
	tab = tableOf(t, "state,pop\nAL,5\n AK ,1\n")
	got, rep, _, err = Join(l, tab, JoinOptions{LayerKey: "code", TableKey: "state"})
	if err != nil || !reflect.DeepEqual(mustColumn(t, got, "pop").Num, []float64{5, 5, 1}) || rep.Matched != 3 {
		t.Errorf("shared keys: %v %+v", err, rep)
	}

	// The layer lost the zeros: its keys of digits differ in width, the
	// table's share one, so the layer's short keys are padded.
	l = areas([]string{"1001", "10001", "9001", "x1"})
	tab = tableOf(t, "GEOID,v\n01001,1\n10001,2\n09001,3\nx1,4\n")
	got, rep, _, err = Join(l, tab, JoinOptions{})
	if err != nil || !reflect.DeepEqual(mustColumn(t, got, "v").Num, []float64{1, 2, 3, 4}) || rep.Padded != 2 || rep.PadWidth != 5 {
		t.Errorf("layer padded: %v %+v", err, rep)
	}

	// Keys with other characters are not padded; nor is a short key whose
	// padded form is another row's key; nor anything when the layer's keys
	// of digits differ in width and the table's too.
	l = areas([]string{"01", "02", "A1"})
	tab = tableOf(t, "k,v\n1,10\n01,11\n2,12\n1A,13\n")
	got, rep, _, err = Join(l, tab, JoinOptions{})
	if err != nil || !reflect.DeepEqual(mustColumn(t, got, "v").Num[:2], []float64{11, 12}) || !got.Columns[1].Missing[2] || rep.Padded != 1 || rep.Unused != 2 {
		t.Errorf("padding limits: %v %+v", err, rep)
	}
	l = areas([]string{"01", "002"})
	tab = tableOf(t, "k,v\n1,10\n2,12\n01,5\n")
	if _, rep, _, err = Join(l, tab, JoinOptions{}); err != nil || rep.Matched != 1 || rep.Padded != 0 {
		t.Errorf("mixed widths: %v %+v", err, rep)
	}

	// Joining on the column the ids came from means the ids; a table
	// column of the layer key's name is left out.
	l = areas([]string{"a", "b"}, "a", "b")
	l.IDColumn = "code"
	tab = tableOf(t, "code,v\na,1\nb,2\n")
	if _, rep, _, err = Join(l, tab, JoinOptions{LayerKey: "code"}); err != nil || rep.LayerKey != "" || rep.TableKey != "code" {
		t.Errorf("id column: %v %+v", err, rep)
	}
	l = areas([]string{"1", "2"}, "a", "b")
	tab = tableOf(t, "k,code,v\na,x,1\nb,y,2\n")
	got, rep, warns, err = Join(l, tab, JoinOptions{LayerKey: "code", TableKey: "k"})
	if err != nil || mustColumn(t, got, "code").Str[0] != "a" || !reflect.DeepEqual(rep.Columns, []string{"v"}) || len(warns) != 1 || !strings.Contains(warns[0], `column "code" is left out`) {
		t.Errorf("key name in the table: %v %+v %q", err, rep, warns)
	}
}

func TestJoinErrors(t *testing.T) {
	st := states(t)
	usps := tableOf(t, "usps,fips,name\nAL,1,Alabama\nAK,2,Alaska\nAZ,4,Arizona\nAR,5,Arkansas\n")
	tests := []struct {
		name string
		l    *layer.Layer
		tab  *Table
		opt  JoinOptions
		want []string
	}{
		{"no match", st, usps, JoinOptions{}, []string{`rates.csv: column "usps": no key matches an area's id (layer keys: 01, 02, 04 and`, "table keys: AL, AK, AZ and 1 more)"}},
		{"no match on a column", st, usps, JoinOptions{LayerKey: "name", TableKey: "fips"}, []string{`no key matches the layer's "name" (layer keys: Alabama, Alaska, Arizona`, "table keys: 1, 2, 4"}},
		{"no layer column", st, usps, JoinOptions{LayerKey: "GEOID"}, []string{"us-states.geojson: has no column \"GEOID\" to join on (its columns: name, fips, centroid_lon, centroid_lat)"}},
		{"no table column", st, usps, JoinOptions{TableKey: "state"}, []string{`rates.csv: has no column "state" to join on (its columns: usps, fips, name)`}},
		{"no table column by the layer's name", st, usps, JoinOptions{LayerKey: "centroid_lat"}, []string{`rates.csv: has no column "centroid_lat"`}},
		{"many columns", st, tableOf(t, "a,b,c,d,e,f,g,h,i,j,k,l\n1,2,3,4,5,6,7,8,9,10,11,12\n"), JoinOptions{TableKey: "z"}, []string{"(its columns: a, b, c, d, e, f, g, h, i, j and 2 more)"}},
		{"duplicate key", st, tableOf(t, "fips,v\n01,1\n02,2\n\"01\",3\n"), JoinOptions{}, []string{`rates.csv: line 4, column "fips": the key "01" is also on line 2`}},
		{"duplicate number key", st, tableOf(t, "fips,v\n1,1\n2,2\n1.0,3\n"), JoinOptions{}, []string{`line 4, column "fips": the key "1" is also on line 2`}},
		{"missing key", st, tableOf(t, "fips,v\n01,1\nNA,2\n"), JoinOptions{}, []string{`rates.csv: line 3, column "fips": the key is missing`}},
		{"empty key", st, tableOf(t, "fips,v\n01,1\n  ,2\n"), JoinOptions{}, []string{`line 3, column "fips": the key is missing`}},
	}
	for _, tc := range tests {
		before := snapshot(tc.l)
		got, rep, warns, err := Join(tc.l, tc.tab, tc.opt)
		checkError(t, tc.name, err, tc.want)
		if got != nil || rep != nil || warns != nil {
			t.Errorf("%s: results along with the error", tc.name)
		}
		if !reflect.DeepEqual(snapshot(tc.l), before) {
			t.Errorf("%s: the layer changed", tc.name)
		}
	}
}
