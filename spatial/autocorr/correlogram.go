package autocorr

import (
	"fmt"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Lag is Moran's I at one order of neighbourhood.
type Lag struct {
	// Order is the position of the graph in the list, from 1: with graphs
	// from LagGraphs, the number of steps between the linked areas.
	Order int `json:"order"`
	// Pairs is the number of linked pairs of areas at this order.
	Pairs int `json:"pairs"`
	Test
}

// Correlogram returns Moran's I of x on each graph of graphs, with its
// moments and permutation test: the spatial correlogram, I against the
// order of neighbourhood (Cliff & Ord 1981). Every order is
// tested with the same plan, so the orders are judged on the same shuffles;
// the p-values are one per order and call for a multiple-testing
// adjustment (shuffle.Adjust) when read together. An order with no linked
// pair is an error naming it.
func Correlogram(x []float64, graphs []*weights.Graph, plan shuffle.Plan) ([]Lag, error) {
	out := make([]Lag, 0, len(graphs))
	for k, g := range graphs {
		if err := checkColumn(x, g); err != nil {
			return nil, fmt.Errorf("order %d: %w", k+1, err)
		}
		pi, _, _ := symmetricPairs(g)
		if len(pi) == 0 {
			return nil, fmt.Errorf("order %d: no two areas are linked at this order", k+1)
		}
		t, err := RunTest(x, g, plan)
		if err != nil {
			return nil, fmt.Errorf("order %d: %w", k+1, err)
		}
		out = append(out, Lag{Order: k + 1, Pairs: len(pi), Test: t})
	}
	return out, nil
}

// LagGraphs returns the graphs of neighbours of exactly order 1, 2, …, k of
// g (weights.Graph.HigherOrder, not cumulative), each with scaling t.
// Orders beyond the largest number of steps between two areas have no
// links; Correlogram rejects them.
func LagGraphs(g *weights.Graph, k int, t weights.Scaling) ([]*weights.Graph, error) {
	out := make([]*weights.Graph, 0, k)
	for order := 1; order <= k; order++ {
		h, err := g.HigherOrder(order, false)
		if err != nil {
			return nil, err
		}
		if h, err = h.Scaled(t); err != nil {
			return nil, err
		}
		out = append(out, h)
	}
	return out, nil
}
