package autocorr

import (
	"errors"
	"math"
	"testing"

	gspatial "gonum.org/v1/gonum/stat/spatial"

	"github.com/areatest/areatest/spatial/rates"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// smallGraph is the 7-area layer of TestMomentsByExactEnumeration: a path
// of four plus a triangle hanging off its end, with a chord, so that S1 and
// S2 differ from any lattice's.
func smallGraph(t testing.TB) *weights.Graph {
	return mustGraph(t, 7, [][2]int32{{0, 1}, {1, 2}, {2, 3}, {3, 4}, {4, 5}, {5, 6}, {6, 4}, {0, 2}})
}

// eightGraph is an irregular 8-area layer with one area of degree 1.
func eightGraph(t testing.TB) *weights.Graph {
	return mustGraph(t, 8, [][2]int32{{0, 1}, {1, 2}, {2, 3}, {3, 0}, {1, 4}, {4, 5}, {5, 6}, {6, 4}, {2, 5}, {6, 7}})
}

// exactNull runs the machinery's full enumeration and returns the mean and
// the variance (divisor N) of the statistic over all distinct arrangements.
// Every distinct arrangement of tied labels stands for the same number of
// permutations, so these are the moments over all n! permutations.
func exactNull(t *testing.T, labels []int32, f shuffle.Factory, want int) (mean, variance float64, null []float64) {
	t.Helper()
	res, err := shuffle.Run(shuffle.Plan{Labels: labels, Permutations: 1, KeepNull: true}, f)
	if err != nil {
		t.Fatal(err)
	}
	if !res.Exact || (want > 0 && res.Permutations != want) {
		t.Fatalf("want exact enumeration over %d arrangements, got exact=%v n=%d", want, res.Exact, res.Permutations)
	}
	for _, v := range res.Null {
		mean += v
	}
	mean /= float64(len(res.Null))
	for _, v := range res.Null {
		variance += (v - mean) * (v - mean)
	}
	variance /= float64(len(res.Null))
	return mean, variance, res.Null
}

func near(a, b, tol float64) bool { return math.Abs(a-b) <= tol }

// Over all arrangements of the values, the mean and variance of Geary's C
// are E[C] = 1 and the randomisation variance of Cliff & Ord (1981) — the
// definition of those moments, checked by exact enumeration: 7 distinct
// values (5,040 arrangements), and 8 values with ties (8!/(2!·3!) = 3,360).
func TestGearyMomentsByExactEnumeration(t *testing.T) {
	cases := []struct {
		g    *weights.Graph
		x    []float64
		want int
	}{
		{smallGraph(t), []float64{1.5, 3.0, 2.2, 8.0, 0.1, 4.4, 5.5}, 5040},
		{eightGraph(t), []float64{2, 2, 5, 5, 5, 1, 7, 0.5}, 3360},
	}
	for _, c := range cases {
		for _, w := range []*weights.Graph{c.g, c.g.RowStandardised()} {
			labels, f, err := GearyPermutation(c.x, w)
			if err != nil {
				t.Fatal(err)
			}
			mean, variance, _ := exactNull(t, labels, f, c.want)
			m, err := GearyMoments(c.x, w)
			if err != nil {
				t.Fatal(err)
			}
			if !near(mean, 1, 1e-12) || !near(variance, m.VarianceRandomisation, 1e-12) {
				t.Errorf("n=%d %s: enumeration mean %v var %v; moments 1 %v", len(c.x), w.Scaling, mean, variance, m.VarianceRandomisation)
			}
			direct, _ := GearysC(c.x, w)
			if got := f()(labels); !near(got, direct, 1e-13) {
				t.Errorf("evaluator %v, direct %v", got, direct)
			}
		}
	}
}

// The same for General G (Getis & Ord 1992): E[G] = S0/(n(n−1)) and their
// randomisation variance equal the moments over all arrangements.
func TestGeneralGMomentsByExactEnumeration(t *testing.T) {
	cases := []struct {
		g    *weights.Graph
		x    []float64
		want int
	}{
		{smallGraph(t), []float64{1.5, 3.0, 2.2, 8.0, 0.1, 4.4, 5.5}, 5040},
		{eightGraph(t), []float64{2, 2, 5, 5, 5, 0, 7, 0.5}, 3360},
	}
	for _, c := range cases {
		for _, w := range []*weights.Graph{c.g, c.g.RowStandardised()} {
			labels, f, err := GeneralGPermutation(c.x, w)
			if err != nil {
				t.Fatal(err)
			}
			mean, variance, _ := exactNull(t, labels, f, c.want)
			e, v, err := GeneralGMoments(c.x, w)
			if err != nil {
				t.Fatal(err)
			}
			n := float64(len(c.x))
			if !near(e, sumWeights(w)/(n*(n-1)), 1e-15) {
				t.Errorf("E[G] %v, want S0/(n(n−1))", e)
			}
			if !near(mean, e, 1e-12) || !near(variance, v, 1e-12) {
				t.Errorf("n=%d %s: enumeration mean %v var %v; moments %v %v", len(c.x), w.Scaling, mean, variance, e, v)
			}
			direct, _ := GeneralG(c.x, w)
			if got := f()(labels); !near(got, direct, 1e-13) {
				t.Errorf("evaluator %v, direct %v", got, direct)
			}
		}
	}
}

// Join counts under sampling without replacement (Cliff & Ord 1981): the
// mean and variance of every same-category count and of the
// different-category count over all arrangements of the categories equal
// the analytic moments. A 3×3 rook lattice with 4 black and 5 white areas
// (C(9,4) = 126 arrangements), the irregular 8-area layer with three
// categories (8!/(2!·3!·3!) = 560), and 9 areas with a category of one.
func TestJoinMomentsByExactEnumeration(t *testing.T) {
	cases := []struct {
		g    *weights.Graph
		cat  []int32
		want int
	}{
		{latticeGraph(3, 3), []int32{1, 0, 1, 0, 1, 0, 1, 0, 0}, 126},
		{eightGraph(t), []int32{0, 1, 2, 2, 1, 0, 2, 1}, 560},
		{latticeGraph(3, 3), []int32{0, 0, 3, 1, 1, 0, 0, 1, 1}, 9 * 70},
	}
	for _, c := range cases {
		res, err := JoinCounts(c.cat, c.g)
		if err != nil {
			t.Fatal(err)
		}
		check := func(name string, s JoinStat, f shuffle.Factory) {
			mean, variance, _ := exactNull(t, c.cat, f, c.want)
			if !near(mean, s.Expected, 1e-12) || !near(variance, s.Variance, 1e-12) {
				t.Errorf("%v %s: enumeration mean %v var %v; moments %v %v", c.cat, name, mean, variance, s.Expected, s.Variance)
			}
			if got := f()(c.cat); got != float64(s.Joins) {
				t.Errorf("%v %s: evaluator %v, count %d", c.cat, name, got, s.Joins)
			}
		}
		for _, s := range res.Same {
			check("same", s.JoinStat, SameJoinsFactory(c.g, s.Category))
		}
		check("different", res.Different, DifferentJoinsFactory(c.g))
		total := res.Different.Joins
		for _, s := range res.Same {
			total += s.Joins
		}
		if total != res.Joins {
			t.Errorf("counts add to %d, want %d joins", total, res.Joins)
		}
	}
}

// Bivariate Moran's I with y shuffled and x fixed is a linear permutation
// statistic; its mean 0 and variance (Wald & Wolfowitz 1944) equal the
// moments over all 5,040 arrangements of y.
func TestBivariateMomentsByExactEnumeration(t *testing.T) {
	g := smallGraph(t)
	x := []float64{4, 1, 3, 3, 9, 2, 6}
	y := []float64{1.5, 3.0, 2.2, 8.0, 0.1, 4.4, 5.5}
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		labels, f, err := BivariatePermutation(x, y, w)
		if err != nil {
			t.Fatal(err)
		}
		mean, variance, _ := exactNull(t, labels, f, 5040)
		e, v, err := BivariateMoments(x, y, w)
		if err != nil {
			t.Fatal(err)
		}
		if !near(mean, e, 1e-13) || !near(variance, v, 1e-12) {
			t.Errorf("%s: enumeration mean %v var %v; moments %v %v", w.Scaling, mean, variance, e, v)
		}
		direct, _ := BivariateMoransI(x, y, w)
		if got := f()(labels); !near(got, direct, 1e-13) {
			t.Errorf("evaluator %v, direct %v", got, direct)
		}
	}
	// With y = x the statistic is Moran's I itself.
	a, _ := BivariateMoransI(y, y, g)
	b, _ := MoransI(y, g)
	if !near(a, b, 1e-14) {
		t.Errorf("I_xx %v, Moran's I %v", a, b)
	}
}

// normals fills x with independent standard normal draws (Box & Muller
// 1958, Ann. Math. Stat. 29:610–611).
func normals(s *shuffle.Stream, x []float64) {
	for i := 0; i < len(x); i += 2 {
		u := 1 - s.Float64()
		r := math.Sqrt(-2 * math.Log(u))
		th := 2 * math.Pi * s.Float64()
		x[i] = r * math.Cos(th)
		if i+1 < len(x) {
			x[i+1] = r * math.Sin(th)
		}
	}
}

// Under normality (independent normal values) the mean and variance of
// Geary's C and Moran's I are those of Cliff & Ord (1981). Simulation:
// 200,000 normal samples on the 7-area layer; each moment must lie within
// 5 standard errors of the sample moment (standard errors from the sample
// itself: sd/√N for the mean, √((m4 − s⁴)/N) for the variance).
func TestNormalityMomentsBySimulation(t *testing.T) {
	if testing.Short() {
		t.Skip("simulation")
	}
	g := smallGraph(t)
	const N = 200_000
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		s := shuffle.NewStream(5, 0, 0)
		x := make([]float64, 7)
		cs, is := make([]float64, N), make([]float64, N)
		for k := range cs {
			normals(&s, x)
			cs[k], _ = GearysC(x, w)
			is[k], _ = MoransI(x, w)
		}
		gm, _ := GearyMoments(x, w)
		mm, _ := MoranMoments(x, w)
		for _, c := range []struct {
			name           string
			v              []float64
			mean, variance float64
		}{{"Geary", cs, 1, gm.VarianceNormality}, {"Moran", is, mm.Expected, mm.VarianceNormality}} {
			var m, s2, m4 float64
			for _, v := range c.v {
				m += v
			}
			m /= N
			for _, v := range c.v {
				d := (v - m) * (v - m)
				s2 += d
				m4 += d * d
			}
			s2 /= N
			m4 /= N
			seMean := math.Sqrt(s2 / N)
			seVar := math.Sqrt((m4 - s2*s2) / N)
			if math.Abs(m-c.mean) > 5*seMean || math.Abs(s2-c.variance) > 5*seVar {
				t.Errorf("%s %s: simulated mean %v (se %v) var %v (se %v); normality moments %v %v",
					c.name, w.Scaling, m, seMean, s2, seVar, c.mean, c.variance)
			}
		}
	}
}

// A checkerboard on a rook lattice: every join links two different colours
// (common knowledge), so BW = all joins, BB = WW = 0, and neighbours differ
// as much as they can: Geary's C above 1. A smooth gradient: C below 1.
func TestKnownPatterns(t *testing.T) {
	g := latticeGraph(6, 6)
	board := make([]float64, 36)
	cat := make([]int32, 36)
	for i := range board {
		cat[i] = int32((i/6 + i%6) % 2)
		board[i] = float64(cat[i])
	}
	res, err := RunJoins(cat, g, shuffle.Plan{Permutations: 999, Seed: 1, Alternative: shuffle.Greater})
	if err != nil {
		t.Fatal(err)
	}
	if res.Joins != 60 || res.Different.Joins != 60 || res.Same[0].Joins != 0 || res.Same[1].Joins != 0 {
		t.Fatalf("checkerboard joins %+v", res)
	}
	if res.Different.Permutation.PValue != 1.0/1000 || res.Different.Z < 5 {
		t.Errorf("checkerboard BW p %v z %v", res.Different.Permutation.PValue, res.Different.Z)
	}
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		c, err := GearysC(board, w)
		if err != nil {
			t.Fatal(err)
		}
		if c <= 1.5 {
			t.Errorf("%s: checkerboard C %v, want well above 1", w.Scaling, c)
		}
	}
	grad := make([]float64, 100)
	for i := range grad {
		grad[i] = float64(i/10 + i%10)
	}
	lat := latticeGraph(10, 10).RowStandardised()
	gt, err := RunGeary(grad, lat, shuffle.Plan{Permutations: 999, Seed: 2, Alternative: shuffle.Less})
	if err != nil {
		t.Fatal(err)
	}
	if gt.GearysC >= 0.3 || gt.Permutation.PValue != 1.0/1000 || gt.ZRandomisation > -5 {
		t.Errorf("gradient: C %v p %v z %v", gt.GearysC, gt.Permutation.PValue, gt.ZRandomisation)
	}
	sd := math.Sqrt(gt.VarianceRandomisation)
	if math.Abs(gt.Permutation.NullMean-1) > 4*sd/math.Sqrt(999) || math.Abs(gt.Permutation.NullSD-sd)/sd > 0.1 {
		t.Errorf("gradient: permutation mean %v sd %v vs 1, %v", gt.Permutation.NullMean, gt.Permutation.NullSD, sd)
	}
	// The gradient's high values sit by high values: G above E[G].
	gg, err := RunGeneralG(grad, lat, shuffle.Plan{Permutations: 999, Seed: 3})
	if err != nil {
		t.Fatal(err)
	}
	if gg.G <= gg.Expected || gg.ZRandomisation < 3 {
		t.Errorf("gradient G %v E %v z %v", gg.G, gg.Expected, gg.ZRandomisation)
	}
}

// Geary's C and Moran's I do not change under a positive affine transform
// a + b·x of the variable, nor bivariate I under one of x or y; General G
// does not change when x is scaled (common knowledge: each is a ratio of
// forms in the centred, respectively raw, values).
func TestInvariance(t *testing.T) {
	g := latticeGraph(5, 6).RowStandardised()
	x := make([]float64, 30)
	y := make([]float64, 30)
	for i := range x {
		x[i] = math.Abs(math.Sin(float64(i)*1.7))*10 + float64(i%4)
		y[i] = math.Cos(float64(i) * 0.4)
	}
	tr := func(v []float64, a, b float64) []float64 {
		out := make([]float64, len(v))
		for i := range v {
			out[i] = a + b*v[i]
		}
		return out
	}
	c1, _ := GearysC(x, g)
	c2, _ := GearysC(tr(x, 1e4, 3.5), g)
	i1, _ := MoransI(x, g)
	i2, _ := MoransI(tr(x, -7, 0.01), g)
	b1, _ := BivariateMoransI(x, y, g)
	b2, _ := BivariateMoransI(tr(x, 5, 2), tr(y, -3, 40), g)
	g1, _ := GeneralG(x, g)
	g2, _ := GeneralG(tr(x, 0, 123), g)
	for _, p := range [][2]float64{{c1, c2}, {i1, i2}, {b1, b2}, {g1, g2}} {
		if !near(p[0], p[1], 1e-11) {
			t.Errorf("transform changed the statistic: %v vs %v", p[0], p[1])
		}
	}
}

func TestConstantAndNegativeAreErrors(t *testing.T) {
	g := latticeGraph(3, 3)
	k := []float64{5, 5, 5, 5, 5, 5, 5, 5, 5}
	y := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9}
	if _, err := GearysC(k, g); !errors.Is(err, ErrConstant) {
		t.Errorf("Geary: %v", err)
	}
	if _, err := RunGeary(k, g, shuffle.Plan{Permutations: 9}); !errors.Is(err, ErrConstant) {
		t.Errorf("RunGeary: %v", err)
	}
	if _, err := GeneralG(k, g); !errors.Is(err, ErrConstant) {
		t.Errorf("G: %v", err)
	}
	if _, err := BivariateMoransI(y, k, g); !errors.Is(err, ErrConstant) {
		t.Errorf("bivariate: %v", err)
	}
	if _, err := GiStar(k, g); !errors.Is(err, ErrConstant) {
		t.Errorf("Gi*: %v", err)
	}
	if _, err := JoinCounts(make([]int32, 9), g); !errors.Is(err, ErrConstant) {
		t.Errorf("joins: %v", err)
	}
	// Equal rates: every score is 0, so Moran's I of the scores is undefined.
	pop := []float64{10, 20, 30, 40, 50, 60, 70, 80, 90}
	if _, err := EBMoran(pop, pop, g, shuffle.Plan{Permutations: 9}); !errors.Is(err, ErrConstant) {
		t.Errorf("EB Moran: %v", err)
	}
	neg := []float64{1, 2, -3, 4, 5, -6, 7, 8, 9}
	_, err := GeneralG(neg, g)
	var ne *NegativeError
	if !errors.Is(err, ErrNegative) || !errors.As(err, &ne) || ne.Count != 2 || ne.First != 2 || ne.Value != -3 {
		t.Errorf("negative values: %v", err)
	}
	if _, err := GearysC([]float64{1, 2, 3}, g); err == nil {
		t.Error("column of the wrong length accepted")
	}
	if _, err := GearysC([]float64{1, 2, 3, 4, math.NaN(), 6, 7, 8, 9}, g); err == nil {
		t.Error("NaN accepted")
	}
	if _, err := JoinCounts([]int32{0, 1, 0, 1, -1, 0, 1, 0, 1}, g); err == nil {
		t.Error("negative category code accepted")
	}
	if _, err := GeneralG([]float64{0, 0, 0, 0, 3, 0, 0, 0, 0}, g); err == nil {
		t.Error("G with one value above zero accepted")
	}
}

// A worked example of the empirical-Bayes scores of Assunção & Reis (1999),
// done by hand in exact fractions. Events 2, 10, 1, 7 over populations
// 100, 400, 50, 200: b = 20/750 = 2/75; rates 1/50, 1/40, 1/50, 7/200;
// s² = Σ p(r − b)²/Σp = 13/450000; mean population 187.5, so
// a = 13/450000 − (2/75)/187.5 = −17/150000. Then v = a + b/p is 23/150000,
// −1/30000 (≤ 0: floored to b/p = 1/15000), 21/50000 and 1/50000, and
// z² = (r − b)²/v = 20/69, 1/24, 20/189, 125/36, with the signs of r − b.
func TestEBScoresWorkedExample(t *testing.T) {
	e := []float64{2, 10, 1, 7}
	p := []float64{100, 400, 50, 200}
	s, err := rates.EBStandardise(e, p)
	if err != nil {
		t.Fatal(err)
	}
	want := []float64{-math.Sqrt(20.0 / 69), -math.Sqrt(1.0 / 24), -math.Sqrt(20.0 / 189), math.Sqrt(125.0 / 36)}
	for i := range want {
		if !near(s.Scores[i], want[i], 1e-13) {
			t.Errorf("z[%d] = %v, want %v", i, s.Scores[i], want[i])
		}
	}
	if !near(s.Mean, 2.0/75, 1e-16) || !near(s.Between, -17.0/150000, 1e-18) {
		t.Errorf("b %v a %v", s.Mean, s.Between)
	}
	if len(s.Floored) != 1 || s.Floored[0] != 1 || len(s.AboveOne) != 0 {
		t.Errorf("floored %v above one %v", s.Floored, s.AboveOne)
	}
	if !near(s.Rates[3], 7.0/200, 1e-17) {
		t.Errorf("rates %v", s.Rates)
	}
	// The test of EB Moran is Moran's I of these scores.
	g := mustGraph(t, 4, [][2]int32{{0, 1}, {1, 2}, {2, 3}})
	eb, err := EBMoran(e, p, g, shuffle.Plan{Permutations: 9})
	if err != nil {
		t.Fatal(err)
	}
	direct, _ := MoransI(want, g)
	if !near(eb.Moran.MoransI, direct, 1e-13) || !eb.Moran.Permutation.Exact || eb.Moran.Permutation.Permutations != 24 {
		t.Errorf("EB Moran %v (direct %v), permutation %+v", eb.Moran.MoransI, direct, eb.Moran.Permutation)
	}
}

// Gi* z-scores equal gonum's stat/spatial.GetisOrdGStar (an outside
// implementation of Ord & Getis 1995) with the self-weight 1 on the
// diagonal of its locality matrix, for binary and row-standardised links.
func TestGiStarAgainstGonum(t *testing.T) {
	g := latticeGraph(6, 7)
	x := make([]float64, g.Len())
	for i := range x {
		x[i] = math.Sin(float64(i)*0.7) + 0.05*float64(i%5) + float64(i/7)*0.3
	}
	for _, w := range []*weights.Graph{g, g.RowStandardised()} {
		got, err := GiStar(x, w)
		if err != nil {
			t.Fatal(err)
		}
		d := dense(w)
		for i := 0; i < w.Len(); i++ {
			d.Set(i, i, 1)
		}
		for i := range got {
			want := gspatial.GetisOrdGStar(i, x, nil, d)
			if !near(got[i], want, 1e-12) {
				t.Errorf("%s: Gi*[%d] %v, gonum %v", w.Scaling, i, got[i], want)
			}
		}
	}
}

// The correlogram's first order is Moran's I on the graph itself; a linear
// gradient's I falls with the order; the pair counts of a 10×10 rook
// lattice are 2·10·9 = 180 at order 1 and, at exactly two steps, 2·10·8
// straight pairs plus 2·9² diagonal ones = 322 (counting, common
// knowledge); an order past the lattice's diameter has no pairs.
func TestCorrelogram(t *testing.T) {
	g := latticeGraph(10, 10)
	x := make([]float64, 100)
	for i := range x {
		x[i] = float64(i/10+i%10) + 0.1*math.Sin(float64(i))
	}
	graphs, err := LagGraphs(g, 4, weights.RowStandardised)
	if err != nil {
		t.Fatal(err)
	}
	plan := shuffle.Plan{Permutations: 199, Seed: 4, Alternative: shuffle.Greater}
	lags, err := Correlogram(x, graphs, plan)
	if err != nil {
		t.Fatal(err)
	}
	one, _ := RunTest(x, g.RowStandardised(), plan)
	if lags[0].MoransI != one.MoransI || lags[0].Permutation.PValue != one.Permutation.PValue {
		t.Errorf("order 1 %v, Moran's I %v", lags[0].MoransI, one.MoransI)
	}
	if lags[0].Pairs != 180 || lags[1].Pairs != 322 {
		t.Errorf("pairs %d %d", lags[0].Pairs, lags[1].Pairs)
	}
	for k := 1; k < len(lags); k++ {
		if lags[k].Order != k+1 || lags[k].MoransI >= lags[k-1].MoransI {
			t.Errorf("order %d: I %v after %v", lags[k].Order, lags[k].MoransI, lags[k-1].MoransI)
		}
	}
	small, _ := LagGraphs(latticeGraph(3, 3), 5, weights.Binary)
	if _, err := Correlogram(x[:9], small, plan); err == nil {
		t.Error("order 5 on a 3×3 lattice (diameter 4) accepted")
	}
}

// The evaluators handed to the machinery must not allocate.
func TestGlobalEvaluatorsDoNotAllocate(t *testing.T) {
	g := latticeGraph(5, 5).RowStandardised()
	x := make([]float64, 25)
	y := make([]float64, 25)
	cat := make([]int32, 25)
	for i := range x {
		x[i] = float64(i*7%11) + 1
		y[i] = math.Sin(float64(i))
		cat[i] = int32(i % 3)
	}
	var factories []shuffle.Factory
	var labelSets [][]int32
	add := func(l []int32, f shuffle.Factory, err error) {
		if err != nil {
			t.Fatal(err)
		}
		labelSets = append(labelSets, l)
		factories = append(factories, f)
	}
	add(GearyPermutation(x, g))
	add(GeneralGPermutation(x, g))
	add(BivariatePermutation(x, y, g))
	add(cat, SameJoinsFactory(g, 1), nil)
	add(cat, DifferentJoinsFactory(g), nil)
	for k, f := range factories {
		eval := f()
		lab := labelSets[k]
		if a := testing.AllocsPerRun(100, func() { eval(lab) }); a != 0 {
			t.Errorf("evaluator %d allocates %v times per call", k, a)
		}
	}
}
