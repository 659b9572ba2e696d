package autocorr

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
	gspatial "gonum.org/v1/gonum/stat/spatial"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// latticeGraph is rook contiguity on an r×c grid, binary weights.
func latticeGraph(r, c int) *weights.Graph { return weights.Lattice(r, c, weights.Rook) }

// dense is g's weights as a dense matrix, for gonum's stat/spatial.
func dense(g *weights.Graph) *mat.Dense { return testkit.Dense(g.Offsets, g.Neighbours, g.Weights) }

// Moran's I agrees with gonum's stat/spatial.GlobalMoransI (an outside
// reference implementation) for binary and row-standardised weights.
//
// gonum's variance is not the randomisation variance of Cliff & Ord (1981,
// eq. 1.38): it uses Σz⁴/(Σz²)² where the formula has the sample kurtosis
// b2 = n·Σz⁴/(Σz²)², so it differs from the variance that exact enumeration
// gives (TestMomentsByExactEnumeration). What gonum does check is our weight
// sums S0, S1, S2: put into gonum's expression they reproduce its value.
func TestMoranAgainstGonum(t *testing.T) {
	g := latticeGraph(6, 7)
	x := make([]float64, g.Len())
	for i := range x {
		x[i] = math.Sin(float64(i)*0.7) + 0.05*float64(i%5) + float64(i/7)*0.3
	}
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		i, err := MoransI(x, w)
		if err != nil {
			t.Fatal(err)
		}
		m, err := MoranMoments(x, w)
		if err != nil {
			t.Fatal(err)
		}
		gi, gv, _ := gspatial.GlobalMoransI(x, nil, dense(w))
		if math.Abs(i-gi) > 1e-12 {
			t.Errorf("%s: I %v, gonum %v", w.Scaling, i, gi)
		}
		n := float64(len(x))
		s0, s1, s2 := weightSums(w)
		z, ss, _ := centre(x)
		var q float64
		for _, v := range z {
			q += v * v * v * v
		}
		d := q / (ss * ss) // gonum's kurtosis term, b2/n
		gonumForm := (n*((n*n-3*n+3)*s1-n*s2+3*s0*s0)-d*((n*n-n)*s1-2*n*s2+6*s0*s0))/((n-1)*(n-2)*(n-3)*s0*s0) - m.Expected*m.Expected
		if math.Abs(gonumForm-gv) > 1e-12 {
			t.Errorf("%s: weight sums disagree with gonum: %v vs %v", w.Scaling, gonumForm, gv)
		}
		if math.Abs(m.VarianceRandomisation-gv) < 1e-9 {
			t.Errorf("%s: gonum's variance now equals the randomisation variance; tighten this test", w.Scaling)
		}
	}
}

// Over all n! arrangements of distinct values the mean and variance of I
// equal the randomisation moments of Cliff & Ord (1981) — the definition of
// those moments, checked by exact enumeration (n = 7, 5,040 arrangements).
func TestMomentsByExactEnumeration(t *testing.T) {
	// A path of 4 plus a triangle hanging off its end, asymmetric enough to
	// make S1 and S2 differ from the lattice case.
	g, _ := weights.FromLinks(7, [][2]int32{{0, 1}, {1, 2}, {2, 3}, {3, 4}, {4, 5}, {5, 6}, {6, 4}, {0, 2}}, "test")
	x := []float64{1.5, 3.0, 2.2, 8.0, 0.1, 4.4, 5.5}
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		labels, f, err := Permutation(x, w)
		if err != nil {
			t.Fatal(err)
		}
		res, err := shuffle.Run(shuffle.Plan{Labels: labels, Permutations: 1, KeepNull: true}, f)
		if err != nil {
			t.Fatal(err)
		}
		if !res.Exact || res.Permutations != 5040 {
			t.Fatalf("want exact over 5040, got %v %d", res.Exact, res.Permutations)
		}
		var s, q float64
		for _, v := range res.Null {
			s += v
		}
		mean := s / float64(len(res.Null))
		for _, v := range res.Null {
			q += (v - mean) * (v - mean)
		}
		variance := q / float64(len(res.Null))
		m, err := MoranMoments(x, w)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(mean-m.Expected) > 1e-12 || math.Abs(variance-m.VarianceRandomisation) > 1e-12 {
			t.Errorf("%s: enumeration mean %v var %v; moments %v %v", w.Scaling, mean, variance, m.Expected, m.VarianceRandomisation)
		}
	}
}

// A checkerboard on a rook lattice is perfectly negatively autocorrelated:
// with binary weights I = −1 (every neighbour pair differs; common knowledge).
// Moran's I is unchanged by a positive affine transform of the variable.
func TestCheckerboardAndAffineInvariance(t *testing.T) {
	g := latticeGraph(6, 6)
	x := make([]float64, 36)
	for i := range x {
		x[i] = float64((i/6 + i%6) % 2)
	}
	i, err := MoransI(x, g)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(i+1) > 1e-12 {
		t.Fatalf("checkerboard I = %v, want -1", i)
	}
	y := []float64{3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8, 9, 7, 9, 3, 2, 3, 8, 4, 6, 2, 6, 4, 3, 3, 8, 3, 2, 7, 9, 5, 0, 2, 8, 8}
	a, _ := MoransI(y, g)
	z := make([]float64, len(y))
	for k, v := range y {
		z[k] = 1000 + 37.5*v
	}
	b, _ := MoransI(z, g)
	if math.Abs(a-b) > 1e-12 {
		t.Fatalf("affine transform changed I: %v vs %v", a, b)
	}
}

func TestConstantIsAnError(t *testing.T) {
	g := latticeGraph(3, 3)
	x := []float64{5, 5, 5, 5, 5, 5, 5, 5, 5}
	if _, err := MoransI(x, g); !errors.Is(err, ErrConstant) {
		t.Fatalf("constant column: %v", err)
	}
	if _, _, err := Permutation(x, g); !errors.Is(err, ErrConstant) {
		t.Fatalf("constant column: %v", err)
	}
}

// The permutation test of a smooth gradient finds strong clustering, and its
// permutation mean is close to E[I] = −1/(n−1).
func TestPermutationOfGradient(t *testing.T) {
	g := latticeGraph(10, 10).RowStandardised()
	x := make([]float64, 100)
	for i := range x {
		x[i] = float64(i/10 + i%10)
	}
	res, err := RunTest(x, g, shuffle.Plan{Permutations: 999, Seed: 3, Alternative: shuffle.Greater})
	if err != nil {
		t.Fatal(err)
	}
	if res.MoransI < 0.8 || res.Permutation.PValue != 1.0/1000 {
		t.Fatalf("I %v p %v", res.MoransI, res.Permutation.PValue)
	}
	sd := math.Sqrt(res.VarianceRandomisation)
	if math.Abs(res.Permutation.NullMean-res.Expected) > 4*sd/math.Sqrt(999) {
		t.Fatalf("permutation mean %v far from E[I] %v", res.Permutation.NullMean, res.Expected)
	}
	if math.Abs(res.Permutation.NullSD-sd)/sd > 0.1 {
		t.Fatalf("permutation sd %v vs analytic %v", res.Permutation.NullSD, sd)
	}
}

func mustGraph(tb testing.TB, n int, pairs [][2]int32) *weights.Graph {
	g, err := weights.FromLinks(n, pairs, "test")
	if err != nil {
		tb.Fatal(err)
	}
	return g
}
