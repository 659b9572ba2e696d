package gpkg

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/tests/testkit"
)

// TestFixturesMatchGeoJSON: the GeoPackages ogr2ogr made from
// us-states.geojson read as the GeoJSON does.
func TestFixturesMatchGeoJSON(t *testing.T) {
	want, _, err := geojson.ReadFile(testkit.Testdata(t, "us-states.geojson"), geojson.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		file      string
		crs       layer.CRS
		sameCoord bool
	}{
		{"states.gpkg", layer.CRS{Name: "WGS 84", EPSG: 4326}, true},
		{"states-5070.gpkg", layer.CRS{Projected: true, Unit: "metre", MetresPerUnit: 1, Name: "NAD83 / Conus Albers", EPSG: 5070}, false},
	} {
		t.Run(tc.file, func(t *testing.T) {
			path := testkit.Testdata(t, "formats/"+tc.file)
			got, warns, err := ReadFile(path, Options{IDColumn: "id"})
			if err != nil || len(warns) > 0 {
				t.Fatalf("%v %v", err, warns)
			}
			if !slices.Equal(got.IDs, want.IDs) || got.IDColumn != "id" || got.CRS != tc.crs {
				t.Fatalf("ids %v…, id column %q, CRS %+v", got.IDs[:3], got.IDColumn, got.CRS)
			}
			sameColumns(t, got, want)
			for i := range want.Geoms {
				sameShape(t, i, got, want, tc.sameCoord)
			}
			// Without an id column the ids are the fids, 1 to 56.
			byFid, _, err := ReadFile(path, Options{})
			if err != nil || byFid.IDs[0] != "1" || byFid.IDs[55] != "56" || byFid.IDColumn != "" || len(byFid.Columns) != 5 {
				t.Errorf("by fid: %v %v", err, byFid)
			}
		})
	}
}

// sameColumns: got has want's columns with the same kinds and values,
// plus its id column, holding the ids.
func sameColumns(t *testing.T, got, want *layer.Layer) {
	t.Helper()
	if len(got.Columns) != len(want.Columns)+1 || got.Columns[0].Name != "id" {
		t.Fatalf("%d columns, the first %q", len(got.Columns), got.Columns[0].Name)
	}
	for i := range got.IDs {
		if got.Columns[0].Label(i) != got.IDs[i] {
			t.Fatalf("id column %q, id %q", got.Columns[0].Label(i), got.IDs[i])
		}
	}
	for _, wc := range want.Columns {
		gc, err := got.Column(wc.Name)
		if err != nil {
			t.Fatal(err)
		}
		if gc.Kind != wc.Kind {
			t.Errorf("column %s: kind %v, GeoJSON %v", wc.Name, gc.Kind, wc.Kind)
			continue
		}
		for i := range wc.Missing {
			if gc.Label(i) != wc.Label(i) || gc.Missing[i] != wc.Missing[i] {
				t.Errorf("column %s, area %d: %q, GeoJSON %q", wc.Name, i, gc.Label(i), wc.Label(i))
			}
		}
	}
}

// sameShape compares area i: parts, rings and positions, and with
// sameCoord every position within 1e-9.
func sameShape(t *testing.T, i int, got, want *layer.Layer, sameCoord bool) {
	t.Helper()
	g, w := got.Geoms[i], want.Geoms[i]
	if len(g) != len(w) {
		t.Fatalf("area %s: %d parts, GeoJSON %d", want.IDs[i], len(g), len(w))
	}
	for p := range w {
		if len(g[p]) != len(w[p]) {
			t.Fatalf("area %s part %d: %d rings, GeoJSON %d", want.IDs[i], p, len(g[p]), len(w[p]))
		}
		for r := range w[p] {
			if len(g[p][r]) != len(w[p][r]) {
				t.Fatalf("area %s: ring of %d positions, GeoJSON %d", want.IDs[i], len(g[p][r]), len(w[p][r]))
			}
			for k, q := range w[p][r] {
				if d := math.Max(math.Abs(g[p][r][k][0]-q[0]), math.Abs(g[p][r][k][1]-q[1])); sameCoord && d > 1e-9 {
					t.Fatalf("area %s: position %v, GeoJSON %v", want.IDs[i], g[p][r][k], q)
				}
			}
		}
	}
}

// skippable in a case of TestReadErrors says the error must be marked
// Skippable; every other error must not be.
const skippable = "\x00skippable"

func TestReadErrors(t *testing.T) {
	tests := []struct {
		name string
		make func(t *testing.T, path string)
		opt  Options
		want []string
	}{
		{"not SQLite", rawFile(`{"type":"FeatureCollection"}`), Options{}, []string{": not a GeoPackage", "SQLite"}},
		{"empty file", rawFile(``), Options{}, []string{": the file is empty"}},
		{"SQLite, not GeoPackage", plainSQLite, Options{}, []string{": is an SQLite database but not a GeoPackage"}},
		{"SQLite header, broken body", rawFile(sqliteMagic + strings.Repeat("\xff", 200)), Options{}, []string{": cannot be read as an SQLite database"}},
		{"no feature table", altered([]string{`DELETE FROM gpkg_geometry_columns`, `DELETE FROM gpkg_contents`, `DROP TABLE areas`}), Options{}, []string{": has no feature table"}},
		{"two feature tables", twoTables, Options{}, []string{`: has several feature tables: "areas", "more"`}},
		{"no such layer", twoTables, Options{Layer: "states"}, []string{`: has no feature table "states"; its feature tables: "areas", "more"`}},
		{"table not in geometry columns", altered([]string{`DELETE FROM gpkg_geometry_columns`}), Options{}, []string{`, table "areas": has no entry in gpkg_geometry_columns`}},
		{"no such id column", base, Options{IDColumn: "GEOID"}, []string{`, table "areas": has no column "GEOID" to take the ids from (its columns: "fid", "geom", "id", "name", "pop", "code")`}},
		{"point", altered(setBlob(2), blob(false, 0, 0, pointWKB())), Options{}, []string{`, table "areas", record 2 (id "2"), column "geom": the geometry is a Point; areas must be Polygon or MultiPolygon`, skippable}},
		{"NULL geometry", altered(setBlob(3), nil), Options{IDColumn: "id"}, []string{`, table "areas", record 3 (id "c"), column "geom": has no geometry (NULL)`, skippable}},
		{"empty flag", altered(setBlob(1), blob(false, 0, flagEmpty, polygonWKB(false, 3, 2))), Options{}, []string{`record 1 (id "1"), column "geom": has no geometry (an empty geometry)`, skippable}},
		{"empty polygon", altered(setBlob(1), blob(false, 0, 0, newWKB(false).u32(3).u32(0).b)), Options{}, []string{`record 1 (id "1"), column "geom": the geometry is empty`, skippable}},
		{"truncated header", altered(setBlob(2), []byte("GP\x00\x03")), Options{}, []string{`record 2 (id "2"), column "geom": the geometry has 4 bytes, fewer than the 8 of a GeoPackage geometry header`}},
		{"truncated envelope", altered(setBlob(2), []byte("GP\x00\x03\xe6\x10\x00\x00\x00\x00")), Options{}, []string{`record 2 (id "2"), column "geom": the geometry has 10 bytes, fewer than its 40-byte header with envelope`}},
		{"bad envelope code", altered(setBlob(2), []byte("GP\x00\x0b\xe6\x10\x00\x00")), Options{}, []string{`record 2 (id "2"), column "geom": the geometry header has envelope code 5`}},
		{"bare WKB", altered(setBlob(2), polygonWKB(false, 3, 2)), Options{}, []string{`record 2 (id "2"), column "geom": the geometry does not start with the GeoPackage magic "GP" (it looks like bare WKB`}},
		{"hostile ring count", altered(setBlob(2), blob(false, 1, 0, newWKB(false).u32(3).u32(0xffffffff).b)), Options{}, []string{`record 2 (id "2"), column "geom": the geometry claims 4294967295 rings, more than its remaining 0 bytes hold`}},
		{"hostile position count", altered(setBlob(2), blob(true, 0, 0, newWKB(true).u32(6).u32(1).b)), Options{}, []string{`record 2 (id "2"), column "geom": the geometry claims 1 polygons, more than its remaining 0 bytes hold`}},
		{"cut WKB", altered(setBlob(2), blob(false, 0, 0, polygonWKB(false, 3, 2)[:30])), Options{}, []string{`record 2 (id "2"), column "geom": the geometry claims 5 positions`}},
		{"bad byte order", altered(setBlob(2), blob(false, 0, 0, []byte{7, 3, 0, 0, 0})), Options{}, []string{`column "geom": the WKB geometry has byte order mark 7`}},
		{"unknown type code", altered(setBlob(2), blob(false, 0, 0, newWKB(false).u32(4003).b)), Options{}, []string{`column "geom": the WKB geometry type code 4003 is not one of ISO WKB's`}},
		{"curve polygon", altered(setBlob(2), blob(false, 0, 0, newWKB(false).u32(10).u32(0).b)), Options{}, []string{`column "geom": the geometry is a CurvePolygon; curved geometry is not read`}},
		{"mixed dimensions", altered(setBlob(2), blob(false, 0, 0, append(newWKB(false).u32(1006).u32(1).b, polygonWKB(false, 3, 2)...))), Options{}, []string{`part 1 of the MultiPolygon is a Polygon with 2 values per position, not a Polygon with 3`}},
		{"short ring", altered(setBlob(2), blob(false, 0, 0, newWKB(false).u32(3).u32(1).u32(3).f64(0, 0, 1, 0, 0, 0).b)), Options{}, []string{`record 2 (id "2"), column "geom": ring 1 has 3 positions`}},
		{"NaN coordinate", altered(setBlob(2), blob(false, 0, 0, newWKB(false).u32(3).u32(1).u32(4).f64(0, 0, math.NaN(), 0, 1, 1, 0, 0).b)), Options{}, []string{`column "geom": ring 1 holds the coordinate [NaN, 0]`}},
		{"text geometry", altered(setBlob(2), "POLYGON((0 0,1 0,1 1,0 0))"), Options{}, []string{`column "geom": the geometry column holds text`}},
		{"duplicate ids", altered([]string{`UPDATE areas SET id = 'a'`}), Options{IDColumn: "id"}, []string{`, table "areas", record 2 (id "a"), column "id": has the same id as record 1; ids must be unique`}},
		{"NULL id", altered([]string{`UPDATE areas SET id = NULL WHERE fid = 2`}), Options{IDColumn: "id"}, []string{`, table "areas", record 2, column "id": the id is NULL`}},
		{"fractional id", altered([]string{`UPDATE areas SET pop = 2.5`}), Options{IDColumn: "pop"}, []string{`record 1, column "pop": the id is 2.5, not a whole number`}},
		{"projected coordinates in a geographic table", altered(setBlob(3), blob(false, 0, 0, newWKB(false).u32(3).u32(1).u32(4).f64(500000, 0, 500001, 0, 500000, 1, 500000, 0).b)), Options{},
			[]string{`record 3 (id "3"), column "geom": the position [500000, 0] is outside longitude/latitude range, but the table's coordinate system "WGS 84" (EPSG:4326) is geographic`}},
		{"no records", altered([]string{`DELETE FROM areas`}), Options{}, []string{`, table "areas": has no records`}},
		{"all left out", altered([]string{`UPDATE areas SET geom = NULL`}), Options{SkipBadGeometry: true}, []string{`, table "areas": all 3 records were left out for lacking polygon geometry`}},
		{"missing table", altered([]string{`DROP TABLE areas`}), Options{}, []string{`, table "areas": is listed in gpkg_contents, but the database has no such table`}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			path := filepath.Join(dir, "areas.gpkg")
			tc.make(t, path)
			before := listDir(t, dir)
			lay, _, err := ReadFile(path, tc.opt)
			if after := listDir(t, dir); !slices.Equal(before, after) {
				t.Errorf("files before %v, after %v", before, after)
			}
			if err == nil || lay != nil {
				t.Fatalf("no error (layer %v)", lay)
			}
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("%T is not an *Error: %v", err, err)
			}
			msg := err.Error()
			if !strings.HasPrefix(msg, path) || strings.ContainsAny(msg, "\n\r") {
				t.Errorf("message %q does not start with the path or is not one line", msg)
			}
			wantSkip := false
			for _, w := range tc.want {
				if w == skippable {
					wantSkip = true
				} else if !strings.Contains(msg, w) {
					t.Errorf("message %q lacks %q", msg, w)
				}
			}
			if e.Skippable != wantSkip {
				t.Errorf("Skippable %v: %s", e.Skippable, msg)
			}
		})
	}
}

// setBlob sets the geometry of record fid to the argument alter passes.
func setBlob(fid int) []string {
	return []string{`UPDATE areas SET geom = ? WHERE fid = ` + string(rune('0'+fid))}
}

func rawFile(content string) func(*testing.T, string) {
	return func(t *testing.T, path string) {
		if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// base writes smallLayer as the table "areas".
func base(t *testing.T, path string) {
	writeFile(t, filepath.Dir(path), filepath.Base(path), smallLayer(), nil, "")
}

// altered writes base, then runs stmts on it.
func altered(stmts []string, args ...any) func(*testing.T, string) {
	return func(t *testing.T, path string) {
		base(t, path)
		alter(t, path, stmts, args...)
	}
}

func plainSQLite(t *testing.T, path string) {
	alter(t, path, []string{`CREATE TABLE t (a INTEGER)`, `INSERT INTO t VALUES (1)`})
}

// twoTables registers a copy of "areas" as the feature table "more".
func twoTables(t *testing.T, path string) {
	base(t, path)
	alter(t, path, []string{
		`CREATE TABLE more AS SELECT * FROM areas`,
		`INSERT INTO gpkg_contents (table_name, data_type, identifier, srs_id) VALUES ('more', 'features', 'more', 4326)`,
		`INSERT INTO gpkg_geometry_columns VALUES ('more', 'geom', 'MULTIPOLYGON', 4326, 0, 0)`,
	})
}

func listDir(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	return names
}
