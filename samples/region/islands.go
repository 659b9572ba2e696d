package region

import (
	"math"

	"github.com/paulmach/orb"
)

// islands makes n offshore island districts that touch nothing: small
// star-shaped polygons in open sea a few cells off the coast, or, when the
// grid has no sea (Config.Sea is 0), just east of the box. When n is at least
// 2 the last island is a pair of islets, one district in two parts, so the
// demo carries a MultiPolygon.
func (g *grid) islands(s *stream, n int) []orb.MultiPolygon {
	if n == 0 {
		return nil
	}
	dist := g.seaDistance()
	// Centres are kept at least 5 cells from land and from each other's
	// reach, so no island can touch the coast or another island.
	var candidates []int
	for c, d := range dist {
		i, j := c%g.nx, c/g.nx
		if d >= 5 && d <= 9 && i >= 3 && j >= 3 && i < g.nx-3 && j < g.ny-3 {
			candidates = append(candidates, c)
		}
	}
	type centre struct{ x, y float64 } // in cell units
	var centres []centre
	separated := func(x, y float64) bool {
		for _, o := range centres {
			if math.Max(math.Abs(o.x-x), math.Abs(o.y-y)) < 9 {
				return false
			}
		}
		return true
	}
	for try := 0; try < 20*len(candidates) && len(centres) < n; try++ {
		c := candidates[s.intN(len(candidates))]
		x, y := float64(c%g.nx)+0.5, float64(c/g.nx)+0.5
		if separated(x, y) {
			centres = append(centres, centre{x, y})
		}
	}
	for k := 0; len(centres) < n; k++ {
		// Off the east edge of the box, spread from south to north.
		y := float64(g.ny) * float64(k+1) / float64(n+1)
		centres = append(centres, centre{float64(g.nx) + 6, y})
	}

	dx := (boxEast - boxWest) / float64(g.nx)
	dy := (boxNorth - boxSouth) / float64(g.ny)
	out := make([]orb.MultiPolygon, n)
	for k, c := range centres {
		if k == n-1 && n >= 2 {
			// Islets 3 cells apart with radius at most about 1.05 cells each.
			out[k] = orb.MultiPolygon{
				islet(s, c.x-1.5, c.y, 0.9, dx, dy),
				islet(s, c.x+1.5, c.y+0.5, 0.9, dx, dy),
			}
			continue
		}
		out[k] = orb.MultiPolygon{islet(s, c.x, c.y, 1.3, dx, dy)}
	}
	return out
}

// islet is a counter-clockwise star-shaped polygon of 12 vertices around
// (cx, cy) in cell units, reaching at most about 1.15 × radius cells from the
// centre. The twelve directions are 30° apart and written with exact
// constants, so no trigonometric routine is needed.
func islet(s *stream, cx, cy, radius, dx, dy float64) orb.Polygon {
	h := math.Sqrt(3) / 2
	dirs := [12][2]float64{
		{1, 0}, {h, 0.5}, {0.5, h}, {0, 1}, {-0.5, h}, {-h, 0.5},
		{-1, 0}, {-h, -0.5}, {-0.5, -h}, {0, -1}, {0.5, -h}, {h, -0.5},
	}
	ring := make(orb.Ring, 0, 13)
	for _, u := range dirs {
		rho := radius * s.uniform(0.6, 1)
		tau := rho * s.uniform(-0.12, 0.12)
		x := cx + float64(rho*u[0]) - float64(tau*u[1])
		y := cy + float64(rho*u[1]) + float64(tau*u[0])
		ring = append(ring, orb.Point{
			round6(boxWest + float64(x*dx)),
			round6(boxSouth + float64(y*dy)),
		})
	}
	ring = append(ring, ring[0])
	return orb.Polygon{ring}
}

// seaDistance gives every cell its Chebyshev distance, in cells, to the
// nearest land cell (0 on land), by breadth-first search from all land.
func (g *grid) seaDistance() []int32 {
	dist := make([]int32, len(g.owner))
	var queue []int
	for c, o := range g.owner {
		if o == ownerSea {
			dist[c] = -1
		} else {
			queue = append(queue, c)
		}
	}
	for head := 0; head < len(queue); head++ {
		c := queue[head]
		i, j := c%g.nx, c/g.nx
		for q := j - 1; q <= j+1; q++ {
			for p := i - 1; p <= i+1; p++ {
				if p < 0 || q < 0 || p >= g.nx || q >= g.ny {
					continue
				}
				n := q*g.nx + p
				if dist[n] < 0 {
					dist[n] = dist[c] + 1
					queue = append(queue, n)
				}
			}
		}
	}
	return dist
}
