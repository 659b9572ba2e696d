package kdtree

import (
	"cmp"
	"math"
	"slices"

	"github.com/areatest/areatest/internal/parallel"
)

// Point is one point as the k-d tree holds it. C places the point in three
// dimensions where straight-line distance is monotone in the metric's
// distance: the unit vector for great-circle distances (chord length grows
// with the angle) and (x, y, 0) for planar ones. E carries what the metric's
// exact distance (given to Build) needs, which decides every ranking and
// every threshold; C only prunes the search.
type Point struct {
	C   [3]float64
	E   [3]float64
	Idx int32 // index of the area in the caller's slice
}

// leafSize is the largest range the tree scans linearly instead of splitting.
const leafSize = 12

// Tree is a static, implicit k-d tree: the points of a range [lo, hi) are
// arranged so that the median along the range's widest dimension sits at
// mid = (lo+hi)/2, the points before it lie on or below it and the points
// after it on or above; the two halves are arranged the same way in turn.
// Nothing but the permuted points and one split dimension per median is
// stored, so the tree costs no pointers and builds in O(n log n).
//
// Points are addressed by their position in the tree. Once built, the
// coordinates are held column-wise (C, E and Idx apart) so that the search,
// which mostly reads C, touches as few cache lines as possible; callers read
// them by tree position and must not change them.
type Tree struct {
	C   [][3]float64
	E   [][3]float64
	Idx []int32
	dim []uint8 // dim[mid] is the split dimension of the range whose median is at mid
	// exact is the metric's own distance between two points' E.
	exact func(a, b *[3]float64) float64
}

// Build arranges pts (reordering the slice) into a tree. exact is the
// metric's distance between two points' E; it must be symmetric and grow
// with the embedding distance of their C, within Slack.
func Build(pts []Point, exact func(a, b *[3]float64) float64) *Tree {
	t := &Tree{dim: make([]uint8, len(pts)), exact: exact}
	t.build(pts, 0, len(pts))
	t.C = make([][3]float64, len(pts))
	t.E = make([][3]float64, len(pts))
	t.Idx = make([]int32, len(pts))
	for p := range pts {
		t.C[p], t.E[p], t.Idx[p] = pts[p].C, pts[p].E, pts[p].Idx
	}
	return t
}

func (t *Tree) build(pts []Point, lo, hi int) {
	for hi-lo > leafSize {
		mn := [3]float64{math.Inf(1), math.Inf(1), math.Inf(1)}
		mx := [3]float64{math.Inf(-1), math.Inf(-1), math.Inf(-1)}
		for p := lo; p < hi; p++ {
			for d := 0; d < 3; d++ {
				v := pts[p].C[d]
				mn[d] = min(mn[d], v)
				mx[d] = max(mx[d], v)
			}
		}
		d := 0
		for e := 1; e < 3; e++ {
			if mx[e]-mn[e] > mx[d]-mn[d] {
				d = e
			}
		}
		mid := (lo + hi) / 2
		selectNth(pts[lo:hi], mid-lo, d)
		t.dim[mid] = uint8(d)
		t.build(pts, lo, mid)
		lo = mid + 1
	}
}

// selectNth rearranges a so that a[k] holds the value that would be there if
// a were sorted by coordinate d, with no larger value before it and no smaller
// one after it (Hoare's selection with a median-of-three pivot, which copes
// with runs of equal coordinates as lattices have).
func selectNth(a []Point, k, d int) {
	lo, hi := 0, len(a)-1
	for hi > lo {
		m := lo + (hi-lo)/2
		if a[m].C[d] < a[lo].C[d] {
			a[m], a[lo] = a[lo], a[m]
		}
		if a[hi].C[d] < a[lo].C[d] {
			a[hi], a[lo] = a[lo], a[hi]
		}
		if a[hi].C[d] < a[m].C[d] {
			a[hi], a[m] = a[m], a[hi]
		}
		pivot := a[m].C[d]
		i, j := lo, hi
		for i <= j {
			for a[i].C[d] < pivot {
				i++
			}
			for a[j].C[d] > pivot {
				j--
			}
			if i <= j {
				a[i], a[j] = a[j], a[i]
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return
		}
	}
}

// Slack widens a squared embedding distance c2 so that any point whose
// metric distance does not exceed the one that c2 came from is certain to lie
// within the result: the embedding and the metric are computed by different
// formulas, and their rounding errors (about 1e-15 in chord length) must not
// prune a true neighbour or a tie.
func Slack(c2 float64) float64 {
	c := math.Sqrt(c2)*(1+1e-9) + 1e-12
	return c * c
}

// Chord2 is the squared straight-line distance between two embedded points.
func Chord2(a, b *[3]float64) float64 {
	dx := a[0] - b[0]
	dy := a[1] - b[1]
	dz := a[2] - b[2]
	return dx*dx + dy*dy + dz*dz
}

// Len returns the number of points.
func (t *Tree) Len() int { return len(t.Idx) }

// NearestRows finds the k nearest other points of every point: row i (i the
// point's Idx) is nb[i*k:(i+1)*k], nearest first, ties in distance by lower
// Idx, with the distances in dist. Queries run in fixed blocks of tree
// positions, each writing only its own rows.
func (t *Tree) NearestRows(k int) (nb []int32, dist []float64) {
	n := t.Len()
	nb = make([]int32, n*k)
	dist = make([]float64, n*k)
	parallel.ForRanges(n, Block, 0, func(lo, hi int) {
		s := newQuery(k)
		for p := lo; p < hi; p++ {
			s.reset(t, p)
			t.nearest(s, 0, n)
			i := int(t.Idx[p])
			s.finish(t, nb[i*k:][:k], dist[i*k:][:k])
		}
	})
	return nb, dist
}

// Within calls visit for the tree position of every point whose squared
// embedding distance from q is at most bound (a point at q itself
// included; callers skip it).
func (t *Tree) Within(q *[3]float64, bound float64, visit func(p int)) {
	t.within(q, bound, 0, t.Len(), visit)
}

// query holds one k-nearest query. The search ranks candidates by their
// cheap embedding distance c2 in a max-heap of k; the metric distance, which
// decides the result, is computed only at the end, for the heap and for the
// few near misses whose c2 lies within Slack of the heap's worst. That set
// holds every point that can rank among the k nearest by (metric distance,
// index): a point beyond it is farther, by the metric, than all k in the heap.
type query struct {
	k, n  int
	c2    []float64   // heap of the k smallest c2 so far, largest on top
	pos   []int32     // their tree positions
	near  []candidate // candidates that were in reach but not (or no longer) in the heap
	prune int         // length of near at which out-of-reach entries are next dropped
	all   []candidate // scratch for the final ranking
	bound float64     // squared embedding distance beyond which no candidate can count
	qpos  int32
	qc    [3]float64
	qe    [3]float64
}

// candidate is a candidate neighbour: its tree position, embedding distance and,
// once computed, metric distance and area index.
type candidate struct {
	c2, d float64
	pos   int32
	idx   int32
}

func newQuery(k int) *query {
	return &query{k: k, c2: make([]float64, k), pos: make([]int32, k)}
}

func (s *query) reset(t *Tree, qpos int) {
	s.qpos, s.qc, s.qe = int32(qpos), t.C[qpos], t.E[qpos]
	s.n, s.bound = 0, math.Inf(1)
	s.near, s.prune = s.near[:0], 4*s.k
}

func (s *query) offer(t *Tree, p int) {
	if int32(p) == s.qpos {
		return
	}
	c2 := Chord2(&t.C[p], &s.qc)
	if c2 > s.bound {
		return
	}
	if s.n < s.k {
		i := s.n
		s.c2[i], s.pos[i] = c2, int32(p)
		s.n++
		for i > 0 {
			up := (i - 1) / 2
			if s.c2[i] <= s.c2[up] {
				break
			}
			s.c2[i], s.c2[up] = s.c2[up], s.c2[i]
			s.pos[i], s.pos[up] = s.pos[up], s.pos[i]
			i = up
		}
		if s.n == s.k {
			s.bound = Slack(s.c2[0])
		}
		return
	}
	if c2 >= s.c2[0] {
		s.near = append(s.near, candidate{c2: c2, pos: int32(p)})
		return
	}
	s.near = append(s.near, candidate{c2: s.c2[0], pos: s.pos[0]})
	s.c2[0], s.pos[0] = c2, int32(p)
	for i := 0; ; {
		l, r, w := 2*i+1, 2*i+2, i
		if l < s.k && s.c2[l] > s.c2[w] {
			w = l
		}
		if r < s.k && s.c2[r] > s.c2[w] {
			w = r
		}
		if w == i {
			break
		}
		s.c2[i], s.c2[w] = s.c2[w], s.c2[i]
		s.pos[i], s.pos[w] = s.pos[w], s.pos[i]
		i = w
	}
	s.bound = Slack(s.c2[0])
	// Drop near misses the tighter bound has put out of reach, so the list
	// stays short however many candidates pass through. When most survive
	// (many points at one distance), the next pruning waits until the list
	// has doubled, so the work stays linear in the candidates.
	if len(s.near) > s.prune {
		kept := s.near[:0]
		for _, c := range s.near {
			if c.c2 <= s.bound {
				kept = append(kept, c)
			}
		}
		s.near = kept
		s.prune = max(4*s.k, 2*len(kept))
	}
}

// finish ranks the candidates by (metric distance, index) and writes the
// first k into row and dist, nearest first.
func (s *query) finish(t *Tree, row []int32, dist []float64) {
	all := s.all[:0]
	for h := range s.n {
		all = append(all, candidate{c2: s.c2[h], pos: s.pos[h]})
	}
	for _, c := range s.near {
		if c.c2 <= s.bound {
			all = append(all, c)
		}
	}
	for i := range all {
		p := all[i].pos
		all[i].d = t.exact(&s.qe, &t.E[p])
		all[i].idx = t.Idx[p]
	}
	if len(all) > 32 {
		// Many points at one distance (a lattice, repeated points).
		slices.SortFunc(all, func(a, b candidate) int {
			return cmp.Or(cmp.Compare(a.d, b.d), cmp.Compare(a.idx, b.idx))
		})
	} else {
		// Insertion sort: the list is short, and nearly all of it is the heap.
		for i := 1; i < len(all); i++ {
			c := all[i]
			j := i
			for ; j > 0 && (all[j-1].d > c.d || (all[j-1].d == c.d && all[j-1].idx > c.idx)); j-- {
				all[j] = all[j-1]
			}
			all[j] = c
		}
	}
	for i := range row {
		row[i], dist[i] = all[i].idx, all[i].d
	}
	s.all = all
}

// nearest runs the query s over the range [lo, hi), nearer half first.
func (t *Tree) nearest(s *query, lo, hi int) {
	for hi-lo > leafSize {
		mid := (lo + hi) / 2
		diff := s.qc[t.dim[mid]] - t.C[mid][t.dim[mid]]
		s.offer(t, mid)
		if diff < 0 {
			t.nearest(s, lo, mid)
			if diff*diff > s.bound {
				return
			}
			lo = mid + 1
		} else {
			t.nearest(s, mid+1, hi)
			if diff*diff > s.bound {
				return
			}
			hi = mid
		}
	}
	for p := lo; p < hi; p++ {
		s.offer(t, p)
	}
}

// within calls visit for the position of every point of [lo, hi) whose
// squared embedding distance from q is at most bound (q itself included;
// callers skip it).
func (t *Tree) within(q *[3]float64, bound float64, lo, hi int, visit func(p int)) {
	for hi-lo > leafSize {
		mid := (lo + hi) / 2
		diff := q[t.dim[mid]] - t.C[mid][t.dim[mid]]
		if Chord2(q, &t.C[mid]) <= bound {
			visit(mid)
		}
		if diff*diff <= bound {
			// Both halves may hold points in reach.
			t.within(q, bound, lo, mid, visit)
			lo = mid + 1
		} else if diff < 0 {
			hi = mid
		} else {
			lo = mid + 1
		}
	}
	for k := lo; k < hi; k++ {
		if Chord2(q, &t.C[k]) <= bound {
			visit(k)
		}
	}
}

// Block is the number of queries a worker takes at a time. Blocks are
// fixed ranges of tree positions and every query writes only its own area's
// slots, so results do not depend on the number of workers or on which
// worker ran which block; consecutive tree positions are close in space,
// which keeps a block's queries in the same part of the tree and the cache.
const Block = 1024
