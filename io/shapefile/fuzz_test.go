package shapefile

import (
	"errors"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// FuzzRead feeds the reader a .shp, .shx and .dbf (and a .cpg text): it
// must never panic or hang, and every failure must be an *Error of one line
// naming a file, with no layer.
func FuzzRead(f *testing.F) {
	states := stateFiles(f)
	f.Add(states[".shp"], states[".shx"], states[".dbf"], "", false)
	rows := [][]string{{"a", "1"}, {"b", "*"}, {"*", "c", "3"}}
	holes := []testShape{poly(square(0, 0, 10), reversed(square(1, 1, 2)), reversed(square(20, 20, 1))), {}, poly(square(0, 0, 1)[:4])}
	for _, fs := range []files{makeFiles(holes, rows), makeFiles(twoSquares, [][]string{{"a", "1"}, {"a", ""}})} {
		f.Add(fs[".shp"], fs[".shx"], fs[".dbf"], "UTF-8", true)
	}
	shp, shx := encodeShapes(shapePolygonZ, []testShape{{typ: shapePolygonZ, parts: [][]orb.Point{square(500000, 4e6, 5)}}})
	f.Add(shp, shx, encodeDBF([]testField{{"name", 'C', 4}, {"d", 'D', 8}, {"l", 'L', 1}}, [][]string{{"Espa\xf1a", "20240101", "T"}}, 0x57), "1252", false)
	f.Fuzz(func(t *testing.T, shp, shx, dbf []byte, cpg string, idColumn bool) {
		fs := &fileSet{
			shp:   member{name: "f.shp", data: shp, ok: true},
			shx:   member{name: "f.shx", data: shx, ok: true},
			dbf:   member{name: "f.dbf", data: dbf, ok: true},
			cpg:   member{name: "f.cpg", data: []byte(cpg), ok: cpg != ""},
			where: "beside f.shp",
		}
		opt := Options{SkipBadGeometry: len(shp)%2 == 0}
		if idColumn {
			opt.IDColumn = "name"
		}
		lay, warns, err := read(fs, "f.shp", opt)
		for _, w := range warns {
			if strings.ContainsAny(w, "\n\r") || !strings.HasPrefix(w, "f.") {
				t.Fatalf("bad warning %q", w)
			}
		}
		if err != nil {
			var e *Error
			if lay != nil || !errors.As(err, &e) {
				t.Fatalf("error %T %v with layer %v", err, err, lay != nil)
			}
			if msg := err.Error(); strings.ContainsAny(msg, "\n\r") || !strings.HasPrefix(msg, "f.") {
				t.Fatalf("bad message %q", msg)
			}
			return
		}
		if lay.Len() == 0 || len(lay.Geoms) != lay.Len() {
			t.Fatalf("layer of %d ids and %d geometries", lay.Len(), len(lay.Geoms))
		}
		for _, c := range lay.Columns {
			if len(c.Missing) != lay.Len() {
				t.Fatalf("column %q has %d values for %d areas", c.Name, len(c.Missing), lay.Len())
			}
		}
	})
}
