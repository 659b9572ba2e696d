package regress

import (
	"math"
	"sort"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/areatest/areatest/spatial/shuffle"
)

// The Gauss–Kronrod rule integrates polynomials of degree up to 22 exactly,
// and the adaptive driver reaches its tolerance on a peaked integrand.
func TestQuadrature(t *testing.T) {
	v, _ := kronrod(func(x float64) float64 { return math.Pow(x, 22) }, 0, 1)
	if math.Abs(v-1.0/23) > 1e-15 {
		t.Errorf("∫x²² = %v, want %v", v, 1.0/23)
	}
	got := adapt(func(x float64) float64 { return 1 / (1e-4 + x*x) }, -1, 1, 1e-12)
	want := 2 / 1e-2 * math.Atan(1/1e-2)
	if math.Abs(got-want) > 1e-9 {
		t.Errorf("peaked integral %v, want %v", got, want)
	}
}

// Imhof's formula against closed forms. With p λ_j equal to 1 and q equal
// to −c, P(Q > 0) = P(χ²_p > c χ²_q) = P(F_{p,q} > cq/p); with two λ_j = a
// and two = −b it is a/(a + b) (a race of exponentials); with four = a and
// two = −b, 1 − (b/(a + b))² (a gamma against an exponential). Scale
// changes nothing, near-zero λ_j add nothing, all positive is 1, all
// negative 0. Absolute error at most 1e-10.
func TestImhofClosedForms(t *testing.T) {
	fTail := func(p, q int, c float64) (lambda []float64, want float64) {
		for range p {
			lambda = append(lambda, 1)
		}
		for range q {
			lambda = append(lambda, -c)
		}
		return lambda, distuv.F{D1: float64(p), D2: float64(q)}.Survival(c * float64(q) / float64(p))
	}
	type tc struct {
		lambda []float64
		want   float64
	}
	var cases []tc
	for _, f := range [][3]float64{{1, 1, 1}, {1, 1, 3}, {1, 3, 0.1}, {3, 1, 20}, {4, 10, 0.5}, {10, 40, 2}, {2, 200, 0.02}, {30, 30, 1.8}} {
		l, w := fTail(int(f[0]), int(f[1]), f[2])
		cases = append(cases, tc{l, w})
	}
	cases = append(cases,
		tc{[]float64{2, 2, -0.5, -0.5}, 0.8},
		tc{[]float64{2e-4, 2e-4, -0.5e-4, -0.5e-4}, 0.8},
		tc{[]float64{1, 1, 1, 1, -3, -3}, 1 - 0.75*0.75},
		tc{[]float64{1, 1, 1, 1, -3, -3, 1e-14, -1e-14}, 1 - 0.75*0.75},
		tc{[]float64{1, 0.5, 0.2}, 1},
		tc{[]float64{-1, -0.5, -0.2}, 0},
	)
	for _, c := range cases {
		if got := imhofUpper(c.lambda); math.Abs(got-c.want) > 1e-10 {
			t.Errorf("λ %v: %v, want %v (error %.2g)", c.lambda, got, c.want, got-c.want)
		}
	}
}

// At 900 areas (a 30×30 lattice, two covariates) the exact upper tail
// agrees with the normal approximation at the moments within 5e-3 at
// z = 0, 1, 1.645, 2 and 2.576: the distribution of I is then close to
// normal (its skewness is of order 1/√n).
func TestExactAgainstNormalLarge(t *testing.T) {
	const rows, cols = 30, 30
	x := design(rows, cols, 2, 13)
	g := lattice(rows, cols)
	u := make([]float64, rows*cols)
	rng := shuffle.NewStream(5, 3, 0)
	rng.Normals(u)
	f := mustOLS(t, outcome(x, u), x)
	r, err := f.Moran(g, shuffle.Greater)
	if err != nil {
		t.Fatal(err)
	}
	lambda, err := f.projectedEigenvalues(g)
	if err != nil {
		t.Fatal(err)
	}
	s0, _, _ := weightTraces(g)
	n := float64(f.Areas)
	shifted := make([]float64, len(lambda))
	for _, z := range []float64{0, 1, 1.645, 2, 2.576} {
		i := r.Mean + z*math.Sqrt(r.Variance)
		for j, l := range lambda {
			shifted[j] = l - i*s0/n
		}
		exact := imhofUpper(shifted)
		normal := distuv.UnitNormal.Survival(z)
		t.Logf("z %.3f: exact %.5f, normal %.5f", z, exact, normal)
		if math.Abs(exact-normal) > 5e-3 {
			t.Errorf("z %v: exact %v, normal %v", z, exact, normal)
		}
	}
	if !r.Exact || math.Abs(r.ExactP-r.P) > 5e-3 {
		t.Errorf("observed: exact %v (computed %v), normal %v", r.ExactP, r.Exact, r.P)
	}
}

// At 30 areas (a 5×6 lattice, two covariates) the exact upper tail against
// 40,000 simulated normal-error data sets, at the simulated 50%, 90%, 95%
// and 99% points: the simulated share above each lies within four binomial
// standard errors of the exact probability, which the normal approximation
// misses at the upper points.
func TestExactAgainstSimulationSmall(t *testing.T) {
	const rows, cols, draws = 5, 6, 40000
	n := rows * cols
	x := design(rows, cols, 2, 17)
	g := lattice(rows, cols)
	f := mustOLS(t, outcome(x, make([]float64, n)), x)
	r, err := f.Moran(g, shuffle.Greater)
	if err != nil {
		t.Fatal(err)
	}
	s0, _, _ := weightTraces(g)
	rng := shuffle.NewStream(23, 4, 0)
	sim := make([]float64, draws)
	eps, we, tmp := make([]float64, n), make([]float64, n), make([]float64, f.k)
	for d := range sim {
		rng.Normals(eps)
		sim[d] = residualMoran(f, g, s0, eps, we, tmp)
	}
	sorted := append([]float64(nil), sim...)
	sort.Float64s(sorted)
	lambda, err := f.projectedEigenvalues(g)
	if err != nil {
		t.Fatal(err)
	}
	shifted := make([]float64, len(lambda))
	for _, q := range []float64{0.5, 0.9, 0.95, 0.99} {
		i := sorted[int(q*draws)]
		var above int
		for _, v := range sim {
			if v >= i {
				above++
			}
		}
		share := float64(above) / draws
		for j, l := range lambda {
			shifted[j] = l - i*s0/float64(n)
		}
		exact := imhofUpper(shifted)
		normal := distuv.UnitNormal.Survival((i - r.Mean) / math.Sqrt(r.Variance))
		se := math.Sqrt(exact * (1 - exact) / draws)
		t.Logf("I %.4f: simulated %.4f, exact %.4f ± %.4f, normal %.4f", i, share, exact, se, normal)
		if math.Abs(share-exact) > 4*se {
			t.Errorf("I %v: simulated share %v, exact %v ± %v", i, share, exact, se)
		}
	}
}
