package weights

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/internal/parallel"
	"github.com/areatest/areatest/weights/internal/kdtree"
)

// InverseDistance links areas with weight 1/d^power, d the distance between
// their representative points under m. With band > 0 only pairs at most band
// apart are linked (the graph then behaves like DistanceBand: islands are
// allowed, no link at all is a *NoNeighboursError); band 0 links every pair,
// which is refused when n(n−1) would exceed MaxLinks (above 7,071 areas) with
// an error that suggests a band.
//
// power must be positive and finite. Two areas with the same representative
// point would get an infinite weight: that is a *CoincidentError naming the
// first such pair. A weight that overflows or underflows float64 (a large
// power on very small or very large distances) is an error too. The graph is
// symmetric.
func InverseDistance(pts []orb.Point, power, band float64, m Metric) (*Graph, error) {
	if !(power > 0) || math.IsInf(power, 1) {
		return nil, fmt.Errorf("weights: the inverse-distance power must be a positive number, not %v", power)
	}
	if band != 0 {
		if err := checkThreshold("the inverse-distance band", band); err != nil {
			return nil, fmt.Errorf("%w (or 0 for all pairs)", err)
		}
	}
	n := len(pts)
	if band == 0 && n >= 2 && int64(n)*int64(n-1) > MaxLinks {
		return nil, fmt.Errorf("weights: inverse distance over all pairs of %s areas would make %s links, more than %s; give a distance band",
			numtext.Count(int64(n)), numtext.Count(int64(n)*int64(n-1)), numtext.Count(MaxLinks))
	}
	ix, err := newPointIndex(pts, m)
	if err != nil {
		return nil, err
	}
	iw := newInverseWeigher(ix, pts, power)
	if band > 0 {
		q := radiusQuery{
			ix:     ix,
			radius: func(int32) float64 { return band },
			weigh:  iw.weigh,
			kind:   fmt.Sprintf("inverse distance (power %s, band %s)", formatNumber(power), formatLength(band, m)),
			what:   "band",
		}
		return q.graph("weighted", band, iw.check)
	}
	return iw.allPairs()
}

// inverseWeigher computes inverse-distance weights and remembers, per area,
// the first problem found: each area's slot is written only by the query of
// that area, so the parallel passes need no locks, and the first problem in
// index order is reported.
type inverseWeigher struct {
	ix         *pointIndex
	pts        []orb.Point
	power      float64
	coincident []int32 // the lowest other area at the same point, or −1
	badWeight  []int32 // the lowest other area whose weight overflows, or −1
}

func newInverseWeigher(ix *pointIndex, pts []orb.Point, power float64) *inverseWeigher {
	iw := &inverseWeigher{ix: ix, pts: pts, power: power, coincident: make([]int32, len(pts)), badWeight: make([]int32, len(pts))}
	for i := range iw.coincident {
		iw.coincident[i], iw.badWeight[i] = -1, -1
	}
	return iw
}

// weigh returns the weight of the link i→j at distance d, or 0 after
// noting a problem.
func (iw *inverseWeigher) weigh(i, j int32, d float64) float64 {
	if d == 0 {
		if c := iw.coincident[i]; c < 0 || j < c {
			iw.coincident[i] = j
		}
		return 0
	}
	w := math.Pow(d, -iw.power)
	if w == 0 || math.IsInf(w, 1) {
		if c := iw.badWeight[i]; c < 0 || j < c {
			iw.badWeight[i] = j
		}
		return 0
	}
	return w
}

// check reports the first problem weigh noted: coincident points before
// weights beyond floating point.
func (iw *inverseWeigher) check() error {
	for i, j := range iw.coincident {
		if j >= 0 {
			return &CoincidentError{A: i, B: int(j), Point: iw.pts[i]}
		}
	}
	for i, j := range iw.badWeight {
		if j >= 0 {
			d := exactDistance(iw.ix.geo, iw.ix.exact(int32(i)), iw.ix.exact(j))
			return fmt.Errorf("weights: inverse distance with power %v gives areas %d and %d, %s apart, the weight %v, beyond floating point; use a smaller power or other units",
				iw.power, i, j, formatLength(d, iw.ix.m), math.Pow(d, -iw.power))
		}
	}
	return nil
}

// allPairs links every pair: row i holds every other area in index order.
func (iw *inverseWeigher) allPairs() (*Graph, error) {
	ix, n := iw.ix, len(iw.pts)
	offsets := make([]int32, n+1)
	for i := range n {
		offsets[i+1] = int32((i + 1) * (n - 1))
	}
	nb := make([]int32, n*(n-1))
	w := make([]float64, n*(n-1))
	parallel.ForRanges(n, kdtree.Block, 0, func(lo, hi int) {
		for i := lo; i < hi; i++ {
			ei := ix.exact(int32(i))
			t := i * (n - 1)
			for j := range n {
				if j == i {
					continue
				}
				nb[t] = int32(j)
				w[t] = iw.weigh(int32(i), int32(j), exactDistance(ix.geo, ei, ix.exact(int32(j))))
				t++
			}
		}
	})
	if err := iw.check(); err != nil {
		return nil, err
	}
	kind := fmt.Sprintf("inverse distance (power %s, all pairs)", formatNumber(iw.power))
	return &Graph{Kind: kind, Scaling: "weighted", Offsets: offsets, Neighbours: nb, Weights: w}, nil
}
