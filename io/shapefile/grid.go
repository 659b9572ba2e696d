package shapefile

import (
	"math"

	"github.com/paulmach/orb"
)

// Records with many shells and many holes (a country with its islands and
// lakes at full detail) would make the search of every shell for every
// hole quadratic. Above gridFrom shells × holes the shells are put in a
// uniform grid by bounding box, about one cell per shell, and a hole is
// tried only against the shells whose box covers its cell; shells covering
// more than gridWide cells (a mainland) are tried for every hole instead.
const (
	gridFrom = 256
	gridWide = 16
)

// shellGrid indexes the shells of one record.
type shellGrid struct {
	b      orb.Bound
	nx, ny int
	cells  [][]int // ring indices of the shells whose box covers each cell
	wide   []int
}

func newShellGrid(boxes []orb.Bound, outer []bool, shells int) *shellGrid {
	g := &shellGrid{}
	first := true
	for s, o := range outer {
		if !o {
			continue
		}
		if first {
			g.b, first = boxes[s], false
		} else {
			g.b = g.b.Union(boxes[s])
		}
	}
	g.nx = int(math.Ceil(math.Sqrt(float64(shells))))
	g.ny = g.nx
	g.cells = make([][]int, g.nx*g.ny)
	for s, o := range outer {
		if !o {
			continue
		}
		x0, y0 := g.cell(boxes[s].Min)
		x1, y1 := g.cell(boxes[s].Max)
		if (x1-x0+1)*(y1-y0+1) > gridWide {
			g.wide = append(g.wide, s)
			continue
		}
		for y := y0; y <= y1; y++ {
			for x := x0; x <= x1; x++ {
				g.cells[y*g.nx+x] = append(g.cells[y*g.nx+x], s)
			}
		}
	}
	return g
}

// cell is the grid cell of a point, clamped to the grid (coordinates that
// are not finite, which the ring checks reject later, land in a corner).
func (g *shellGrid) cell(p orb.Point) (int, int) {
	return axisCell(p[0], g.b.Min[0], g.b.Max[0], g.nx), axisCell(p[1], g.b.Min[1], g.b.Max[1], g.ny)
}

func axisCell(v, lo, hi float64, n int) int {
	f := (v - lo) / (hi - lo) * float64(n)
	if !(f > 0) { // also NaN, and a grid of zero width
		return 0
	}
	if f >= float64(n) {
		return n - 1
	}
	return int(f)
}

// near returns the shells that may hold a box: those whose box covers the
// cell of its lower corner, and the wide ones.
func (g *shellGrid) near(box orb.Bound) ([]int, []int) {
	x, y := g.cell(box.Min)
	return g.cells[y*g.nx+x], g.wide
}
