package main

import (
	"fmt"
	"os"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/input"
)

// Distances take a unit: on the lon/lat sample region a band of 20 (km)
// is the band of 20km, 20000m and 12.4274238447mi (20 km in international
// miles, 1 mi = 1.609344 km by definition), and a lag width likewise; a
// snap given in metres is converted to degrees. Bad units are usage
// errors that list the units.
func TestDistanceUnits(t *testing.T) {
	sampleDir(t)
	base := []string{"weights", "-i", "region.geojson", "--format", "json"}
	ref := runIn("", append(base, "--band", "20")...)
	if ref.code != 0 || links(ref.stdout) == "" {
		t.Fatalf("--band 20: %s %s", ref.stderr, ref.stdout)
	}
	for _, band := range []string{"20km", "20000m", "20 KM", "12.427423844746679mi"} {
		r := runIn("", append(base, "--band", band)...)
		// The report names the band as the converted number, so the
		// graphs agree in their links; compare the neighbour counts.
		if r.code != 0 || links(r.stdout) != links(ref.stdout) {
			t.Errorf("--band %s: exit %d, %s; links %q vs %q", band, r.code, r.stderr, links(r.stdout), links(ref.stdout))
		}
	}
	lag := []string{"autocorr", "-i", "region.geojson", "--variables", "rate", "--lags", "2", "-n", "99", "--format", "json"}
	a, b := runIn("", append(lag, "--lag-width", "30")...), runIn("", append(lag, "--lag-width", "30000m")...)
	if a.code != 0 || a.stdout != b.stdout {
		t.Errorf("--lag-width 30 and 30000m differ: %s %s", a.stderr, b.stderr)
	}
	s1, s2 := runIn("", append(base, "--snap", "0.0001")...), runIn("", append(base, "--snap", "11.1195m")...)
	if s1.code != 0 || s2.code != 0 || links(s1.stdout) != links(s2.stdout) {
		t.Errorf("--snap 0.0001 (degrees) and 11.1195m: %s %s", s1.stderr, s2.stderr)
	}
	for _, bad := range []string{"20furlongs", "km", "12,5km"} {
		r := runIn("", append(base, "--band", bad)...)
		if r.code != 2 || !strings.Contains(r.stderr, "--band") {
			t.Errorf("--band %s: exit %d, %s", bad, r.code, r.stderr)
		}
	}
}

// links picks the number of links out of a weights JSON report.
func links(doc string) string {
	i := strings.Index(doc, `"links"`)
	if i < 0 {
		return ""
	}
	j := strings.IndexAny(doc[i:], ",\n}")
	return doc[i : i+j]
}

// A projected layer (here a GeoJSON with a legacy "crs" member naming
// EPSG:32633, UTM in metres): distances are planar in metres, units in a
// distance flag are converted with the metre, the JSON records the
// coordinate system, and a GeoJSON copy of the results is refused (GeoJSON
// is lon/lat by RFC 7946) without writing anything.
func TestProjectedLayer(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	var f []string
	for i := range 6 {
		for j := range 6 {
			x, y := 500000+float64(j)*10000, 4000000+float64(i)*10000
			f = append(f, fmt.Sprintf(`{"type":"Feature","id":"a%d","properties":{"v":%d},"geometry":{"type":"Polygon","coordinates":[[[%g,%g],[%g,%g],[%g,%g],[%g,%g],[%g,%g]]]}}`,
				6*i+j, (i*j)%5, x, y, x+10000, y, x+10000, y+10000, x, y+10000, x, y))
		}
	}
	doc := `{"type":"FeatureCollection","crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::32633"}},"features":[` + strings.Join(f, ",") + "]}"
	if err := os.WriteFile("utm.geojson", []byte(doc), 0o644); err != nil {
		t.Fatal(err)
	}
	a := runIn("", "weights", "-i", "utm.geojson", "--band", "10.5km", "--format", "json")
	b := runIn("", "weights", "-i", "utm.geojson", "--band", "10500", "--format", "json")
	if a.code != 0 || a.stdout != b.stdout || !strings.Contains(a.stdout, `"kind": "distance band 10500 m"`) || !strings.Contains(a.stdout, `"epsg": 32633`) {
		t.Errorf("band 10.5km on UTM: exit %d %s\n%s", a.code, a.stderr, a.stdout)
	}
	if links(a.stdout) != `"links": 120` { // 60 rook pairs of a 6×6 grid, both ways
		t.Errorf("links: %s", links(a.stdout))
	}
	r := runIn("", "local", "-i", "utm.geojson", "--variable", "v", "-n", "99", "--out", "res.geojson")
	if r.code != 2 || !strings.Contains(r.stderr, "RFC 7946") || !strings.Contains(r.stderr, "EPSG:32633") {
		t.Errorf("GeoJSON out of a projected layer: exit %d, %s", r.code, r.stderr)
	}
	if _, err := os.Stat("res.geojson"); err == nil {
		t.Error("res.geojson was written")
	}
}

// local --out res.gpkg writes a GeoPackage that reads back (through the
// same reader as any input) with every area, the layer's columns and the
// result columns; and a GeoPackage given as the input is read by content.
func TestLocalGeoPackageOut(t *testing.T) {
	sampleDir(t)
	geo := runIn("", "local", "-i", "region.geojson", "--variable", "rate", "-n", "99", "--out", "res.gpkg", "--format", "json")
	if geo.code != 0 {
		t.Fatalf("exit %d: %s", geo.code, geo.stderr)
	}
	l, _, err := input.Read("res.gpkg", nil, input.Options{IDColumn: "id"})
	if err != nil {
		t.Fatal(err)
	}
	for _, col := range []string{"rate", "policy", "local_category", "local_statistic"} {
		if _, err := l.Column(col); err != nil {
			t.Errorf("res.gpkg: %v", err)
		}
	}
	if l.Len() != 200 {
		t.Errorf("res.gpkg has %d areas", l.Len())
	}
	again := runIn("", "local", "-i", "res.gpkg", "--id", "id", "--variable", "rate", "-n", "99", "--format", "json")
	if again.code != 0 {
		t.Fatalf("reading res.gpkg back: exit %d: %s", again.code, again.stderr)
	}
}

// The join's flags: a key column that does not exist is an error naming
// the columns (exit 1), --key without --table and --table - are usage
// errors (exit 2), and nothing is written.
func TestTableFlags(t *testing.T) {
	sampleDir(t)
	if err := os.WriteFile("t.csv", []byte("id;extra\nD001;1\nD002;2\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"--table", "t.csv", "--table-key", "code"}, 1, `"code"`},
		{[]string{"--key", "id"}, 2, "--key and --table-key go with --table"},
		{[]string{"--table", "-"}, 2, "--table must name a file"},
		{[]string{"--table", "region.geojson"}, 1, "region.geojson"},
	} {
		r := runIn("", append([]string{"autocorr", "-i", "region.geojson", "--variables", "rate", "-n", "99", "-o", "out.txt"}, c.args...)...)
		if r.code != c.code || !strings.Contains(r.stderr, c.want) {
			t.Errorf("%v: exit %d, %q", c.args, r.code, r.stderr)
		}
		if _, err := os.Stat("out.txt"); err == nil {
			t.Errorf("%v: out.txt was written", c.args)
		}
	}
	ok := runIn("", "autocorr", "-i", "region.geojson", "--table", "t.csv", "--variables", "rate", "-n", "99", "--format", "json")
	if ok.code != 0 || !strings.Contains(ok.stdout, `"areas_matched": 2`) || !strings.Contains(ok.stderr, "198 of 200 areas have no row") {
		t.Errorf("a join of two rows: exit %d, %s", ok.code, ok.stderr)
	}
}
