package geojson

import (
	"errors"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

const square = `[[[0,0],[1,0],[1,1],[0,1],[0,0]]]`

// fc wraps features in a FeatureCollection.
func fc(features ...string) string {
	return `{"type":"FeatureCollection","features":[` + strings.Join(features, ",") + `]}`
}

// feat builds a feature with the given id member text ("" for none),
// geometry text and properties text.
func feat(id, geometry, props string) string {
	s := `{"type":"Feature",`
	if id != "" {
		s += `"id":` + id + `,`
	}
	return s + `"geometry":` + geometry + `,"properties":` + props + `}`
}

func poly(coords string) string { return `{"type":"Polygon","coordinates":` + coords + `}` }

func sq(id string) string { return feat(id, poly(square), `{}`) }

// skippable in a TestReadErrors case says the error must be marked
// Skippable (Options.SkipBadGeometry would pass over the feature); every
// other error must not be.
const skippable = "\x00skippable"

func TestReadErrors(t *testing.T) {
	tests := []struct {
		name string
		doc  string
		opt  Options
		want []string
	}{
		{"not JSON", `hello`, Options{}, []string{"counties.geojson: ", "not valid JSON", "line 1, column 1", "'h'"}},
		{"not JSON inside a feature", "{\"type\":\"FeatureCollection\",\n\"features\":[\n" + feat(`1`, poly(square), `{"a":NaN}`) + "]}",
			Options{}, []string{"counties.geojson: feature 1: ", "not valid JSON at line 3", "NaN and Infinity"}},
		{"truncated", `{"type":"FeatureCollection","features":[{"type":"Feature"`, Options{}, []string{"counties.geojson: ", "cut short"}},
		{"empty input", ``, Options{}, []string{"counties.geojson: ", "empty"}},
		{"blank input", "  \n ", Options{}, []string{"counties.geojson: ", "empty"}},
		{"gzip", "\x1f\x8b\x08\x00rest", Options{}, []string{"counties.geojson: ", "gzip"}},
		// Other formats are called what they look like, not a JSON
		// syntax error about their first letter.
		{"CSV", "GEOID,rate\r\n01001,2.5\r\n", Options{}, []string{"counties.geojson: not GeoJSON: ", "CSV", `first line "GEOID,rate"`}},
		{"CSV starting with null-like word", "name,rate\nx,1\n", Options{}, []string{"counties.geojson: not GeoJSON: ", "CSV", `"name,rate"`}},
		{"CSV of quoted names", "\"id\";\"rate\"\n\"a\";1\n", Options{}, []string{"counties.geojson: not GeoJSON: ", "CSV", `"\"id\";\"rate\""`}},
		{"CSV of numbers", "1,2,3\n4,5,6\n", Options{}, []string{"counties.geojson: not GeoJSON: ", "CSV"}},
		{"tab-separated", "id\trate\n", Options{}, []string{"counties.geojson: not GeoJSON: ", "CSV"}},
		{"CSV with a long first line", strings.Repeat("column,", 40) + "\n", Options{}, []string{"counties.geojson: not GeoJSON: ", "CSV", `..."`}},
		{"KML", `<?xml version="1.0"?><kml/>`, Options{}, []string{"counties.geojson: not GeoJSON: ", "XML"}},
		{"zip", "PK\x03\x04rest", Options{}, []string{"counties.geojson: not GeoJSON: ", "ZIP"}},
		{"array at top", `[` + sq(`1`) + `]`, Options{}, []string{"counties.geojson: ", "JSON array, not a GeoJSON FeatureCollection"}},
		{"string at top", `"FeatureCollection"`, Options{}, []string{"counties.geojson: ", "JSON string"}},
		{"single feature", sq(`1`), Options{}, []string{"counties.geojson: ", "single GeoJSON Feature"}},
		{"bare geometry", poly(square), Options{}, []string{"counties.geojson: ", "bare Polygon geometry"}},
		{"topojson", `{"type":"Topology","objects":{},"arcs":[]}`, Options{}, []string{"counties.geojson: ", "TopoJSON"}},
		{"wrong type after features", `{"features":[` + sq(`1`) + `],"type":"Feature"}`, Options{}, []string{"counties.geojson: ", "single GeoJSON Feature"}},
		{"type in wrong case", `{"type":"featurecollection","features":[]}`, Options{}, []string{"counties.geojson: ", "case-sensitive"}},
		{"type not a string", `{"type":7,"features":[]}`, Options{}, []string{"counties.geojson: ", `"type" member is a JSON number`}},
		{"missing features", `{"type":"FeatureCollection","bbox":[0,0,1,1]}`, Options{}, []string{"counties.geojson: ", `no "features" member`}},
		{"missing type", `{"features":[` + sq(`1`) + `]}`, Options{}, []string{"counties.geojson: ", `no "type" member`}},
		{"features null", `{"type":"FeatureCollection","features":null}`, Options{}, []string{"counties.geojson: ", `"features" is JSON null`}},
		{"features object", `{"type":"FeatureCollection","features":{}}`, Options{}, []string{"counties.geojson: ", `"features" is a JSON object`}},
		{"two features members", `{"type":"FeatureCollection","features":[` + sq(`1`) + `],"features":[]}`, Options{}, []string{"counties.geojson: ", `two "features"`}},
		{"trailing data", fc(sq(`1`)) + ` {}`, Options{}, []string{"counties.geojson: ", "more data after the top-level object"}},
		{"feature is a number", fc(sq(`1`), `5`), Options{}, []string{"counties.geojson: feature 2: ", "JSON number, not a Feature object"}},
		{"feature is null", fc(`null`), Options{}, []string{"counties.geojson: feature 1: ", "is JSON null, not a Feature"}},
		{"feature of another type", fc(`{"type":"Thing","id":"q","geometry":null}`), Options{}, []string{`counties.geojson: feature 1 (id "q"): `, `has type "Thing"`}},
		{"feature type in another case", fc(`{"Type":"Feature","id":"q","geometry":null}`), Options{}, []string{`counties.geojson: feature 1 (id "q"): `, `no "type" member`}},
		{"geometry type not a string", fc(feat(`"a"`, `{"type":["Polygon"],"coordinates":[]}`, `{}`)), Options{SkipBadGeometry: true}, []string{`feature 1 (id "a")`, `the geometry's "type" is a JSON array`}},
		{"feature without type", fc(`{"id":"q","geometry":null}`), Options{}, []string{`counties.geojson: feature 1 (id "q"): `, `no "type" member`}},
		{"geometry in place of a feature", fc(sq(`1`), poly(square)), Options{}, []string{"counties.geojson: feature 2: ", "bare Polygon geometry, not a Feature"}},
		{"feature type not a string", fc(`{"type":1}`), Options{}, []string{"counties.geojson: feature 1: ", `member "type" is a JSON number`}},
		{"geometry not an object", fc(feat(`"a"`, `"x"`, `{}`)), Options{}, []string{`counties.geojson: feature 1 (id "a"): `, `"geometry" is a JSON string`}},
		{"null geometry", fc(sq(`"a"`), feat(`"b"`, `null`, `{}`)), Options{}, []string{`counties.geojson: feature 2 (id "b"): `, "no geometry", skippable}},
		{"missing geometry", fc(`{"type":"Feature","id":"b","properties":{}}`), Options{}, []string{`counties.geojson: feature 1 (id "b"): `, "no geometry", skippable}},
		{"point", fc(feat(`"48201"`, `{"type":"Point","coordinates":[1,2]}`, `{}`)), Options{},
			[]string{`counties.geojson: feature 1 (id "48201"): geometry is a Point; areas must be Polygon or MultiPolygon`, skippable}},
		{"multipoint", fc(feat(`"a"`, `{"type":"MultiPoint","coordinates":[[1,2]]}`, `{}`)), Options{}, []string{`feature 1 (id "a")`, "geometry is a MultiPoint", skippable}},
		{"linestring", fc(feat(`"a"`, `{"type":"LineString","coordinates":[[1,2],[3,4]]}`, `{}`)), Options{}, []string{`feature 1 (id "a")`, "geometry is a LineString", skippable}},
		{"multilinestring", fc(feat(`"a"`, `{"type":"MultiLineString","coordinates":[[[1,2],[3,4]]]}`, `{}`)), Options{}, []string{`feature 1 (id "a")`, "geometry is a MultiLineString", skippable}},
		{"geometrycollection", fc(feat(`"a"`, `{"type":"GeometryCollection","geometries":[`+poly(square)+`]}`, `{}`)), Options{}, []string{`feature 1 (id "a")`, "geometry is a GeometryCollection", skippable}},
		{"unknown geometry type", fc(feat(`"a"`, `{"type":"polygon","coordinates":`+square+`}`, `{}`)), Options{}, []string{`feature 1 (id "a")`, `"polygon"`, "case-sensitive", skippable}},
		{"geometry without type", fc(feat(`"a"`, `{"coordinates":`+square+`}`, `{}`)), Options{}, []string{`feature 1 (id "a")`, `geometry has no "type"`, skippable}},
		{"polygon without coordinates", fc(feat(`"a"`, `{"type":"Polygon"}`, `{}`)), Options{}, []string{`feature 1 (id "a")`, "no coordinates", skippable}},
		{"empty polygon", fc(feat(`"a"`, poly(`[]`), `{}`)), Options{}, []string{`feature 1 (id "a")`, "Polygon geometry is empty", skippable}},
		{"geographic crs with projected coordinates", `{"crs":{"type":"name","properties":{"name":"EPSG:4326"}},"type":"FeatureCollection","features":[` + sq(`"a"`) + `,` + feat(`"b"`, poly(`[[[512345.25,4200000],[512400,4200000],[512400,4200100],[512345.25,4200000]]]`), `{}`) + `]}`,
			Options{}, []string{`counties.geojson: feature 2 (id "b"): coordinate [512345.25, 4200000] is not a longitude/latitude pair`, `"EPSG:4326", a geographic system`, "contradicts itself"}},
		{"CRS84 after the features, latitude first", `{"type":"FeatureCollection","features":[` + feat(`"a"`, poly(`[[[45.5,120],[45.5,121],[46,121],[45.5,120]]]`), `{}`) + `],"crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:OGC:1.3:CRS84"}}}`,
			Options{SkipBadGeometry: true}, []string{`feature 1 (id "a"): coordinate [45.5, 120]`, "contradicts itself", "[latitude, longitude]"}},
		{"infinite coordinate", fc(feat(`"a"`, poly(`[[[1e999,0],[1,0],[1,1],[0,0]]]`), `{}`)), Options{}, []string{`feature 1 (id "a")`, "1e999", "not a finite number"}},
		{"short ring", fc(feat(`"a"`, poly(`[[[0,0],[1,0],[0,0]]]`), `{}`)), Options{}, []string{`counties.geojson: feature 1 (id "a"): `, "ring 1 has 3 positions", "at least 4"}},
		{"short ring after closing", fc(feat(`"a"`, poly(`[[[0,0],[1,0]]]`), `{}`)), Options{}, []string{`feature 1 (id "a")`, "ring 1 has 3 positions"}},
		{"short hole", fc(feat(`"a"`, poly(`[[[0,0],[4,0],[4,4],[0,0]],[]]`), `{}`)), Options{}, []string{`feature 1 (id "a")`, "ring 2 has 0 positions"}},
		{"short ring in a part", fc(feat(`"a"`, `{"type":"MultiPolygon","coordinates":[`+square+`,[[[0,0],[1,1],[0,0]]]]}`, `{}`)), Options{}, []string{`feature 1 (id "a")`, "ring 1 of part 2 has 3 positions"}},
		{"polygon nested like a multipolygon", fc(feat(`"a"`, poly(`[`+square+`]`), `{}`)), Options{}, []string{`feature 1 (id "a")`, "not nested as a Polygon needs", "look like a MultiPolygon's"}},
		{"multipolygon nested like a polygon", fc(feat(`"a"`, `{"type":"MultiPolygon","coordinates":`+square+`}`, `{}`)), Options{}, []string{`feature 1 (id "a")`, "not nested as a MultiPolygon needs", "look like a Polygon's"}},
		{"position with one number", fc(feat(`"a"`, poly(`[[[0,0],[1],[1,1],[0,0]]]`), `{}`)), Options{}, []string{`feature 1 (id "a")`, "1 number(s)"}},
		{"position with a string", fc(feat(`"a"`, poly(`[[[0,0],["1",0],[1,1],[0,0]]]`), `{}`)), Options{}, []string{`feature 1 (id "a")`, "a JSON string where a number belongs"}},
		{"duplicate ids", fc(sq(`"a"`), sq(`"b"`), sq(`"a"`)), Options{}, []string{`counties.geojson: feature 3 (id "a"): `, "same id as feature 1", "unique"}},
		{"duplicate numeric ids", fc(sq(`7`), sq(`7.0`)), Options{}, []string{`counties.geojson: feature 2 (id "7"): `, "same id as feature 1"}},
		{"some ids missing", fc(sq(`"a"`), sq(``), sq(`"c"`)), Options{}, []string{"counties.geojson: feature 2: ", `has no "id"`, `feature 1 has one (id "a")`}},
		{"first id missing", fc(sq(``), sq(``), sq(`"c"`)), Options{}, []string{"counties.geojson: feature 1: ", `has no "id"`, `feature 3 has one (id "c")`}},
		{"null id counts as missing", fc(sq(`"a"`), sq(`null`)), Options{}, []string{"counties.geojson: feature 2: ", `has no "id"`}},
		{"empty string id", fc(sq(`""`)), Options{}, []string{"counties.geojson: feature 1: ", `"id" is an empty string`}},
		{"boolean id", fc(sq(`true`)), Options{}, []string{"counties.geojson: feature 1: ", `"id" is a JSON boolean`}},
		{"id column missing", fc(feat(`"a"`, poly(square), `{"name":"x","pop":3}`)), Options{IDColumn: "GEOID"},
			[]string{`counties.geojson: feature 1 (id "a"): `, `no property "GEOID"`, `its properties: "name", "pop"`}},
		{"id column in another case", fc(feat(``, poly(square), `{"geoid":"x"}`)), Options{IDColumn: "GEOID"}, []string{"counties.geojson: feature 1: ", `no property "GEOID"`, `"geoid"`}},
		{"id column null", fc(feat(``, poly(square), `{"GEOID":"1"}`), feat(``, poly(square), `{"GEOID":null}`)), Options{IDColumn: "GEOID"},
			[]string{"counties.geojson: feature 2: ", `property "GEOID" (the id column) is null`}},
		{"id column empty", fc(feat(``, poly(square), `{"GEOID":" "}`)), Options{IDColumn: "GEOID"}, []string{"counties.geojson: feature 1: ", `"GEOID" (the id column) is an empty string`}},
		{"id column fraction", fc(feat(``, poly(square), `{"GEOID":3.5}`)), Options{IDColumn: "GEOID"}, []string{"counties.geojson: feature 1: ", `"GEOID" (the id column) is 3.5, not a whole number`}},
		{"id column object", fc(feat(``, poly(square), `{"GEOID":{}}`)), Options{IDColumn: "GEOID"}, []string{"counties.geojson: feature 1: ", `"GEOID" (the id column) is a JSON object`}},
		{"id column duplicate", fc(feat(``, poly(square), `{"GEOID":"01001"}`), feat(``, poly(square), `{"GEOID":"01001"}`)), Options{IDColumn: "GEOID"},
			[]string{`counties.geojson: feature 2 (id "01001"): `, `same "GEOID" value as feature 1`}},
		{"properties not an object", fc(feat(`"a"`, poly(square), `[1,2]`)), Options{}, []string{`counties.geojson: feature 1 (id "a"): `, `"properties" is a JSON array`}},
		{"no features", fc(), Options{}, []string{"counties.geojson: ", "has no features"}},
		{"nothing left after skipping", fc(feat(`"a"`, `null`, `{}`), feat(`"b"`, `{"type":"Point","coordinates":[0,0]}`, `{}`)), Options{SkipBadGeometry: true},
			[]string{"counties.geojson: ", "all 2 features were left out"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			lay, _, err := Read(strings.NewReader(tc.doc), "counties.geojson", tc.opt)
			if err == nil {
				t.Fatalf("no error; layer has %d areas", lay.Len())
			}
			if lay != nil {
				t.Errorf("layer returned along with error %v", err)
			}
			msg := err.Error()
			if strings.ContainsAny(msg, "\n\r") {
				t.Errorf("error is not one line: %q", msg)
			}
			var ge *Error
			if !errors.As(err, &ge) {
				t.Fatalf("error %T is not an *Error", err)
			}
			if strings.Contains(msg, "--") {
				t.Errorf("error %q names a command-line flag", msg)
			}
			if want := slices.Contains(tc.want, skippable); ge.Skippable != want {
				t.Errorf("error %q: Skippable %v, want %v", msg, ge.Skippable, want)
			}
			if at := fmt.Sprintf("JSON at line %d, column %d", ge.Line, ge.Column); (ge.Line > 0) != strings.Contains(msg, "JSON at line") || ge.Line > 0 && !strings.Contains(msg, at) {
				t.Errorf("error %q: Line %d, Column %d", msg, ge.Line, ge.Column)
			}
			for _, w := range tc.want {
				if w != skippable && !strings.Contains(msg, w) {
					t.Errorf("error %q lacks %q", msg, w)
				}
			}
		})
	}
}

func mustRead(t *testing.T, doc string, opt Options) (*layer.Layer, []string) {
	t.Helper()
	lay, warns, err := Read(strings.NewReader(doc), "t.geojson", opt)
	if err != nil {
		t.Fatalf("Read: %v", err)
	}
	checkShape(t, lay)
	return lay, warns
}

// checkShape asserts what every layer must hold.
func checkShape(t testing.TB, lay *layer.Layer) {
	t.Helper()
	n := len(lay.IDs)
	if len(lay.Geoms) != n {
		t.Fatalf("%d ids but %d geometries", n, len(lay.Geoms))
	}
	seen := map[string]bool{}
	for _, id := range lay.IDs {
		if seen[id] {
			t.Fatalf("id %q twice", id)
		}
		seen[id] = true
	}
	for _, g := range lay.Geoms {
		if len(g) == 0 {
			t.Fatalf("empty geometry")
		}
		for _, p := range g {
			for _, r := range p {
				if len(r) < 4 || r[0] != r[len(r)-1] {
					t.Fatalf("ring %v is short or open", r)
				}
			}
		}
	}
	for _, c := range lay.Columns {
		if len(c.Missing) != n {
			t.Fatalf("column %q has %d rows, want %d", c.Name, len(c.Missing), n)
		}
		switch c.Kind {
		case layer.Number:
			if len(c.Num) != n || c.Str != nil || c.NotNumber != nil {
				t.Fatalf("number column %q: %d numbers, %d strings, %d marks", c.Name, len(c.Num), len(c.Str), len(c.NotNumber))
			}
		case layer.Text:
			if len(c.Str) != n || c.Num != nil || len(c.NotNumber) != n {
				t.Fatalf("text column %q: %d strings, %d numbers, %d marks", c.Name, len(c.Str), len(c.Num), len(c.NotNumber))
			}
			for i, bad := range c.NotNumber {
				if bad && c.Missing[i] {
					t.Fatalf("text column %q: row %d is missing and marked not a number", c.Name, i)
				}
			}
		}
	}
}

func TestMemberOrder(t *testing.T) {
	f := `{"properties":{"v":1},"geometry":` + poly(square) + `,"bbox":[0,0,1,1],"id":"a","type":"Feature"}`
	docs := map[string]string{
		"usual":           fc(f),
		"type last":       `{"features":[` + f + `],"type":"FeatureCollection"}`,
		"foreign first":   `{"name":"counties","bbox":[0,0,1,1],"crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:OGC:1.3:CRS84"}},"features":[` + f + `],"extra":{"deep":[[{"x":"]"}]]},"type":"FeatureCollection"}`,
		"spaced":          "\n{ \"type\" : \"FeatureCollection\" ,\r\n\t\"features\" : [ " + f + " ] }\n",
		"byte-order mark": "\xef\xbb\xbf" + fc(f),
	}
	for name, doc := range docs {
		t.Run(name, func(t *testing.T) {
			lay, warns := mustRead(t, doc, Options{})
			if len(warns) != 0 {
				t.Errorf("warnings: %q", warns)
			}
			if fmt.Sprint(lay.IDs) != "[a]" || lay.IDColumn != "" || len(lay.Columns) != 1 || lay.Columns[0].Num[0] != 1 {
				t.Errorf("got ids %v, id column %q, columns %d", lay.IDs, lay.IDColumn, len(lay.Columns))
			}
		})
	}
}

func TestFeatureMemberNamesAreExact(t *testing.T) {
	f := `{"type":"Feature","ID":"upper","id":"a","Id":"mixed","Geometry":null,"geometry":` + poly(square) + `,"Properties":{"x":1},"properties":{"y":2}}`
	lay, _ := mustRead(t, fc(f), Options{})
	if lay.IDs[0] != "a" || len(lay.Columns) != 1 || lay.Columns[0].Name != "y" {
		t.Errorf("got ids %v, columns %+v", lay.IDs, lay.Columns)
	}
}

func TestColumns(t *testing.T) {
	doc := fc(
		feat(`1`, poly(square), `{"rate":"1.5","code":"01001","mixed":1,"name":"Harris","flag":true,"gap":null,"obj":{"a": [1, 2]},"word":"NA","big":12345678901234567890,"bigtext":12345678901234567890}`),
		feat(`2`, poly(square), `{"rate":" 2 ","code":"01003","mixed":"x","name":"", "flag":false,"word":" n/a ","extra":2.50,"big":1,"bigtext":"x"}`),
		feat(`3`, poly(square), `{"rate":3e2,"code":null,"mixed":2.50,"name":"Dallas","word":"NaN","gap":"null","big":"7","bigtext":1E21}`),
		feat(`4`, poly(square), `{"rate":"N/A","mixed":48201,"name":"\u00c9lan","word":"Null"}`),
	)
	lay, _ := mustRead(t, doc, Options{})
	want := []struct {
		name    string
		kind    layer.Kind
		labels  string
		missing string
	}{
		{"rate", layer.Number, "[1.5 2 300 ]", "[false false false true]"},
		{"code", layer.Text, "[01001 01003  ]", "[false false true true]"},
		{"mixed", layer.Text, "[1 x 2.5 48201]", "[false false false false]"},
		{"name", layer.Text, "[Harris  Dallas Élan]", "[false true false false]"},
		{"flag", layer.Text, "[true false  ]", "[false false true true]"},
		{"gap", layer.Number, "[   ]", "[true true true true]"},
		{"obj", layer.Text, `[{"a":[1,2]}   ]`, "[false true true true]"},
		{"word", layer.Number, "[   ]", "[true true true true]"},
		{"big", layer.Number, "[12345678901234567000 1 7 ]", "[false false false true]"},
		{"bigtext", layer.Text, "[12345678901234567890 x 1e+21 ]", "[false false false true]"},
		{"extra", layer.Number, "[ 2.5  ]", "[true false true true]"},
	}
	if len(lay.Columns) != len(want) {
		t.Fatalf("%d columns, want %d", len(lay.Columns), len(want))
	}
	for i, w := range want {
		c := lay.Columns[i]
		var labels []string
		for r := range lay.IDs {
			labels = append(labels, c.Label(r))
		}
		if c.Name != w.name || c.Kind != w.kind || fmt.Sprint(labels) != w.labels || fmt.Sprint(c.Missing) != w.missing {
			t.Errorf("column %d: got %s %v %v %v, want %s %v %s %s", i, c.Name, c.Kind, labels, c.Missing, w.name, w.kind, w.labels, w.missing)
		}
	}
	if c, _ := lay.Column("rate"); !math.IsNaN(c.Num[3]) {
		t.Errorf("missing number stored as %v, want NaN", c.Num[3])
	}
}

func TestNumericStringsKeepTheirTextInMixedColumns(t *testing.T) {
	doc := fc(
		feat(`1`, poly(square), `{"v":"1.50"}`),
		feat(`2`, poly(square), `{"v":1.50}`),
		feat(`3`, poly(square), `{"v":"1e3"}`),
		feat(`4`, poly(square), `{"v":"many"}`),
	)
	lay, _ := mustRead(t, doc, Options{})
	if got := fmt.Sprint(lay.Columns[0].Str); got != "[1.50 1.5 1e3 many]" {
		t.Errorf("got %s", got)
	}
}

func TestRepeatedKeyLastWins(t *testing.T) {
	for _, c := range []struct {
		name, first string
		kind        layer.Kind
		want        string
	}{
		{"text last", `{"v":1,"v":"two"}`, layer.Text, "[two 3]"},
		// The earlier text value must not make the column text.
		{"number last", `{"v":"two","v":1}`, layer.Number, "[1 3]"},
		{"object then number", `{"v":{"a":1},"w":5,"v":"2.5"}`, layer.Number, "[2.5 3]"},
		{"missing last", `{"v":"x","v":null}`, layer.Number, "[ 3]"},
	} {
		t.Run(c.name, func(t *testing.T) {
			lay, _ := mustRead(t, fc(feat(`1`, poly(square), c.first), feat(`2`, poly(square), `{"v":3}`)), Options{})
			col, err := lay.Column("v")
			if err != nil || col.Kind != c.kind || fmt.Sprint(col.Labels()) != c.want {
				t.Errorf("got %+v, want %v %s", col, c.kind, c.want)
			}
		})
	}
}

// TestNotNumberMarks: a text column marks the values that are not numbers,
// whether they came before or after the column turned to text (hand count
// over the features below).
func TestNotNumberMarks(t *testing.T) {
	doc := fc(
		feat(`1`, poly(square), `{"v":1.5,"c":"01001"}`),
		feat(`2`, poly(square), `{"v":"12,5","c":"10001"}`),
		feat(`3`, poly(square), `{"v":" 7 ","c":null}`),
		feat(`4`, poly(square), `{"v":{"k":1},"c":true}`),
		feat(`5`, poly(square), `{"v":null,"c":1e999}`),
		feat(`6`, poly(square), `{"v":"3e2","c":"n/a"}`),
	)
	lay, _ := mustRead(t, doc, Options{})
	for _, w := range []struct {
		name, notNumber string
		mostly          bool
	}{
		{"v", "[false true false true false false]", true},
		{"c", "[true false false true true false]", false},
	} {
		c, _ := lay.Column(w.name)
		if c.Kind != layer.Text || fmt.Sprint(c.NotNumber) != w.notNumber || c.MostlyNumbers() != w.mostly {
			t.Errorf("%s: kind %v, NotNumber %v, mostly %v; want %s, %v", w.name, c.Kind, c.NotNumber, c.MostlyNumbers(), w.notNumber, w.mostly)
		}
	}
}

func TestPropertyNamesAreCaseSensitive(t *testing.T) {
	lay, _ := mustRead(t, fc(feat(`1`, poly(square), `{"Pop":1,"pop":2,"p\u006fp":3}`)), Options{})
	if len(lay.Columns) != 2 || lay.Columns[0].Name != "Pop" || lay.Columns[1].Name != "pop" || lay.Columns[1].Num[0] != 3 {
		t.Errorf("got %+v %+v", *lay.Columns[0], *lay.Columns[len(lay.Columns)-1])
	}
}

func TestIDs(t *testing.T) {
	tests := []struct {
		name  string
		doc   string
		opt   Options
		ids   string
		idCol string
		warn  string
	}{
		{"strings", fc(sq(`"a"`), sq(`"b\"c"`)), Options{}, `[a b"c]`, "", ""},
		{"numbers in shortest form", fc(sq(`48201`), sq(`4.8201e+04`), sq(`1.5`), sq(`12345678901234567890`), sq(`-0`), sq(`1e21`)), Options{}, "[48201 48202 1.5 12345678901234567890 0 1e+21]", "", ""},
		{"positions", fc(sq(``), sq(`null`), sq(``)), Options{}, "[1 2 3]", "#", `no feature has an "id"`},
		{"from a property", fc(feat(`"x"`, poly(square), `{"GEOID":"48201"}`), feat(`"y"`, poly(square), `{"GEOID":48113.0}`), feat(``, poly(square), `{"GEOID":1e3}`)),
			Options{IDColumn: "GEOID"}, "[48201 48113 1000]", "GEOID", ""},
	}
	tests[1].doc = strings.Replace(tests[1].doc, `4.8201e+04`, `4.8202e+04`, 1)
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			lay, warns := mustRead(t, tc.doc, tc.opt)
			if got := fmt.Sprint(lay.IDs); got != tc.ids {
				t.Errorf("ids %s, want %s", got, tc.ids)
			}
			if lay.IDColumn != tc.idCol {
				t.Errorf("id column %q, want %q", lay.IDColumn, tc.idCol)
			}
			if tc.warn == "" && len(warns) > 0 || tc.warn != "" && (len(warns) != 1 || !strings.Contains(warns[0], tc.warn) || !strings.HasPrefix(warns[0], "t.geojson: ")) {
				t.Errorf("warnings %q, want one with %q", warns, tc.warn)
			}
		})
	}
}

func TestIDColumnIsKeptAsColumn(t *testing.T) {
	lay, _ := mustRead(t, fc(feat(``, poly(square), `{"name":"a","GEOID":"01001"}`)), Options{IDColumn: "GEOID"})
	c, err := lay.Column("GEOID")
	if err != nil || c.Label(0) != "01001" || c.Kind != layer.Text {
		t.Errorf("GEOID column: %v %+v", err, c)
	}
}

func TestGeometry(t *testing.T) {
	hole := `[[[0,0],[10,0],[10,10],[0,10],[0,0]],[[2,2],[2,4],[4,4],[4,2],[2,2]]]`
	doc := fc(
		feat(`"hole"`, poly(hole), `{}`),
		feat(`"two"`, `{"type":"MultiPolygon","coordinates":[`+square+`,`+hole+`]}`, `{}`),
		feat(`"z"`, poly(`[[[0,0,5],[1,0,5],[1,1,5],[0,0,5]]]`), `{}`),
		feat(`"emptypart"`, `{"type":"MultiPolygon","coordinates":[[],`+square+`]}`, `{}`),
		feat(`"edge"`, poly(`[[[-180,-90],[180,-90],[180,90],[-180,-90]]]`), `{}`),
	)
	lay, warns := mustRead(t, doc, Options{})
	if len(warns) != 0 {
		t.Errorf("warnings %q", warns)
	}
	g := lay.Geoms
	if len(g[0]) != 1 || len(g[0][0]) != 2 || len(g[0][0][1]) != 5 || g[0][0][1][1] != (orb.Point{2, 4}) {
		t.Errorf("polygon with a hole: %v", g[0])
	}
	if len(g[1]) != 2 || len(g[1][0]) != 1 || len(g[1][1]) != 2 {
		t.Errorf("multipolygon: %v", g[1])
	}
	if g[2][0][0][2] != (orb.Point{1, 1}) {
		t.Errorf("altitude: %v", g[2])
	}
	if len(g[3]) != 1 {
		t.Errorf("empty part not dropped: %v", g[3])
	}
	// A later stage appending to a ring must not write into its neighbour.
	r := g[0][0][0]
	_ = append(r, orb.Point{99, 99})
	if g[0][0][1][0] != (orb.Point{2, 2}) {
		t.Errorf("rings share capacity")
	}
}

func TestUnclosedRingsAreClosedWithOneWarning(t *testing.T) {
	open := poly(`[[[0,0],[1,0],[1,1],[0,1]]]`)
	lay, warns := mustRead(t, fc(feat(`"a"`, poly(square), `{}`), feat(`"b"`, open, `{}`), feat(`"c"`, open, `{}`)), Options{})
	if len(lay.Geoms[1][0][0]) != 5 {
		t.Errorf("ring not closed: %v", lay.Geoms[1])
	}
	if len(warns) != 1 || !strings.Contains(warns[0], `2 feature(s)`) || !strings.Contains(warns[0], `feature 2 (id "b")`) {
		t.Errorf("warnings %q", warns)
	}
}

func TestSkipBadGeometry(t *testing.T) {
	var fs []string
	for i := 1; i <= 9; i++ {
		switch i {
		case 2:
			fs = append(fs, feat(`"p2"`, `{"type":"Point","coordinates":[0,0]}`, `{"v":"only here"}`))
		case 4, 5, 6, 7, 8:
			fs = append(fs, feat(fmt.Sprintf(`"p%d"`, i), `null`, `{}`))
		default:
			fs = append(fs, feat(fmt.Sprintf(`"p%d"`, i), poly(square), fmt.Sprintf(`{"v":%d}`, i)))
		}
	}
	lay, warns := mustRead(t, fc(fs...), Options{SkipBadGeometry: true})
	if got := fmt.Sprint(lay.IDs); got != "[p1 p3 p9]" {
		t.Errorf("ids %s", got)
	}
	if c := lay.Columns[0]; c.Kind != layer.Number || fmt.Sprint(c.Num) != "[1 3 9]" {
		t.Errorf("a skipped feature's properties leaked in: %+v", *c)
	}
	want := []string{
		`t.geojson: feature 2 (id "p2"): left out: geometry is a Point`,
		`t.geojson: feature 4 (id "p4"): left out: has no geometry`,
		`feature 5 (id "p5")`, `feature 6 (id "p6")`, `feature 7 (id "p7")`,
		`t.geojson: 1 more features left out for lacking polygon geometry (6 in all)`,
	}
	if len(warns) != len(want) {
		t.Fatalf("warnings %q", warns)
	}
	for i, w := range want {
		if !strings.Contains(warns[i], w) {
			t.Errorf("warning %q lacks %q", warns[i], w)
		}
	}
	// A skipped feature's missing id does not count against the others.
	lay, _ = mustRead(t, fc(sq(`"a"`), feat(``, `null`, `{}`)), Options{SkipBadGeometry: true})
	if lay.Len() != 1 {
		t.Errorf("got %d areas", lay.Len())
	}
}

func TestCRSMember(t *testing.T) {
	for _, name := range []string{"urn:ogc:def:crs:OGC:1.3:CRS84", "EPSG:4326", "urn:ogc:def:crs:EPSG::4326", "http://www.opengis.net/def/crs/EPSG/0/4326"} {
		doc := `{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"` + name + `"}},"features":[` + sq(`1`) + `]}`
		if _, warns := mustRead(t, doc, Options{}); len(warns) != 0 {
			t.Errorf("%s: warnings %q", name, warns)
		}
	}
	doc := `{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::4269"}},"features":[` + sq(`1`) + `]}`
	if _, warns := mustRead(t, doc, Options{}); len(warns) != 1 || !strings.Contains(warns[0], `"urn:ogc:def:crs:EPSG::4269"`) {
		t.Errorf("warnings %q", warns)
	}
	doc = `{"type":"FeatureCollection","crs":null,"features":[` + sq(`1`) + `]}`
	if _, warns := mustRead(t, doc, Options{}); len(warns) != 0 {
		t.Errorf("null crs: warnings %q", warns)
	}
}

// onlyReader hides the Seek method of a reader, as a pipe would.
type onlyReader struct{ r io.Reader }

func (o onlyReader) Read(p []byte) (int, error) { return o.r.Read(p) }

func TestSyntaxErrorPosition(t *testing.T) {
	doc := "{\"type\": \"FeatureCollection\",\n \"features\": [\n  " + sq(`1`) + ",\n  " + sq(`2`) + ",\n  {\"type\": \"Feature\", \"id\": 3 \"geometry\": null}\n]}\n"
	offset := strings.Index(doc, `"geometry": null}`)
	tests := []struct {
		name string
		r    io.Reader
		want string
	}{
		{"seekable", strings.NewReader(doc), "feature 3: not valid JSON at line 5, column 31: invalid character '\"' after object key:value pair"},
		{"pipe", onlyReader{strings.NewReader(doc)}, fmt.Sprintf("feature 3: not valid JSON at byte offset %d:", offset)},
		{"seekable with a byte-order mark", strings.NewReader("\xef\xbb\xbf" + doc), "line 5, column 31"},
		{"pipe with a byte-order mark", onlyReader{strings.NewReader("\xef\xbb\xbf" + doc)}, fmt.Sprintf("byte offset %d:", offset+3)},
	}
	for _, tc := range tests {
		_, _, err := Read(tc.r, "t.geojson", Options{})
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want %q", tc.name, err, tc.want)
		}
	}
	// A syntax error at the top level, in a key.
	_, _, err := Read(strings.NewReader("{\"type\":\"FeatureCollection\",\n  \"fea\x01tures\":[]}"), "t.geojson", Options{})
	if err == nil || !strings.Contains(err.Error(), "line 2, column 7") {
		t.Errorf("got %v", err)
	}
	_, _, err = Read(strings.NewReader("{\"type\":\"FeatureCollection\",\n \"features\" []}"), "t.geojson", Options{})
	if err == nil || !strings.Contains(err.Error(), "line 2, column 13") {
		t.Errorf("got %v", err)
	}
}

func TestReadFile(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "areas.geojson")
	if err := os.WriteFile(path, []byte(fc(sq(`"a"`), sq(`"b"`))), 0o644); err != nil {
		t.Fatal(err)
	}
	lay, _, err := ReadFile(path, Options{})
	if err != nil || lay.Source != path || lay.Len() != 2 {
		t.Fatalf("ReadFile: %v %+v", err, lay)
	}

	bad := filepath.Join(dir, "bad.geojson")
	if err := os.WriteFile(bad, []byte(fc(sq(`"a"`), sq(`"a"`))), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, _, err := ReadFile(bad, Options{}); err == nil || !strings.HasPrefix(err.Error(), bad+": feature 2") {
		t.Errorf("got %v", err)
	}
	missing := filepath.Join(dir, "none.geojson")
	if _, _, err := ReadFile(missing, Options{}); err == nil || !strings.HasPrefix(err.Error(), missing+": cannot be opened") || !errors.Is(err, os.ErrNotExist) {
		t.Errorf("got %v", err)
	}
	if _, _, err := ReadFile(dir, Options{}); err == nil || !strings.HasPrefix(err.Error(), dir+": ") {
		t.Errorf("directory: got %v", err)
	}

	// "-" reads standard input and names it "stdin".
	stdin := os.Stdin
	defer func() { os.Stdin = stdin }()
	for _, doc := range []string{fc(sq(`"a"`)), fc(sq(`"a"`), sq(`"a"`))} {
		r, w, err := os.Pipe()
		if err != nil {
			t.Fatal(err)
		}
		go func() {
			w.Write([]byte(doc))
			w.Close()
		}()
		os.Stdin = r
		lay, _, err = ReadFile("-", Options{})
		r.Close()
		if err == nil && (lay.Source != "-" || lay.Len() != 1) {
			t.Errorf("stdin: %+v", lay)
		}
		if err != nil && !strings.HasPrefix(err.Error(), "stdin: feature 2") {
			t.Errorf("stdin: got %v", err)
		}
	}
}

func TestHelpers(t *testing.T) {
	if _, err := scanObject([]byte(`{"a":`), nil); err == nil {
		t.Errorf("scanObject accepted a cut object")
	}
	cells, err := scanObject([]byte(` { "a\"b" : [1, "]", {"c": "}"}] , "d":"x\\" } `), nil)
	if err != nil || len(cells) != 2 || string(cells[0].key) != `a"b` || string(cells[0].raw) != `[1, "]", {"c": "}"}]` || string(cells[1].raw) != `"x\\"` {
		t.Errorf("scanObject: %v %q", err, cells)
	}
}
