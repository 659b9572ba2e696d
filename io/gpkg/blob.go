package gpkg

import (
	"encoding/binary"
	"fmt"
	"math"

	"github.com/paulmach/orb"
	geom "github.com/twpayne/go-geom"
	"github.com/twpayne/go-geom/encoding/wkb"
)

// A GeoPackage geometry blob (OGC 12-128r18, clause 2.1.3) is a header —
// magic "GP", version 0, a flags byte, the srs_id and an optional envelope —
// followed by the geometry in ISO well-known binary.
const (
	blobHeaderLen = 8
	flagEmpty     = 1 << 4
	flagExtended  = 1 << 5
)

// envelopeLen gives the size of each envelope kind (flags bits 1–3): none,
// xy, xyz, xym, xyzm. Kinds 5–7 are not defined.
var envelopeLen = [...]int{0, 32, 48, 48, 64}

// wkbTypeNames are the geometry types of ISO WKB by code, for messages.
var wkbTypeNames = [...]string{
	1: "Point", 2: "LineString", 3: "Polygon", 4: "MultiPoint", 5: "MultiLineString",
	6: "MultiPolygon", 7: "GeometryCollection", 8: "CircularString", 9: "CompoundCurve",
	10: "CurvePolygon", 11: "MultiCurve", 12: "MultiSurface", 13: "Curve", 14: "Surface",
	15: "PolyhedralSurface", 16: "TIN", 17: "Triangle",
}

const (
	wkbPolygon      = 3
	wkbMultiPolygon = 6
	wkbMultiSurface = 12
)

// badGeom says why a blob gives no area; skippable as for Error.Skippable.
type badGeom struct {
	msg       string
	skippable bool
}

func broken(format string, args ...any) *badGeom {
	return &badGeom{msg: fmt.Sprintf(format, args...)}
}

func notArea(format string, args ...any) *badGeom {
	return &badGeom{msg: fmt.Sprintf(format, args...), skippable: true}
}

// decodeBlob turns one geometry blob into polygons. Every length in the
// header and in the WKB is checked against the blob's size (checkWKB)
// before go-geom decodes it, so that a hostile blob cannot make it
// allocate more than the blob holds.
func decodeBlob(b []byte) (orb.MultiPolygon, *badGeom) {
	if len(b) < blobHeaderLen {
		return nil, broken("the geometry has %d bytes, fewer than the %d of a GeoPackage geometry header", len(b), blobHeaderLen)
	}
	if b[0] != 'G' || b[1] != 'P' {
		hint := ""
		if b[0] <= 1 {
			hint = " (it looks like bare WKB, without the GeoPackage header)"
		}
		return nil, broken("the geometry does not start with the GeoPackage magic \"GP\"%s", hint)
	}
	if b[2] != 0 {
		return nil, broken("the geometry header has version %d; GeoPackage 1.x writes version 0", b[2])
	}
	flags := b[3]
	if flags&flagExtended != 0 {
		return nil, notArea("the geometry is of an extended (non-standard) type; areas must be Polygon or MultiPolygon")
	}
	kind := int(flags>>1) & 7
	if kind >= len(envelopeLen) {
		return nil, broken("the geometry header has envelope code %d; codes 0 to 4 are defined", kind)
	}
	start := blobHeaderLen + envelopeLen[kind]
	if len(b) < start {
		return nil, broken("the geometry has %d bytes, fewer than its %d-byte header with envelope", len(b), start)
	}
	if flags&flagEmpty != 0 {
		return nil, notArea("has no geometry (an empty geometry); areas must be Polygon or MultiPolygon")
	}
	return decodeWKB(b[start:])
}

// decodeWKB checks the WKB, then decodes a Polygon or MultiPolygon with
// go-geom and converts it.
func decodeWKB(w []byte) (orb.MultiPolygon, *badGeom) {
	surface, bad := checkWKB(w)
	if bad != nil {
		return nil, bad
	}
	if surface {
		// A MultiSurface of Polygons is a MultiPolygon by another code,
		// which go-geom does not know: give it the MultiPolygon's (12 → 6,
		// 1012 → 1006, …).
		w = append([]byte(nil), w...)
		order := byteOrder(w[0])
		order.PutUint32(w[1:], order.Uint32(w[1:])-(wkbMultiSurface-wkbMultiPolygon))
	}
	g, err := wkb.Unmarshal(w)
	if err != nil {
		return nil, broken("the geometry cannot be decoded: %v", err)
	}
	switch g := g.(type) {
	case *geom.Polygon:
		return orb.MultiPolygon{toPolygon(g)}, nil
	case *geom.MultiPolygon:
		mp := make(orb.MultiPolygon, g.NumPolygons())
		for i := range mp {
			mp[i] = toPolygon(g.Polygon(i))
		}
		return mp, nil
	}
	return nil, broken("the geometry decodes as %T", g)
}

// toPolygon keeps x and y of each position, dropping Z and M.
func toPolygon(p *geom.Polygon) orb.Polygon {
	flat, stride := p.FlatCoords(), p.Stride()
	ends := p.Ends()
	poly := make(orb.Polygon, len(ends))
	begin := 0
	for i, end := range ends {
		ring := make(orb.Ring, (end-begin)/stride)
		for k := range ring {
			j := begin + k*stride
			ring[k] = orb.Point{flat[j], flat[j+1]}
		}
		poly[i], begin = ring, end
	}
	return poly
}

// wkbReader walks WKB without decoding it, checking each count against
// the bytes left.
type wkbReader struct {
	b   []byte
	off int
}

func (r *wkbReader) left() int { return len(r.b) - r.off }

// header reads a geometry's byte order and type code: base type (1 to 17)
// and the number of values per position (2, or 3 with Z or M, 4 with both).
func (r *wkbReader) header() (order binary.ByteOrder, base uint32, dims int, bad *badGeom) {
	if r.left() < 5 {
		return nil, 0, 0, broken("the geometry ends at byte %d, inside a WKB geometry header", len(r.b))
	}
	if order = byteOrder(r.b[r.off]); order == nil {
		return nil, 0, 0, broken("the WKB geometry has byte order mark %d at byte %d; 0 or 1 expected", r.b[r.off], r.off)
	}
	code := order.Uint32(r.b[r.off+1:])
	r.off += 5
	base, z := code%1000, code/1000
	if z > 3 || base == 0 || int(base) >= len(wkbTypeNames) {
		return nil, 0, 0, broken("the WKB geometry type code %d is not one of ISO WKB's", code)
	}
	return order, base, 2 + int(z+1)/2, nil // Z or M: 3 values; ZM: 4
}

// byteOrder reads WKB's byte order mark; nil for a bad one.
func byteOrder(mark byte) binary.ByteOrder {
	switch mark {
	case 0:
		return binary.BigEndian
	case 1:
		return binary.LittleEndian
	}
	return nil
}

// count reads a uint32 count of items of at least minSize bytes each, and
// refuses one the bytes left cannot hold.
func (r *wkbReader) count(order binary.ByteOrder, minSize int, what string) (int, *badGeom) {
	if r.left() < 4 {
		return 0, broken("the geometry ends at byte %d, before the count of %s", len(r.b), what)
	}
	n := uint64(order.Uint32(r.b[r.off:]))
	r.off += 4
	if n*uint64(minSize) > uint64(r.left()) {
		return 0, broken("the geometry claims %d %s, more than its remaining %d bytes hold", n, what, r.left())
	}
	return int(n), nil
}

// polygon walks the rings of a polygon whose header has been read.
func (r *wkbReader) polygon(order binary.ByteOrder, dims int) *badGeom {
	rings, bad := r.count(order, 4, "rings")
	if bad != nil {
		return bad
	}
	for range rings {
		n, bad := r.count(order, 8*dims, "positions")
		if bad != nil {
			return bad
		}
		r.off += n * 8 * dims
	}
	return nil
}

// checkWKB accepts a Polygon or MultiPolygon (with Z, M or both) whose
// every count fits the bytes given, or a MultiSurface of Polygons (surface),
// and says what else it is.
func checkWKB(w []byte) (surface bool, bad *badGeom) {
	r := &wkbReader{b: w}
	order, base, dims, bad := r.header()
	if bad != nil {
		return false, bad
	}
	switch base {
	case wkbPolygon:
		return false, r.polygon(order, dims)
	case wkbMultiPolygon, wkbMultiSurface:
	case 10, 14: // CurvePolygon, Surface
		return false, curved(base)
	default:
		return false, notArea("the geometry is a %s; areas must be Polygon or MultiPolygon", wkbTypeNames[base])
	}
	parts, bad := r.count(order, 9, "polygons")
	if bad != nil {
		return false, bad
	}
	for i := range parts {
		porder, pbase, pdims, bad := r.header()
		switch {
		case bad != nil:
			return false, bad
		case pbase == 10 || pbase == 14:
			return false, curved(pbase)
		case pbase != wkbPolygon || pdims != dims:
			return false, broken("part %d of the %s is a %s with %d values per position, not a Polygon with %d", i+1, wkbTypeNames[base], wkbTypeNames[pbase], pdims, dims)
		}
		if bad := r.polygon(porder, dims); bad != nil {
			return false, bad
		}
	}
	return base == wkbMultiSurface, nil
}

// curved is the error for a curved type.
func curved(base uint32) *badGeom {
	return broken("the geometry is a %s; curved geometry is not read: convert the layer to Polygon or MultiPolygon (linear rings)", wkbTypeNames[base])
}

// appendBlob appends the GeoPackage blob of mp: a little-endian header
// with srs_id and xy envelope, then ISO WKB MultiPolygon, little-endian.
func appendBlob(dst []byte, mp orb.MultiPolygon, srsID int32) []byte {
	le := binary.LittleEndian
	bound := mp.Bound()
	dst = append(dst, 'G', 'P', 0, 1|1<<1) // little-endian, xy envelope
	dst = le.AppendUint32(dst, uint32(srsID))
	for _, v := range [4]float64{bound.Min[0], bound.Max[0], bound.Min[1], bound.Max[1]} {
		dst = le.AppendUint64(dst, math.Float64bits(v))
	}
	dst = append(dst, 1)
	dst = le.AppendUint32(dst, wkbMultiPolygon)
	dst = le.AppendUint32(dst, uint32(len(mp)))
	for _, poly := range mp {
		dst = append(dst, 1)
		dst = le.AppendUint32(dst, wkbPolygon)
		dst = le.AppendUint32(dst, uint32(len(poly)))
		for _, ring := range poly {
			dst = le.AppendUint32(dst, uint32(len(ring)))
			for _, p := range ring {
				dst = le.AppendUint64(dst, math.Float64bits(p[0]))
				dst = le.AppendUint64(dst, math.Float64bits(p[1]))
			}
		}
	}
	return dst
}
