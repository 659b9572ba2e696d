package shapefile

import (
	"encoding/binary"
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// The main file and the index share a 100-byte header: the file code
// (big-endian), the file length in 16-bit words (big-endian), the version
// and the shape type (little-endian), then the bounding box.
const (
	fileCode   = 9994
	version    = 1000
	headerSize = 100
	indexEntry = 8 // offset and content length, in 16-bit words, big-endian
)

// Shape types of the description. Only the polygons make areas.
const (
	shapeNull     = 0
	shapePolygon  = 5
	shapePolygonZ = 15
	shapePolygonM = 25
)

var shapeNames = map[int32]string{
	0: "Null", 1: "Point", 3: "PolyLine", 5: "Polygon", 8: "MultiPoint",
	11: "PointZ", 13: "PolyLineZ", 15: "PolygonZ", 18: "MultiPointZ",
	21: "PointM", 23: "PolyLineM", 25: "PolygonM", 28: "MultiPointM", 31: "MultiPatch",
}

func isPolygon(t int32) bool {
	return t == shapePolygon || t == shapePolygonZ || t == shapePolygonM
}

// shapeKind says in words what a file of a shape type that is not a
// polygon holds.
func shapeKind(t int32) string {
	switch t {
	case 1, 11, 21:
		return "points"
	case 8, 18, 28:
		return "groups of points"
	case 3, 13, 23:
		return "lines"
	case 31:
		return "3-D surfaces"
	}
	return ""
}

// checkHeader reads the shape type from the header of a .shp or .shx.
func checkHeader(m member, what string) (int32, *Error) {
	if len(m.data) < headerSize {
		return 0, errorf(m.name, 0, "is %d bytes long, shorter than the %d-byte header of a shapefile %s; is it cut short?", len(m.data), headerSize, what)
	}
	if !Sniff(m.data[:32]) {
		return 0, errorf(m.name, 0, "does not start as a shapefile %s does (file code 9994, version 1000)", what)
	}
	return int32(binary.LittleEndian.Uint32(m.data[32:])), nil
}

// checkShapeType accepts polygon files (and files of null shapes only) and
// names what any other file holds.
func checkShapeType(m member, t int32) *Error {
	if isPolygon(t) || t == shapeNull {
		return nil
	}
	if kind := shapeKind(t); kind != "" {
		return errorf(m.name, 0, "the shapefile holds %s (%s); areas must be polygons", kind, shapeNames[t])
	}
	return errorf(m.name, 0, "has shape type %d, which the shapefile description does not define", t)
}

// index is the .shx: where each record of the .shp starts.
type index struct {
	m member
	n int // records
}

func newIndex(m member) (index, *Error) {
	body := len(m.data) - headerSize
	if body%indexEntry != 0 {
		return index{}, errorf(m.name, 0, "holds %d bytes after its header, not a whole number of %d-byte entries; is it cut short?", body, indexEntry)
	}
	return index{m: m, n: body / indexEntry}, nil
}

// offset is where record i (0-based) starts in the .shp, in bytes.
func (x index) offset(i int) int64 {
	return 2 * int64(binary.BigEndian.Uint32(x.m.data[headerSize+indexEntry*i:]))
}

// content returns the content of record i (0-based) of the .shp, after its
// 8-byte header, or the message for a record that does not fit in the
// file.
func content(shp member, x index, i int) ([]byte, string) {
	size := int64(len(shp.data))
	off := x.offset(i)
	if off < headerSize || off+8 > size {
		return nil, fmt.Sprintf("starts at byte %d by the index %s, beyond the end of the .shp (%d bytes); is the .shp cut short?", off, x.m.name, size)
	}
	n := 2 * int64(binary.BigEndian.Uint32(shp.data[off+4:]))
	if off+8+n > size {
		return nil, fmt.Sprintf("has %d bytes of content from byte %d, past the end of the .shp (%d bytes); is the file cut short?", n, off+8, size)
	}
	return shp.data[off+8 : off+8+n], ""
}

// shape decodes a record's content into rings, one per part, all sharing
// one slice of points (each capped at its length, so that closing one
// cannot overwrite the next). skippable marks a record without polygon
// geometry; msg is empty when the record is good.
func shape(c []byte) (rings []orb.Ring, skippable bool, msg string) {
	if len(c) < 4 {
		return nil, false, fmt.Sprintf("has %d bytes of content, too few for a shape type", len(c))
	}
	t := int32(binary.LittleEndian.Uint32(c))
	switch {
	case t == shapeNull:
		return nil, true, "has no geometry (a null shape); areas must be polygons"
	case !isPolygon(t):
		if name, ok := shapeNames[t]; ok {
			return nil, true, fmt.Sprintf("is a %s shape; areas must be polygons", name)
		}
		return nil, false, fmt.Sprintf("has shape type %d, which the shapefile description does not define", t)
	case len(c) < 44:
		return nil, false, fmt.Sprintf("is a polygon of %d bytes, too few for its bounding box and counts (44)", len(c))
	}
	nParts := int64(int32(binary.LittleEndian.Uint32(c[36:])))
	nPoints := int64(int32(binary.LittleEndian.Uint32(c[40:])))
	switch {
	case nParts < 0 || nPoints < 0:
		return nil, false, fmt.Sprintf("says it has %d parts and %d points", nParts, nPoints)
	case nParts == 0 || nPoints == 0:
		return nil, true, "has no geometry (a polygon with no parts); areas must be polygons"
	case 44+4*nParts+16*nPoints > int64(len(c)):
		return nil, false, fmt.Sprintf("says it has %d parts and %d points, which need %d bytes, but its content is %d bytes", nParts, nPoints, 44+4*nParts+16*nPoints, len(c))
	}
	pts := make([]orb.Point, nPoints)
	at := 44 + 4*nParts
	for k := range pts {
		o := at + 16*int64(k)
		pts[k] = orb.Point{
			math.Float64frombits(binary.LittleEndian.Uint64(c[o:])),
			math.Float64frombits(binary.LittleEndian.Uint64(c[o+8:])),
		}
	}
	rings = make([]orb.Ring, nParts)
	for p := range rings {
		start := int64(int32(binary.LittleEndian.Uint32(c[44+4*p:])))
		end := nPoints
		if p+1 < len(rings) {
			end = int64(int32(binary.LittleEndian.Uint32(c[44+4*(p+1):])))
		}
		switch {
		case p == 0 && start != 0:
			return nil, false, fmt.Sprintf("has its first part start at point %d; it must start at point 0", start)
		case end <= start || end > nPoints:
			return nil, false, fmt.Sprintf("has part %d from point %d to point %d of %d; parts must hold points, in order", p+1, start, end, nPoints)
		}
		rings[p] = orb.Ring(pts[start:end:end])
	}
	return rings, false, ""
}
