package surrogate

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// nullOf returns the null distribution of the difference in medians over
// draws surrogates of y from basis opt.
func nullOf(t *testing.T, g *weights.Graph, opt Options, y []float64, lab []int32, draws int, purpose uint64) shuffle.Result {
	t.Helper()
	_, o := prepared(t, g, opt, y)
	return groupTest(t, o, groups.DiffMedians, lab, groupValue(t, groups.DiffMedians, y, lab),
		shuffle.SurrogatePlan{Draws: draws, Seed: 3, Purpose: purpose, KeepNull: true})
}

// The sparse path's null distribution of the difference in medians matches
// the dense path's on layers both can do (400 areas; the sparse basis holds
// 90 of the 399 vectors, so about 40% of the outcome's variance lies in the
// residual subspace). Two-sample Kolmogorov–Smirnov distance (Smirnov 1939)
// between 2,000 dense and 2,000 sparse null values, against the distance
// between two independent dense runs (Monte Carlo noise alone); the bound
// 0.0617 is the 0.1% critical value 1.95·√(2/2000) of the two-sample test
// (Smirnov's asymptotic distribution). Rotations inside repeated
// eigenvalues are the default and matter here: with sign flips only, the
// null on the lattice depends on which basis of each repeated eigenspace
// the solver returned, and dense and sparse return different ones (the
// distance is reported, not asserted). Matched and White residuals give
// the same null of this statistic to Monte Carlo noise.
func TestSparseNullMatchesDense(t *testing.T) {
	const draws = 2000
	bound := 1.95 * math.Sqrt(2.0/draws)
	for name, g := range map[string]*weights.Graph{
		"rook 20×20":      lattice(t, 20, 20).RowStandardised(),
		"irregular 20×20": irregular(t, 20, 20, 8).RowStandardised(),
	} {
		rng := shuffle.NewStream(17, 17, 0)
		y := newSAR(g, 0.8).draw(t, &rng)
		lab := medianSplit(newSAR(g, 0.8).draw(t, &rng))
		dense := nullOf(t, g, Options{}, y, lab, draws, 1)
		again := nullOf(t, g, Options{}, y, lab, draws, 2)
		matched := nullOf(t, g, Options{Method: Sparse, Top: 60, Bottom: 30}, y, lab, draws, 3)
		white := nullOf(t, g, Options{Method: Sparse, Top: 60, Bottom: 30, Residual: White}, y, lab, draws, 4)
		signsDense := nullOf(t, g, Options{RotationGap: -1}, y, lab, draws, 5)
		signsSparse := nullOf(t, g, Options{Method: Sparse, Top: 60, Bottom: 30, RotationGap: -1}, y, lab, draws, 6)
		dNoise := ksDistance(dense.Null, again.Null)
		dMatched := ksDistance(dense.Null, matched.Null)
		dWhite := ksDistance(dense.Null, white.Null)
		dSigns := ksDistance(signsDense.Null, signsSparse.Null)
		t.Logf("%s: KS distance dense–dense %.4f, dense–sparse matched %.4f, dense–sparse white %.4f, signs only dense–sparse %.4f (bound %.4f); null sd dense %.4g, matched %.4g, white %.4g, signs dense %.4g, sparse %.4g",
			name, dNoise, dMatched, dWhite, dSigns, bound, dense.NullSD, matched.NullSD, white.NullSD, signsDense.NullSD, signsSparse.NullSD)
		if dMatched > bound || dWhite > bound {
			t.Errorf("%s: the sparse null departs from the dense one: KS distance %.4f (matched), %.4f (white) > %.4f", name, dMatched, dWhite, bound)
		}
	}
}

// ksDistance against hand-made cases: identical samples 0, disjoint 1,
// shifted halves 0.5.
func TestKSDistance(t *testing.T) {
	a := []float64{1, 2, 3, 4}
	if d := ksDistance(a, a); d != 0 {
		t.Errorf("identical: %v", d)
	}
	if d := ksDistance(a, []float64{5, 6, 7}); d != 1 {
		t.Errorf("disjoint: %v", d)
	}
	if d := ksDistance(a, []float64{3, 4, 5, 6}); d != 0.5 {
		t.Errorf("shifted: %v", d)
	}
}
