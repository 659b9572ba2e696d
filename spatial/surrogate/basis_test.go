package surrogate

import (
	"math"
	"runtime"
	"slices"
	"sort"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// denseOmega is M W* M of the areas in keep (ascending) as a dense
// matrix, written out from its definition (Dray, Legendre & Peres-Neto
// 2006, eq. 4; de Jong, Sprenger & van Veen 1984), for checks.
func denseOmega(g *weights.Graph, keep []int32) *mat.SymDense {
	idx := make([]int, len(keep))
	for k, i := range keep {
		idx[k] = int(i)
	}
	s := g.Subset(idx)
	return testkit.DoublyCentred(testkit.Dense(s.Offsets, s.Neighbours, s.Weights))
}

// checkEigenpairs checks that the stored vectors are orthonormal,
// orthogonal to 1, and eigenvectors of Ω with the stored values, to tol.
func checkEigenpairs(t *testing.T, b *Basis, omega *mat.SymDense, tol float64) {
	t.Helper()
	L := len(b.Linked())
	v := mat.NewDense(L, b.m, b.vecs)
	var gram mat.Dense
	gram.Mul(v.T(), v)
	worst := 0.0
	for i := 0; i < b.m; i++ {
		for j := 0; j < b.m; j++ {
			want := 0.0
			if i == j {
				want = 1
			}
			worst = math.Max(worst, math.Abs(gram.At(i, j)-want))
		}
	}
	if worst > tol {
		t.Errorf("VᵀV departs from I by %g", worst)
	}
	for k := 0; k < b.m; k++ {
		var s float64
		for i := 0; i < L; i++ {
			s += v.At(i, k)
		}
		if math.Abs(s) > tol*math.Sqrt(float64(L)) {
			t.Errorf("vector %d: sum %g, not orthogonal to 1", k, s)
		}
	}
	var ov mat.Dense
	ov.Mul(omega, v)
	worst = 0
	for k := 0; k < b.m; k++ {
		var r float64
		for i := 0; i < L; i++ {
			d := ov.At(i, k) - b.values[k]*v.At(i, k)
			r += d * d
		}
		worst = math.Max(worst, math.Sqrt(r))
	}
	if worst > tol {
		t.Errorf("largest ‖Ωv − λv‖ = %g", worst)
	}
	for k := 1; k < b.m; k++ {
		if b.values[k] > b.values[k-1] {
			t.Fatalf("eigenvalues not in descending order at %d", k)
		}
	}
}

// The dense path returns all n − 1 eigenvectors of M W* M orthogonal to 1
// (Dray et al. 2006), also when 0 is a repeated eigenvalue (the 9×9 rook
// lattice has several), with the eigenvalues gonum finds for the dense
// matrix written out from the definition, less one 0 (that of 1).
func TestDenseBasisIsTheEigenbasis(t *testing.T) {
	for name, g := range map[string]*weights.Graph{
		"rook 9×9 binary":           lattice(t, 9, 9),
		"rook 9×9 row-standardised": lattice(t, 9, 9).RowStandardised(),
		"irregular 12×11 row":       irregular(t, 12, 11, 3).RowStandardised(),
	} {
		t.Run(name, func(t *testing.T) {
			b, err := NewBasis(g, Options{})
			if err != nil {
				t.Fatal(err)
			}
			info := b.Info()
			if info.Method != "dense" || !info.Complete || info.Vectors != len(b.Linked())-1 {
				t.Fatalf("info %+v", info)
			}
			omega := denseOmega(g, b.Linked())
			checkEigenpairs(t, b, omega, 1e-10)
			var es mat.EigenSym
			if !es.Factorize(omega, false) {
				t.Fatal("reference eigen-decomposition failed")
			}
			ref := es.Values(nil)
			// Drop the reference eigenvalue nearest 0 (the one of 1).
			drop := 0
			for k, v := range ref {
				if math.Abs(v) < math.Abs(ref[drop]) {
					drop = k
				}
			}
			ref = append(ref[:drop], ref[drop+1:]...)
			sort.Sort(sort.Reverse(sort.Float64Slice(ref)))
			for k, v := range ref {
				if math.Abs(v-b.values[k]) > 1e-11 {
					t.Fatalf("eigenvalue %d: %v, reference %v", k, b.values[k], v)
				}
			}
		})
	}
}

// The sparse path on layers the dense path can also do: its eigenvalues at
// both ends equal the dense ones, repeated eigenvalues of the 20×20 lattice
// included (a block method resolves them; single-vector Lanczos would miss
// copies), and its vectors are eigenvectors to the convergence tolerance.
func TestSparseBasisMatchesDense(t *testing.T) {
	for name, g := range map[string]*weights.Graph{
		"rook 20×20 row-standardised": lattice(t, 20, 20).RowStandardised(),
		"irregular 20×20 row":         irregular(t, 20, 20, 5).RowStandardised(),
	} {
		t.Run(name, func(t *testing.T) {
			dense, err := NewBasis(g, Options{})
			if err != nil {
				t.Fatal(err)
			}
			sp, err := NewBasis(g, Options{Method: Sparse, Top: 60, Bottom: 30})
			if err != nil {
				t.Fatal(err)
			}
			info := sp.Info()
			t.Logf("%+v", info)
			if info.Method != "sparse" || info.Complete || info.Vectors != 90 || !info.Converged {
				t.Fatalf("info %+v", info)
			}
			checkEigenpairs(t, sp, denseOmega(g, sp.Linked()), 1e-8)
			dv, sv := dense.Values(), sp.Values()
			for k := 0; k < 60; k++ {
				if math.Abs(dv[k]-sv[k]) > 1e-9 {
					t.Errorf("top %d: sparse %v, dense %v", k, sv[k], dv[k])
				}
			}
			for k := 0; k < 30; k++ {
				if d, s := dv[len(dv)-1-k], sv[len(sv)-1-k]; math.Abs(d-s) > 1e-9 {
					t.Errorf("bottom %d: sparse %v, dense %v", k, s, d)
				}
			}
			repeats := 0
			for k := 1; k < 60; k++ {
				if math.Abs(dv[k]-dv[k-1]) < 1e-12 {
					repeats++
				}
			}
			t.Logf("%d repeated eigenvalues among the top 60", repeats)
		})
	}
}

// Islands are set apart by default and kept on request; a graph with too
// few linked areas is an error, not a panic.
func TestIslands(t *testing.T) {
	g := irregular(t, 10, 10, 11)
	// Cut area 0 and area 55 loose by rebuilding the graph without their links.
	var pairs [][2]int32
	for i := 0; i < g.Len(); i++ {
		nb, _ := g.Row(i)
		for _, j := range nb {
			if int(j) > i && i != 0 && i != 55 && j != 0 && j != 55 {
				pairs = append(pairs, [2]int32{int32(i), j})
			}
		}
	}
	cut, err := weights.FromLinks(100, pairs, "test")
	if err != nil {
		t.Fatal(err)
	}
	rs := cut.RowStandardised()
	b, err := NewBasis(rs, Options{})
	if err != nil {
		t.Fatal(err)
	}
	isl := b.Islands()
	if len(isl) < 2 || isl[0] != 0 {
		t.Fatalf("islands %v", isl)
	}
	if b.Info().Islands != len(isl) || len(b.Linked())+len(isl) != 100 {
		t.Fatalf("info %+v", b.Info())
	}
	kept, err := NewBasis(rs, Options{KeepIslands: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(kept.Islands()) != 0 || kept.Info().Vectors != 99 {
		t.Fatalf("kept: %+v", kept.Info())
	}
	checkEigenpairs(t, kept, denseOmega(rs, kept.Linked()), 1e-10)

	few, _ := weights.FromLinks(6, [][2]int32{{0, 1}}, "test")
	if _, err := NewBasis(few, Options{}); err == nil {
		t.Fatal("two linked areas accepted")
	}
	if _, err := NewBasis(nil, Options{}); err == nil {
		t.Fatal("nil graph accepted")
	}
	if _, err := NewBasis(lattice(t, 5, 5), Options{Method: Sparse, Top: 20, Bottom: 10}); err == nil {
		t.Fatal("30 vectors of 24 accepted")
	}
}

// The basis is the same bit for bit whatever the number of cores (block
// products split rows, and gonum's matrix products split output blocks,
// neither changing the order of any sum), and a sparse basis asked for
// nearly every vector still comes out right.
func TestBasisRepeatsAndNearlyComplete(t *testing.T) {
	g := irregular(t, 40, 40, 9).RowStandardised() // large enough for the products to split
	prev := runtime.GOMAXPROCS(1)
	one, err := NewBasis(g, Options{Method: Sparse, Top: 40, Bottom: 20, Seed: 4})
	runtime.GOMAXPROCS(prev)
	if err != nil {
		t.Fatal(err)
	}
	all, err := NewBasis(g, Options{Method: Sparse, Top: 40, Bottom: 20, Seed: 4})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(one.vecs, all.vecs) || !slices.Equal(one.values, all.values) {
		t.Error("the sparse basis depends on the number of cores")
	}
	small := irregular(t, 10, 10, 2).RowStandardised()
	near, err := NewBasis(small, Options{Method: Sparse, Top: 60, Bottom: 30})
	if err != nil {
		t.Fatal(err)
	}
	checkEigenpairs(t, near, denseOmega(small, near.Linked()), 1e-8)
	full, err := NewBasis(small, Options{Method: Sparse, Top: len(near.Linked()) - 1})
	if err != nil {
		t.Fatal(err)
	}
	if !full.Info().Complete {
		t.Errorf("every vector asked for: %+v", full.Info())
	}
	checkEigenpairs(t, full, denseOmega(small, full.Linked()), 1e-8)
}
