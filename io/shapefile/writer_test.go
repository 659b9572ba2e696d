package shapefile

import (
	"archive/zip"
	"bytes"
	"encoding/binary"
	"maps"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// A minimal writer of shapefiles, for the tests and the benchmark only: it
// writes what the description requires and nothing a reader could miss.

// testShape is one record: its shape type (0 null) and its parts.
type testShape struct {
	typ   int32
	parts [][]orb.Point
}

func poly(parts ...[]orb.Point) testShape { return testShape{typ: shapePolygon, parts: parts} }

// square is a closed clockwise ring (a shell) of side s at (x, y).
func square(x, y, s float64) []orb.Point {
	return []orb.Point{{x, y}, {x, y + s}, {x + s, y + s}, {x + s, y}, {x, y}}
}

// reversed is the ring wound the other way (a hole, for a square).
func reversed(r []orb.Point) []orb.Point {
	out := make([]orb.Point, len(r))
	for i, p := range r {
		out[len(r)-1-i] = p
	}
	return out
}

// encodeShapes writes the .shp and .shx of a file of shape type fileType.
func encodeShapes(fileType int32, shapes []testShape) (shp, shx []byte) {
	var body, index bytes.Buffer
	off := headerSize
	for i, s := range shapes {
		c := shapeContent(s)
		be32(&body, int32(i+1))
		be32(&body, int32(len(c)/2))
		body.Write(c)
		be32(&index, int32(off/2))
		be32(&index, int32(len(c)/2))
		off += 8 + len(c)
	}
	return append(fileHeader(fileType, headerSize+body.Len()), body.Bytes()...),
		append(fileHeader(fileType, headerSize+index.Len()), index.Bytes()...)
}

func fileHeader(fileType int32, size int) []byte {
	h := make([]byte, headerSize)
	binary.BigEndian.PutUint32(h, fileCode)
	binary.BigEndian.PutUint32(h[24:], uint32(size/2))
	binary.LittleEndian.PutUint32(h[28:], version)
	binary.LittleEndian.PutUint32(h[32:], uint32(fileType))
	return h
}

func shapeContent(s testShape) []byte {
	var c bytes.Buffer
	le32(&c, s.typ)
	switch s.typ {
	case shapeNull:
	case 1:
		p := s.parts[0][0]
		leFloat(&c, p[0], p[1])
	default:
		var all []orb.Point
		for _, p := range s.parts {
			all = append(all, p...)
		}
		b := orb.MultiPoint(all).Bound()
		leFloat(&c, b.Min[0], b.Min[1], b.Max[0], b.Max[1])
		le32(&c, int32(len(s.parts)))
		le32(&c, int32(len(all)))
		start := 0
		for _, p := range s.parts {
			le32(&c, int32(start))
			start += len(p)
		}
		for _, p := range all {
			leFloat(&c, p[0], p[1])
		}
		if s.typ == shapePolygonZ { // Z range and values, then M
			for range 2 {
				leFloat(&c, 0, 100)
				for k := range all {
					leFloat(&c, float64(k))
				}
			}
		}
	}
	return c.Bytes()
}

func be32(b *bytes.Buffer, v int32) { b.Write(binary.BigEndian.AppendUint32(nil, uint32(v))) }
func le32(b *bytes.Buffer, v int32) { b.Write(binary.LittleEndian.AppendUint32(nil, uint32(v))) }

func leFloat(b *bytes.Buffer, vs ...float64) {
	for _, v := range vs {
		b.Write(binary.LittleEndian.AppendUint64(nil, math.Float64bits(v)))
	}
}

// testField is a column of the table: name, dBASE type and width.
type testField struct {
	name string
	typ  byte
	size int
}

// encodeDBF writes a dBASE table; a row whose first value is "*" is
// marked deleted (the value itself is not written). Text is written as
// given, in whatever code page the test means.
func encodeDBF(fields []testField, rows [][]string, ldid byte) []byte {
	recLen := 1
	for _, f := range fields {
		recLen += f.size
	}
	headerLen := dbfHeader + fieldDesc*len(fields) + 1
	var b bytes.Buffer
	h := make([]byte, dbfHeader)
	h[0], h[1], h[2], h[3] = 3, 124, 1, 1
	binary.LittleEndian.PutUint32(h[4:], uint32(len(rows)))
	binary.LittleEndian.PutUint16(h[8:], uint16(headerLen))
	binary.LittleEndian.PutUint16(h[10:], uint16(recLen))
	h[29] = ldid
	b.Write(h)
	for _, f := range fields {
		d := make([]byte, fieldDesc)
		copy(d, f.name)
		d[11], d[16] = f.typ, byte(f.size)
		b.Write(d)
	}
	b.WriteByte(fieldsEnd)
	for _, row := range rows {
		flag := byte(' ')
		if len(row) > len(fields) && row[0] == "*" {
			flag, row = deletedRec, row[1:]
		}
		b.WriteByte(flag)
		for k, f := range fields {
			v := row[k]
			pad := strings.Repeat(" ", max(0, f.size-len(v)))
			if f.typ == 'N' || f.typ == 'F' {
				v = pad + v
			} else {
				v += pad
			}
			b.WriteString(v[:f.size])
		}
	}
	b.WriteByte(0x1A)
	return b.Bytes()
}

// files is a shapefile as bytes by extension (".shp", ".dbf", …).
type files map[string][]byte

// makeFiles writes a polygon shapefile with one C field "name" and one N
// field "value"; rows give name and value per shape.
func makeFiles(shapes []testShape, rows [][]string) files {
	shp, shx := encodeShapes(shapePolygon, shapes)
	return files{".shp": shp, ".shx": shx, ".dbf": encodeDBF([]testField{{"name", 'C', 20}, {"value", 'N', 10}}, rows, 0)}
}

// writeFiles writes fs into dir as base plus each extension and returns
// the path of the .shp.
func writeFiles(t testing.TB, dir, base string, fs files) string {
	t.Helper()
	for ext, data := range fs {
		if err := os.WriteFile(filepath.Join(dir, base+ext), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return filepath.Join(dir, base+".shp")
}

// zipFiles packs files named by their path inside the zip.
func zipFiles(t testing.TB, members map[string][]byte) []byte {
	t.Helper()
	var b bytes.Buffer
	zw := zip.NewWriter(&b)
	for _, name := range slices.Sorted(maps.Keys(members)) {
		w, err := zw.Create(name)
		if err != nil {
			t.Fatal(err)
		}
		w.Write(members[name])
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}
