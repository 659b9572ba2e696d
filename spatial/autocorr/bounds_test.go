package autocorr

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// queenLattice is queen contiguity on an m×m grid, binary weights.
func queenLattice(tb testing.TB, m int) *weights.Graph { return weights.Lattice(m, m, weights.Queen) }

// nearestGraph links each of n pseudo-random points to its k nearest
// others: an irregular, asymmetric graph (i may be among j's nearest
// without j being among i's).
func nearestGraph(tb testing.TB, n, k int) *weights.Graph {
	s := shuffle.NewStream(9, 0, 0)
	px, py := make([]float64, n), make([]float64, n)
	for i := range px {
		px[i], py[i] = s.Float64(), s.Float64()
	}
	var links []weights.Link
	for i := 0; i < n; i++ {
		best := make([]int, 0, k+1)
		d := func(j int) float64 { return math.Hypot(px[i]-px[j], py[i]-py[j]) }
		for j := 0; j < n; j++ {
			if j == i {
				continue
			}
			best = append(best, j)
			for a := len(best) - 1; a > 0 && d(best[a]) < d(best[a-1]); a-- {
				best[a], best[a-1] = best[a-1], best[a]
			}
			if len(best) > k {
				best = best[:k]
			}
		}
		for _, j := range best {
			links = append(links, weights.Link{From: int32(i), To: int32(j), Weight: 1})
		}
	}
	g, err := weights.FromEntries(n, links, "nearest", "binary")
	if err != nil {
		tb.Fatal(err)
	}
	return g
}

// denseExtremeVectors returns eigenvectors of M W* M for the smallest and
// largest eigenvalues orthogonal to 1, from gonum's EigenSym.
func denseExtremeVectors(t *testing.T, g *weights.Graph) (vmin, vmax []float64) {
	s := testkit.DoublyCentred(dense(g))
	var es mat.EigenSym
	if !es.Factorize(s, true) {
		t.Fatal("EigenSym failed")
	}
	var vec mat.Dense
	es.VectorsTo(&vec)
	vals := es.Values(nil)
	lo, hi := -1, -1
	for k := range vals {
		col := mat.Col(nil, k, &vec)
		var sum float64
		for _, v := range col {
			sum += v
		}
		if math.Abs(sum) > 0.5 { // the constant vector's direction
			continue
		}
		if lo < 0 || vals[k] < vals[lo] {
			lo = k
		}
		if hi < 0 || vals[k] > vals[hi] {
			hi = k
		}
	}
	return mat.Col(nil, lo, &vec), mat.Col(nil, hi, &vec)
}

// de Jong, Sprenger & van Veen (1984): no arrangement of any variable can
// give a Moran's I outside the bounds. Checked over all 8! = 40,320
// arrangements of 8 distinct values on an irregular layer, for binary and
// row-standardised weights; each bound is attained by its eigenvector
// (checked with gonum's dense EigenSym as the outside computation).
func TestBoundsBracketEnumeration(t *testing.T) {
	g := eightGraph(t)
	x := []float64{3.1, -2, 0.5, 7, 1.25, 4, -0.3, 2.2}
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		b, err := MoranBounds(w)
		if err != nil {
			t.Fatal(err)
		}
		labels, f, err := Permutation(x, w)
		if err != nil {
			t.Fatal(err)
		}
		_, _, null := exactNull(t, labels, f, 40320)
		lo, hi := math.Inf(1), math.Inf(-1)
		for _, v := range null {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
		if lo < b.Min-1e-12 || hi > b.Max+1e-12 {
			t.Errorf("%s: arrangements reach [%v, %v] outside the bounds [%v, %v]", w.Scaling, lo, hi, b.Min, b.Max)
		}
		vmin, vmax := denseExtremeVectors(t, w)
		imin, _ := MoransI(vmin, w)
		imax, _ := MoransI(vmax, w)
		if !near(imin, b.Min, 1e-10) || !near(imax, b.Max, 1e-10) {
			t.Errorf("%s: eigenvectors give I %v and %v, bounds %v %v", w.Scaling, imin, imax, b.Min, b.Max)
		}
	}
}

// The sparse Lanczos iteration agrees with the dense eigen-decomposition
// to 1e-8 (relative) on layers of a few hundred areas: queen and rook
// lattices and an asymmetric nearest-neighbour graph, binary and
// row-standardised.
func TestLanczosMatchesDense(t *testing.T) {
	for _, c := range []struct {
		name string
		g    *weights.Graph
	}{
		{"queen 20×20", queenLattice(t, 20)},
		{"rook 15×20", latticeGraph(15, 20)},
		{"4 nearest of 300", nearestGraph(t, 300, 4)},
	} {
		for _, w := range []*weights.Graph{c.g, c.g.RowStandardised()} {
			dlo, dhi, err := denseBounds(w)
			if err != nil {
				t.Fatal(err)
			}
			e := lanczosBounds(newCentredSym(w), 1, 1e-11, 2000)
			lo, hi, iters, ok := e.lo, e.hi, e.steps, e.converged
			if !ok {
				t.Errorf("%s %s: no convergence in %d steps", c.name, w.Scaling, iters)
			}
			if math.Abs(lo-dlo) > 1e-8*math.Abs(dlo) || math.Abs(hi-dhi) > 1e-8*math.Abs(dhi) {
				t.Errorf("%s %s: lanczos [%v, %v] dense [%v, %v]", c.name, w.Scaling, lo, hi, dlo, dhi)
			}
			t.Logf("%s %s: %d steps, [%.12g, %.12g]", c.name, w.Scaling, iters, lo, hi)
		}
	}
	// Past DenseBoundsLimit MoranBounds switches to Lanczos.
	g := nearestGraph(t, 600, 5).RowStandardised()
	b, err := MoranBounds(g)
	if err != nil {
		t.Fatal(err)
	}
	dlo, dhi, _ := denseBounds(g)
	s := float64(g.Len()) / sumWeights(g)
	if b.Method != "lanczos" || !b.Converged || math.Abs(b.Min-s*dlo) > 1e-8*math.Abs(s*dlo) || math.Abs(b.Max-s*dhi) > 1e-8*math.Abs(s*dhi) {
		t.Errorf("600 areas: %+v, dense [%v, %v]", b, s*dlo, s*dhi)
	}
}

// Only the symmetric part of W matters: a row-standardised (asymmetric) W
// has the bounds of (W + Wᵀ)/2.
func TestBoundsUseSymmetricPart(t *testing.T) {
	w := nearestGraph(t, 120, 3).RowStandardised()
	a, _ := MoranBounds(w)
	b, _ := MoranBounds(w.Symmetrised())
	if !near(a.Min, b.Min, 1e-12) || !near(a.Max, b.Max, 1e-12) {
		t.Errorf("W %+v, (W+Wᵀ)/2 %+v", a, b)
	}
}

// On a rook lattice with row-standardised weights the largest attainable
// I is close to, but below, 1, and it creeps towards 1 as the lattice grows
// (0.878, 0.976, 0.995 for 5×5, 10×10, 20×20). With binary weights I is not
// confined to [−1, 1]: on a 10×10 rook lattice the upper bound is just
// above 1, and the lower bound is below −1, the value of the checkerboard
// (TestCheckerboardAndAffineInvariance).
func TestBoundsRookLattice(t *testing.T) {
	prev := 0.0
	for _, m := range []int{5, 10, 20} {
		b, err := MoranBounds(latticeGraph(m, m).RowStandardised())
		if err != nil {
			t.Fatal(err)
		}
		if b.Max >= 1 || b.Max < 0.85 || b.Max <= prev || b.Min >= -1 || b.Min < -1.01 {
			t.Errorf("%d×%d row-standardised: %+v", m, m, b)
		}
		prev = b.Max
	}
	b, _ := MoranBounds(latticeGraph(10, 10))
	if b.Max <= 1 || b.Max > 1.01 || b.Min > -1 {
		t.Errorf("10×10 binary: %+v", b)
	}
}

// On a complete graph every variable has I = −1/(n − 1): with W = 11ᵀ − I,
// zᵀWz = (Σz)² − zᵀz = −zᵀz for centred z and S0 = n(n − 1). Both bounds
// are therefore −1/(n − 1); Lanczos finds an invariant subspace at its
// first step. Checked on both paths (n = 12 dense, n = 520 Lanczos).
func TestBoundsCompleteGraph(t *testing.T) {
	for _, n := range []int{12, 520} {
		var pairs [][2]int32
		for i := 0; i < n; i++ {
			for j := i + 1; j < n; j++ {
				pairs = append(pairs, [2]int32{int32(i), int32(j)})
			}
		}
		b, err := MoranBounds(mustGraph(t, n, pairs))
		if err != nil {
			t.Fatal(err)
		}
		want := -1 / float64(n-1)
		if !near(b.Min, want, 1e-12) || !near(b.Max, want, 1e-12) || !b.Converged {
			t.Errorf("K_%d: %+v, want both %v", n, b, want)
		}
	}
}

// Lanczos on tiny and awkward graphs — a path of 3 (one step short of the
// usual convergence check), a star, and a layer of two components with an
// island — agrees with the dense answer.
func TestLanczosSmallGraphs(t *testing.T) {
	for _, g := range []*weights.Graph{
		mustGraph(t, 3, [][2]int32{{0, 1}, {1, 2}}),
		mustGraph(t, 6, [][2]int32{{0, 1}, {0, 2}, {0, 3}, {0, 4}, {0, 5}}),
		mustGraph(t, 9, [][2]int32{{0, 1}, {1, 2}, {2, 0}, {3, 4}, {4, 5}, {5, 6}, {6, 7}}),
	} {
		for _, w := range []*weights.Graph{g, g.RowStandardised()} {
			dlo, dhi, _ := denseBounds(w)
			e := lanczosBounds(newCentredSym(w), 1, 1e-11, 2000)
			lo, hi, ok := e.lo, e.hi, e.converged
			if !ok || !near(lo, dlo, 1e-10) || !near(hi, dhi, 1e-10) {
				t.Errorf("n=%d %s: lanczos [%v, %v] (converged %v), dense [%v, %v]", w.Len(), w.Scaling, lo, hi, ok, dlo, dhi)
			}
		}
	}
}
