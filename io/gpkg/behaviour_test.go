package gpkg

import (
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/layer"
)

// read makes a file with mk and reads it.
func read(t *testing.T, mk func(*testing.T, string), opt Options) (*layer.Layer, []string) {
	t.Helper()
	dir := t.TempDir()
	path := filepath.Join(dir, "areas.gpkg")
	mk(t, path)
	before := listDir(t, dir)
	l, warns, err := ReadFile(path, opt)
	if err != nil {
		t.Fatal(err)
	}
	if after := listDir(t, dir); !slices.Equal(before, after) {
		t.Errorf("files before %v, after %v", before, after)
	}
	return l, warns
}

func TestSkipBadGeometry(t *testing.T) {
	mk := func(t *testing.T, path string) {
		base(t, path)
		alter(t, path, setBlob(1), blob(false, 0, 0, pointWKB()))
		alter(t, path, []string{`UPDATE areas SET geom = NULL WHERE fid = 3`})
	}
	l, warns := read(t, mk, Options{SkipBadGeometry: true, IDColumn: "id"})
	if !slices.Equal(l.IDs, []string{"b"}) || l.Columns[1].Label(0) != "Birch" || len(warns) != 2 {
		t.Fatalf("%v %v %q", l.IDs, l.Columns[1].Str, warns)
	}
	if !strings.Contains(warns[0], `, table "areas", record 1 (id "a"), column "geom": left out: the geometry is a Point`) || !strings.Contains(warns[1], `record 3 (id "c"), column "geom": left out: has no geometry (NULL)`) {
		t.Errorf("warnings %q", warns)
	}
}

func TestUnclosedRings(t *testing.T) {
	open := blob(false, 1, 0, newWKB(false).u32(3).u32(1).u32(4).f64(0, 0, 1, 0, 1, 1, 0, 1).b)
	mk := func(t *testing.T, path string) {
		base(t, path)
		alter(t, path, []string{`UPDATE areas SET geom = ?`}, open)
	}
	l, warns := read(t, mk, Options{})
	if len(l.Geoms[2][0][0]) != 5 || len(warns) != 1 || !strings.Contains(warns[0], `table "areas": 3 record(s) had rings whose last position differs from the first; they were closed (first: record 1 (id "1"))`) {
		t.Errorf("%v %q", l.Geoms[2], warns)
	}
}

// TestValueKinds: SQLite's storage classes and GeoPackage's declared
// types become columns by the shared rules.
func TestValueKinds(t *testing.T) {
	mk := altered([]string{
		`ALTER TABLE areas ADD COLUMN flag BOOLEAN`,
		`ALTER TABLE areas ADD COLUMN big INTEGER`,
		`ALTER TABLE areas ADD COLUMN day DATE`,
		`ALTER TABLE areas ADD COLUMN raw BLOB`,
		`ALTER TABLE areas ADD COLUMN count MEDIUMINT`,
		`ALTER TABLE areas ADD COLUMN mixed`,
		`UPDATE areas SET flag = fid % 2, big = 1152921504606846976 + fid, day = '2024-01-0' || fid, raw = x'0102', count = CASE fid WHEN 2 THEN NULL ELSE fid END, mixed = CASE fid WHEN 1 THEN 7 WHEN 2 THEN ' 2.5 ' ELSE 'n/a' END`,
	})
	l, _ := read(t, mk, Options{})
	want := map[string]struct {
		kind   layer.Kind
		labels []string
	}{
		"name":  {layer.Text, []string{"Ash", "Birch", ""}},
		"pop":   {layer.Number, []string{"100.5", "200.5", "300.5"}},
		"code":  {layer.Text, []string{"01001", "01003", ""}},
		"flag":  {layer.Text, []string{"true", "false", "true"}},
		"big":   {layer.Text, []string{"1152921504606846977", "1152921504606846978", "1152921504606846979"}},
		"day":   {layer.Text, []string{"2024-01-01", "2024-01-02", "2024-01-03"}},
		"raw":   {layer.Text, []string{"<blob, 2 bytes>", "<blob, 2 bytes>", "<blob, 2 bytes>"}},
		"count": {layer.Number, []string{"1", "", "3"}},
		"mixed": {layer.Number, []string{"7", "2.5", ""}},
	}
	if len(l.Columns) != len(want)+1 {
		t.Fatalf("%d columns", len(l.Columns))
	}
	for name, w := range want {
		c, err := l.Column(name)
		if err != nil {
			t.Fatal(err)
		}
		var labels []string
		for i := range l.IDs {
			labels = append(labels, c.Label(i))
		}
		if c.Kind != w.kind || !slices.Equal(labels, w.labels) {
			t.Errorf("%s: %v %q, want %v %q", name, c.Kind, labels, w.kind, w.labels)
		}
	}
	if c, _ := l.Column("code"); !c.Missing[2] || !c.NotNumber[0] {
		t.Errorf("code: missing %v, not numbers %v", c.Missing, c.NotNumber)
	}
}

func TestIDs(t *testing.T) {
	l, _ := read(t, altered([]string{`UPDATE areas SET pop = fid * 10`}), Options{IDColumn: "pop"})
	if !slices.Equal(l.IDs, []string{"10", "20", "30"}) || l.IDColumn != "pop" {
		t.Errorf("from a number column: %v %q", l.IDs, l.IDColumn)
	}
	if c, _ := l.Column("pop"); c == nil || c.Kind != layer.Number {
		t.Error("the id column is not kept")
	}
	l, _ = read(t, base, Options{IDColumn: "fid"})
	if !slices.Equal(l.IDs, []string{"1", "2", "3"}) || l.IDColumn != "" || len(l.Columns) != 4 {
		t.Errorf("naming the key: %v %q %d", l.IDs, l.IDColumn, len(l.Columns))
	}
	// A table whose key is not an integer: positions, and the key is data.
	noKey := altered([]string{
		`CREATE TABLE plain (code TEXT PRIMARY KEY, geom MULTIPOLYGON)`,
		`INSERT INTO plain SELECT code || '-' || fid, geom FROM areas ORDER BY fid DESC`,
		`DELETE FROM gpkg_geometry_columns`, `DELETE FROM gpkg_contents`,
		`INSERT INTO gpkg_contents (table_name, data_type, identifier, srs_id) VALUES ('plain', 'features', 'plain', 4326)`,
		`INSERT INTO gpkg_geometry_columns VALUES ('plain', 'geom', 'MULTIPOLYGON', 4326, 0, 0)`,
	})
	l, warns := read(t, noKey, Options{})
	if !slices.Equal(l.IDs, []string{"1", "2", "3"}) || l.IDColumn != "#" || len(warns) != 1 || !strings.Contains(warns[0], `table "plain" has no integer primary key; the areas are numbered by their position (1 to 3)`) {
		t.Errorf("no integer key: %v %q %q", l.IDs, l.IDColumn, warns)
	}
}

func TestChooseTable(t *testing.T) {
	for _, name := range []string{"more", "MORE"} {
		if l, _ := read(t, twoTables, Options{Layer: name}); l.Len() != 3 {
			t.Errorf("%s: %d areas", name, l.Len())
		}
	}
	odd := func(t *testing.T, path string) {
		writeFile(t, filepath.Dir(path), filepath.Base(path), smallLayer(), nil, `odd "name"; --`)
	}
	if l, _ := read(t, odd, Options{}); l.Len() != 3 {
		t.Errorf("odd name: %d areas", l.Len())
	}
}

// TestCoordinateSystemRules: definitions read, codes looked up, and the
// coordinates deciding when neither says.
func TestCoordinateSystemRules(t *testing.T) {
	far := blob(false, 0, 0, newWKB(false).u32(3).u32(1).u32(4).f64(600000, 0, 600001, 0, 600000, 1, 600000, 0).b)
	srs := func(id int, org string, code int, def string, moveFar bool) func(*testing.T, string) {
		return func(t *testing.T, path string) {
			base(t, path)
			stmts := []string{`UPDATE gpkg_geometry_columns SET srs_id = ?`}
			if id > 0 {
				alter(t, path, []string{`INSERT INTO gpkg_spatial_ref_sys VALUES ('test system', ?, ?, ?, ?, NULL)`}, id, org, code, def)
			}
			alter(t, path, stmts, id)
			if moveFar {
				alter(t, path, setBlob(2), far)
			}
		}
	}
	utm := layer.CRS{Projected: true, Unit: "metre", MetresPerUnit: 1, Name: "test system", EPSG: 32615}
	for _, tc := range []struct {
		name string
		mk   func(*testing.T, string)
		crs  layer.CRS
		warn string
	}{
		{"undefined Cartesian, lon/lat range", srs(-1, "", 0, "", false), layer.CRS{}, ""},
		{"undefined Cartesian, beyond", srs(-1, "", 0, "", true), layer.CRS{Projected: true}, `table "areas" has no coordinate system definition and its coordinates are not longitude/latitude (record 2 (id "2") has [600000, 0]); distances will be in the layer's own units`},
		{"undefined geographic", srs(0, "", 0, "", false), layer.CRS{}, ""},
		{"EPSG code, no definition", srs(32615, "EPSG", 32615, "undefined", true), utm, ""},
		{"definition", srs(7, "NONE", 7, `LOCAL_CS["grid",UNIT["metre",1]]`, true), layer.CRS{Projected: true, Unit: "metre", MetresPerUnit: 1, Name: "grid"}, ""},
		{"unreadable definition", srs(8, "NONE", 8, `nonsense`, true), layer.CRS{Projected: true}, `the coordinate system "test system" (srs_id 8) of table "areas": its definition cannot be read`},
		{"unknown code", srs(9, "EPSG", 999999, "undefined", false), layer.CRS{}, `its definition is "undefined" and EPSG 999999 is not a code this program knows`},
		{"no row", func(t *testing.T, path string) {
			base(t, path)
			alter(t, path, []string{`PRAGMA foreign_keys = OFF`, `UPDATE gpkg_geometry_columns SET srs_id = 77`})
		}, layer.CRS{}, `the coordinate system (srs_id 77) of table "areas" cannot be read: it has no row in gpkg_spatial_ref_sys`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			l, warns := read(t, tc.mk, Options{})
			if l.CRS != tc.crs {
				t.Errorf("CRS %+v, want %+v", l.CRS, tc.crs)
			}
			if tc.warn == "" && len(warns) > 0 || tc.warn != "" && (len(warns) == 0 || !strings.Contains(strings.Join(warns, "\n"), tc.warn)) {
				t.Errorf("warnings %q, want %q", warns, tc.warn)
			}
		})
	}
}

// TestWALNothingWritten: a database in write-ahead-log mode is read
// without the log and shared-memory files SQLite would make beside it.
func TestWALNothingWritten(t *testing.T) {
	wal := func(t *testing.T, path string) {
		base(t, path)
		alter(t, path, []string{`PRAGMA journal_mode = WAL`})
	}
	if l, _ := read(t, wal, Options{}); l.Len() != 3 {
		t.Errorf("%d areas", l.Len())
	}
}
