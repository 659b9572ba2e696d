package contig

import (
	"fmt"
	"math"
	"math/bits"
	"runtime"
	"slices"

	"github.com/areatest/areatest/internal/parallel"
)

// The neighbour search puts every boundary segment into the cells of a
// uniform grid that its bounding box, grown by the snap distance, overlaps,
// and compares only segments that share a cell. The grid is never stored as
// an array of cells: each (cell, piece) membership is one uint64 key, and
// sorting the keys groups the members of each cell together. Memory is
// therefore proportional to the number of segments whatever the extent of
// the layer, and nothing depends on map order.
//
// Segments much longer than a cell would cover a large box of cells (a long
// diagonal border covers a square of them), so they are cut into pieces no
// longer than a cell in either direction; each piece is a member on its own
// and the tests are made on the whole segments.
//
// Each pair of pieces is tested in one cell only: the cell holding the
// lower-left corner of the overlap of their grown boxes, a cell that both
// belong to. So no pair of pieces is tested twice without any set of seen
// pairs; only a small table of area pairs found lately spares the repeated
// tests along one border.

// grid maps coordinates to cells.
type grid struct {
	x0, y0 float64 // lower-left corner of cell (0, 0)
	inv    float64 // 1 / cell size
	nx, ny int64
}

func (g *grid) col(x float64) int64 {
	f := (x - g.x0) * g.inv
	if !(f > 0) {
		return 0
	}
	if f >= float64(g.nx) {
		return g.nx - 1
	}
	return int64(f)
}

func (g *grid) row(y float64) int64 {
	f := (y - g.y0) * g.inv
	if !(f > 0) {
		return 0
	}
	if f >= float64(g.ny) {
		return g.ny - 1
	}
	return int64(f)
}

func (g *grid) cell(x, y float64) uint64 { return uint64(g.row(y)*g.nx + g.col(x)) }

// pieceTable records how the segments are cut: seg[p] is the segment of
// piece p (and segment.first the first piece of each segment).
type pieceTable struct {
	seg []int32
}

// pieces returns the number of pieces of the segment at vertex v.
func (l *layer) pieces(v int32) int32 { return l.seg[v+1].first - l.seg[v].first }

// pieceBox returns the bounding box of piece p (0-based within its segment)
// of the segment starting at vertex v, cut into k pieces. Neighbouring
// pieces share their cut point, computed the same way every time.
func (l *layer) pieceBox(v, p, k int32) (minx, miny, maxx, maxy float64) {
	s := l.pts[v : v+2 : v+2]
	ax, ay, bx, by := s[0][0], s[0][1], s[1][0], s[1][1]
	if k > 1 {
		x0, y0 := ax, ay
		dx, dy := bx-ax, by-ay
		if p > 0 {
			t := float64(p) / float64(k)
			ax, ay = x0+dx*t, y0+dy*t
		}
		if p < k-1 {
			t := float64(p+1) / float64(k)
			bx, by = x0+dx*t, y0+dy*t
		}
	}
	return min(ax, bx), min(ay, by), max(ax, bx), max(ay, by)
}

// segMedian returns the median length of the layer's segments, from an
// evenly spaced sample.
func (l *layer) segMedian(nseg int) float64 {
	stride := max(1, nseg/65536)
	sample := make([]float64, 0, min(nseg, 65536)+1)
	var k int
	for v, sg := range l.seg {
		if sg.area < 0 {
			continue
		}
		if k%stride == 0 {
			sample = append(sample, math.Hypot(l.pts[v+1][0]-l.pts[v][0], l.pts[v+1][1]-l.pts[v][1]))
		}
		k++
	}
	slices.Sort(sample)
	return sample[len(sample)/2]
}

// maxPieces bounds the number of pieces (they are numbered in 32 bits
// with room to spare).
const maxPieces = 1 << 31

// layout chooses the grid and cuts the segments. The cell size starts at 1.5
// times the median segment length — a typical segment then touches two or
// three cells and a cell holds about a dozen members, where the cost of
// listing memberships and of testing pairs within cells balance (measured
// on the demo generator's regions) — and doubles while the grid would have
// 2³² cells or more (cell numbers are 32 bits) or the segments more than
// maxPieces pieces, which only happens for layers whose extent dwarfs
// their segments.
func (l *layer) layout(nseg int, snap float64) (grid, pieceTable, error) {
	cs := max(1.5*l.segMedian(nseg), 4*snap)
	w, h := l.b.maxx-l.b.minx+2*snap, l.b.maxy-l.b.miny+2*snap
	if !(cs > 0) {
		cs = max(w, h, 1)
	}
	for {
		nx, ny := math.Floor(w/cs)+1, math.Floor(h/cs)+1
		if nx*ny < 1<<32 {
			g := grid{x0: l.b.minx - snap, y0: l.b.miny - snap, inv: 1 / cs, nx: int64(nx), ny: int64(ny)}
			ps, ok := l.cut(cs)
			if ok {
				return g, ps, nil
			}
		}
		cs *= 2
		if math.IsInf(cs, 0) {
			return grid{}, pieceTable{}, fmt.Errorf("weights: the boundaries span too far to index (%g by %g)", w, h)
		}
	}
}

// cut splits each segment into pieces at most cs wide and high; ok is false
// when there would be too many.
func (l *layer) cut(cs float64) (pieceTable, bool) {
	var n int64
	for v := range l.seg {
		l.seg[v].first = int32(n)
		if l.seg[v].area < 0 {
			continue
		}
		side := max(math.Abs(l.pts[v+1][0]-l.pts[v][0]), math.Abs(l.pts[v+1][1]-l.pts[v][1]))
		k := max(1, int64(math.Ceil(side/cs)))
		n += k
		if n > maxPieces {
			return pieceTable{}, false
		}
	}
	seg := make([]int32, n)
	for v := 0; v+1 < len(l.seg); v++ {
		for p := l.seg[v].first; p < l.seg[v+1].first; p++ {
			seg[p] = int32(v)
		}
	}
	return pieceTable{seg: seg}, true
}

// members lists every (cell, piece) membership as cell<<32 | piece, grouped
// by cell and, within a cell, in piece order.
func (l *layer) members(g *grid, snap float64) []uint64 {
	var n int
	l.eachPieceCells(g, snap, func(p int32, c0, c1, r0, r1 int64) {
		n += int((c1 - c0 + 1) * (r1 - r0 + 1))
	})
	keys := make([]uint64, 0, n)
	l.eachPieceCells(g, snap, func(p int32, c0, c1, r0, r1 int64) {
		for r := r0; r <= r1; r++ {
			for c := c0; c <= c1; c++ {
				keys = append(keys, uint64(r*g.nx+c)<<32|uint64(p))
			}
		}
	})
	// Pieces were appended in order, so a stable sort on the cell bits
	// alone leaves each cell's members in piece order.
	radixHigh(keys, bits.Len64(uint64(g.nx*g.ny-1)))
	return keys
}

// eachPieceCells calls f with the range of cell columns and rows that each
// piece's box, grown by snap, overlaps, pieces in order.
func (l *layer) eachPieceCells(g *grid, snap float64, f func(p int32, c0, c1, r0, r1 int64)) {
	for v := 0; v+1 < len(l.seg); v++ {
		if l.seg[v].area < 0 {
			continue
		}
		k := l.pieces(int32(v))
		for p := int32(0); p < k; p++ {
			minx, miny, maxx, maxy := l.pieceBox(int32(v), p, k)
			f(l.seg[v].first+p, g.col(minx-snap), g.col(maxx+snap), g.row(miny-snap), g.row(maxy+snap))
		}
	}
}

// radixHigh sorts keys stably by their top bits (bits 32 to
// 32+nbits-1), in as few passes of at most 11 bits as cover them: narrow
// digits keep the scatter of each pass within a few thousand write
// positions, which caches follow far better than 65,536.
func radixHigh(keys []uint64, nbits int) {
	if len(keys) < 2 || nbits == 0 {
		return
	}
	passes := (nbits + 10) / 11
	width := (nbits + passes - 1) / passes
	mask := uint64(1)<<width - 1
	tmp := make([]uint64, len(keys))
	src, dst := keys, tmp
	count := make([]int, 1<<width)
	for shift := 32; shift < 32+nbits; shift += width {
		clear(count)
		for _, k := range src {
			count[(k>>shift)&mask]++
		}
		sum := 0
		for d, c := range count {
			count[d] = sum
			sum += c
		}
		for _, k := range src {
			d := (k >> shift) & mask
			dst[count[d]] = k
			count[d]++
		}
		src, dst = dst, src
	}
	if &src[0] != &keys[0] {
		copy(keys, src)
	}
}

// crossing is a point where a ring meets itself; proper when two
// sides cross rather than touch.
type crossing struct {
	ring   int32
	proper bool
	x, y   float64
}

// maybePair is a contact found through a ring that may be a sliver
// (ringMaybe): it counts only if ring a, and ring b when not -1, turn out to
// cross themselves.
type maybePair struct {
	a, b int32
	key  uint64
}

// member is a piece as a cell's sweep sees it.
type member struct {
	minx, miny, maxx, maxy float64
	seg, area, ring        int32
	maybe                  bool
}

// findings is what the search finds: area pairs as lo<<32 | hi (sorted,
// without repeats), contacts that depend on candidate slivers, and the
// points where rings meet themselves in a fixed order.
type findings struct {
	pairs     []uint64
	maybe     []maybePair
	crossings []crossing
}

// search finds the neighbour pairs (under the rook rule when rook is set,
// else queen) and the points where rings meet themselves.
func (l *layer) search(rook bool, snap float64) (findings, error) {
	var nseg int
	for _, sg := range l.seg {
		if sg.area >= 0 {
			nseg++
		}
	}
	if nseg == 0 {
		return findings{}, nil
	}
	g, ps, err := l.layout(nseg, snap)
	if err != nil {
		return findings{}, err
	}
	keys := l.members(&g, snap)

	// Split the sorted members into contiguous stretches of whole cells, one
	// block each, every block writing its own result slot. Results are
	// concatenated in stretch order, which is the order a single sweep
	// would produce, so the outcome does not depend on the number of
	// stretches or of workers.
	cuts := stretches(keys, min(runtime.GOMAXPROCS(0), 8))
	res := make([]findings, len(cuts)-1)
	parallel.ForBlocks(len(res), len(res), func() func(int) {
		return func(b int) {
			sw := sweeper{l: l, g: &g, ps: &ps, rook: rook, snap: snap}
			sw.run(keys[cuts[b]:cuts[b+1]])
			res[b] = sw.found
		}
	})
	var all findings
	for _, r := range res {
		all.pairs = append(all.pairs, r.pairs...)
		all.maybe = append(all.maybe, r.maybe...)
		all.crossings = append(all.crossings, r.crossings...)
	}
	slices.Sort(all.pairs)
	all.pairs = slices.Compact(all.pairs)
	return all, nil
}

// stretches cuts the sorted members into n stretches of about equal length
// that never split a cell (one stretch when there are few members), and
// returns the n+1 boundaries.
func stretches(keys []uint64, n int) []int {
	if len(keys) < 1<<14 {
		n = 1
	}
	cuts := make([]int, n+1)
	for w := 1; w < n; w++ {
		c := max(len(keys)*w/n, cuts[w-1])
		for c > 0 && c < len(keys) && keys[c]>>32 == keys[c-1]>>32 {
			c++
		}
		cuts[w] = c
	}
	cuts[n] = len(keys)
	return cuts
}

// links turns the found pairs into FromLinks input, adding the contacts of
// candidate slivers that crossed themselves.
func (f *findings) links(crossed []bool) [][2]int32 {
	keys := f.pairs
	if len(f.maybe) > 0 {
		keys = slices.Clone(keys)
		for _, m := range f.maybe {
			if crossed[m.a] && (m.b < 0 || crossed[m.b]) {
				keys = append(keys, m.key)
			}
		}
		slices.Sort(keys)
		keys = slices.Compact(keys)
	}
	pairs := make([][2]int32, len(keys))
	for k, p := range keys {
		pairs[k] = [2]int32{int32(p >> 32), int32(p & 0xffffffff)}
	}
	return pairs
}

// sweeper tests the members of a run of cells.
type sweeper struct {
	l    *layer
	g    *grid
	ps   *pieceTable
	rook bool
	snap float64

	found findings
	cell  []member
	// recent holds area pairs found lately, so that a border seen by many
	// pairs of sides is recorded and tested about once; a stale entry only
	// costs a repeated test.
	recent [1 << 12]uint64
}

func (sw *sweeper) run(keys []uint64) {
	for start := 0; start < len(keys); {
		c := keys[start] >> 32
		end := start + 1
		for end < len(keys) && keys[end]>>32 == c {
			end++
		}
		if end-start > 1 {
			sw.sweepCell(c, keys[start:end])
		}
		start = end
	}
}

func (sw *sweeper) sweepCell(c uint64, keys []uint64) {
	l, ps := sw.l, sw.ps
	sw.cell = sw.cell[:0]
	for _, k := range keys {
		p := int32(k & 0xffffffff)
		v := ps.seg[p]
		sg := l.seg[v]
		minx, miny, maxx, maxy := l.pieceBox(v, p-sg.first, l.seg[v+1].first-sg.first)
		sw.cell = append(sw.cell, member{minx, miny, maxx, maxy, v, sg.area, sg.ring, l.ringMaybe[sg.ring]})
	}
	snap := sw.snap
	snap2 := snap * snap
	minShared := RookMinShared * snap
	for i := range sw.cell {
		a := &sw.cell[i]
		for j := i + 1; j < len(sw.cell); j++ {
			b := &sw.cell[j]
			if b.minx > a.maxx+snap || a.minx > b.maxx+snap || b.miny > a.maxy+snap || a.miny > b.maxy+snap {
				continue
			}
			if sw.g.cell(max(a.minx, b.minx), max(a.miny, b.miny)) != c {
				continue // this pair's own cell is another one
			}
			if a.area == b.area {
				if a.ring == b.ring && a.seg != b.seg {
					sw.selfCheck(a.seg, b.seg, a.ring)
				}
				continue
			}
			lo, hi := a.area, b.area
			if lo > hi {
				lo, hi = hi, lo
			}
			key := uint64(lo)<<32 | uint64(hi)
			slot := &sw.recent[(key*0x9e3779b97f4a7c15)>>52]
			if *slot == key+1 {
				continue
			}
			u, v := a.seg, b.seg
			ax, ay, bx, by := l.pts[u][0], l.pts[u][1], l.pts[u+1][0], l.pts[u+1][1]
			cx, cy, dx, dy := l.pts[v][0], l.pts[v][1], l.pts[v+1][0], l.pts[v+1][1]
			var hit bool
			if !sw.rook {
				hit = segNear(ax, ay, bx, by, cx, cy, dx, dy, snap2)
			} else {
				hit = segShared(ax, ay, bx, by, cx, cy, dx, dy, snap) > minShared
			}
			switch {
			case !hit:
			case a.maybe || b.maybe:
				m := maybePair{a.ring, -1, key}
				if !a.maybe {
					m.a = b.ring
				} else if b.maybe {
					m.b = b.ring
				}
				sw.found.maybe = append(sw.found.maybe, m)
			default:
				*slot = key + 1
				sw.found.pairs = append(sw.found.pairs, key)
			}
		}
	}
}

// selfCheck records where two sides of one ring meet, unless they are
// consecutive (and so share a vertex by construction).
func (sw *sweeper) selfCheck(u, v, ring int32) {
	l := sw.l
	start, end := l.ringStart[ring], l.ringStart[ring+1]
	n := end - start - 1 // sides of the ring
	d := u - v
	if d < 0 {
		d = -d
	}
	if d == 1 || d == n-1 {
		return
	}
	p, q := l.pts[u:u+2], l.pts[v:v+2]
	ok, proper, x, y := segMeet(p[0][0], p[0][1], p[1][0], p[1][1], q[0][0], q[0][1], q[1][0], q[1][1])
	if ok {
		sw.found.crossings = append(sw.found.crossings, crossing{ring, proper, x, y})
	}
}

// crossed marks the rings that properly cross themselves.
func (l *layer) crossed(cs []crossing) []bool {
	out := make([]bool, len(l.ringPart))
	for _, c := range cs {
		if c.proper {
			out[c.ring] = true
		}
	}
	return out
}

// crossingProblems turns the self-meeting points into one problem per
// area, naming the first ring and point found (the order is that of the
// sorted cells, so it is fixed by the input). Rings left out as slivers are
// not named again.
func (l *layer) crossingProblems(cs []crossing, crossed []bool, names namer) []Problem {
	if len(cs) == 0 {
		return nil
	}
	areaOf := func(c crossing) int32 { return l.seg[l.ringStart[c.ring]].area }
	cs = slices.DeleteFunc(cs, func(c crossing) bool { return l.ringMaybe[c.ring] && !crossed[c.ring] })
	slices.SortStableFunc(cs, func(a, b crossing) int { return int(areaOf(a)) - int(areaOf(b)) })
	var out []Problem
	for k, c := range cs {
		if k > 0 && areaOf(cs[k-1]) == areaOf(c) {
			continue
		}
		out = append(out, Problem{MeetsItself, int(areaOf(c)), fmt.Sprintf("%s: %s crosses or touches itself near (%v, %v); its sides are still used to find neighbours",
			names.area(int(areaOf(c))), ringName(int(l.ringPart[c.ring]), int(l.ringHole[c.ring])), c.x, c.y)})
	}
	return out
}
