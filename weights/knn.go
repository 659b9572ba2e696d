package weights

import (
	"fmt"
	"slices"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/internal/numtext"
)

// KNearest links every area to the k other areas whose representative points
// are nearest under m, with weight one. Neighbours are ranked by distance and,
// among equally distant ones (a lattice has many), by lower index, so the k-th
// place and the whole graph are fixed by the input order; "equally distant"
// means equal values of Distance, so points that are equidistant in exact
// arithmetic but not after rounding are ranked by their rounded distances.
// Coincident points are at distance zero and rank first.
//
// The plain graph is asymmetric: j may be among i's nearest without i being
// among j's. With symmetrise, i and j are linked both ways when either is among
// the other's k nearest (the union), so every area keeps at least k neighbours
// and some get more.
//
// k must be at least 1 and at most n−1, and n·k at most MaxLinks.
//
// The search runs on a static k-d tree. For Geographic it is built over the
// points' 3-D unit vectors, where straight-line (chord) length grows with
// great-circle distance, so the antimeridian and the poles need no special
// case; the tree only narrows the candidates, and the haversine Distance
// decides the ranking. Queries run in parallel, each writing only its own
// row, so the graph does not depend on the number of workers.
func KNearest(pts []orb.Point, k int, m Metric, symmetrise bool) (*Graph, error) {
	n := len(pts)
	if k < 1 {
		return nil, fmt.Errorf("weights: the number of nearest neighbours must be at least 1, not %d", k)
	}
	if n >= 2 && k > n-1 {
		return nil, fmt.Errorf("weights: k must be at most n−1 = %d for %d areas, not %d", n-1, n, k)
	}
	if n >= 2 && int64(n)*int64(k) > MaxLinks {
		return nil, fmt.Errorf("weights: %d nearest neighbours of %s areas would make %s links, more than %s; choose a smaller k",
			k, numtext.Count(int64(n)), numtext.Count(int64(n)*int64(k)), numtext.Count(MaxLinks))
	}
	ix, err := newPointIndex(pts, m)
	if err != nil {
		return nil, err
	}
	nb, _ := ix.nearestRows(k)
	kind := fmt.Sprintf("%d nearest neighbours", k)
	if k == 1 {
		kind = "1 nearest neighbour"
	}
	var offsets []int32
	if symmetrise {
		kind += " (symmetrised)"
		offsets, nb = unionRows(n, k, nb)
	} else {
		offsets = make([]int32, n+1)
		for i := range n {
			offsets[i+1] = int32((i + 1) * k)
			slices.Sort(nb[i*k : (i+1)*k])
		}
	}
	w := make([]float64, len(nb))
	for t := range w {
		w[t] = 1
	}
	return &Graph{Kind: kind, Scaling: "binary", Offsets: offsets, Neighbours: nb, Weights: w}, nil
}

// unionRows returns the rows (sorted, without repeats) of the union of the
// relation "j is in row i" (k entries per row of nb) and its transpose.
func unionRows(n, k int, nb []int32) (offsets, out []int32) {
	cnt := make([]int32, n+1)
	for i := range n {
		cnt[i+1] += int32(k)
		for _, j := range nb[i*k : (i+1)*k] {
			cnt[j+1]++
		}
	}
	for i := 1; i <= n; i++ {
		cnt[i] += cnt[i-1]
	}
	both := make([]int32, cnt[n])
	fill := slices.Clone(cnt[:n])
	for i := range n {
		for _, j := range nb[i*k : (i+1)*k] {
			both[fill[i]] = j
			fill[i]++
			both[fill[j]] = int32(i)
			fill[j]++
		}
	}
	offsets = make([]int32, n+1)
	out = both[:0]
	for i := range n {
		row := both[cnt[i]:cnt[i+1]]
		slices.Sort(row)
		// Compacting in place is safe: out never runs ahead of the row being read.
		prev := int32(-1)
		for _, j := range row {
			if j != prev {
				out = append(out, j)
				prev = j
			}
		}
		offsets[i+1] = int32(len(out))
	}
	return offsets, out
}
