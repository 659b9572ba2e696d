package autocorr

import (
	"math"
	"sort"
	"testing"

	"github.com/areatest/areatest/weights"
)

// uncentred is W* on the whole space, for checks against the closed-form
// eigenvalues of lattice adjacency matrices.
type uncentred struct{ c centredSym }

func (u uncentred) Len() int             { return u.c.Len() }
func (u uncentred) Apply(v, y []float64) { u.c.gather(v, y) }
func (u uncentred) Project([]float64)    {}

// torus links every cell of an m×m grid that wraps round at its edges to
// the cells at the given (row, column) offsets and their opposites.
func torus(tb testing.TB, m int, offsets [][2]int) *weights.Graph {
	var pairs [][2]int32
	for r := 0; r < m; r++ {
		for c := 0; c < m; c++ {
			for _, o := range offsets {
				j := ((r+o[0])%m+m)%m*m + ((c+o[1])%m+m)%m
				pairs = append(pairs, [2]int32{int32(r*m + c), int32(j)})
			}
		}
	}
	g, err := weights.FromLinks(m*m, pairs, "torus")
	if err != nil {
		tb.Fatal(err)
	}
	return g
}

// torusSpectrum is every eigenvalue of a torus's binary adjacency but the
// one of the constant vector (wave numbers (0, 0)), sorted: the matrix is
// circulant, so wave numbers (a, b) = 2π(i, j)/m give λ = Σ over the
// offsets of 2cos(a·o_r + b·o_c) — common knowledge of circulant
// matrices.
func torusSpectrum(m int, offsets [][2]int) []float64 {
	var out []float64
	for i := 0; i < m; i++ {
		for j := 0; j < m; j++ {
			if i == 0 && j == 0 {
				continue
			}
			a, b := 2*math.Pi*float64(i)/float64(m), 2*math.Pi*float64(j)/float64(m)
			var l float64
			for _, o := range offsets {
				l += 2 * math.Cos(a*float64(o[0])+b*float64(o[1]))
			}
			out = append(out, l)
		}
	}
	sort.Float64s(out)
	return out
}

// multiplicity counts the values within 1e-9 of v.
func multiplicity(vals []float64, v float64) int {
	k := 0
	for _, x := range vals {
		if math.Abs(x-v) < 1e-9 {
			k++
		}
	}
	return k
}

// On a torus the constant vector is an eigenvector of the binary weights
// (every cell has the same number of neighbours), so the range of Moran's
// I is the extreme eigenvalues of the rest divided by the degree. These
// lattices have repeated eigenvalues at both ends — the largest is 4-fold
// on the rook and queen tori and 6-fold on the triangular one (the
// contiguity of a hexagonal tessellation) — and the Lanczos path (576
// areas, above DenseBoundsLimit) finds them to its stated tolerance,
// binary and row-standardised (the same matrix divided by the degree).
func TestBoundsTorusClosedForm(t *testing.T) {
	const m = 24 // even and a multiple of 3, so the smallest eigenvalues are on the wave-number grid
	for _, c := range []struct {
		name     string
		offsets  [][2]int
		top, bot int // multiplicities at the ends
	}{
		{"rook", [][2]int{{0, 1}, {1, 0}}, 4, 1},
		{"queen", [][2]int{{0, 1}, {1, 0}, {1, 1}, {1, -1}}, 4, 2},
		{"triangular (hexagons)", [][2]int{{0, 1}, {1, 0}, {1, -1}}, 6, 2},
	} {
		g := torus(t, m, c.offsets)
		vals := torusSpectrum(m, c.offsets)
		lo, hi := vals[0], vals[len(vals)-1]
		if multiplicity(vals, hi) != c.top || multiplicity(vals, lo) != c.bot {
			t.Fatalf("%s: multiplicities %d and %d, want %d and %d", c.name, multiplicity(vals, lo), multiplicity(vals, hi), c.bot, c.top)
		}
		d := float64(2 * len(c.offsets))
		for _, w := range []*weights.Graph{g, g.RowStandardised()} {
			b, err := MoranBoundsWith(w, BoundsOptions{Tolerance: 1e-9})
			if err != nil {
				t.Fatal(err)
			}
			tol := b.Tolerance + 1e-12
			if b.Method != "lanczos" || !b.Converged || b.Tolerance > 1e-9*(hi/d) ||
				math.Abs(b.Min-lo/d) > tol || math.Abs(b.Max-hi/d) > tol {
				t.Errorf("%s %s: %+v, closed form [%v, %v]", c.name, w.Scaling, b, lo/d, hi/d)
			}
			// The Ritz values never overshoot the true range.
			if b.Min < lo/d-1e-13 || b.Max > hi/d+1e-13 {
				t.Errorf("%s %s: [%v, %v] outside [%v, %v]", c.name, w.Scaling, b.Min, b.Max, lo/d, hi/d)
			}
		}
	}
}

// The binary rook adjacency of an r×c grid (no wrap) has the eigenvalues
// 2cos(πi/(r+1)) + 2cos(πj/(c+1)), i = 1..r, j = 1..c (common knowledge:
// it is the Kronecker sum of two path graphs). Its extremes are ±(2cos(π/(r+1))
// + 2cos(π/(c+1))); the Lanczos iteration on the uncentred weights finds
// them. On a square grid the next eigenvalue in from each end is double.
func TestLanczosRookClosedForm(t *testing.T) {
	for _, c := range [][2]int{{30, 30}, {20, 45}, {1, 60}} {
		r, k := c[0], c[1]
		want := 2*math.Cos(math.Pi/float64(r+1)) + 2*math.Cos(math.Pi/float64(k+1))
		if r == 1 { // a path: one factor only
			want = 2 * math.Cos(math.Pi/float64(k+1))
		}
		g := weights.Lattice(r, k, weights.Rook)
		e := lanczosBounds(uncentred{newCentredSym(g)}, 1, 1e-10, 5000)
		// W* is half of W + Wᵀ = the adjacency itself.
		if !e.converged || math.Abs(e.hi-want) > 1e-9*want || math.Abs(e.lo+want) > 1e-9*want {
			t.Errorf("%d×%d: %+v, want ±%v", r, k, e, want)
		}
	}
}

// Offset rows of hexagons: each cell touches its two neighbours in the row
// and two in each of the rows above and below (which two depends on the
// row's parity). The Lanczos path agrees with the dense eigenvalues, and
// so does it on queen and rook lattices of other shapes.
func TestLanczosLatticesMatchDense(t *testing.T) {
	for _, c := range []struct {
		name string
		g    *weights.Graph
	}{
		{"hexagons 24×25", hexagons(t, 24, 25)},
		{"queen 17×31", weights.Lattice(17, 31, weights.Queen)},
		{"rook 23×23", weights.Lattice(23, 23, weights.Rook)},
	} {
		for _, w := range []*weights.Graph{c.g, c.g.RowStandardised()} {
			dlo, dhi, err := denseBounds(w)
			if err != nil {
				t.Fatal(err)
			}
			s := float64(w.Len()) / sumWeights(w)
			b, err := MoranBoundsWith(w, BoundsOptions{Sparse: true, Tolerance: 1e-9})
			if err != nil {
				t.Fatal(err)
			}
			if !b.Converged || math.Abs(b.Min-s*dlo) > b.Tolerance+1e-12 || math.Abs(b.Max-s*dhi) > b.Tolerance+1e-12 {
				t.Errorf("%s %s: %+v, dense [%v, %v]", c.name, w.Scaling, b, s*dlo, s*dhi)
			}
		}
	}
}

// hexagons is the contiguity of rows×cols hexagons in offset rows.
func hexagons(tb testing.TB, rows, cols int) *weights.Graph {
	var pairs [][2]int32
	id := func(r, c int) int32 { return int32(r*cols + c) }
	for r := 0; r < rows; r++ {
		for c := 0; c < cols; c++ {
			if c+1 < cols {
				pairs = append(pairs, [2]int32{id(r, c), id(r, c+1)})
			}
			if r+1 == rows {
				continue
			}
			// Odd rows are shifted half a cell to the right.
			for _, dc := range []int{r%2 - 1, r % 2} {
				if cc := c + dc; cc >= 0 && cc < cols {
					pairs = append(pairs, [2]int32{id(r, c), id(r+1, cc)})
				}
			}
		}
	}
	g, err := weights.FromLinks(rows*cols, pairs, "hexagons")
	if err != nil {
		tb.Fatal(err)
	}
	return g
}

// Stopped early, the iteration says so, and what it returns is still
// inside the true range (values of I that real variables attain), with a
// tolerance that says how far off they may be.
func TestBoundsStoppedEarly(t *testing.T) {
	g := weights.Lattice(30, 30, weights.Queen).RowStandardised()
	full, err := MoranBounds(g)
	if err != nil {
		t.Fatal(err)
	}
	b, err := MoranBoundsWith(g, BoundsOptions{MaxIterations: 12})
	if err != nil {
		t.Fatal(err)
	}
	if b.Converged || b.Iterations != 12 || b.Min < full.Min-full.Tolerance || b.Max > full.Max+full.Tolerance ||
		b.Tolerance < DefaultBoundsTolerance || !(b.Max-b.Min < full.Max-full.Min) {
		t.Errorf("stopped: %+v, full %+v", b, full)
	}
}

// The start vector is drawn from a fixed stream: the same graph gives the
// same bits every time.
func TestBoundsRepeatable(t *testing.T) {
	g := hexagons(t, 30, 30).RowStandardised()
	a, _ := MoranBounds(g)
	b, _ := MoranBounds(g)
	if a != b {
		t.Errorf("%+v then %+v", a, b)
	}
}
