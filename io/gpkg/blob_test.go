package gpkg

import (
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

// TestBlobVariants: both byte orders of header and WKB, every envelope
// kind, Z, M and ZM positions (dropped), Polygon and MultiPolygon.
func TestBlobVariants(t *testing.T) {
	want := orb.Ring{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {0, 0}}
	for _, headerBE := range []bool{false, true} {
		for _, wkbBE := range []bool{false, true} {
			for env := range envelopeLen {
				for _, typ := range []uint32{3, 1003, 2003, 3003} {
					dims := []int{2, 3, 3, 4}[typ/1000]
					poly := polygonWKB(wkbBE, typ, dims)
					multi := append(newWKB(!wkbBE).u32(typ+3).u32(2).b, append(poly, poly...)...)
					for parts, w := range map[int][]byte{1: poly, 2: multi} {
						mp, bad := decodeBlob(blob(headerBE, env, 0, w))
						if bad != nil || len(mp) != parts || !slices.Equal(mp[0][0], want) || !slices.Equal(mp[parts-1][0], want) {
							t.Errorf("header BE %v, WKB BE %v, envelope %d, type %d, %d parts: %v %v", headerBE, wkbBE, env, typ, parts, mp, bad)
						}
					}
				}
			}
		}
	}
}

// TestAppendBlob: the blob Write stores decodes to what was written, with
// the xy envelope of the geometry.
func TestAppendBlob(t *testing.T) {
	mp := orb.MultiPolygon{square(2, 3)[0], {{{-1, -1}, {0, -1}, {0, 0}, {-1, -1}}, {{-0.5, -0.9}, {-0.1, -0.8}, {-0.2, -0.3}, {-0.5, -0.9}}}}
	b := appendBlob(nil, mp, 5070)
	if string(b[:4]) != "GP\x00\x03" || b[4] != 0xce || b[5] != 0x13 {
		t.Fatalf("header % x", b[:8])
	}
	got, bad := decodeBlob(b)
	if bad != nil || len(got) != 2 || len(got[1]) != 2 || !slices.Equal(got[1][1], mp[1][1]) {
		t.Fatalf("%v %v", got, bad)
	}
}

// TestMultiSurface: a MultiSurface of Polygons reads as a MultiPolygon; a
// curved part is an error naming it, and so is a CurvePolygon.
func TestMultiSurface(t *testing.T) {
	poly := polygonWKB(true, 1003, 3)
	mp, bad := decodeBlob(blob(false, 0, 0, append(newWKB(false).u32(1012).u32(2).b, append(poly, poly...)...)))
	if bad != nil || len(mp) != 2 || len(mp[1][0]) != 5 {
		t.Fatalf("%v %v", mp, bad)
	}
	curvedPart := append(newWKB(false).u32(12).u32(1).b, newWKB(false).u32(10).u32(0).b...)
	for _, w := range [][]byte{curvedPart, newWKB(true).u32(10).u32(0).b} {
		if _, bad := decodeBlob(blob(false, 0, 0, w)); bad == nil || bad.skippable || bad.msg != "the geometry is a CurvePolygon; curved geometry is not read: convert the layer to Polygon or MultiPolygon (linear rings)" {
			t.Errorf("%v", bad)
		}
	}
}
