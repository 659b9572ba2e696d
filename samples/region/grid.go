package region

import (
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// The invented region lies in a 3° × 2° box over open South Atlantic water,
// where no real coastline can be mistaken for it.
const (
	boxWest  = -24.0
	boxEast  = -21.0
	boxSouth = -41.0
	boxNorth = -39.0
)

// Cell owners that are not districts.
const (
	ownerSea        int32 = -1
	ownerUnassigned int32 = -2
)

// Directions of lattice edges, counter-clockwise from east, so that a left turn
// is +1 and a right turn is +3 (mod 4).
const (
	dirE = iota
	dirN
	dirW
	dirS
)

// grid is a lattice of (nx+1) × (ny+1) jittered points forming nx × ny
// quadrilateral cells. Cell (i, j) has corners (i, j), (i+1, j), (i+1, j+1),
// (i, j+1) in counter-clockwise order; i grows eastwards, j northwards. Every
// district outline is a chain of lattice points, which is what makes shared
// boundaries bit-identical on both sides.
type grid struct {
	nx, ny   int
	lon, lat []float64 // lattice points, index j*(nx+1)+i, rounded to 1e-6
	owner    []int32   // cells, index j*nx+i: a district, ownerSea or ownerUnassigned
}

// round6 rounds to 6 decimals, the precision written to GeoJSON. Rounding
// before any vertex is shared means that writing and reading back as text
// reproduces the same float64 on every side of a boundary.
func round6(x float64) float64 {
	return math.Round(x*1e6) / 1e6
}

// newGrid lays out roughly wantCells cells over the box, about square on the
// ground (a degree of longitude being shorter than one of latitude). Interior points move by up to ±jitter of the spacing in each
// direction; points on the box edge move only along the edge, so the cells tile
// the box exactly. With jitter below 0.25 every cell stays convex.
func newGrid(s *stream, wantCells int) *grid {
	const width, height = boxEast - boxWest, boxNorth - boxSouth
	nx := max(4, int(math.Round(math.Sqrt(float64(wantCells)*width*lonScale/height))))
	ny := max(4, int(math.Round(float64(wantCells)/float64(nx))))
	g := &grid{
		nx:    nx,
		ny:    ny,
		lon:   make([]float64, (nx+1)*(ny+1)),
		lat:   make([]float64, (nx+1)*(ny+1)),
		owner: make([]int32, nx*ny),
	}
	for c := range g.owner {
		g.owner[c] = ownerUnassigned
	}
	const jitter = 0.22
	dx, dy := width/float64(nx), height/float64(ny)
	for j := 0; j <= ny; j++ {
		for i := 0; i <= nx; i++ {
			// Draw both offsets for every point so that the sequence does not
			// depend on which points lie on the edge.
			ju, jv := s.uniform(-jitter, jitter), s.uniform(-jitter, jitter)
			if i == 0 || i == nx {
				ju = 0
			}
			if j == 0 || j == ny {
				jv = 0
			}
			x := boxWest + float64((float64(i)+ju)*dx)
			y := boxSouth + float64((float64(j)+jv)*dy)
			switch i {
			case 0:
				x = boxWest
			case nx:
				x = boxEast
			}
			switch j {
			case 0:
				y = boxSouth
			case ny:
				y = boxNorth
			}
			p := j*(nx+1) + i
			g.lon[p], g.lat[p] = round6(x), round6(y)
		}
	}
	return g
}

func (g *grid) cellOwner(i, j int) int32 {
	if i < 0 || j < 0 || i >= g.nx || j >= g.ny {
		return ownerSea
	}
	return g.owner[j*g.nx+i]
}

// edgeSides returns the cells to the left and to the right of the lattice edge
// that leaves point (i, j) in direction dir.
func edgeSides(i, j, dir int) (li, lj, ri, rj int) {
	switch dir {
	case dirE:
		return i, j, i, j - 1
	case dirN:
		return i - 1, j, i, j
	case dirW:
		return i - 1, j - 1, i - 1, j
	default: // dirS
		return i, j - 1, i - 1, j - 1
	}
}

var stepI = [4]int{1, 0, -1, 0}
var stepJ = [4]int{0, 1, 0, -1}

// isBoundary reports whether the edge leaving (i, j) in direction dir has
// district d on its left and something else on its right.
func (g *grid) isBoundary(i, j, dir int, d int32) bool {
	li, lj, ri, rj := edgeSides(i, j, dir)
	return g.cellOwner(li, lj) == d && g.cellOwner(ri, rj) != d
}

// cellArea is the shoelace area of cell c in square degrees.
func (g *grid) cellArea(c int) float64 {
	i, j := c%g.nx, c/g.nx
	w := g.nx + 1
	p := [4]int{j*w + i, j*w + i + 1, (j+1)*w + i + 1, (j+1)*w + i}
	var a float64
	for k := range 4 {
		q, r := p[k], p[(k+1)%4]
		a += float64(g.lon[q]*g.lat[r]) - float64(g.lon[r]*g.lat[q])
	}
	return a / 2
}

// cellCentre is the mean of the cell's corners: good enough to place a district
// in the smooth fields.
func (g *grid) cellCentre(c int) (float64, float64) {
	i, j := c%g.nx, c/g.nx
	w := g.nx + 1
	p := [4]int{j*w + i, j*w + i + 1, (j+1)*w + i + 1, (j+1)*w + i}
	var x, y float64
	for _, q := range p {
		x += g.lon[q]
		y += g.lat[q]
	}
	return x / 4, y / 4
}

// carveCoast turns about the share sea of the cells into sea so that the land
// is one irregular mass: a falloff from the centre of the box, roughened by a
// smooth random field. Afterwards the land has no corner-only contacts (which
// would pinch the coastline into a point), is one edge-connected piece, and
// has no lakes, so every piece of coast is an edge between land and open sea.
func (g *grid) carveCoast(s *stream, sea float64) error {
	if sea == 0 {
		return nil
	}
	rough := newField(s, 5, 4, 3)
	score := make([]float64, len(g.owner))
	for c := range g.owner {
		i, j := c%g.nx, c/g.nx
		u := (float64(i) + 0.5) / float64(g.nx)
		v := (float64(j) + 0.5) / float64(g.ny)
		du, dv := float64(2*u)-1, float64(2*v)-1
		// Land within a tenth of the box's width of its edge is discouraged,
		// so the coast seldom runs straight along the box.
		edge := math.Min(math.Min(u, 1-u), math.Min(v, 1-v))
		score[c] = -math.Sqrt(float64(du*du)+float64(dv*dv)) + float64(0.55*rough.at(u, v)) - float64(4*math.Max(0, 0.1-edge))
		if i == 0 || j == 0 || i == g.nx-1 || j == g.ny-1 {
			score[c] = math.Inf(-1)
		}
	}
	sorted := slices.Clone(score)
	slices.Sort(sorted)
	k := min(len(sorted)-1, int(sea*float64(len(sorted))))
	threshold := sorted[k]
	for c := range g.owner {
		if score[c] < threshold {
			g.owner[c] = ownerSea
		} else {
			g.owner[c] = ownerUnassigned
		}
	}
	g.fillPinches()
	g.keepLargestLand()
	g.fillLakes()
	if len(g.landCells()) == 0 {
		return fmt.Errorf("region: the coastline left no land; use less sea")
	}
	return nil
}

func (g *grid) land(i, j int) bool { return g.cellOwner(i, j) != ownerSea }

// fillPinches removes every 2 × 2 block where land and sea alternate
// diagonally by making its sea cells land, until none is left.
func (g *grid) fillPinches() {
	for changed := true; changed; {
		changed = false
		for j := 0; j+1 < g.ny; j++ {
			for i := 0; i+1 < g.nx; i++ {
				a, b := g.land(i, j), g.land(i+1, j)
				c, d := g.land(i, j+1), g.land(i+1, j+1)
				if a == d && b == c && a != b {
					for _, q := range [][2]int{{i, j}, {i + 1, j}, {i, j + 1}, {i + 1, j + 1}} {
						g.owner[q[1]*g.nx+q[0]] = ownerUnassigned
					}
					changed = true
				}
			}
		}
	}
}

// neighbours4 appends the edge neighbours of cell c that lie inside the grid.
func (g *grid) neighbours4(c int, out []int) []int {
	i, j := c%g.nx, c/g.nx
	if i > 0 {
		out = append(out, c-1)
	}
	if i+1 < g.nx {
		out = append(out, c+1)
	}
	if j > 0 {
		out = append(out, c-g.nx)
	}
	if j+1 < g.ny {
		out = append(out, c+g.nx)
	}
	return out
}

// keepLargestLand turns every land piece but the largest into sea.
func (g *grid) keepLargestLand() {
	label := make([]int32, len(g.owner))
	for c := range label {
		label[c] = -1
	}
	var sizes []int
	var queue, nb []int
	for c := range g.owner {
		if g.owner[c] == ownerSea || label[c] >= 0 {
			continue
		}
		id := int32(len(sizes))
		size := 0
		label[c] = id
		queue = append(queue[:0], c)
		for len(queue) > 0 {
			q := queue[len(queue)-1]
			queue = queue[:len(queue)-1]
			size++
			for _, n := range g.neighbours4(q, nb[:0]) {
				if g.owner[n] != ownerSea && label[n] < 0 {
					label[n] = id
					queue = append(queue, n)
				}
			}
		}
		sizes = append(sizes, size)
	}
	if len(sizes) == 0 {
		return
	}
	best := int32(0)
	for id, n := range sizes {
		if n > sizes[best] {
			best = int32(id)
		}
	}
	for c := range g.owner {
		if g.owner[c] != ownerSea && label[c] != best {
			g.owner[c] = ownerSea
		}
	}
}

// fillLakes turns sea that cannot reach the edge of the grid into land.
func (g *grid) fillLakes() {
	open := make([]bool, len(g.owner))
	var queue, nb []int
	for c := range g.owner {
		i, j := c%g.nx, c/g.nx
		if g.owner[c] == ownerSea && (i == 0 || j == 0 || i == g.nx-1 || j == g.ny-1) {
			open[c] = true
			queue = append(queue, c)
		}
	}
	for len(queue) > 0 {
		q := queue[len(queue)-1]
		queue = queue[:len(queue)-1]
		for _, n := range g.neighbours4(q, nb[:0]) {
			if g.owner[n] == ownerSea && !open[n] {
				open[n] = true
				queue = append(queue, n)
			}
		}
	}
	for c := range g.owner {
		if g.owner[c] == ownerSea && !open[c] {
			g.owner[c] = ownerUnassigned
		}
	}
}

// landCells lists the land cells in index order.
func (g *grid) landCells() []int32 {
	var out []int32
	for c, o := range g.owner {
		if o != ownerSea {
			out = append(out, int32(c))
		}
	}
	return out
}

// grow divides the land into n districts. With enclave set, district 0 is a
// 2 × 2 block of cells wholly surrounded by district 1, so that district 1
// needs a hole. Seeds are spread out (a seed is refused within spacing cells
// of another while enough candidates remain); then, round after round, every
// district claims one more cell, taken at random from its edge. Growing
// every district at the same pace keeps sizes even; the random cell keeps
// shapes rounded but irregular. Districts grow through cell edges
// only, so every district is one edge-connected piece.
func (g *grid) grow(s *stream, n int, enclave bool, cellsPerArea int) error {
	land := g.landCells()
	if len(land) < n+16 {
		return fmt.Errorf("region: only %d land cells for %d districts", len(land), n)
	}
	gr := &growth{g: g, frontier: make([][]int32, n)}
	next := int32(0)
	if enclave {
		if !g.placeEnclave(s, land) {
			return fmt.Errorf("region: no room for an enclave; use more areas or less sea")
		}
		next = 2
		for c, o := range g.owner {
			if o == 1 {
				gr.push(1, c)
			}
		}
	}
	seeds := g.spreadSeeds(s, land, n-int(next), 0.75*math.Sqrt(float64(cellsPerArea)))
	if len(seeds) != n-int(next) {
		return fmt.Errorf("region: could only place %d of %d districts", int(next)+len(seeds), n)
	}
	// Numbering the districts in lattice order keeps the growth rounds
	// below walking memory mostly forwards, which matters at a million cells.
	slices.Sort(seeds)
	for _, c := range seeds {
		g.owner[c] = next
		gr.push(next, int(c))
		next++
	}
	gr.rounds(s)
	for _, c := range land {
		if g.owner[c] < 0 {
			return fmt.Errorf("region: internal error: cell %d left without a district", c)
		}
	}
	return nil
}

// spreadSeeds picks up to want unassigned land cells as district seeds, in
// a random order of the land: first only cells at least spacing cells from
// every seed so far, then, if that leaves too few, any cell not yet chosen.
func (g *grid) spreadSeeds(s *stream, land []int32, want int, spacing float64) []int32 {
	b := newSeedBuckets(g, spacing)
	order := slices.Clone(land)
	s.shuffle(order)
	seeds := make([]int32, 0, want)
	chosen := make([]bool, len(g.owner))
	for _, spread := range []bool{true, false} {
		for _, c := range order {
			if len(seeds) == want {
				return seeds
			}
			if g.owner[c] == ownerUnassigned && (spread && b.far(c) || !spread && !chosen[c]) {
				chosen[c] = true
				seeds = append(seeds, c)
				b.add(c)
			}
		}
	}
	return seeds
}

// seedBuckets files the seeds placed so far in square buckets at least one
// spacing wide, so that whether a cell is far from every seed needs only
// the 3 × 3 buckets around it.
type seedBuckets struct {
	nx, bucket, bx, by int
	spacing            float64
	in                 [][]int32
}

func newSeedBuckets(g *grid, spacing float64) *seedBuckets {
	bucket := max(1, int(math.Ceil(spacing)))
	bx, by := (g.nx+bucket-1)/bucket, (g.ny+bucket-1)/bucket
	return &seedBuckets{nx: g.nx, bucket: bucket, bx: bx, by: by, spacing: spacing, in: make([][]int32, bx*by)}
}

// far reports whether cell c lies at least spacing cells from every seed.
func (b *seedBuckets) far(c int32) bool {
	i, j := int(c)%b.nx, int(c)/b.nx
	for bj := max(0, j/b.bucket-1); bj <= min(b.by-1, j/b.bucket+1); bj++ {
		for bi := max(0, i/b.bucket-1); bi <= min(b.bx-1, i/b.bucket+1); bi++ {
			for _, o := range b.in[bj*b.bx+bi] {
				oi, oj := int(o)%b.nx, int(o)/b.nx
				di, dj := float64(oi-i), float64(oj-j)
				if float64(di*di)+float64(dj*dj) < float64(b.spacing*b.spacing) {
					return false
				}
			}
		}
	}
	return true
}

func (b *seedBuckets) add(c int32) {
	i, j := int(c)%b.nx, int(c)/b.nx
	k := (j/b.bucket)*b.bx + i/b.bucket
	b.in[k] = append(b.in[k], c)
}

// growth is the state of the growth rounds: for each district, the
// unassigned cells next to it (a cell may be listed more than once, and
// may have been claimed by another district since).
type growth struct {
	g        *grid
	frontier [][]int32
	nb       []int
}

// push adds the unassigned edge neighbours of cell c to district d's
// frontier.
func (gr *growth) push(d int32, c int) {
	gr.nb = gr.g.neighbours4(c, gr.nb[:0])
	for _, q := range gr.nb {
		if gr.g.owner[q] == ownerUnassigned {
			gr.frontier[d] = append(gr.frontier[d], int32(q))
		}
	}
}

// rounds lets every district still able to grow claim one more cell per
// round until none can.
func (gr *growth) rounds(s *stream) {
	active := make([]int32, 0, len(gr.frontier))
	for d := range gr.frontier {
		if len(gr.frontier[d]) > 0 {
			active = append(active, int32(d))
		}
	}
	for len(active) > 0 {
		keep := active[:0]
		for _, d := range active {
			if gr.claim(s, d) {
				keep = append(keep, d)
			}
		}
		active = keep
	}
}

// claim gives district d one cell drawn at random from its frontier,
// dropping the cells other districts took meanwhile, and reports whether
// the frontier still holds cells.
func (gr *growth) claim(s *stream, d int32) bool {
	f := gr.frontier[d]
	for len(f) > 0 {
		k := s.intN(len(f))
		c := f[k]
		f[k] = f[len(f)-1]
		f = f[:len(f)-1]
		if gr.g.owner[c] == ownerUnassigned {
			gr.g.owner[c] = d
			gr.frontier[d] = f
			gr.push(d, int(c))
			f = gr.frontier[d]
			break
		}
	}
	if len(f) > 0 {
		gr.frontier[d] = f
		return true
	}
	gr.frontier[d] = nil
	return false
}

// placeEnclave looks for a 4 × 4 block of land whose middle 2 × 2 cells become
// district 0 and whose ring of 12 cells becomes district 1. Blocks that keep a
// further ring of land around them are preferred, so the surrounding district
// is not squeezed against the coast.
func (g *grid) placeEnclave(s *stream, land []int32) bool {
	fits := func(c int32, r int) bool {
		i, j := int(c)%g.nx, int(c)/g.nx
		for q := j - 1 - r; q <= j+2+r; q++ {
			for p := i - 1 - r; p <= i+2+r; p++ {
				if g.cellOwner(p, q) != ownerUnassigned {
					return false
				}
			}
		}
		return true
	}
	for _, margin := range []int{2, 0} {
		for range 4000 {
			c := land[s.intN(len(land))]
			if !fits(c, margin) {
				continue
			}
			i, j := int(c)%g.nx, int(c)/g.nx
			for q := j - 1; q <= j+2; q++ {
				for p := i - 1; p <= i+2; p++ {
					inner := p >= i && p <= i+1 && q >= j && q <= j+1
					if inner {
						g.owner[q*g.nx+p] = 0
					} else {
						g.owner[q*g.nx+p] = 1
					}
				}
			}
			return true
		}
	}
	return false
}

// cellsByDistrict groups the land cells by district, each list in cell order.
func (g *grid) cellsByDistrict(n int) [][]int32 {
	count := make([]int, n+1)
	for _, o := range g.owner {
		if o >= 0 {
			count[o+1]++
		}
	}
	for d := 1; d <= n; d++ {
		count[d] += count[d-1]
	}
	flat := make([]int32, count[n])
	pos := slices.Clone(count[:n])
	for c, o := range g.owner {
		if o >= 0 {
			flat[pos[o]] = int32(c)
			pos[o]++
		}
	}
	out := make([][]int32, n)
	for d := range out {
		out[d] = flat[count[d]:count[d+1]:count[d+1]]
	}
	return out
}

// trace returns the outline of district d, whose cells are given, as a
// MultiPolygon. It walks the lattice edges that have d on the left and another
// owner on the right, so exteriors come out counter-clockwise and holes
// clockwise (RFC 7946), and every lattice point along the way is kept. Where
// the walk reaches a point with two ways on (two cells of d touching only at a
// corner) it turns as far left as it can, which closes the loop around the
// cell it came along and keeps every ring simple. used marks the edges taken,
// four bits per lattice point.
func (g *grid) trace(d int32, cells []int32, used []uint8) (orb.MultiPolygon, error) {
	w := g.nx + 1
	var exteriors []orb.Ring
	var holes []orb.Ring
	for _, c := range cells {
		ci, cj := int(c)%g.nx, int(c)/g.nx
		starts := [4][3]int{
			{ci, cj, dirE},
			{ci + 1, cj, dirN},
			{ci + 1, cj + 1, dirW},
			{ci, cj + 1, dirS},
		}
		for _, st := range starts {
			i0, j0, d0 := st[0], st[1], st[2]
			if used[j0*w+i0]&(1<<d0) != 0 || !g.isBoundary(i0, j0, d0, d) {
				continue
			}
			ring := orb.Ring{{g.lon[j0*w+i0], g.lat[j0*w+i0]}}
			i, j, h := i0, j0, d0
			for {
				used[j*w+i] |= 1 << h
				i, j = i+stepI[h], j+stepJ[h]
				ring = append(ring, orb.Point{g.lon[j*w+i], g.lat[j*w+i]})
				nh := -1
				for _, t := range [3]int{(h + 1) & 3, h, (h + 3) & 3} {
					if g.isBoundary(i, j, t, d) {
						nh = t
						break
					}
				}
				if nh < 0 {
					return nil, fmt.Errorf("region: internal error: outline of district %d breaks off", d)
				}
				if i == i0 && j == j0 && nh == d0 {
					break
				}
				if used[j*w+i]&(1<<nh) != 0 {
					return nil, fmt.Errorf("region: internal error: outline of district %d runs into itself", d)
				}
				h = nh
			}
			if ringArea(ring) > 0 {
				exteriors = append(exteriors, ring)
			} else {
				holes = append(holes, ring)
			}
		}
	}
	return assemble(exteriors, holes)
}

// assemble gives each hole to the smallest exterior that contains it.
func assemble(exteriors, holes []orb.Ring) (orb.MultiPolygon, error) {
	if len(exteriors) == 0 {
		return nil, fmt.Errorf("region: internal error: outline without an exterior")
	}
	mp := make(orb.MultiPolygon, len(exteriors))
	for k, r := range exteriors {
		mp[k] = orb.Polygon{r}
	}
	for _, h := range holes {
		// The midpoint of a hole edge lies on no other ring: rings meet only at
		// lattice points.
		probe := orb.Point{(h[0][0] + h[1][0]) / 2, (h[0][1] + h[1][1]) / 2}
		best := -1
		for k, r := range exteriors {
			if len(exteriors) == 1 || (inRing(probe, r) && (best < 0 || ringArea(r) < ringArea(exteriors[best]))) {
				best = k
			}
		}
		if best < 0 {
			return nil, fmt.Errorf("region: internal error: hole outside every exterior")
		}
		mp[best] = append(mp[best], h)
	}
	return mp, nil
}

// ringArea is the signed shoelace area: positive for counter-clockwise rings.
func ringArea(r orb.Ring) float64 {
	var a float64
	for k := 0; k+1 < len(r); k++ {
		a += float64(r[k][0]*r[k+1][1]) - float64(r[k+1][0]*r[k][1])
	}
	return float64(a / 2)
}

// inRing is the even–odd test for a point that lies on no edge of r.
func inRing(p orb.Point, r orb.Ring) bool {
	in := false
	for k := 0; k+1 < len(r); k++ {
		a, b := r[k], r[k+1]
		if (a[1] > p[1]) != (b[1] > p[1]) {
			x := a[0] + float64((p[1]-a[1])/(b[1]-a[1])*(b[0]-a[0]))
			if x > p[0] {
				in = !in
			}
		}
	}
	return in
}

// rookPairs lists each pair of districts that share at least one cell edge,
// as (smaller, larger), sorted and without repeats.
func (g *grid) rookPairs() [][2]int32 {
	var pairs [][2]int32
	add := func(a, b int32) {
		if a < 0 || b < 0 || a == b {
			return
		}
		if a > b {
			a, b = b, a
		}
		pairs = append(pairs, [2]int32{a, b})
	}
	for j := 0; j < g.ny; j++ {
		for i := 0; i < g.nx; i++ {
			o := g.owner[j*g.nx+i]
			if i+1 < g.nx {
				add(o, g.owner[j*g.nx+i+1])
			}
			if j+1 < g.ny {
				add(o, g.owner[(j+1)*g.nx+i])
			}
		}
	}
	slices.SortFunc(pairs, func(x, y [2]int32) int {
		if x[0] != y[0] {
			return int(x[0] - y[0])
		}
		return int(x[1] - y[1])
	})
	return slices.Compact(pairs)
}
