package weights

import (
	"fmt"
	"math"

	"github.com/areatest/areatest/internal/choice"
)

// Transform names a re-weighting of a graph's links.
type Transform string

const (
	// RowStandardised scales each row to sum to one, so an area's spatial lag
	// is the weighted mean of its neighbours. The default for statistics.
	RowStandardised Transform = "row-standardised"
	// Binary sets every link to one.
	Binary Transform = "binary"
	// VarianceStabilising scales each row to the same sum of squared
	// weights, then all weights so they sum to n (the S-coding of
	// Tiefelsdorf, Griffith & Boots 1999, Environ. Plan. A 31:165–180). It
	// sits between binary weights, which favour areas with many neighbours,
	// and row-standardised ones, which favour areas with few.
	VarianceStabilising Transform = "variance-stabilising"
)

// The names of the transforms: ParseTransform's former ones, the full names
// (the Transform values) it reads without listing them, and ParseScaling's.
var (
	transformNames = []choice.Name[Transform]{{Name: "row", Value: RowStandardised}, {Name: "binary", Value: Binary}, {Name: "variance", Value: VarianceStabilising}}
	transformFull  = []choice.Name[Transform]{{Name: string(RowStandardised), Value: RowStandardised}, {Name: string(VarianceStabilising), Value: VarianceStabilising}}
	scalingNames   = []choice.Name[Transform]{{Name: "row", Value: RowStandardised}, {Name: "none", Value: Binary}, {Name: "stabilised", Value: VarianceStabilising}}
)

// ParseTransform reads the former names "row", "binary" or "variance", or
// a transform's full name such as "row-standardised" (any case). New
// callers read ParseScaling's names.
func ParseTransform(s string) (Transform, error) {
	t, err := choice.Parse("transform", s, transformNames...)
	if err != nil {
		if full, errFull := choice.Parse("transform", s, transformFull...); errFull == nil {
			return full, nil
		}
	}
	return t, err
}

// ParseScaling reads the scaling of the weights (any case): "row" for
// RowStandardised, "none" for Binary (every link weight one, the weights as
// contiguity, nearest neighbours and distance bands build them) and
// "stabilised" for VarianceStabilising.
func ParseScaling(s string) (Transform, error) {
	return choice.Parse("scaling", s, scalingNames...)
}

// Transformed returns a copy of g with the transform applied. Islands keep
// empty rows.
func (g *Graph) Transformed(t Transform) (*Graph, error) {
	switch t {
	case RowStandardised:
		return g.RowStandardised(), nil
	case Binary:
		h := g.withWeights(string(Binary))
		for k := range h.Weights {
			h.Weights[k] = 1
		}
		return h, nil
	case VarianceStabilising:
		h := g.withWeights(string(VarianceStabilising))
		var total float64
		for i := 0; i < g.Len(); i++ {
			_, w := g.Row(i)
			var q float64
			for _, v := range w {
				q += v * v
			}
			q = math.Sqrt(q)
			a := g.Offsets[i]
			for k, v := range w {
				h.Weights[int(a)+k] = v / q
				total += v / q
			}
		}
		if total > 0 {
			scale := float64(g.Len()) / total
			for k := range h.Weights {
				h.Weights[k] *= scale
			}
		}
		return h, nil
	}
	return nil, fmt.Errorf("weights: unknown transform %q", t)
}

// withWeights copies g's structure with a fresh weight slice.
func (g *Graph) withWeights(transform string) *Graph {
	h := *g
	h.Transform = transform
	h.Weights = append([]float64(nil), g.Weights...)
	return &h
}

// Symmetrised returns W made symmetric: for binary graphs the union of links
// (i and j are neighbours when either lists the other), for weighted ones
// (W + Wᵀ)/2, where a missing entry counts as zero.
func (g *Graph) Symmetrised() *Graph {
	n := g.Len()
	binary := g.Transform == string(Binary)
	var links []Link
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			back := weightOf(g, int(j), int32(i))
			v := (w[k] + back) / 2
			if binary {
				v = 1
			}
			links = append(links, Link{int32(i), j, v})
			if back == 0 {
				links = append(links, Link{j, int32(i), v})
			}
		}
	}
	h, err := FromEntries(n, links, g.Kind+" (symmetrised)", g.Transform)
	if err != nil { // cannot happen: every pair is added once per direction
		panic(err)
	}
	return h
}

// weightOf returns w_ij, or 0 when j is not a neighbour of i.
func weightOf(g *Graph, i int, j int32) float64 {
	nb, w := g.Row(i)
	lo, hi := 0, len(nb)
	for lo < hi {
		m := (lo + hi) / 2
		if nb[m] < j {
			lo = m + 1
		} else {
			hi = m
		}
	}
	if lo < len(nb) && nb[lo] == j {
		return w[lo]
	}
	return 0
}

// Asymmetric counts directed links i→j with no link j→i.
func (g *Graph) Asymmetric() int {
	c := 0
	for i := 0; i < g.Len(); i++ {
		nb, _ := g.Row(i)
		for _, j := range nb {
			if weightOf(g, int(j), int32(i)) == 0 {
				c++
			}
		}
	}
	return c
}
