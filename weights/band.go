package weights

import (
	"errors"
	"fmt"
	"math"
	"sort"
	"sync/atomic"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/internal/parallel"
	"github.com/areatest/areatest/weights/internal/kdtree"
)

// DistanceBand links, with weight one, every pair of areas whose
// representative points are at most d apart under m (km for Geographic,
// layer units for Planar). d must be positive and finite.
//
// Areas with no other area within d are islands of the returned graph, which
// the graph's summary reports. A band under which no area at all has a
// neighbour is an error, a *NoNeighboursError that says how far apart the
// closest areas are and which band gives every area a neighbour. A band that
// would make more than MaxLinks links is an error too.
func DistanceBand(pts []orb.Point, d float64, m Metric) (*Graph, error) {
	if err := checkThreshold("the distance band", d); err != nil {
		return nil, err
	}
	ix, err := newPointIndex(pts, m)
	if err != nil {
		return nil, err
	}
	q := radiusQuery{
		ix:     ix,
		radius: func(int32) float64 { return d },
		weigh:  func(_, _ int32, _ float64) float64 { return 1 },
		kind:   "distance band " + formatLength(d, m),
		what:   "band",
	}
	return q.graph("binary", d, nil)
}

// radiusQuery describes a graph that links each area i to the other areas
// j within radius(i) of it, with weight weigh(i, j, d_ij); links of weight
// zero are left out.
type radiusQuery struct {
	ix     *pointIndex
	radius func(i int32) float64
	weigh  func(i, j int32, d float64) float64
	kind   string
	what   string // the parameter to shrink when there are too many links
	// none, if set, makes the error for a graph without links; by default
	// that is a *NoNeighboursError for a fixed threshold.
	none func() error
}

// visit calls f for each other area within radius of the area at tree
// position q, in no particular order.
func (r *radiusQuery) visit(q int, f func(j int32, d float64)) {
	t := r.ix.tree
	rad := r.radius(t.Idx[q])
	t.Within(&t.C[q], r.ix.reach(rad), func(p int) {
		if p == q {
			return
		}
		if d := exactDistance(r.ix.geo, &t.E[q], &t.E[p]); d <= rad {
			f(t.Idx[p], d)
		}
	})
}

// graph builds the graph in two passes, the first only counting, so that
// memory is allocated once at its final size and a request for too many links
// stops before it has taken the memory. check, if given, runs between the
// passes (builders use it to report problems weigh found). threshold is the
// fixed distance reported if no area gets a neighbour.
func (r *radiusQuery) graph(scaling string, threshold float64, check func() error) (*Graph, error) {
	ix := r.ix
	n := ix.len()
	counts := make([]int32, n)
	var total atomic.Int64
	parallel.ForRanges(n, kdtree.Block, 0, func(lo, hi int) {
		if total.Load() > MaxLinks {
			return
		}
		var sum int64
		for p := lo; p < hi; p++ {
			i := ix.tree.Idx[p]
			c := int32(0)
			r.visit(p, func(j int32, d float64) {
				if r.weigh(i, j, d) > 0 {
					c++
				}
			})
			counts[i] = c
			sum += int64(c)
		}
		total.Add(sum)
	})
	if check != nil {
		if err := check(); err != nil {
			return nil, err
		}
	}
	if t := total.Load(); t > MaxLinks {
		return nil, fmt.Errorf("weights: %s makes more than %s links (over %s neighbours per area on average); choose a smaller %s",
			r.kind, numtext.Count(MaxLinks), numtext.Count(int64(MaxLinks/n)), r.what)
	} else if t == 0 {
		if r.none != nil {
			return nil, r.none()
		}
		return nil, noNeighbours(ix, r.kind, threshold)
	}
	offsets := make([]int32, n+1)
	for i, c := range counts {
		offsets[i+1] = offsets[i] + c
	}
	nb := make([]int32, offsets[n])
	w := make([]float64, offsets[n])
	parallel.ForRanges(n, kdtree.Block, 0, func(lo, hi int) {
		for p := lo; p < hi; p++ {
			i := ix.tree.Idx[p]
			a, b := offsets[i], offsets[i+1]
			t := a
			r.visit(p, func(j int32, d float64) {
				if v := r.weigh(i, j, d); v > 0 {
					nb[t], w[t] = j, v
					t++
				}
			})
			sortRow(nb[a:b], w[a:b])
		}
	})
	return &Graph{Kind: r.kind, Scaling: scaling, Offsets: offsets, Neighbours: nb, Weights: w}, nil
}

// sortRow orders a row by neighbour index, carrying the weights along.
func sortRow(nb []int32, w []float64) {
	if len(nb) > 24 {
		sort.Sort(rowSorter{nb, w})
		return
	}
	for i := 1; i < len(nb); i++ {
		j, v := nb[i], w[i]
		k := i
		for ; k > 0 && nb[k-1] > j; k-- {
			nb[k], w[k] = nb[k-1], w[k-1]
		}
		nb[k], w[k] = j, v
	}
}

type rowSorter struct {
	nb []int32
	w  []float64
}

func (r rowSorter) Len() int           { return len(r.nb) }
func (r rowSorter) Less(a, b int) bool { return r.nb[a] < r.nb[b] }
func (r rowSorter) Swap(a, b int) {
	r.nb[a], r.nb[b] = r.nb[b], r.nb[a]
	r.w[a], r.w[b] = r.w[b], r.w[a]
}

// DistanceClasses returns the binary graphs of the distance classes of a
// correlogram: class c (c = 1..k) links the areas whose points lie more than
// (c−1)·width and at most c·width apart. A class with no pair is an empty
// graph, not an error.
func DistanceClasses(pts []orb.Point, width float64, k int, m Metric) ([]*Graph, error) {
	if !(width > 0) || math.IsInf(width, 0) {
		return nil, fmt.Errorf("weights: the width of the distance classes must be a positive distance, not %v", width)
	}
	if k < 1 {
		return nil, fmt.Errorf("weights: need at least one distance class, not %d", k)
	}
	unit := m.Unit()
	if unit == "" {
		unit = "layer units"
	}
	var out []*Graph
	var previous *Graph
	for c := 1; c <= k; c++ {
		band, err := DistanceBand(pts, float64(c)*width, m)
		var none *NoNeighboursError
		if errors.As(err, &none) {
			band, _ = FromLinks(len(pts), nil, "")
		} else if err != nil {
			return nil, err
		}
		class := band
		if previous != nil {
			class = withoutLinksOf(band, previous)
		}
		class.Kind = fmt.Sprintf("distance class %g–%g %s", float64(c-1)*width, float64(c)*width, unit)
		class.Scaling = string(Binary)
		out = append(out, class)
		previous = band
	}
	return out, nil
}

// withoutLinksOf returns the links of g that are not links of h (both with
// sorted rows), as a binary graph.
func withoutLinksOf(g, h *Graph) *Graph {
	n := g.Len()
	offsets := make([]int32, n+1)
	var nb []int32
	for i := 0; i < n; i++ {
		a, _ := g.Row(i)
		b, _ := h.Row(i)
		k := 0
		for _, j := range a {
			for k < len(b) && b[k] < j {
				k++
			}
			if k < len(b) && b[k] == j {
				continue
			}
			nb = append(nb, j)
		}
		offsets[i+1] = int32(len(nb))
	}
	w := make([]float64, len(nb))
	for k := range w {
		w[k] = 1
	}
	return &Graph{Offsets: offsets, Neighbours: nb, Weights: w}
}
