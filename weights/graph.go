package weights

import (
	"fmt"
	"slices"
	"sort"
)

// Graph is a sparse spatial weights matrix in compressed-row form: the
// neighbours of area i are Neighbours[Offsets[i]:Offsets[i+1]] with weights
// Weights[Offsets[i]:Offsets[i+1]]. Neighbour lists are sorted by index and
// never contain i itself.
type Graph struct {
	// Kind describes how the graph was built, e.g. "queen contiguity".
	Kind string
	// Scaling names the weighting of the links: "binary", a builder's own
	// ("weighted", "as given") or a Scaling applied to them, such as
	// "row-standardised".
	Scaling    string
	Offsets    []int32
	Neighbours []int32
	Weights    []float64
}

// Len returns the number of areas (rows).
func (g *Graph) Len() int { return len(g.Offsets) - 1 }

// Links returns the number of directed links (non-zero entries).
func (g *Graph) Links() int { return len(g.Neighbours) }

// Degree returns the number of neighbours of area i.
func (g *Graph) Degree(i int) int { return int(g.Offsets[i+1] - g.Offsets[i]) }

// Row returns the neighbours of area i and their weights. The slices alias the
// graph and must not be modified.
func (g *Graph) Row(i int) ([]int32, []float64) {
	a, b := g.Offsets[i], g.Offsets[i+1]
	return g.Neighbours[a:b], g.Weights[a:b]
}

// Islands returns the indices of areas with no neighbour, in order.
func (g *Graph) Islands() []int {
	var out []int
	for i := 0; i < g.Len(); i++ {
		if g.Degree(i) == 0 {
			out = append(out, i)
		}
	}
	return out
}

// FromLinks builds a binary graph on n areas from undirected pairs. Pairs may
// repeat and come in any order; self-pairs are an error.
func FromLinks(n int, pairs [][2]int32, kind string) (*Graph, error) {
	deg := make([]int32, n+1)
	for _, p := range pairs {
		if p[0] == p[1] {
			return nil, fmt.Errorf("weights: area %d linked to itself", p[0])
		}
		if p[0] < 0 || p[1] < 0 || int(p[0]) >= n || int(p[1]) >= n {
			return nil, fmt.Errorf("weights: link %v out of range for %d areas", p, n)
		}
		deg[p[0]+1]++
		deg[p[1]+1]++
	}
	for i := 1; i <= n; i++ {
		deg[i] += deg[i-1]
	}
	nb := make([]int32, deg[n])
	fill := make([]int32, n)
	copy(fill, deg[:n])
	for _, p := range pairs {
		nb[fill[p[0]]] = p[1]
		fill[p[0]]++
		nb[fill[p[1]]] = p[0]
		fill[p[1]]++
	}
	// Sort each row and drop repeated links.
	out := make([]int32, 0, len(nb))
	offsets := make([]int32, n+1)
	for i := 0; i < n; i++ {
		row := nb[deg[i]:deg[i+1]]
		slices.Sort(row)
		for k, j := range row {
			if k > 0 && row[k-1] == j {
				continue
			}
			out = append(out, j)
		}
		offsets[i+1] = int32(len(out))
	}
	w := make([]float64, len(out))
	for k := range w {
		w[k] = 1
	}
	return &Graph{Kind: kind, Scaling: "binary", Offsets: offsets, Neighbours: out, Weights: w}, nil
}

// RowStandardised returns a copy whose rows each sum to one. Rows of islands
// stay empty.
func (g *Graph) RowStandardised() *Graph {
	h := &Graph{Kind: g.Kind, Scaling: "row-standardised", Offsets: g.Offsets, Neighbours: g.Neighbours,
		Weights: make([]float64, len(g.Weights))}
	for i := 0; i < g.Len(); i++ {
		a, b := g.Offsets[i], g.Offsets[i+1]
		var s float64
		for k := a; k < b; k++ {
			s += g.Weights[k]
		}
		for k := a; k < b; k++ {
			h.Weights[k] = g.Weights[k] / s
		}
	}
	return h
}

// Subset returns the graph induced on the areas keep (indices into g, in the
// order given): area k of the result is keep[k], and only links between kept
// areas survive. Weights are copied as they are; re-standardise afterwards if
// needed.
func (g *Graph) Subset(keep []int) *Graph {
	pos := make([]int32, g.Len())
	for i := range pos {
		pos[i] = -1
	}
	for k, i := range keep {
		pos[i] = int32(k)
	}
	h := &Graph{Kind: g.Kind, Scaling: g.Scaling, Offsets: make([]int32, len(keep)+1)}
	for k, i := range keep {
		nb, w := g.Row(i)
		start := len(h.Neighbours)
		for t, j := range nb {
			if p := pos[j]; p >= 0 {
				h.Neighbours = append(h.Neighbours, p)
				h.Weights = append(h.Weights, w[t])
			}
		}
		row := h.Neighbours[start:]
		rw := h.Weights[start:]
		sort.Sort(byIndex{row, rw})
		h.Offsets[k+1] = int32(len(h.Neighbours))
	}
	return h
}

type byIndex struct {
	j []int32
	w []float64
}

func (b byIndex) Len() int           { return len(b.j) }
func (b byIndex) Less(x, y int) bool { return b.j[x] < b.j[y] }
func (b byIndex) Swap(x, y int) {
	b.j[x], b.j[y] = b.j[y], b.j[x]
	b.w[x], b.w[y] = b.w[y], b.w[x]
}

// Link is one directed, weighted entry of a graph under construction.
type Link struct {
	From, To int32
	Weight   float64
}

// FromEntries builds a graph on n areas from directed weighted links (which
// need not be symmetric). Links may come in any order; a repeated (from, to)
// pair, a self-link, an index out of range, or a negative or non-finite
// weight is an error. Links of weight zero are dropped.
func FromEntries(n int, links []Link, kind, scaling string) (*Graph, error) {
	offsets := make([]int32, n+1)
	for _, l := range links {
		if l.From == l.To {
			return nil, fmt.Errorf("weights: area %d linked to itself", l.From)
		}
		if l.From < 0 || l.To < 0 || int(l.From) >= n || int(l.To) >= n {
			return nil, fmt.Errorf("weights: link %d→%d out of range for %d areas", l.From, l.To, n)
		}
		if !(l.Weight >= 0) || l.Weight > 1e300 {
			return nil, fmt.Errorf("weights: link %d→%d has weight %v; weights must be finite and not negative", l.From, l.To, l.Weight)
		}
		if l.Weight > 0 {
			offsets[l.From+1]++
		}
	}
	for i := 1; i <= n; i++ {
		offsets[i] += offsets[i-1]
	}
	nb := make([]int32, offsets[n])
	w := make([]float64, offsets[n])
	fill := make([]int32, n)
	copy(fill, offsets[:n])
	for _, l := range links {
		if l.Weight > 0 {
			nb[fill[l.From]] = l.To
			w[fill[l.From]] = l.Weight
			fill[l.From]++
		}
	}
	g := &Graph{Kind: kind, Scaling: scaling, Offsets: offsets, Neighbours: nb, Weights: w}
	for i := 0; i < n; i++ {
		a, b := offsets[i], offsets[i+1]
		sort.Sort(byIndex{nb[a:b], w[a:b]})
		for k := a + 1; k < b; k++ {
			if nb[k] == nb[k-1] {
				return nil, fmt.Errorf("weights: link %d→%d given twice", i, nb[k])
			}
		}
	}
	return g, nil
}
