package weights

import (
	"fmt"
	"math"

	"github.com/areatest/areatest/internal/choice"
)

// Scaling names how the statistics weigh a graph's links: as built, or
// re-weighted so that areas with many or few neighbours count alike.
type Scaling string

const (
	// RowStandardised scales each row to sum to one, so an area's spatial lag
	// is the weighted mean of its neighbours. The default for statistics.
	RowStandardised Scaling = "row-standardised"
	// Binary sets every link to one.
	Binary Scaling = "binary"
	// VarianceStabilising scales each row to the same sum of squared
	// weights, then all weights so they sum to n (the S-coding of
	// Tiefelsdorf, Griffith & Boots 1999, Environ. Plan. A 31:165–180). It
	// sits between binary weights, which favour areas with many neighbours,
	// and row-standardised ones, which favour areas with few.
	VarianceStabilising Scaling = "variance-stabilising"
	// AsBuilt keeps the weights the graph was built or read with: ones for
	// contiguity, nearest neighbours and distance bands, the kernel or
	// inverse-distance values, an edge list's own weights.
	AsBuilt Scaling = "as built"
)

// The names of the scalings: ParseScaling's, and those of the former
// option --transform that ParseTransform reads, with the full names it
// reads without listing them.
var (
	transformNames = []choice.Name[Scaling]{{Name: "row", Value: RowStandardised}, {Name: "binary", Value: Binary}, {Name: "variance", Value: VarianceStabilising}}
	transformFull  = []choice.Name[Scaling]{{Name: string(RowStandardised), Value: RowStandardised}, {Name: string(VarianceStabilising), Value: VarianceStabilising}}
	scalingNames   = []choice.Name[Scaling]{{Name: "row", Value: RowStandardised}, {Name: "none", Value: AsBuilt}, {Name: "stabilised", Value: VarianceStabilising}}
)

// ParseTransform reads the names of the former option --transform: "row",
// "binary" (every link weight one) or "variance", or a full name such as
// "row-standardised" (any case). New callers read ParseScaling's names.
func ParseTransform(s string) (Scaling, error) {
	t, err := choice.Parse("transform", s, transformNames...)
	if err != nil {
		if full, errFull := choice.Parse("transform", s, transformFull...); errFull == nil {
			return full, nil
		}
	}
	return t, err
}

// ParseScaling reads the scaling of the weights (any case): "row" for
// RowStandardised, "none" for AsBuilt (the weights as built: every link
// weight one for contiguity, nearest neighbours and distance bands) and
// "stabilised" for VarianceStabilising.
func ParseScaling(s string) (Scaling, error) {
	return choice.Parse("scaling", s, scalingNames...)
}

// Scaled returns a copy of g with the scaling applied. Islands keep empty
// rows.
func (g *Graph) Scaled(t Scaling) (*Graph, error) {
	switch t {
	case AsBuilt:
		return g.withWeights(g.Scaling), nil
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
	return nil, fmt.Errorf("weights: unknown scaling %q", t)
}

// withWeights copies g's structure with a fresh weight slice.
func (g *Graph) withWeights(scaling string) *Graph {
	h := *g
	h.Scaling = scaling
	h.Weights = append([]float64(nil), g.Weights...)
	return &h
}

// Symmetrised returns W made symmetric: for binary graphs the union of links
// (i and j are neighbours when either lists the other), for weighted ones
// (W + Wᵀ)/2, where a missing entry counts as zero.
func (g *Graph) Symmetrised() *Graph {
	n := g.Len()
	binary := g.Scaling == string(Binary)
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
	h, err := FromEntries(n, links, g.Kind+" (symmetrised)", g.Scaling)
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
