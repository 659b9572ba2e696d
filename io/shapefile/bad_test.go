package shapefile

import (
	"bytes"
	"encoding/binary"
	"errors"
	"os"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

// stateFiles is the states shapefile as bytes by extension, to edit.
func stateFiles(t testing.TB) files {
	t.Helper()
	dir := t.TempDir()
	shp := unzipTo(t, "states.shp.zip", dir)
	fs := files{}
	for _, ext := range []string{".shp", ".shx", ".dbf", ".prj"} {
		data, err := os.ReadFile(strings.TrimSuffix(shp, ".shp") + ext)
		if err != nil {
			t.Fatal(err)
		}
		fs[ext] = data
	}
	return fs
}

// skippable in a TestBadInput case says the error must be marked
// Skippable; every other error must not be.
const skippable = "\x00skippable"

var twoSquares = []testShape{poly(square(0, 0, 1)), poly(square(2, 0, 1))}

// TestBadInput: each case is a clear error naming the file, the record
// when there is one, and what is wrong, and no layer comes with it.
func TestBadInput(t *testing.T) {
	states := stateFiles(t)
	edit := func(f func(fs files)) files {
		fs := files{}
		for ext, data := range states {
			fs[ext] = bytes.Clone(data)
		}
		f(fs)
		return fs
	}
	points, pointsIdx := encodeShapes(1, []testShape{{typ: 1, parts: [][]orb.Point{{{1, 2}}}}})
	lines, linesIdx := encodeShapes(3, []testShape{{typ: 3, parts: [][]orb.Point{{{0, 0}, {1, 1}}}}})
	rows := [][]string{{"a", "1"}, {"b", "2"}}
	far := makeFiles([]testShape{poly(square(500000, 4e6, 100)), poly(square(2, 0, 1))}, rows)
	far[".prj"] = states[".prj"]
	hostile := makeFiles(twoSquares, rows)
	binary.LittleEndian.PutUint32(hostile[".shp"][100+8+36:], 1<<30) // parts of record 1
	shared := makeFiles(twoSquares, rows)
	copy(shared[".shx"][108:], shared[".shx"][100:108]) // both entries at record 1,
	shared[".shp"] = shared[".shp"][:100+8+128]         // the only one left
	for _, tc := range []struct {
		name string
		fs   files
		opt  Options
		want []string
	}{
		{"truncated .shp", edit(func(fs files) { fs[".shp"] = fs[".shp"][:len(fs[".shp"])/2] }), Options{},
			[]string{"/states.shp: record 19: has 7196 bytes of content from byte 115188", "past the end of the .shp", "cut short"}},
		{"truncated .shp, whole records gone", edit(func(fs files) { fs[".shp"] = fs[".shp"][:100] }), Options{},
			[]string{"/states.shp: record 1: starts at byte 100", "beyond the end of the .shp (100 bytes)"}},
		{"record counts differ", edit(func(fs files) { binary.LittleEndian.PutUint32(fs[".dbf"][4:], 55) }), Options{},
			[]string{"/states.dbf: holds 55 records, while the index states.shx lists 56 shapes"}},
		{"truncated .dbf", edit(func(fs files) { fs[".dbf"] = fs[".dbf"][:5000] }), Options{},
			[]string{"/states.dbf: says it holds 56 records", "cut short"}},
		{"missing .shx", edit(func(fs files) { delete(fs, ".shx") }), Options{},
			[]string{"/states.shp: the index states.shx is missing beside states.shp; a shapefile needs its .shx"}},
		{"missing .dbf", edit(func(fs files) { delete(fs, ".dbf") }), Options{},
			[]string{"/states.shp: the table states.dbf is missing beside states.shp; a shapefile needs its .dbf"}},
		{"points", files{".shp": points, ".shx": pointsIdx, ".dbf": encodeDBF(nil, [][]string{{}}, 0)}, Options{},
			[]string{"/states.shp: the shapefile holds points (Point); areas must be polygons"}},
		{"lines", files{".shp": lines, ".shx": linesIdx, ".dbf": encodeDBF(nil, [][]string{{}}, 0)}, Options{},
			[]string{"/states.shp: the shapefile holds lines (PolyLine); areas must be polygons"}},
		{"not a shapefile", edit(func(fs files) { copy(fs[".shp"], "hello") }), Options{},
			[]string{"/states.shp: does not start as a shapefile main file (.shp) does"}},
		{"null shape", makeFiles([]testShape{poly(square(0, 0, 1)), {}}, rows), Options{IDColumn: "name"},
			[]string{`/states.shp: record 2 (id "b"): has no geometry (a null shape)`, skippable}},
		{"no parts", makeFiles([]testShape{poly(), poly(square(0, 0, 1))}, rows), Options{},
			[]string{`/states.shp: record 1: has no geometry (a polygon with no parts)`, skippable}},
		{"short ring", makeFiles([]testShape{poly([]orb.Point{{0, 0}, {1, 1}, {0, 0}}), poly(square(0, 0, 1))}, rows), Options{},
			[]string{`/states.shp: record 1: ring 1 has 3 positions`}},
		{"hostile part count", hostile, Options{},
			[]string{`/states.shp: record 1: says it has 1073741824 parts and 5 points, which need 4294967420 bytes, but its content is 128 bytes`}},
		{"index entries sharing a record", shared, Options{},
			[]string{`/states.shp: record 2: overlaps other records: by the index states.shx the records' contents add up to more than the .shp holds`}},
		{"duplicate id", makeFiles(twoSquares, [][]string{{"a", "1"}, {"a", "2"}}), Options{IDColumn: "name"},
			[]string{`/states.dbf: record 2 (id "a"), column "name": has the same id as record 1; ids must be unique`}},
		{"empty id", makeFiles(twoSquares, [][]string{{"a", "1"}, {"", "2"}}), Options{IDColumn: "name"},
			[]string{`/states.dbf: record 2, column "name": is empty; every area needs an id`}},
		{"no such id column", makeFiles(twoSquares, rows), Options{IDColumn: "GEOID"},
			[]string{`/states.dbf: has no column "GEOID" to take the ids from (its columns: "name", "value")`}},
		{"geographic .prj, projected coordinates", far, Options{},
			[]string{`/states.shp: record 1: has the coordinate [500000, 4e+06], which is not a longitude/latitude, though states.prj defines the geographic system "GCS_WGS_1984"`}},
		{"no records", makeFiles(nil, nil), Options{}, []string{"/states.shp: holds no records; the layer is empty"}},
		{"only deleted records", makeFiles(twoSquares, [][]string{{"*", "a", "1"}, {"*", "b", "2"}}), Options{},
			[]string{"/states.shp: all 2 records are marked deleted in the table; no areas remain"}},
		{"all left out", makeFiles([]testShape{{}, {}}, rows), Options{SkipBadGeometry: true},
			[]string{"/states.shp: all 2 records were left out", "no areas remain"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			path := writeFiles(t, t.TempDir(), "states", tc.fs)
			lay, _, err := ReadFile(path, tc.opt)
			checkError(t, lay, err, tc.want)
		})
	}
}

// checkError checks that err is an *Error of one line holding every wanted
// piece (and marked Skippable when the pieces say so), with no layer.
func checkError(t *testing.T, lay *layer.Layer, err error, want []string) {
	t.Helper()
	var e *Error
	if !errors.As(err, &e) {
		t.Fatalf("error %v (%T), want an *Error", err, err)
	}
	if lay != nil {
		t.Errorf("a layer came with the error")
	}
	msg := err.Error()
	if strings.ContainsAny(msg, "\n\r") {
		t.Errorf("message of several lines: %q", msg)
	}
	wantSkip := false
	for _, w := range want {
		if w == skippable {
			wantSkip = true
		} else if !strings.Contains(msg, w) {
			t.Errorf("message %q lacks %q", msg, w)
		}
	}
	if e.Skippable != wantSkip {
		t.Errorf("Skippable %v for %q", e.Skippable, msg)
	}
}
