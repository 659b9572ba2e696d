package shapefile

import (
	"bytes"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

// readFiles writes fs as states.* in a temp folder and reads it.
func readFiles(t *testing.T, fs files, opt Options) (*layer.Layer, []string) {
	t.Helper()
	lay, warns, err := ReadFile(writeFiles(t, t.TempDir(), "states", fs), opt)
	if err != nil {
		t.Fatal(err)
	}
	return lay, warns
}

// hasWarning reports a warning holding every piece.
func hasWarning(warns []string, pieces ...string) bool {
	for _, w := range warns {
		all := true
		for _, p := range pieces {
			all = all && strings.Contains(w, p)
		}
		if all {
			return true
		}
	}
	return false
}

func TestRings(t *testing.T) {
	outer := square(0, 0, 10)
	lake := reversed(square(1, 1, 8))
	island := square(2, 2, 6)
	pond := reversed(square(3, 3, 4))
	stray := reversed(square(20, 20, 1))
	touching := reversed([]orb.Point{{0, 0}, {0, 5}, {5, 5}, {0, 0}}) // shares the shell's corner
	for _, tc := range []struct {
		name   string
		parts  [][]orb.Point
		rings  []int // rings per polygon
		orphan bool
	}{
		{"one shell", [][]orb.Point{outer}, []int{1}, false},
		{"shell and hole", [][]orb.Point{outer, lake}, []int{2}, false},
		{"hole first", [][]orb.Point{lake, outer}, []int{2}, false},
		{"hole touching its shell", [][]orb.Point{outer, touching}, []int{2}, false},
		// The pond lies in the island, the smallest shell holding it, not in
		// the outer shell, whose box holds it too.
		{"island in a lake", [][]orb.Point{outer, lake, island, pond}, []int{2, 2}, false},
		{"hole outside any shell", [][]orb.Point{outer, stray}, []int{1, 1}, true},
		{"two shells", [][]orb.Point{outer, square(20, 0, 1)}, []int{1, 1}, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			lay, warns := readFiles(t, makeFiles([]testShape{poly(tc.parts...)}, [][]string{{"a", "1"}}), Options{IDColumn: "name"})
			mp := lay.Geoms[0]
			var got []int
			for _, p := range mp {
				got = append(got, len(p))
			}
			if !equalInts(got, tc.rings) {
				t.Errorf("rings per polygon %v, want %v", got, tc.rings)
			}
			if tc.name == "island in a lake" && (mp[0][1][0] != lake[0] || mp[1][1][0] != pond[0]) {
				t.Errorf("holes in the wrong shells: %v", mp)
			}
			w := hasWarning(warns, `states.shp: 1 record(s) had rings wound as holes that lie in no outer ring; they were read as outer rings (first: record 1 (id "a"))`)
			if w != tc.orphan {
				t.Errorf("warnings %q", warns)
			}
		})
	}
}

// TestManyRings places holes in a record with enough shells and holes to
// use the grid: a mainland with lakes, islands with ponds, and a wide
// island spanning the others.
func TestManyRings(t *testing.T) {
	parts := [][]orb.Point{square(0, 0, 100)}
	var want []int
	for i := range 20 {
		x := float64(i*4 + 1)
		parts = append(parts, reversed(square(x, 1, 2)), square(x, 50, 3), reversed(square(x+0.5, 50.5, 1)))
		want = append(want, 2)
	}
	wide := []orb.Point{{0, 110}, {0, 300}, {100, 300}, {100, 110}, {0, 110}}
	parts = append(parts, wide, reversed(square(90, 290, 1)), reversed(square(150, 150, 1)))
	want = append([]int{21}, want...)
	want = append(want, 2, 1)
	lay, warns := readFiles(t, makeFiles([]testShape{poly(parts...)}, [][]string{{"a", "1"}}), Options{})
	var got []int
	for _, p := range lay.Geoms[0] {
		got = append(got, len(p))
	}
	if !equalInts(got, want) || len(warns) != 3 || !hasWarning(warns, "1 record(s) had rings wound as holes that lie in no outer ring") {
		t.Errorf("rings per polygon %v, want %v; warnings %q", got, want, warns)
	}
	if mp := lay.Geoms[0]; mp[3][1][0] != parts[9][0] || mp[21][1][0] != parts[62][0] {
		t.Errorf("holes in the wrong shells")
	}
}

func equalInts(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

func TestGeometryRules(t *testing.T) {
	rows := [][]string{{"a", "1"}, {"b", "2"}, {"c", "3"}}
	t.Run("PolygonZ", func(t *testing.T) {
		shp, shx := encodeShapes(shapePolygonZ, []testShape{{typ: shapePolygonZ, parts: [][]orb.Point{square(0, 0, 1)}}})
		lay, _ := readFiles(t, files{".shp": shp, ".shx": shx, ".dbf": encodeDBF([]testField{{"name", 'C', 5}}, [][]string{{"a"}}, 0)}, Options{})
		if len(lay.Geoms[0][0][0]) != 5 || lay.Geoms[0][0][0][2] != (orb.Point{1, 1}) {
			t.Errorf("geometry %v", lay.Geoms[0])
		}
	})
	t.Run("skipped and deleted", func(t *testing.T) {
		fs := makeFiles([]testShape{{}, poly(square(0, 0, 1)), poly(square(1, 0, 1))}, [][]string{{"a", "1"}, {"b", "2"}, {"*", "c", "3"}})
		lay, warns := readFiles(t, fs, Options{SkipBadGeometry: true})
		if strings.Join(lay.IDs, ",") != "2" || lay.Columns[0].Label(0) != "b" {
			t.Errorf("ids %v", lay.IDs)
		}
		for _, w := range []string{"states.shp: record 1: left out: has no geometry (a null shape)", "states.dbf: 1 record(s) are marked deleted; they were left out",
			"states.shp: no id column was named; the areas are numbered by their record in the file (1 to 3)"} {
			if !hasWarning(warns, w) {
				t.Errorf("no warning %q in %q", w, warns)
			}
		}
	})
	t.Run("unclosed ring", func(t *testing.T) {
		open := square(0, 0, 1)[:4]
		lay, warns := readFiles(t, makeFiles([]testShape{poly(square(5, 5, 1)), poly(open), poly(open)}, rows), Options{IDColumn: "name"})
		if len(lay.Geoms[1][0][0]) != 5 || !hasWarning(warns, `states.shp: 2 record(s) had rings whose last point differs from the first; they were closed (first: record 2 (id "b"))`) {
			t.Errorf("geometry %v, warnings %q", lay.Geoms[1], warns)
		}
	})
	t.Run("no .prj, projected coordinates", func(t *testing.T) {
		lay, warns := readFiles(t, makeFiles([]testShape{poly(square(500000, 4e6, 100))}, rows[:1]), Options{IDColumn: "name"})
		if lay.CRS != (layer.CRS{Projected: true}) || !hasWarning(warns, "states.shp: has no coordinate system definition and its coordinates are not longitude/latitude; distances will be in the layer's own units") {
			t.Errorf("CRS %+v, warnings %q", lay.CRS, warns)
		}
	})
	t.Run("unreadable .prj", func(t *testing.T) {
		fs := makeFiles([]testShape{poly(square(5, 5, 1))}, rows[:1])
		fs[".prj"] = []byte("not a definition")
		lay, warns := readFiles(t, fs, Options{IDColumn: "name"})
		if lay.CRS != (layer.CRS{}) || !hasWarning(warns, "states.prj: cannot be read (", "the layer is read as having no coordinate system definition") {
			t.Errorf("CRS %+v, warnings %q", lay.CRS, warns)
		}
	})
	t.Run("upper-case extensions", func(t *testing.T) {
		fs := makeFiles([]testShape{poly(square(5, 5, 1))}, rows[:1])
		upper := files{}
		for ext, data := range fs {
			upper[strings.ToUpper(ext)] = data
		}
		path := strings.TrimSuffix(writeFiles(t, t.TempDir(), "STATES", upper), ".shp") + ".SHP"
		lay, _, err := ReadFile(path, Options{IDColumn: "NAME"})
		if err != nil || lay.IDs[0] != "a" || lay.IDColumn != "name" {
			t.Errorf("%v %+v", err, lay)
		}
	})
}

func TestColumns(t *testing.T) {
	fields := []testField{{"NAME", 'C', 12}, {"POP", 'N', 6}, {"RATE", 'F', 8}, {"URBAN", 'L', 1}, {"SINCE", 'D', 8}, {"CODE", 'C', 5}, {"NOTE", 'M', 10}}
	rows := [][]string{
		{"Espa\xf1a  ", "12", "1.500", "T", "20240131", "01001", "1"},
		{"NA", "", "*****", "?", "", "01003", ""},
		{" Lyon", "-3", "", "n", "00000000", "1005", ""},
		{"", "7", "2e3", "x", "2024", "", ""},
	}
	shapes := []testShape{poly(square(0, 0, 1)), poly(square(1, 0, 1)), poly(square(2, 0, 1)), poly(square(3, 0, 1))}
	shp, shx := encodeShapes(shapePolygon, shapes)
	lay, warns := readFiles(t, files{".shp": shp, ".shx": shx, ".dbf": encodeDBF(fields, rows, 0x57)}, Options{})
	if !hasWarning(warns, `states.dbf: column "NOTE" is of dBASE type 'M', which is not read; it is left out`) {
		t.Errorf("warnings %q", warns)
	}
	for _, tc := range []struct {
		col    string
		kind   layer.Kind
		labels []string
	}{
		{"NAME", layer.Text, []string{"España", "", " Lyon", ""}},
		{"POP", layer.Number, []string{"12", "", "-3", "7"}},
		{"RATE", layer.Number, []string{"1.5", "", "", "2000"}},
		{"URBAN", layer.Text, []string{"true", "", "false", "x"}},
		{"SINCE", layer.Text, []string{"2024-01-31", "", "", "2024"}},
		{"CODE", layer.Text, []string{"01001", "01003", "1005", ""}},
	} {
		c, err := lay.Column(tc.col)
		if err != nil {
			t.Error(err)
			continue
		}
		if c.Kind != tc.kind || strings.Join(c.Labels(), "|") != strings.Join(tc.labels, "|") {
			t.Errorf("column %s: %v %q, want %v %q", tc.col, c.Kind, c.Labels(), tc.kind, tc.labels)
		}
	}
	if len(lay.Columns) != 6 {
		t.Errorf("%d columns", len(lay.Columns))
	}
}

func TestCodePages(t *testing.T) {
	utf := "Espa\xc3\xb1a"
	for _, tc := range []struct {
		name string
		text string // the bytes of the name
		ldid byte
		cpg  string // "" for none
		want string
		warn []string
	}{
		{"language driver 0x57", "Espa\xf1a", 0x57, "", "España", nil},
		{"language driver 0x03", "\x80 5", 0x03, "", "€ 5", nil},
		{"language driver 0x01 (437)", "Espa\xa4a", 0x01, "", "España", nil},
		{"language driver 0x02 (850)", "Espa\xa4a", 0x02, "", "España", nil},
		{".cpg 1252", "Espa\xf1a", 0, "1252", "España", nil},
		{".cpg windows-1252 over the driver byte", "Espa\xf1a", 0x01, "windows-1252\r\n", "España", nil},
		{".cpg ISO-8859-1", "Espa\xf1a", 0, "ISO-8859-1", "España", nil},
		{".cpg 88591", "Espa\xf1a", 0, "88591", "España", nil},
		{".cpg CP1252", "Espa\xf1a", 0, "CP1252", "España", nil},
		{".cpg UTF-8", utf, 0x57, "UTF-8", "España", nil},
		{"no code page", utf, 0, "", "España", nil},
		{"not UTF-8", "Espa\xf1a", 0, "UTF-8", "Espa\uFFFDa", []string{`states.dbf: 1 value(s) are not valid UTF-8`, `(first: record 1, column "NAME")`}},
		{"East Asian driver byte", utf, 0x4D, "", "España", []string{"states.dbf: its language driver byte 0x4D says the East Asian code page 936, which is not read; its text is read as UTF-8"}},
		{"unknown .cpg", utf, 0, "GBK", "España", []string{`states.cpg: names the code page "GBK", which is not read`}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			fs := makeFiles(twoSquares[:1], nil)
			fs[".dbf"] = encodeDBF([]testField{{"NAME", 'C', 12}}, [][]string{{tc.text}}, tc.ldid)
			if tc.cpg != "" {
				fs[".cpg"] = []byte(tc.cpg)
			}
			lay, warns := readFiles(t, fs, Options{IDColumn: "NAME"})
			if lay.IDs[0] != tc.want {
				t.Errorf("id %q, want %q", lay.IDs[0], tc.want)
			}
			if len(tc.warn) == 0 && len(warns) != 0 || len(tc.warn) > 0 && (len(warns) != 1 || !hasWarning(warns, tc.warn...)) {
				t.Errorf("warnings %q, want %q", warns, tc.warn)
			}
		})
	}
}

func TestZip(t *testing.T) {
	a := makeFiles(twoSquares, [][]string{{"a1", "1"}, {"a2", "2"}})
	b := makeFiles(twoSquares[:1], [][]string{{"b1", "1"}})
	members := map[string][]byte{"__MACOSX/data/._a.shp": {0}, "data/readme.txt": []byte("hello")}
	for ext, data := range a {
		members["data/a"+ext] = data
	}
	for ext, data := range b {
		members["data/b"+strings.ToUpper(ext)] = data
	}
	z := zipFiles(t, members)
	read := func(opt Options) (*layer.Layer, error) {
		lay, _, err := Read(bytes.NewReader(z), int64(len(z)), "two.zip", opt)
		return lay, err
	}
	lay, err := read(Options{})
	checkError(t, lay, err, []string{`two.zip: holds several shapefiles: "a", "b"; name the one to read`})
	lay, err = read(Options{Layer: "c"})
	checkError(t, lay, err, []string{`two.zip: holds no shapefile named "c"; it holds "a", "b"`})
	for _, name := range []string{"b", "data/b"} {
		lay, err = read(Options{Layer: name, IDColumn: "name"})
		if err != nil || strings.Join(lay.IDs, ",") != "b1" {
			t.Errorf("layer %s: %v %v", name, err, lay)
		}
	}
	delete(members, "data/b.DBF")
	z = zipFiles(t, members)
	lay, err = read(Options{Layer: "b"})
	checkError(t, lay, err, []string{`two.zip:data/b.shp: the table b.dbf is missing in two.zip; a shapefile needs its .dbf`})

	none := zipFiles(t, map[string][]byte{"x.csv": []byte("a,b")})
	lay, _, err = Read(bytes.NewReader(none), int64(len(none)), "none.zip", Options{})
	checkError(t, lay, err, []string{`none.zip: holds no shapefile (no .shp file); it holds "x.csv"`})

	shp := a[".shp"]
	lay, _, err = Read(bytes.NewReader(shp), int64(len(shp)), "a.shp", Options{})
	checkError(t, lay, err, []string{`a.shp: is a bare .shp; its table (.dbf) and index (.shx) are separate files`})
}

func TestZipBomb(t *testing.T) {
	fs := makeFiles(twoSquares, [][]string{{"a", "1"}, {"b", "2"}})
	fs[".dbf"] = append(fs[".dbf"], make([]byte, minUnpackedCap)...)
	members := map[string][]byte{}
	for ext, data := range fs {
		members["bomb"+ext] = data
	}
	z := zipFiles(t, members)
	lay, _, err := Read(bytes.NewReader(z), int64(len(z)), "bomb.zip", Options{})
	checkError(t, lay, err, []string{"bomb.zip:bomb.dbf: unpacks to more than 64.0 MiB in all (the limit for a zip of ", "the zip is damaged or hostile"})
}

func TestSniff(t *testing.T) {
	shp, _ := encodeShapes(shapePolygon, nil)
	for _, tc := range []struct {
		head []byte
		want bool
	}{{shp, true}, {shp[:4], true}, {shp[:3], false}, {[]byte("PK\x03\x04"), false}, {append(bytes.Clone(shp[:28]), 1, 2, 3, 4), false}} {
		if got := Sniff(tc.head); got != tc.want {
			t.Errorf("Sniff(% x) = %v", tc.head[:min(8, len(tc.head))], got)
		}
	}
}

func TestPaths(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct{ path, want string }{
		{filepath.Join(dir, "nope.shp"), "nope.shp: cannot be read: no such file or directory"},
		{filepath.Join(dir, "nope.zip"), "nope.zip: cannot be read: no such file or directory"},
		{filepath.Join(dir, "nope.dat"), "nope.dat: cannot be read: no such file or directory"},
	} {
		lay, _, err := ReadFile(tc.path, Options{})
		checkError(t, lay, err, []string{tc.want})
		if !errors.Is(err, os.ErrNotExist) {
			t.Errorf("%v does not wrap os.ErrNotExist", err)
		}
	}
	text := filepath.Join(dir, "notes.txt")
	os.WriteFile(text, []byte("hello"), 0o644)
	lay, _, err := ReadFile(text, Options{})
	checkError(t, lay, err, []string{"notes.txt: is neither a shapefile (.shp) nor a zip holding one"})

	// A zip and a .shp under other names are read by their first bytes.
	z, err := os.ReadFile(fixture(t, "states.shp.zip"))
	if err != nil {
		t.Fatal(err)
	}
	renamed := filepath.Join(dir, "states.download")
	os.WriteFile(renamed, z, 0o644)
	if lay, _, err := ReadFile(renamed, Options{IDColumn: "fips"}); err != nil || lay.Len() != 56 {
		t.Errorf("renamed zip: %v", err)
	}
	shp := writeFiles(t, dir, "areas", makeFiles(twoSquares, [][]string{{"a", "1"}, {"b", "2"}}))
	odd := strings.TrimSuffix(shp, ".shp") + ".shape"
	os.Rename(shp, odd)
	if lay, _, err := ReadFile(odd, Options{}); err != nil || lay.Len() != 2 {
		t.Errorf("renamed .shp: %v", err)
	}
	os.Rename(odd, shp)
	lay, _, err = ReadFile(shp, Options{Layer: "other"})
	checkError(t, lay, err, []string{`areas.shp: holds the one layer "areas", not "other"`})
}

func TestNumericIDs(t *testing.T) {
	shapes := []testShape{poly(square(0, 0, 1)), poly(square(1, 0, 1)), poly(square(2, 0, 1)), poly(square(3, 0, 1))}
	shp, shx := encodeShapes(shapePolygon, shapes)
	dbf := encodeDBF([]testField{{"GEOID", 'N', 20}, {"GEOID", 'C', 3}}, [][]string{{"48201", "x"}, {"12345678901234567", "x"}, {"1.50", "x"}, {"+7", "x"}}, 0)
	lay, warns := readFiles(t, files{".shp": shp, ".shx": shx, ".dbf": dbf}, Options{IDColumn: "geoid"})
	if got := strings.Join(lay.IDs, ","); got != "48201,12345678901234567,1.5,7" || lay.IDColumn != "GEOID" || len(lay.Columns) != 1 {
		t.Errorf("ids %s from %q, %d columns", got, lay.IDColumn, len(lay.Columns))
	}
	if !hasWarning(warns, `states.dbf: a second column is named "GEOID"; it is left out`) {
		t.Errorf("warnings %q", warns)
	}
}
