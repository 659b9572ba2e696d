package local

import (
	"errors"
	"math"
	"reflect"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
	gspatial "gonum.org/v1/gonum/stat/spatial"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

func near(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}

// unequal returns g with the weight of link i→j set to 1/(1 + |i − j|) + 0.1·(i%3):
// asymmetric and unequal within rows, so nothing relies on equal weights.
func unequal(t testing.TB, g *weights.Graph) *weights.Graph {
	t.Helper()
	var links []weights.Link
	for i := 0; i < g.Len(); i++ {
		nb, _ := g.Row(i)
		for _, j := range nb {
			w := 1/(1+math.Abs(float64(i-int(j)))) + 0.1*float64(i%3)
			links = append(links, weights.Link{From: int32(i), To: j, Weight: w})
		}
	}
	h, err := weights.FromEntries(g.Len(), links, "test", "unequal")
	if err != nil {
		t.Fatal(err)
	}
	return h
}

// meanSD returns the mean and the population standard deviation (divisor
// n), the scale the published formulas standardise by.
func meanSD(x []float64) (mean, sd float64) {
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	for _, v := range x {
		sd += (v - mean) * (v - mean)
	}
	return mean, math.Sqrt(sd / float64(len(x)))
}

// direct computes every statistic straight from its published formula, on
// a dense matrix and with no shared code: local Moran (Anselin 1995,
// eq. 12), cross local Moran, local Geary (Anselin 2019) and the
// Ord & Getis (1995) Gi and Gi* z-scores, Gi with the mean and variance of
// the other n−1 values.
func direct(kind Kind, x, y []float64, w mat.Matrix) []float64 {
	n := len(x)
	fn := float64(n)
	mx, sx := meanSD(x)
	out := make([]float64, n)
	for i := 0; i < n; i++ {
		switch kind {
		case Moran, CrossMoran, Geary:
			my, sy := mx, sx
			v := x
			if kind == CrossMoran {
				my, sy = meanSD(y)
				v = y
			}
			var s float64
			for j := 0; j < n; j++ {
				zi, zj := (x[i]-mx)/sx, (v[j]-my)/sy
				if kind == Geary {
					s += w.At(i, j) * (zi - zj) * (zi - zj)
				} else {
					s += w.At(i, j) * zi * zj
				}
			}
			out[i] = s
		case Gi:
			var others []float64
			var wx, wi, s1 float64
			for j := 0; j < n; j++ {
				if j != i {
					wij := w.At(i, j)
					others = append(others, x[j])
					wx += wij * x[j]
					wi += wij
					s1 += wij * wij
				}
			}
			m, s := meanSD(others)
			out[i] = (wx - m*wi) / (s * math.Sqrt(((fn-1)*s1-wi*wi)/(fn-2)))
		case GiStar:
			var wx, wi, s1 float64
			for j := 0; j < n; j++ {
				wij := w.At(i, j)
				if j == i {
					wij = 1
				}
				wx += wij * x[j]
				wi += wij
				s1 += wij * wij
			}
			out[i] = (wx - mx*wi) / (sx * math.Sqrt((fn*s1-wi*wi)/(fn-1)))
		}
	}
	return out
}

func testColumns(n int) (x, y []float64) {
	x, y = make([]float64, n), make([]float64, n)
	for i := range x {
		x[i] = math.Sin(float64(i)*0.9) + 0.2*float64(i%4) + 10
		y[i] = math.Cos(float64(i)*0.4) - 0.1*float64(i%3)
	}
	return x, y
}

// Every statistic equals its formula evaluated directly, for binary,
// row-standardised and unequal weights.
func TestStatisticsAgainstFormulas(t *testing.T) {
	b := lattice(t, 5, 6, true, 4)
	x, y := testColumns(b.Len())
	for _, g := range []*weights.Graph{b, b.RowStandardised(), unequal(t, b)} {
		w := testkit.Dense(g.Offsets, g.Neighbours, g.Weights)
		for k := Moran; k <= GiStar; k++ {
			var yy []float64
			if k == CrossMoran {
				yy = y
			}
			got, err := Statistic(k, x, yy, g)
			if err != nil {
				t.Fatal(err)
			}
			want := direct(k, x, yy, w)
			for i := range got {
				if !near(got[i], want[i], 1e-12) {
					t.Errorf("%s, %s: area %d %v, formula %v", g.Scaling, k, i, got[i], want[i])
				}
			}
		}
	}
}

// Gi* equals gonum's stat/spatial.GetisOrdGStar (an outside implementation
// of Ord & Getis 1995) with 1 on the diagonal of its locality matrix, and
// autocorr.GiStar. Gi equals GetisOrdGStar applied to the other n−1 areas
// with i's row of weights, which is the same formula (Ord & Getis 1995:
// Gi is Gi* of the layer without area i).
func TestGetisOrdAgainstGonum(t *testing.T) {
	b := lattice(t, 6, 7, false, 0)
	x, _ := testColumns(b.Len())
	n := b.Len()
	for _, g := range []*weights.Graph{b, b.RowStandardised(), unequal(t, b)} {
		star, err := Statistic(GiStar, x, nil, g)
		if err != nil {
			t.Fatal(err)
		}
		gi, err := Statistic(Gi, x, nil, g)
		if err != nil {
			t.Fatal(err)
		}
		ours, err := autocorr.GiStar(x, g)
		if err != nil {
			t.Fatal(err)
		}
		// Gi* counts each area as its own neighbour with weight 1; no
		// graph here has self-links, so the off-diagonal entries stay
		// the graph's weights.
		d := testkit.Dense(g.Offsets, g.Neighbours, g.Weights)
		for i := 0; i < n; i++ {
			d.Set(i, i, 1)
		}
		for i := 0; i < n; i++ {
			if want := gspatial.GetisOrdGStar(i, x, nil, d); !near(star[i], want, 1e-12) {
				t.Errorf("%s: Gi*[%d] %v, gonum %v", g.Scaling, i, star[i], want)
			}
			if !near(star[i], ours[i], 1e-12) {
				t.Errorf("%s: Gi*[%d] %v, autocorr %v", g.Scaling, i, star[i], ours[i])
			}
			// The layer without area i; i's weights become row 0's.
			var rest []float64
			row := mat.NewDense(n-1, n-1, nil)
			for j := 0; j < n; j++ {
				if j == i {
					continue
				}
				k := len(rest)
				rest = append(rest, x[j])
				row.Set(0, k, d.At(i, j))
			}
			if want := gspatial.GetisOrdGStar(0, rest, nil, row); !near(gi[i], want, 1e-12) {
				t.Errorf("%s: Gi[%d] %v, gonum on the other areas %v", g.Scaling, i, gi[i], want)
			}
		}
	}
}

// Σ_i I_i = S0 · I (Anselin 1995, the sum identity after eq. 12), with I
// the global Moran's I of autocorr.MoransI and S0 the sum of the weights.
func TestLocalMoranSum(t *testing.T) {
	b := lattice(t, 7, 8, true, 3)
	x, _ := testColumns(b.Len())
	for _, g := range []*weights.Graph{b, b.RowStandardised(), unequal(t, b)} {
		li, err := Statistic(Moran, x, nil, g)
		if err != nil {
			t.Fatal(err)
		}
		I, err := autocorr.MoransI(x, g)
		if err != nil {
			t.Fatal(err)
		}
		var sum, s0 float64
		for _, v := range li {
			sum += v
		}
		for _, v := range g.Weights {
			s0 += v
		}
		if !near(sum, s0*I, 1e-12) {
			t.Errorf("%s: Σ I_i %v, S0·I %v", g.Scaling, sum, s0*I)
		}
	}
}

// permutations calls f with every arrangement of 0..n−1 (Heap's algorithm).
func permutations(n int, f func([]int)) {
	a := make([]int, n)
	c := make([]int, n)
	for i := range a {
		a[i] = i
	}
	f(a)
	for i := 0; i < n; {
		if c[i] < i {
			if i%2 == 0 {
				a[0], a[i] = a[i], a[0]
			} else {
				a[c[i]], a[i] = a[i], a[c[i]]
			}
			f(a)
			c[i]++
			i = 0
		} else {
			c[i] = 0
			i++
		}
	}
}

// Anselin's (1995, eqs. 13–14) expectation and variance of I_i under total
// randomisation equal the mean and variance of I_i over all 7! = 5,040
// arrangements of seven values, for binary and unequal weights.
func TestMoranMomentsByEnumeration(t *testing.T) {
	pairs := [][2]int32{{0, 1}, {0, 2}, {1, 2}, {1, 3}, {2, 4}, {3, 4}, {3, 5}, {4, 6}, {5, 6}, {2, 3}}
	b, err := weights.FromLinks(7, pairs, "test")
	if err != nil {
		t.Fatal(err)
	}
	x := []float64{1.5, -0.3, 2.9, 0.4, 7.2, -1.1, 0.8} // skewed, so b2 matters
	for _, g := range []*weights.Graph{b, unequal(t, b)} {
		e, v, err := MoranMoments(x, g)
		if err != nil {
			t.Fatal(err)
		}
		var sum, sumSq [7]float64
		count := 0
		perm := make([]float64, 7)
		permutations(7, func(a []int) {
			for i, k := range a {
				perm[i] = x[k]
			}
			li, err := Statistic(Moran, perm, nil, g)
			if err != nil {
				t.Fatal(err)
			}
			for i, s := range li {
				sum[i] += s
				sumSq[i] += s * s
			}
			count++
		})
		if count != 5040 {
			t.Fatalf("%d arrangements", count)
		}
		for i := 0; i < 7; i++ {
			m := sum[i] / 5040
			vr := sumSq[i]/5040 - m*m
			if !near(m, e[i], 1e-12) || !near(vr, v[i], 1e-10) {
				t.Errorf("%s area %d: enumeration %v %v, Anselin %v %v", g.Scaling, i, m, vr, e[i], v[i])
			}
		}
	}
}

// tinyLayer is eight areas: a 2×4 grid with rook links and one diagonal.
func tinyLayer(t testing.TB) *weights.Graph {
	t.Helper()
	g, err := weights.FromLinks(8, [][2]int32{{0, 1}, {1, 2}, {2, 3}, {4, 5}, {5, 6}, {6, 7},
		{0, 4}, {1, 5}, {2, 6}, {3, 7}, {1, 6}}, "tiny")
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// By exact enumeration on eight areas, the conditional mean of local Moran
// at area i is −w_i z_i²/((n−1) m2) and its variance
// (z_i/m2)² σ_i² (w_i(2) − (w_i² − w_i(2))/(n−2)), where σ_i² is the
// variance (divisor n−1) of the n−1 values other than z_i: i's value is
// fixed and its neighbours are a sample without replacement from the rest,
// two of whose draws have covariance −σ_i²/(n−2) (the moments of Anselin
// 1995 with z_i held fixed; the covariance of draws without replacement as
// in Cochran 1977, Sampling Techniques, section 2.5, recalled). Gi's
// conditional distribution has mean 0 and standard deviation 1: the Ord &
// Getis (1995) moments are exactly those of this permutation.
func TestConditionalMomentsExact(t *testing.T) {
	b := tinyLayer(t)
	x := []float64{3.1, 1.2, 4.4, 0.7, 2.9, 5.0, 1.8, 3.6}
	n := 8.0
	z := make([]float64, 8)
	mean, _ := meanSD(x)
	var m2 float64
	for i, v := range x {
		z[i] = v - mean
		m2 += z[i] * z[i] / n
	}
	for _, g := range []*weights.Graph{b, b.RowStandardised(), unequal(t, b)} {
		res, err := Run(Moran, x, nil, g, DefaultOptions())
		if err != nil {
			t.Fatal(err)
		}
		gi, err := Run(Gi, x, nil, g, DefaultOptions())
		if err != nil {
			t.Fatal(err)
		}
		for i, r := range res {
			if !r.Exact {
				t.Fatalf("area %d not enumerated", i)
			}
			_, w := g.Row(i)
			var wi, w2 float64
			for _, v := range w {
				wi += v
				w2 += v * v
			}
			e := -wi * z[i] * z[i] / ((n - 1) * m2)
			mu := -z[i] / (n - 1)
			s2 := (n*m2-z[i]*z[i])/(n-1) - mu*mu
			vr := (z[i] / m2) * (z[i] / m2) * s2 * (w2 - (wi*wi-w2)/(n-2))
			if !near(r.Expected, e, 1e-12) || !near(r.SD*r.SD, vr, 1e-10) {
				t.Errorf("%s area %d: mean %v sd² %v, want %v %v", g.Scaling, i, r.Expected, r.SD*r.SD, e, vr)
			}
			if math.Abs(gi[i].Expected) > 1e-12 || !near(gi[i].SD, 1, 1e-12) {
				t.Errorf("%s area %d: Gi mean %v sd %v, want 0 and 1", g.Scaling, i, gi[i].Expected, gi[i].SD)
			}
		}
	}
}

// On eight areas, the Monte Carlo p-values of every kind and both the
// folded and two-sided alternatives lie within their Clopper–Pearson
// intervals (Clopper & Pearson 1934) around the exact conditional p-values
// of full enumeration. All 99.9% intervals must cover; of the 95% ones, no
// more may miss than the 99.9% quantile of Binomial(tests, 0.05) allows.
func TestMonteCarloCoversExact(t *testing.T) {
	b := tinyLayer(t)
	x := []float64{3.1, 1.2, 4.4, 0.7, 2.9, 5.0, 1.8, 3.6}
	y := []float64{0.5, 2.2, 1.1, 3.3, 0.9, 2.0, 4.1, 1.5}
	tests, miss95 := 0, 0
	for _, g := range []*weights.Graph{b, b.RowStandardised(), unequal(t, b)} {
		for k := Moran; k <= GiStar; k++ {
			var yy []float64
			if k == CrossMoran {
				yy = y
			}
			for _, alt := range []shuffle.Alternative{shuffle.Folded, shuffle.TwoSided} {
				opt := Options{Permutations: 2999, Seed: 21, Alternative: alt}
				exact, err := Run(k, x, yy, g, opt)
				if err != nil {
					t.Fatal(err)
				}
				opt.ExactLimit = -1
				mc, err := Run(k, x, yy, g, opt)
				if err != nil {
					t.Fatal(err)
				}
				for i := range mc {
					if !exact[i].Exact || mc[i].Exact {
						t.Fatalf("exact flags %v %v", exact[i].Exact, mc[i].Exact)
					}
					// The count behind the Monte Carlo p-value.
					c := int(math.Round(mc[i].P*3000)) - 1
					if alt == shuffle.TwoSided {
						c = int(math.Round(mc[i].P*1500)) - 1
					}
					pe := exact[i].P
					if alt == shuffle.TwoSided {
						pe /= 2
					}
					if mc[i].P == 1 && pe >= 0.5 {
						continue // doubled and capped: nothing to compare
					}
					tests++
					lo, hi := shuffle.ClopperPearson(c, 2999, 0.999)
					if pe < lo-1e-12 || pe > hi+1e-12 {
						t.Errorf("%s %s %s area %d: exact %v outside 99.9%% [%v, %v] of Monte Carlo %v",
							g.Scaling, k, alt.String(), i, pe, lo, hi, mc[i].P)
					}
					lo, hi = shuffle.ClopperPearson(c, 2999, 0.95)
					if pe < lo-1e-12 || pe > hi+1e-12 {
						miss95++
					}
				}
			}
		}
	}
	limit := binomialQuantile(tests, 0.05, 0.999)
	t.Logf("%d comparisons, %d outside their 95%% interval (at most %d allowed)", tests, miss95, limit)
	if miss95 > limit {
		t.Errorf("%d of %d exact p-values outside the 95%% intervals, more than %d", miss95, tests, limit)
	}
}

// Results do not depend on the number of workers.
func TestRunDeterministic(t *testing.T) {
	g := lattice(t, 20, 20, true, 3).RowStandardised()
	x, y := testColumns(g.Len())
	for k := Moran; k <= GiStar; k++ {
		var yy []float64
		if k == CrossMoran {
			yy = y
		}
		var first []AreaResult
		for _, w := range []int{1, 2, 5} {
			opt := DefaultOptions()
			opt.Permutations, opt.Seed, opt.Workers, opt.KeepNull = 199, 8, w, []int{3}
			res, err := Run(k, x, yy, g, opt)
			if err != nil {
				t.Fatal(err)
			}
			if first == nil {
				first = res
			} else if !reflect.DeepEqual(res, first) {
				t.Errorf("%s: %d workers differ from 1", k, w)
			}
		}
	}
}

// One evaluation allocates nothing, for every kind.
func TestEvaluatorsDoNotAllocate(t *testing.T) {
	g := lattice(t, 10, 10, true, 1).RowStandardised()
	x, y := testColumns(g.Len())
	drawn := []int32{1, 5, 9, 20, 33, 47, 60, 71}
	for k := Moran; k <= GiStar; k++ {
		var yy []float64
		if k == CrossMoran {
			yy = y
		}
		p, err := prepare(k, x, yy, g)
		if err != nil {
			t.Fatal(err)
		}
		eval := p.factory()()
		var sink float64
		if a := testing.AllocsPerRun(100, func() { sink += eval(44, drawn) }); a != 0 {
			t.Errorf("%s: %v allocations per evaluation", k, a)
		}
		_ = sink
	}
}

// The cross local Moran of x against itself is the local Moran of x.
func TestCrossOfItself(t *testing.T) {
	g := lattice(t, 6, 6, true, 2).RowStandardised()
	x, _ := testColumns(g.Len())
	a, _ := Statistic(Moran, x, nil, g)
	b, err := Statistic(CrossMoran, x, x, g)
	if err != nil {
		t.Fatal(err)
	}
	for i := range a {
		if !near(a[i], b[i], 1e-14) {
			t.Errorf("area %d: %v %v", i, a[i], b[i])
		}
	}
}

// Categories follow the signs and the p-value: the rules of run.go.
func TestCategories(t *testing.T) {
	r := func(std, lag, stat, expected, p float64, nb int) AreaResult {
		return AreaResult{Standardised: std, StandardisedLag: lag, Statistic: stat, Expected: expected,
			P: p, AdjustedP: math.Min(1, 10*p), Neighbours: nb}
	}
	for _, c := range []struct {
		kind Kind
		r    AreaResult
		want string
	}{
		{Moran, r(1, 2, 2, 0, 0.01, 3), HighHigh},
		{Moran, r(-1, -2, 2, 0, 0.01, 3), LowLow},
		{Moran, r(1, -2, -2, 0, 0.01, 3), HighLow},
		{Moran, r(-1, 2, -2, 0, 0.01, 3), LowHigh},
		{Moran, r(1, 2, 2, 0, 0.2, 3), NotSignificant},
		{Moran, r(1, 2, 0, 0, 1, 0), NoNeighbours},
		{CrossMoran, r(-1, 2, -2, 0, 0.01, 3), LowHigh},
		{Geary, r(1, 1, 0.1, 2, 0.01, 3), SimilarHigh},
		{Geary, r(-1, -1, 0.1, 2, 0.01, 3), SimilarLow},
		{Geary, r(1, -0.2, 0.1, 2, 0.01, 3), SimilarMixed},
		{Geary, r(1, -1, 5, 2, 0.01, 3), Dissimilar},
		{Geary, r(1, -1, 5, 2, 0.3, 3), NotSignificant},
		{Gi, r(1, 1, 2.5, 0, 0.01, 3), HighCluster},
		{GiStar, r(1, 1, 0.5, 1.5, 0.01, 3), LowCluster},
	} {
		res := []AreaResult{c.r}
		Classify(c.kind, res, 0.05, false)
		if res[0].Category != c.want {
			t.Errorf("%s %+v: %q, want %q", c.kind, c.r, res[0].Category, c.want)
		}
	}
	// On adjusted p-values the 0.01 above becomes 0.1: not significant.
	res := []AreaResult{r(1, 2, 2, 0, 0.01, 3)}
	Classify(Moran, res, 0.05, true)
	if res[0].Category != NotSignificant {
		t.Errorf("adjusted: %q", res[0].Category)
	}
}

// An island (kept with a lag of zero) has one filling, p = 1, and the
// category NoNeighbours; Summarise counts categories and exact areas.
func TestIslandsAndSummary(t *testing.T) {
	const n = 500
	g, err := weights.FromLinks(n, func() (p [][2]int32) {
		for i := int32(0); i < n-2; i++ {
			p = append(p, [2]int32{i, i + 1})
		}
		return p
	}(), "path")
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, n)
	for i := range x {
		x[i] = float64(i * i % 7)
	}
	opt := DefaultOptions()
	opt.Adjustment = shuffle.BenjaminiHochberg
	res, err := Run(Moran, x, nil, g.RowStandardised(), opt)
	if err != nil {
		t.Fatal(err)
	}
	last := res[n-1]
	if !last.Exact || last.Permutations != 1 || last.P != 1 || last.Category != NoNeighbours || last.Statistic != 0 {
		t.Errorf("island: %+v", last)
	}
	s := Summarise(Moran, res, opt)
	var total, cats int
	for _, c := range s.Categories {
		cats += c.Areas
	}
	for _, r := range res {
		if r.Exact {
			total++
		}
	}
	if s.Areas != n || cats != n || s.ExactAreas != total || s.Alternative != "folded" ||
		s.Adjustment != "benjamini-hochberg" || s.CategoriesFrom != "adjusted" {
		t.Errorf("summary %+v", s)
	}
	// The path's two ends have C(499, 1) = 499 fillings and are exact too;
	// the areas between have C(499, 2) = 124,251, past the limit.
	if total != 3 {
		t.Errorf("%d exact areas, want 3 (two ends and the island)", total)
	}
}

func TestRunErrors(t *testing.T) {
	g := lattice(t, 3, 3, false, 0)
	x := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9}
	for _, c := range []struct {
		name string
		run  func() error
		want string
	}{
		{"length", func() error { _, err := Run(Moran, x[:8], nil, g, Options{}); return err }, "8 values"},
		{"nan", func() error {
			v := append([]float64(nil), x...)
			v[4] = math.NaN()
			_, err := Run(Geary, v, nil, g, Options{})
			return err
		}, "not a finite number"},
		{"y for moran", func() error { _, err := Run(Moran, x, x, g, Options{}); return err }, "one variable"},
		{"no y", func() error { _, err := Run(CrossMoran, x, nil, g, Options{}); return err }, "second variable"},
		{"y constant", func() error {
			_, err := Run(CrossMoran, x, make([]float64, 9), g, Options{})
			return err
		}, "constant"},
		{"alpha", func() error { _, err := Run(Moran, x, nil, g, Options{Alpha: 2}); return err }, "alpha"},
		{"kind", func() error { _, err := Run(Kind(9), x, nil, g, Options{}); return err }, "unknown"},
		{"graph", func() error { _, err := Run(Moran, x, nil, nil, Options{}); return err }, "graph"},
	} {
		if err := c.run(); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %v, want %q", c.name, err, c.want)
		}
	}
	if _, err := Run(Gi, make([]float64, 9), nil, g, Options{}); !errors.Is(err, autocorr.ErrConstant) {
		t.Errorf("constant: %v", err)
	}
	for k := Moran; k <= GiStar; k++ {
		if got, err := ParseKind(k.Code()); err != nil || got != k {
			t.Errorf("%s: %v %v", k.Code(), got, err)
		}
	}
	if _, err := ParseKind("lisa"); err == nil {
		t.Error("unknown kind accepted")
	}
}
