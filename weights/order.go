package weights

import "fmt"

// HigherOrder returns the binary graph of neighbours of order k: areas
// reached in exactly k steps along links of g and not fewer. With cumulative
// it links every area reached in 1..k steps. Steps follow links in either
// direction (an asymmetric graph is symmetrised first), so the result is
// symmetric. Correlograms use one graph per order.
func (g *Graph) HigherOrder(k int, cumulative bool) (*Graph, error) {
	if k < 1 {
		return nil, fmt.Errorf("weights: the order must be at least 1, not %d", k)
	}
	if g.Asymmetric() > 0 {
		g = g.Symmetrised()
	}
	n := g.Len()
	dist := make([]int32, n)
	for i := range dist {
		dist[i] = -1
	}
	var pairs [][2]int32
	frontier, next, touched := []int32{}, []int32{}, []int32{}
	for s := 0; s < n; s++ {
		// Breadth-first search from s, reset only what it touched.
		dist[s] = 0
		touched = append(touched[:0], int32(s))
		frontier = append(frontier[:0], int32(s))
		for step := int32(1); step <= int32(k) && len(frontier) > 0; step++ {
			next = next[:0]
			for _, u := range frontier {
				nb, _ := g.Row(int(u))
				for _, v := range nb {
					if dist[v] < 0 {
						dist[v] = step
						next = append(next, v)
						touched = append(touched, v)
						if int(v) > s && (cumulative || step == int32(k)) {
							pairs = append(pairs, [2]int32{int32(s), v})
						}
					}
				}
			}
			frontier, next = next, frontier
		}
		for _, v := range touched {
			dist[v] = -1
		}
	}
	kind := fmt.Sprintf("%s, order %d", g.Kind, k)
	if cumulative {
		kind = fmt.Sprintf("%s, orders 1 to %d", g.Kind, k)
	}
	return FromLinks(n, pairs, kind)
}
