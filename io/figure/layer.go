package figure

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// flatLayer holds every area's rings, projected, in flat arrays, so a map
// of many areas is projected once and walked cheaply afterwards.
type flatLayer struct {
	pts                    []pt
	ringEnd                []int  // end of ring r in pts
	ringHole               []bool // ring r is a hole
	areaRing               []int  // area i has rings areaRing[i] … areaRing[i+1]−1
	partRing               []int  // the same for parts (polygons), all areas together
	partArea               []int  // the area of each part
	minX, minY, maxX, maxY float64
}

func flatten(geoms []orb.MultiPolygon, proj projector) (*flatLayer, error) {
	if len(geoms) == 0 {
		return nil, fmt.Errorf("plot: no areas to draw")
	}
	var nPts, nRings, nParts int
	for i, mp := range geoms {
		if len(mp) == 0 {
			return nil, fmt.Errorf("plot: area %d has no polygon", i+1)
		}
		nParts += len(mp)
		for _, poly := range mp {
			nRings += len(poly)
			for _, ring := range poly {
				nPts += len(ring)
			}
		}
	}
	fl := &flatLayer{
		pts:      make([]pt, 0, nPts),
		ringEnd:  make([]int, 0, nRings),
		ringHole: make([]bool, 0, nRings),
		areaRing: make([]int, 0, len(geoms)+1),
		partRing: make([]int, 0, nParts+1),
		partArea: make([]int, 0, nParts),
		minX:     math.Inf(1), minY: math.Inf(1), maxX: math.Inf(-1), maxY: math.Inf(-1),
	}
	for i, mp := range geoms {
		fl.areaRing = append(fl.areaRing, len(fl.ringEnd))
		for _, poly := range mp {
			fl.partRing = append(fl.partRing, len(fl.ringEnd))
			fl.partArea = append(fl.partArea, i)
			for r, ring := range poly {
				for _, q := range ring {
					if math.IsNaN(q[0]) || math.IsNaN(q[1]) || math.IsInf(q[0], 0) || math.IsInf(q[1], 0) {
						return nil, fmt.Errorf("plot: area %d has a coordinate that is not a finite number", i+1)
					}
					x, y := proj.xy(q)
					fl.pts = append(fl.pts, pt{x, y})
					fl.minX, fl.maxX = math.Min(fl.minX, x), math.Max(fl.maxX, x)
					fl.minY, fl.maxY = math.Min(fl.minY, y), math.Max(fl.maxY, y)
				}
				fl.ringEnd = append(fl.ringEnd, len(fl.pts))
				fl.ringHole = append(fl.ringHole, r > 0)
			}
		}
	}
	fl.areaRing = append(fl.areaRing, len(fl.ringEnd))
	fl.partRing = append(fl.partRing, len(fl.ringEnd))
	if len(fl.pts) == 0 {
		return nil, fmt.Errorf("plot: the areas have no coordinates")
	}
	// A layer of one point or one line still gets a square to be drawn in.
	if fl.maxX-fl.minX == 0 && fl.maxY-fl.minY == 0 {
		fl.minX, fl.maxX, fl.minY, fl.maxY = fl.minX-0.5, fl.maxX+0.5, fl.minY-0.5, fl.maxY+0.5
	} else if d := math.Max(fl.maxX-fl.minX, fl.maxY-fl.minY) * 1e-3; fl.maxX-fl.minX < d {
		fl.minX, fl.maxX = fl.minX-d, fl.maxX+d
	} else if fl.maxY-fl.minY < d {
		fl.minY, fl.maxY = fl.minY-d, fl.maxY+d
	}
	return fl, nil
}

func (fl *flatLayer) ringStart(r int) int {
	if r == 0 {
		return 0
	}
	return fl.ringEnd[r-1]
}

// toPixels maps the layer into the box whose top-left corner is (x0, y0)
// at s pixels per layer unit, north up.
func (fl *flatLayer) toPixels(x0, y0, s float64) {
	for i, q := range fl.pts {
		fl.pts[i] = pt{x0 + s*(q.x-fl.minX), y0 + s*(fl.maxY-q.y)}
	}
}

// bbox is a box in pixels.
type bbox struct{ x0, y0, x1, y1 float64 }

func (fl *flatLayer) ringsBox(r0, r1 int) bbox {
	b := bbox{math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)}
	for _, q := range fl.pts[fl.ringStart(r0):fl.ringEnd[r1-1]] {
		b.x0, b.x1 = math.Min(b.x0, q.x), math.Max(b.x1, q.x)
		b.y0, b.y1 = math.Min(b.y0, q.y), math.Max(b.y1, q.y)
	}
	return b
}

// Tiny isolated parts — an islet a pixel across, with nothing else near
// it — would vanish on the map or read as a speck of dirt. They get a
// marker disc in their colour, drawn on top.
const (
	tinyPart    = 4.0 // largest side of a part's box, pixels, that counts as tiny
	isolationPx = 2.0 // a part with no other area's box this close is isolated
	markerR     = 3.2
)

// isolation finds, for each part, whether any other area's part has its box
// within isolationPx; only parts for which want returns true are looked at.
// It buckets the boxes on a uniform grid of the pixels.
func (fl *flatLayer) isolation(boxes []bbox, want func(p int) bool) []bool {
	const cell = 16.0
	type key struct{ x, y int32 }
	grid := map[key][]int32{}
	cellOf := func(v float64) int32 { return int32(math.Floor(v / cell)) }
	for p, b := range boxes {
		for cy := cellOf(b.y0); cy <= cellOf(b.y1); cy++ {
			for cx := cellOf(b.x0); cx <= cellOf(b.x1); cx++ {
				grid[key{cx, cy}] = append(grid[key{cx, cy}], int32(p))
			}
		}
	}
	out := make([]bool, len(boxes))
	for p, b := range boxes {
		if !want(p) {
			continue
		}
		e := bbox{b.x0 - isolationPx, b.y0 - isolationPx, b.x1 + isolationPx, b.y1 + isolationPx}
		alone := true
	search:
		for cy := cellOf(e.y0); cy <= cellOf(e.y1); cy++ {
			for cx := cellOf(e.x0); cx <= cellOf(e.x1); cx++ {
				for _, q := range grid[key{cx, cy}] {
					if fl.partArea[q] == fl.partArea[p] {
						continue
					}
					o := boxes[q]
					if o.x0 <= e.x1 && o.x1 >= e.x0 && o.y0 <= e.y1 && o.y1 >= e.y0 {
						alone = false
						break search
					}
				}
			}
		}
		out[p] = alone
	}
	return out
}
