package weights

import (
	"container/heap"
	"errors"
	"fmt"
	"math"
)

// DefaultZoneSize is the zone size Zones aims for when given none: √n
// rounded, at least 2, so that a layer of n areas gets about √n zones of
// about √n areas — as many zones as areas per zone, a balance between zones
// small enough to keep the spatial structure of the labels and large enough
// for labels to move within them.
func DefaultZoneSize(n int) int {
	return max(2, int(math.Round(math.Sqrt(float64(n)))))
}

// Zones divides the areas of g into contiguous zones of about target areas
// each (target 0 means DefaultZoneSize), for a within-zone shuffle when the
// user names no strata. zones[i] is the zone of area i, numbered 0, 1, … in
// order of each zone's first area. The result depends only on the graph and
// target: no randomness, and ties are always broken by the lower index.
//
// How: links count in either direction and weights are ignored. Each group
// of linked areas (connected component) of m areas gets round(m/target)
// zones, at least one. Their seeds are spread out by farthest-point
// sampling on the number of steps between areas: the first is the area
// farthest from the component's first area, each next one the area farthest
// from every seed so far. The zones then grow from their seeds one area at
// a time, the zone with the fewest areas always growing next (breadth-first
// from its seed, so zones stay compact) until every area belongs to one.
// Finally each zone below half the target is merged into its smallest
// neighbouring zone, smallest first. Every zone is connected: it grows only
// into neighbours of its areas, and a merge joins two zones that touch.
//
// Sizes: zones hold at least half the target areas, except where a whole
// component is smaller than that; islands (areas with no neighbour) and
// such small components form zones of their own, since the graph has no
// link to say which zone is nearest (a zone of one area keeps its label in a
// within-zone shuffle). No upper bound holds in general; on lattices and on
// the demo region every zone stays within twice the target (see the tests).
//
// target must be 0 or at least 2: zones of one area would shuffle nothing.
func Zones(g *Graph, target int) ([]int32, error) {
	if g == nil || g.Len() == 0 {
		return nil, errors.New("weights: no areas to divide into zones")
	}
	n := g.Len()
	switch {
	case target == 0:
		target = DefaultZoneSize(n)
	case target < 2:
		return nil, fmt.Errorf("weights: the zone size must be at least 2 areas, not %d", target)
	}
	if g.Asymmetric() > 0 {
		g = g.Symmetrised()
	}
	z := &zoner{g: g, target: target, zone: make([]int32, n), dist: make([]int32, n)}
	for i := range z.zone {
		z.zone[i] = -1
	}
	seen := make([]bool, n)
	var members []int32
	for s := 0; s < n; s++ {
		if seen[s] {
			continue
		}
		// Collect the component of s, in breadth-first order.
		members = append(members[:0], int32(s))
		seen[s] = true
		for h := 0; h < len(members); h++ {
			nb, _ := g.Row(int(members[h]))
			for _, v := range nb {
				if !seen[v] {
					seen[v] = true
					members = append(members, v)
				}
			}
		}
		z.component(members)
	}
	return renumber(z.zone), nil
}

// ZoneSizes returns the number of areas in each zone of zones (numbered
// 0..k−1 as Zones numbers them).
func ZoneSizes(zones []int32) []int {
	var sizes []int
	for _, c := range zones {
		for int(c) >= len(sizes) {
			sizes = append(sizes, 0)
		}
		sizes[c]++
	}
	return sizes
}

// zoner holds the state of one call of Zones.
type zoner struct {
	g      *Graph
	target int
	zone   []int32 // zone of each area, −1 while unassigned
	next   int32   // number of zones made so far
	dist   []int32 // scratch: steps to the nearest seed
}

// component divides one connected component into zones.
func (z *zoner) component(members []int32) {
	m := len(members)
	k := max(1, (m+z.target/2)/z.target)
	if k == 1 {
		for _, v := range members {
			z.zone[v] = z.next
		}
		z.next++
		return
	}
	seeds := z.seeds(members, k)
	first := z.next
	z.next += int32(k)
	z.grow(seeds, first)
	z.mergeSmall(members, first, int32(k))
}

// seeds picks k spread-out areas of the component by farthest-point
// sampling.
func (z *zoner) seeds(members []int32, k int) []int32 {
	const far = math.MaxInt32
	for _, v := range members {
		z.dist[v] = far
	}
	// The component's first area is members[0]; the area farthest from it
	// lies on the rim, a good first seed.
	z.relax(members[0])
	start := z.farthest(members)
	for _, v := range members {
		z.dist[v] = far
	}
	seeds := []int32{start}
	z.relax(start)
	for len(seeds) < k {
		s := z.farthest(members)
		seeds = append(seeds, s)
		z.relax(s)
	}
	return seeds
}

// relax lowers dist to the number of steps from s wherever that is
// smaller, by a breadth-first search that stops where it improves nothing:
// after the first few seeds each search touches only the areas nearer the
// new seed than any older one.
func (z *zoner) relax(s int32) {
	z.dist[s] = 0
	queue := []int32{s}
	for h := 0; h < len(queue); h++ {
		u := queue[h]
		d := z.dist[u] + 1
		nb, _ := z.g.Row(int(u))
		for _, v := range nb {
			if d < z.dist[v] {
				z.dist[v] = d
				queue = append(queue, v)
			}
		}
	}
}

// farthest returns the member with the largest dist, the lowest index among
// ties.
func (z *zoner) farthest(members []int32) int32 {
	best, bestD := int32(-1), int32(-1)
	for _, v := range members {
		if d := z.dist[v]; d > bestD || (d == bestD && v < best) {
			best, bestD = v, d
		}
	}
	return best
}

// grow assigns every area of the component to the zones first+0…
// first+len(seeds)−1 grown from seeds, the smallest zone always growing
// next by the oldest area on its frontier.
func (z *zoner) grow(seeds []int32, first int32) {
	k := len(seeds)
	frontier := make([][]int32, k)
	head := make([]int, k)
	h := &zoneHeap{}
	for c, s := range seeds {
		z.zone[s] = first + int32(c)
		nb, _ := z.g.Row(int(s))
		frontier[c] = append(frontier[c], nb...)
		heap.Push(h, zoneSize{size: 1, zone: int32(c)})
	}
	for h.Len() > 0 {
		top := heap.Pop(h).(zoneSize)
		c := top.zone
		for head[c] < len(frontier[c]) {
			v := frontier[c][head[c]]
			head[c]++
			if z.zone[v] >= 0 {
				continue
			}
			z.zone[v] = first + c
			nb, _ := z.g.Row(int(v))
			for _, u := range nb {
				if z.zone[u] < 0 {
					frontier[c] = append(frontier[c], u)
				}
			}
			heap.Push(h, zoneSize{size: top.size + 1, zone: c})
			break
		}
		// A zone whose frontier ran dry is enclosed by others and stops
		// growing; it is not pushed back.
	}
}

// mergeSmall merges each zone of fewer than half the target areas (zones
// first…first+k−1 of one component) into its smallest neighbouring zone,
// smallest zones first.
func (z *zoner) mergeSmall(members []int32, first, k int32) {
	size := make([]int, k)
	areas := make([][]int32, k)
	for _, v := range members {
		c := z.zone[v] - first
		size[c]++
		areas[c] = append(areas[c], v)
	}
	h := &zoneHeap{}
	for c := int32(0); c < k; c++ {
		heap.Push(h, zoneSize{size: size[c], zone: c})
	}
	alive := int(k)
	for h.Len() > 0 && alive > 1 {
		top := heap.Pop(h).(zoneSize)
		c := top.zone
		if size[c] != top.size {
			continue // stale: the zone grew or was merged away
		}
		if 2*size[c] >= z.target {
			break // the smallest zone left is large enough
		}
		// The smallest zone touching c, the lowest number among ties.
		into := int32(-1)
		for _, v := range areas[c] {
			nb, _ := z.g.Row(int(v))
			for _, u := range nb {
				d := z.zone[u] - first
				if d == c {
					continue
				}
				if into < 0 || size[d] < size[into] || (size[d] == size[into] && d < into) {
					into = d
				}
			}
		}
		for _, v := range areas[c] {
			z.zone[v] = first + into
		}
		areas[into] = append(areas[into], areas[c]...)
		size[into] += size[c]
		areas[c], size[c] = nil, 0
		alive--
		heap.Push(h, zoneSize{size: size[into], zone: into})
	}
}

// renumber numbers zones 0, 1, … in order of their first area, so that the
// numbers read naturally and gaps left by merges close.
func renumber(zone []int32) []int32 {
	code := map[int32]int32{}
	out := make([]int32, len(zone))
	for i, c := range zone {
		v, ok := code[c]
		if !ok {
			v = int32(len(code))
			code[c] = v
		}
		out[i] = v
	}
	return out
}

// zoneSize orders zones by size, then number.
type zoneSize struct {
	size int
	zone int32
}

type zoneHeap []zoneSize

func (h zoneHeap) Len() int { return len(h) }
func (h zoneHeap) Less(a, b int) bool {
	if h[a].size != h[b].size {
		return h[a].size < h[b].size
	}
	return h[a].zone < h[b].zone
}
func (h zoneHeap) Swap(a, b int) { h[a], h[b] = h[b], h[a] }
func (h *zoneHeap) Push(x any)   { *h = append(*h, x.(zoneSize)) }
func (h *zoneHeap) Pop() any {
	old := *h
	x := old[len(old)-1]
	*h = old[:len(old)-1]
	return x
}
