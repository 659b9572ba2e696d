package gpkg

import (
	"database/sql"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/areatest/areatest/tests/testkit"
)

// fixtureBlobs gives the geometry blobs of three small areas of the
// fixture (one polygon, two multipart), as seeds.
func fixtureBlobs(f *testing.F) [][]byte {
	db, err := sql.Open("sqlite", "file:"+testkit.Testdata(f, "formats/states.gpkg")+"?mode=ro&immutable=1")
	if err != nil {
		f.Fatal(err)
	}
	defer db.Close()
	rows, err := db.Query(`SELECT geom FROM states WHERE fid IN (9, 52, 56) ORDER BY fid`)
	if err != nil {
		f.Fatal(err)
	}
	defer rows.Close()
	var out [][]byte
	for rows.Next() {
		var b []byte
		if err := rows.Scan(&b); err != nil {
			f.Fatal(err)
		}
		out = append(out, b)
	}
	return out
}

// FuzzReadBlob: the geometry blob decoder never panics, and what it
// accepts is polygons whose positions the blob held.
func FuzzReadBlob(f *testing.F) {
	for _, b := range fixtureBlobs(f) {
		f.Add(b)
	}
	f.Add(appendBlob(nil, square(0, 0), 4326))
	f.Add(blob(true, 4, 0, polygonWKB(true, 3003, 4)))
	f.Add(blob(false, 2, 0, append(newWKB(false).u32(1006).u32(1).b, polygonWKB(true, 1003, 3)...)))
	f.Add(blob(false, 0, flagEmpty, nil))
	f.Add(blob(false, 0, 0, pointWKB()))
	f.Fuzz(func(t *testing.T, b []byte) {
		mp, bad := decodeBlob(b)
		if bad != nil {
			if mp != nil || bad.msg == "" || strings.ContainsAny(bad.msg, "\n\r") {
				t.Fatalf("%v with %q", mp, bad.msg)
			}
			return
		}
		n := 0
		for _, p := range mp {
			for _, r := range p {
				n += len(r)
			}
		}
		if n*16 > len(b) {
			t.Fatalf("%d positions from %d bytes", n, len(b))
		}
	})
}

// FuzzReadFile: any file, read as a GeoPackage, gives a layer or an
// *Error of one line naming the file; never a panic, never a file beside
// it.
func FuzzReadFile(f *testing.F) {
	dir := f.TempDir()
	small := writeFile(f, dir, "small.gpkg", smallLayer(), nil, "")
	for _, p := range []string{small, testkit.Testdata(f, "formats/states.gpkg")} {
		b, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b, "")
	}
	f.Add([]byte(sqliteMagic), "id")
	f.Add([]byte("not a database"), "")
	f.Fuzz(func(t *testing.T, data []byte, idColumn string) {
		dir := t.TempDir()
		path := filepath.Join(dir, "fuzz.gpkg")
		if err := os.WriteFile(path, data, 0o644); err != nil {
			t.Fatal(err)
		}
		lay, _, err := ReadFile(path, Options{IDColumn: idColumn, SkipBadGeometry: len(data)%2 == 0})
		if err != nil {
			var e *Error
			if lay != nil || !errors.As(err, &e) {
				t.Fatalf("%T %v with layer %v", err, err, lay)
			}
			if msg := err.Error(); strings.ContainsAny(msg, "\n\r") || !strings.HasPrefix(msg, path) {
				t.Fatalf("bad message %q", msg)
			}
		} else if lay.Len() == 0 || len(lay.Geoms) != lay.Len() {
			t.Fatalf("layer of %d ids, %d geometries", lay.Len(), len(lay.Geoms))
		}
		if left := listDir(t, dir); len(left) != 1 {
			t.Fatalf("files %v", left)
		}
	})
}
