package geojson

import (
	"bytes"
	"os"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/tests/testkit"
)

func TestCoordinateSystems(t *testing.T) {
	utm := feat(`"b"`, poly(`[[[512345.25,4200000],[512400,4200000],[512400,4200100],[512345.25,4200000]]]`), `{}`)
	member := func(name string) string { return `"crs":{"type":"name","properties":{"name":"` + name + `"}}` }
	metre := func(code int, name string) layer.CRS {
		return layer.CRS{Projected: true, Unit: "metre", MetresPerUnit: 1, EPSG: code, Name: name}
	}
	tests := []struct {
		name  string
		doc   string
		opt   Options
		crs   layer.CRS
		warns []string // substrings of the one warning; none when nil
	}{
		{"lon/lat", fc(sq(`"a"`), sq(`"b"`)), Options{}, layer.CRS{}, nil},
		{"no member, out of range", fc(sq(`"a"`), utm), Options{}, layer.CRS{Projected: true},
			[]string{"t.geojson: has no coordinate system definition and its coordinates are not longitude/latitude (first: [512345.25, 4200000] in feature 2 (id \"b\"))", "planar coordinates in unknown units", "distances will be in those units"}},
		{"no member, out of range, skipping", fc(feat(`"a"`, poly(`[[[1000,0],[1,0],[1,1],[1000,0]]]`), `{}`)), Options{SkipBadGeometry: true}, layer.CRS{Projected: true},
			[]string{"[1000, 0] in feature 1", "unknown units"}},
		{"no member, latitude first", fc(feat(`"a"`, poly(`[[[45.5,120],[45.5,121],[46,121],[45.5,120]]]`), `{}`)), Options{}, layer.CRS{Projected: true},
			[]string{"(first: [45.5, 120] in feature 1", "[latitude, longitude] and must be swapped"}},
		{"projected member after the features", `{"type":"FeatureCollection","features":[` + utm + `,` + sq(`"c"`) + `],` + member("urn:ogc:def:crs:EPSG::32615") + `}`, Options{},
			metre(32615, "urn:ogc:def:crs:EPSG::32615"), []string{`t.geojson: the legacy "crs" member names "urn:ogc:def:crs:EPSG::32615", a projected system (EPSG:32615, unit metre)`}},
		{"projected member by code, first", `{"crs":{"type":"EPSG","properties":{"code":3857}},"type":"FeatureCollection","features":[` + feat(`"a"`, poly(`[[[-8e6,4e6],[-8e6,5e6],[-7e6,5e6],[-8e6,4e6]]]`), `{}`) + `]}`, Options{},
			metre(3857, "EPSG:3857"), []string{`"EPSG:3857", a projected system`}},
		{"projected member, small coordinates", `{"type":"FeatureCollection",` + member("EPSG:2263") + `,"features":[` + sq(`1`) + `]}`, Options{},
			layer.CRS{Projected: true, Unit: "US survey foot", MetresPerUnit: 1200.0 / 3937, EPSG: 2263, Name: "EPSG:2263"}, []string{"unit US survey foot"}},
		{"unknown member, out of range", `{"type":"FeatureCollection",` + member("EPSG:99999") + `,"features":[` + utm + `]}`, Options{}, layer.CRS{Projected: true, Name: "EPSG:99999"},
			[]string{`t.geojson: has a legacy "crs" member naming "EPSG:99999", a system not known here, and its coordinates are not longitude/latitude (first: [512345.25, 4200000]`, "unknown units"}},
		{"unknown member, lon/lat", `{"type":"FeatureCollection",` + member("local grid") + `,"features":[` + sq(`1`) + `]}`, Options{}, layer.CRS{},
			[]string{`"local grid"; the coordinates were read as lon/lat WGS84`}},
		{"NAD83 member, lon/lat", `{"type":"FeatureCollection",` + member("EPSG:4269") + `,"features":[` + sq(`1`) + `]}`, Options{}, layer.CRS{},
			[]string{`"EPSG:4269"; the coordinates were read as lon/lat WGS84`}},
	}
	for _, tc := range tests {
		lay, warns := mustRead(t, tc.doc, tc.opt)
		if lay.CRS != tc.crs {
			t.Errorf("%s: CRS %+v, want %+v", tc.name, lay.CRS, tc.crs)
		}
		if wantOne := tc.warns != nil; len(warns) != map[bool]int{true: 1}[wantOne] {
			t.Errorf("%s: warnings %q", tc.name, warns)
			continue
		}
		for _, w := range tc.warns {
			if !strings.Contains(warns[0], w) {
				t.Errorf("%s: warning %q lacks %q", tc.name, warns[0], w)
			}
		}
	}
}

// The states in NAD83 / Conus Albers, as GDAL writes them with the legacy
// "crs" member and without it: projected, with the ids, attributes and
// geometry shape of the lon/lat original.
func TestProjectedFixture(t *testing.T) {
	orig, _, err := ReadFile(testkit.Testdata(t, "us-states.geojson"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile(testkit.Testdata(t, "formats/states-5070.geojson"))
	if err != nil {
		t.Fatal(err)
	}
	bare := regexp.MustCompile(`"crs": \{[^\n]*\},\n`).ReplaceAll(data, nil)
	if bytes.Equal(bare, data) {
		t.Fatal("the fixture has no crs member to remove")
	}
	tests := []struct {
		name string
		data []byte
		crs  layer.CRS
		warn string
	}{
		{"with member", data, layer.CRS{Projected: true, Unit: "metre", MetresPerUnit: 1, EPSG: 5070, Name: "urn:ogc:def:crs:EPSG::5070"}, `names "urn:ogc:def:crs:EPSG::5070", a projected system (EPSG:5070, unit metre)`},
		{"member removed", bare, layer.CRS{Projected: true}, `has no coordinate system definition and its coordinates are not longitude/latitude (first: [736249.0, 825225.8] in feature 1 (id "01"))`},
	}
	for _, tc := range tests {
		lay, warns, err := Read(bytes.NewReader(tc.data), "states-5070.geojson", Options{})
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if lay.CRS != tc.crs || lay.CRS.DistanceUnit() != map[bool]string{true: "m", false: "layer units"}[tc.crs.Unit != ""] {
			t.Errorf("%s: CRS %+v", tc.name, lay.CRS)
		}
		if len(warns) != 1 || !strings.Contains(warns[0], tc.warn) {
			t.Errorf("%s: warnings %q", tc.name, warns)
		}
		if !reflect.DeepEqual(lay.IDs, orig.IDs) || !reflect.DeepEqual(lay.Columns, orig.Columns) || lay.IDColumn != orig.IDColumn {
			t.Errorf("%s: ids or columns differ from the lon/lat original", tc.name)
		}
		for i, mp := range lay.Geoms {
			o := orig.Geoms[i]
			same := len(mp) == len(o)
			for p := 0; same && p < len(mp); p++ {
				same = len(mp[p]) == len(o[p])
				for r := 0; same && r < len(mp[p]); r++ {
					same = len(mp[p][r]) == len(o[p][r])
				}
			}
			if !same {
				t.Errorf("%s: area %s: parts, rings or positions differ from the original", tc.name, lay.IDs[i])
			}
		}
		// Conus Albers puts the lower 48 within a few thousand km of its
		// origin (common knowledge of the projection).
		if p := lay.Geoms[0][0][0][0]; p[0] < 0 || p[0] > 2e6 || p[1] < 0 || p[1] > 2e6 {
			t.Errorf("%s: Alabama's first position %v", tc.name, p)
		}
	}
}
