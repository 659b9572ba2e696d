package effective

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// lattice is rook contiguity on a rows×cols grid, binary weights.
func lattice(t testing.TB, rows, cols int) *weights.Graph {
	return weights.Lattice(rows, cols, weights.Rook)
}

// irregular is a small graph with the cases a lattice lacks: a chain, a
// cycle, a leaf, a second group of linked areas and an island (area 11).
func irregular(t testing.TB) *weights.Graph {
	t.Helper()
	pairs := [][2]int32{{0, 1}, {1, 2}, {2, 3}, {3, 4}, {4, 0}, {2, 5}, {5, 6}, {6, 7}, {1, 6}, {8, 9}, {9, 10}}
	g, err := weights.FromLinks(12, pairs, "irregular")
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// sarField draws fields y = (I − ρW)⁻¹ε with W the row-standardised
// graph and ε standard normal from the test's stream (testkit.SAR: one
// factorisation, one solve per field).
type sarField struct {
	sar *testkit.SAR
	n   int
}

func newSAR(g *weights.Graph, rho float64) sarField {
	w := g.RowStandardised()
	return sarField{sar: testkit.NewSAR(testkit.Dense(w.Offsets, w.Neighbours, w.Weights), rho), n: g.Len()}
}

func (f sarField) draw(tb testing.TB, rng *rand.Rand) []float64 {
	return f.sar.Field(tb, normals(f.n, rng))
}

// normals draws n standard normal values from rng.
func normals(n int, rng *rand.Rand) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = rng.NormFloat64()
	}
	return out
}

// aboveMedian is the 0/1 indicator of the values above the median: a
// grouping as clustered as the field it is cut from.
func aboveMedian(v []float64) []float64 {
	s := append([]float64(nil), v...)
	// A simple sort keeps the helper free of dependencies.
	for i := 1; i < len(s); i++ {
		for j := i; j > 0 && s[j] < s[j-1]; j-- {
			s[j], s[j-1] = s[j-1], s[j]
		}
	}
	med := (s[(len(s)-1)/2] + s[len(s)/2]) / 2
	out := make([]float64, len(v))
	for i, x := range v {
		if x > med {
			out[i] = 1
		}
	}
	return out
}

// The per-order correlations and pair counts equal Moran's I on the binary
// graphs of weights.Graph.HigherOrder, computed by autocorr.MoransI: the
// package's own breadth-first count must find exactly those pairs.
func TestCorrelogramMatchesHigherOrder(t *testing.T) {
	for _, c := range []struct {
		name string
		g    *weights.Graph
	}{{"lattice 7×6", lattice(t, 7, 6)}, {"irregular", irregular(t)}} {
		t.Run(c.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(1, 2))
			n := c.g.Len()
			y := newSAR(c.g, 0.7).draw(t, rng)
			x := normals(n, rng)
			res, err := Test(y, x, c.g, Options{})
			if err != nil {
				t.Fatal(err)
			}
			for _, o := range res.Orders {
				h, err := c.g.HigherOrder(o.Order, false)
				if err != nil {
					t.Fatal(err)
				}
				if int64(h.Links()/2) != o.Pairs {
					t.Fatalf("order %d: %d pairs, HigherOrder has %d", o.Order, o.Pairs, h.Links()/2)
				}
				iy, err := autocorr.MoransI(y, h)
				if err != nil {
					t.Fatal(err)
				}
				ix, _ := autocorr.MoransI(x, h)
				if math.Abs(iy-o.Outcome) > 1e-12 || math.Abs(ix-o.Group) > 1e-12 {
					t.Fatalf("order %d: I = %v, %v; MoransI gives %v, %v", o.Order, o.Outcome, o.Group, iy, ix)
				}
			}
			// By default every order is used: the next one has no pair.
			k := len(res.Orders)
			h, _ := c.g.HigherOrder(k+1, false)
			if h.Links() != 0 {
				t.Fatalf("stopped at order %d, but order %d has %d links", k, k+1, h.Links())
			}
		})
	}
}

// denseVariance evaluates Dutilleul's (1993) expression
// σ²_r = tr(B R_y B R_x) / (tr(B R_y) tr(B R_x)) with dense n×n matrices:
// R built entry by entry from the order of each pair (HigherOrder graphs)
// and Moran's I at that order, B = I − 11ᵀ/n.
func denseVariance(t *testing.T, g *weights.Graph, y, x []float64, K int) float64 {
	t.Helper()
	n := g.Len()
	ry := mat.NewDense(n, n, nil)
	rx := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		ry.Set(i, i, 1)
		rx.Set(i, i, 1)
	}
	for k := 1; k <= K; k++ {
		h, err := g.HigherOrder(k, false)
		if err != nil {
			t.Fatal(err)
		}
		if h.Links() == 0 {
			break
		}
		iy, _ := autocorr.MoransI(y, h)
		ix, _ := autocorr.MoransI(x, h)
		for i := 0; i < n; i++ {
			nb, _ := h.Row(i)
			for _, j := range nb {
				ry.Set(i, int(j), iy)
				rx.Set(i, int(j), ix)
			}
		}
	}
	b := testkit.Centring(n)
	var bry, brx, prod mat.Dense
	bry.Mul(b, ry)
	brx.Mul(b, rx)
	prod.Mul(&bry, &brx)
	return mat.Trace(&prod) / (mat.Trace(&bry) * mat.Trace(&brx))
}

// The sparse expansion of the traces reproduces the published expression
// evaluated with dense matrices.
func TestVarianceMatchesDenseFormula(t *testing.T) {
	for _, c := range []struct {
		name string
		g    *weights.Graph
		K    int
	}{
		{"lattice 7×6, 10 orders", lattice(t, 7, 6), 10},
		{"lattice 7×6, 3 orders", lattice(t, 7, 6), 3},
		{"irregular, all orders", irregular(t), 10},
	} {
		t.Run(c.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(3, 4))
			n := c.g.Len()
			field := newSAR(c.g, 0.8)
			y := field.draw(t, rng)
			x := aboveMedian(field.draw(t, rng))
			res, err := Test(y, x, c.g, Options{MaxOrder: c.K})
			if err != nil {
				t.Fatal(err)
			}
			want := denseVariance(t, c.g, y, x, c.K)
			if math.Abs(res.CorrelationVariance-want) > 1e-12*want {
				t.Fatalf("σ²_r = %.15g, dense formula %.15g", res.CorrelationVariance, want)
			}
			neff := math.Min(float64(n), 1+1/want)
			if math.Abs(res.EffectiveSampleSize-neff) > 1e-9*neff {
				t.Fatalf("n_eff = %v, want %v", res.EffectiveSampleSize, neff)
			}
			wantT := res.Correlation * math.Sqrt((neff-2)/(1-res.Correlation*res.Correlation))
			wantP := 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: neff - 2}.Survival(math.Abs(wantT))
			if math.Abs(res.T-wantT) > 1e-9*math.Abs(wantT) || math.Abs(res.PValue-wantP) > 1e-9 || math.Abs(res.DF-(neff-2)) > 1e-9*neff {
				t.Fatalf("t = %v df = %v p = %v, want %v, %v, %v", res.T, res.DF, res.PValue, wantT, neff-2, wantP)
			}
		})
	}
}

// With every estimated correlation zero, σ²_r = 1/(n − 1) and n_eff = n
// exactly: the trace formula reduces to the independent case. A graph whose
// only pairs have a variable's centred values multiplying to zero makes the
// correlations vanish exactly.
func TestNoAutocorrelationGivesN(t *testing.T) {
	// Areas 0–1 and 2–3 are linked; the outcome is 0 at areas 0 and 2, so
	// every product z_i z_j over a linked pair is zero once the mean is 0.
	g, err := weights.FromLinks(6, [][2]int32{{0, 1}, {2, 3}}, "pairs")
	if err != nil {
		t.Fatal(err)
	}
	y := []float64{0, 1, 0, -1, 2, -2}
	x := []float64{1, 0, 0, 1, 1, 0}
	res, err := Test(y, x, g, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if res.Orders[0].Outcome != 0 {
		t.Fatalf("outcome correlation %v, want 0", res.Orders[0].Outcome)
	}
	if math.Abs(res.CorrelationVariance-1.0/5) > 1e-15 || math.Abs(res.EffectiveSampleSize-6) > 1e-12 {
		t.Fatalf("σ²_r = %v n_eff = %v, want 1/5 and 6", res.CorrelationVariance, res.EffectiveSampleSize)
	}
	if math.Abs(res.T-res.OrdinaryT) > 1e-12 || math.Abs(res.PValue-res.OrdinaryPValue) > 1e-12 {
		t.Fatalf("modified and ordinary tests differ: %v/%v vs %v/%v", res.T, res.PValue, res.OrdinaryT, res.OrdinaryPValue)
	}
}

// The ordinary test on the point-biserial r is Student's pooled two-sample
// t-test (textbook identity), so the doc's reading of what is tested holds.
func TestOrdinaryIsPooledTwoSampleT(t *testing.T) {
	g := lattice(t, 6, 5)
	rng := rand.New(rand.NewPCG(5, 6))
	y := normals(30, rng)
	x := aboveMedian(normals(30, rng))
	for i := range y {
		y[i] += 0.8 * x[i]
	}
	res, err := Test(y, x, g, Options{Alternative: shuffle.Greater})
	if err != nil {
		t.Fatal(err)
	}
	var sa, sb, na, nb float64
	for i, v := range y {
		if x[i] == 1 {
			sa += v
			na++
		} else {
			sb += v
			nb++
		}
	}
	ma, mb := sa/na, sb/nb
	var ssw float64
	for i, v := range y {
		m := mb
		if x[i] == 1 {
			m = ma
		}
		ssw += (v - m) * (v - m)
	}
	sp := math.Sqrt(ssw / (na + nb - 2))
	want := (ma - mb) / (sp * math.Sqrt(1/na+1/nb))
	if math.Abs(res.OrdinaryT-want) > 1e-10 {
		t.Fatalf("ordinary t %v, pooled two-sample t %v", res.OrdinaryT, want)
	}
	wantP := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: 28}.Survival(want)
	if math.Abs(res.OrdinaryPValue-wantP) > 1e-12 {
		t.Fatalf("ordinary p %v, want %v", res.OrdinaryPValue, wantP)
	}
}

// On independent normal data the estimated correlations are noise around
// zero and n_eff stays close to n; on two independent but autocorrelated
// fields it falls well below n, and the further the stronger the
// autocorrelation. Tolerances from 100 layers on a 20×20 rook lattice: the
// mean ratio n_eff/n within 3% of 1 and no layer below 0.85 (n_eff is capped
// at n, so the mean sits a little under 1); SAR fields with ρ = 0.8 below
// n/2 on average, with ρ = 0.95 below n/4.
func TestEffectiveSizeIndependentAndClustered(t *testing.T) {
	g := lattice(t, 20, 20)
	l, err := NewLags(g, 0)
	if err != nil {
		t.Fatal(err)
	}
	if l.Orders() != 38 { // the longest rook path between corners: 19 + 19 steps
		t.Fatalf("orders %d, want 38", l.Orders())
	}
	fields := map[float64]sarField{0.8: newSAR(g, 0.8), 0.95: newSAR(g, 0.95)}
	rng := rand.New(rand.NewPCG(7, 8))
	const layers, n = 100, 400
	var iidSum, iidMin float64
	iidMin = math.Inf(1)
	sum := map[float64]float64{}
	for k := 0; k < layers; k++ {
		r, err := l.Test(normals(n, rng), aboveMedian(normals(n, rng)), shuffle.TwoSided)
		if err != nil {
			t.Fatal(err)
		}
		ratio := r.EffectiveSampleSize / n
		iidSum += ratio
		iidMin = math.Min(iidMin, ratio)
		for _, rho := range []float64{0.8, 0.95} {
			s, err := l.Test(fields[rho].draw(t, rng), aboveMedian(fields[rho].draw(t, rng)), shuffle.TwoSided)
			if err != nil {
				t.Fatal(err)
			}
			sum[rho] += s.EffectiveSampleSize
		}
	}
	t.Logf("independent: mean n_eff/n %.4f, lowest %.4f; SAR: mean n_eff %.1f (ρ = 0.8), %.1f (ρ = 0.95) of %d",
		iidSum/layers, iidMin, sum[0.8]/layers, sum[0.95]/layers, n)
	if m := iidSum / layers; math.Abs(m-1) > 0.03 || iidMin < 0.85 {
		t.Errorf("independent data: mean n_eff/n = %.4f, lowest %.4f", m, iidMin)
	}
	if m := sum[0.8] / layers; m > n/2 {
		t.Errorf("SAR ρ = 0.8: mean n_eff %.1f, want below %d", m, n/2)
	}
	if m := sum[0.95] / layers; m > n/4 {
		t.Errorf("SAR ρ = 0.95: mean n_eff %.1f, want below %d", m, n/4)
	}
}

// With k > 2 groups, one test per group against the rest; with two, one
// test, of group 0's indicator.
func TestGroups(t *testing.T) {
	g := lattice(t, 8, 8)
	l, err := NewLags(g, 5)
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(9, 10))
	y := newSAR(g, 0.5).draw(t, rng)
	labels := make([]int32, 64)
	for i := range labels {
		labels[i] = int32((i % 8) / 3) // three vertical bands
	}
	res, err := l.Groups(y, labels, 3, shuffle.TwoSided)
	if err != nil {
		t.Fatal(err)
	}
	if len(res) != 3 {
		t.Fatalf("%d results for 3 groups", len(res))
	}
	for grp, r := range res {
		x := make([]float64, 64)
		for i, lab := range labels {
			if lab == int32(grp) {
				x[i] = 1
			}
		}
		want, err := l.Test(y, x, shuffle.TwoSided)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.PValue-want.PValue) > 1e-14 || math.Abs(r.EffectiveSampleSize-want.EffectiveSampleSize) > 1e-10 {
			t.Fatalf("group %d: %+v, alone %+v", grp, r, want)
		}
	}
	two := make([]int32, 64)
	for i := range two {
		two[i] = labels[i] & 1
	}
	res, err = l.Groups(y, two, 2, shuffle.Greater)
	if err != nil || len(res) != 1 {
		t.Fatalf("two groups: %d results, %v", len(res), err)
	}
	x := make([]float64, 64)
	for i, lab := range two {
		if lab == 0 {
			x[i] = 1
		}
	}
	want, _ := l.Test(y, x, shuffle.Greater)
	if res[0].PValue != want.PValue {
		t.Fatalf("two groups p %v, indicator of group 0 gives %v", res[0].PValue, want.PValue)
	}
}

// Opposite patterns: outcome and indicator with opposite estimated
// autocorrelation give an estimate of n_eff above n, which is capped.
func TestCapAtN(t *testing.T) {
	g := lattice(t, 10, 10)
	y := make([]float64, 100)
	x := make([]float64, 100)
	for i := range y {
		r, c := i/10, i%10
		y[i] = float64(r) + 0.3*math.Sin(float64(7*i)) // smooth: positive I
		x[i] = float64((r + c) % 2)                    // chessboard: I = −1 at order 1
	}
	res, err := Test(y, x, g, Options{MaxOrder: 1})
	if err != nil {
		t.Fatal(err)
	}
	if !res.Capped || res.EffectiveSampleSize != 100 || res.DF != 98 {
		t.Fatalf("capped %v n_eff %v df %v", res.Capped, res.EffectiveSampleSize, res.DF)
	}
	if res.PValue != res.OrdinaryPValue {
		t.Fatalf("capped test should equal the ordinary one: %v vs %v", res.PValue, res.OrdinaryPValue)
	}
}

func TestErrors(t *testing.T) {
	g := lattice(t, 4, 4)
	y := make([]float64, 16)
	x := make([]float64, 16)
	for i := range y {
		y[i] = float64(i)
		x[i] = float64(i % 2)
	}
	cases := []struct {
		name string
		run  func() error
		is   error
	}{
		{"constant outcome", func() error { _, err := Test(make([]float64, 16), x, g, Options{}); return err }, ErrConstant},
		{"constant indicator", func() error { _, err := Test(y, make([]float64, 16), g, Options{}); return err }, ErrConstant},
		{"NaN", func() error {
			bad := append([]float64(nil), y...)
			bad[3] = math.NaN()
			_, err := Test(bad, x, g, Options{})
			return err
		}, nil},
		{"length", func() error { _, err := Test(y[:5], x, g, Options{}); return err }, nil},
		{"no links", func() error {
			e, _ := weights.FromLinks(16, nil, "none")
			_, err := Test(y, x, e, Options{})
			return err
		}, nil},
		{"nil graph", func() error { _, err := Test(y, x, nil, Options{}); return err }, nil},
		{"label out of range", func() error {
			l, _ := NewLags(g, 0)
			_, err := l.Groups(y, make([]int32, 16), 1, shuffle.TwoSided)
			return err
		}, nil},
		{"empty group", func() error {
			l, _ := NewLags(g, 0)
			_, err := l.Groups(y, make([]int32, 16), 3, shuffle.TwoSided)
			return err
		}, ErrConstant},
	}
	for _, c := range cases {
		err := c.run()
		if err == nil {
			t.Errorf("%s: no error", c.name)
			continue
		}
		if c.is != nil && !errors.Is(err, c.is) {
			t.Errorf("%s: %v, want %v", c.name, err, c.is)
		}
	}
	// A trend and a step along a chain of six areas: neighbours nearly
	// equal, so the chain carries the information of under three
	// independent areas.
	var chain [][2]int32
	for i := int32(0); i < 5; i++ {
		chain = append(chain, [2]int32{i, i + 1})
	}
	path, _ := weights.FromLinks(6, chain, "chain")
	if _, err := Test([]float64{0, 1, 2, 3, 4, 5}, []float64{0, 0, 0, 1, 1, 1}, path, Options{}); !errors.Is(err, ErrTooFew) {
		t.Errorf("chain of six: %v, want ErrTooFew", err)
	}
}

// Stored pairs and the breadth-first walk give the same test.
func TestStoredPairsMatchWalk(t *testing.T) {
	g := irregular(t)
	rng := rand.New(rand.NewPCG(11, 12))
	y, x := normals(12, rng), normals(12, rng)
	for i := range y {
		y[i] += x[i] // some association, so p is not near 1
	}
	l, err := NewLags(g, 0)
	if err != nil {
		t.Fatal(err)
	}
	if l.partner == nil {
		t.Fatal("pairs of a small layer should be stored")
	}
	walked := *l
	walked.first, walked.partner, walked.order = nil, nil, nil
	a, err := l.Test(y, x, shuffle.TwoSided)
	if err != nil {
		t.Fatal(err)
	}
	b, err := walked.Test(y, x, shuffle.TwoSided)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(a.PValue-b.PValue) > 1e-14 || math.Abs(a.EffectiveSampleSize-b.EffectiveSampleSize) > 1e-12 {
		t.Fatalf("stored %+v, walked %+v", a, b)
	}
}

// The automatic choice of orders on a layer too large for every pair: the
// orders chosen hold about the budget of pairs, and one more would not fit.
func TestAffordableOrders(t *testing.T) {
	g := lattice(t, 60, 60)
	l := &Lags{n: g.Len(), off: g.Offsets, nb: g.Neighbours}
	const budget = 100_000
	k := affordable(l.estimatePairs(), budget)
	full, err := NewLags(g, 119)
	if err != nil {
		t.Fatal(err)
	}
	var within int64
	for d := 1; d <= k; d++ {
		within += full.Pairs(d)
	}
	next := within + full.Pairs(k+1)
	t.Logf("budget %d: %d orders, %d pairs (%d with one more order)", budget, k, within, next)
	// The estimate comes from 64 searches; allow it 10% either way.
	if float64(within) > 1.1*budget || float64(next) < 0.9*budget {
		t.Fatalf("%d orders hold %d pairs, %d with the next, for a budget of %d", k, within, next, budget)
	}
	// With every pair allowed, every order the searches reach counts: on a
	// 60×60 rook lattice each search reaches all areas, at most 118 steps
	// away (corner to corner) and at least 59 (from the centre).
	if got := affordable(l.estimatePairs(), int64(3600*3599/2)); got < 59 || got > 118 {
		t.Fatalf("every pair fits: %d orders", got)
	}
}
