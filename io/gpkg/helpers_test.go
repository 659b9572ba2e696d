package gpkg

import (
	"bytes"
	"database/sql"
	"encoding/binary"
	"math"
	"os"
	"path/filepath"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

// square is the unit square moved by (x, y), as one polygon part.
func square(x, y float64) orb.MultiPolygon {
	return orb.MultiPolygon{{{{x, y}, {x + 1, y}, {x + 1, y + 1}, {x, y + 1}, {x, y}}}}
}

// smallLayer is three squares with a text, a number and a code column.
func smallLayer() *layer.Layer {
	name, pop, code := layer.NewBuilder("name", 0), layer.NewBuilder("pop", 0), layer.NewBuilder("code", 0)
	for i, s := range []string{"Ash", "Birch", ""} {
		name.AddText(s)
		pop.AddNumber(float64(100*(i+1))+0.5, "")
		code.AddText([]string{"01001", "01003", "NA"}[i])
	}
	return &layer.Layer{
		Source:  "small",
		IDs:     []string{"a", "b", "c"},
		Geoms:   []orb.MultiPolygon{square(0, 0), square(1, 0), square(0, 1)},
		Columns: []*layer.Column{name.Column(), pop.Column(), code.Column()},
	}
}

// writeFile writes l with Write to dir/name and returns the path.
func writeFile(t testing.TB, dir, name string, l *layer.Layer, extra []*layer.Column, table string) string {
	t.Helper()
	var buf bytes.Buffer
	if err := Write(&buf, l, extra, table); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// alter runs statements on the database at path, read-write; args go to
// the last one.
func alter(t testing.TB, path string, stmts []string, args ...any) {
	t.Helper()
	db, err := sql.Open("sqlite", path)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	for i, s := range stmts {
		var a []any
		if i == len(stmts)-1 {
			a = args
		}
		if _, err := db.Exec(s, a...); err != nil {
			t.Fatalf("%s: %v", s, err)
		}
	}
}

// blob builds a geometry blob: header (byte order of the header, envelope
// kind, extra flags), then wkb.
func blob(bigEndian bool, envelope int, flags byte, wkb []byte) []byte {
	var order endian = binary.LittleEndian
	f := byte(envelope<<1) | flags
	if bigEndian {
		order = binary.BigEndian
	} else {
		f |= 1
	}
	b := []byte{'G', 'P', 0, f}
	b = order.AppendUint32(b, 4326)
	for range envelopeLen[envelope] / 8 {
		b = order.AppendUint64(b, math.Float64bits(0))
	}
	return append(b, wkb...)
}

// endian is a byte order that appends.
type endian interface {
	binary.ByteOrder
	binary.AppendByteOrder
}

// wkbBuf writes WKB by hand, in one byte order.
type wkbBuf struct {
	order endian
	b     []byte
}

func newWKB(bigEndian bool) *wkbBuf {
	if bigEndian {
		return &wkbBuf{order: binary.BigEndian, b: []byte{0}}
	}
	return &wkbBuf{order: binary.LittleEndian, b: []byte{1}}
}

func (w *wkbBuf) u32(v uint32) *wkbBuf { w.b = w.order.AppendUint32(w.b, v); return w }

func (w *wkbBuf) f64(vs ...float64) *wkbBuf {
	for _, v := range vs {
		w.b = w.order.AppendUint64(w.b, math.Float64bits(v))
	}
	return w
}

// polygonWKB is a unit square with dims values per position (the extra
// ones 7), of type code typ (3, 1003, 2003, 3003).
func polygonWKB(bigEndian bool, typ uint32, dims int) []byte {
	w := newWKB(bigEndian).u32(typ).u32(1).u32(5)
	for _, p := range [][2]float64{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {0, 0}} {
		w.f64(p[0], p[1])
		for range dims - 2 {
			w.f64(7)
		}
	}
	return w.b
}

func pointWKB() []byte { return newWKB(false).u32(1).f64(2, 3).b }
