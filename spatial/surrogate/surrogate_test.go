package surrogate

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Wagner & Dray 2015 (Methods Ecol. Evol. 6:1169–1178): a sign-randomised
// surrogate keeps the outcome's mean, variance and Moran's I, because I of
// a centred z is (n/S0)·Σλ_k c_k²/Σc_k² and depends only on the symmetric
// part of W (zᵀWz = zᵀW*z). On the dense path: I to 1e-9, mean and
// variance to 1e-12 (relative), for every draw, with sign flips only and
// with the default rotations inside repeated eigenvalues (which keep I
// too, the eigenvalue being the same); islands keep their own values.
func TestDenseSurrogatesKeepMoranMeanVariance(t *testing.T) {
	rook := lattice(t, 20, 20).RowStandardised()
	field := newSAR(rook, 0.8)
	rng := shuffle.NewStream(1, 1, 0)
	sarY := field.draw(t, &rng)
	irr := irregular(t, 15, 14, 2) // has islands
	irrRow := irr.RowStandardised()
	irrY := make([]float64, irr.Len())
	for i := range irrY {
		irrY[i] = float64(i%14) + 0.3*float64(i/14) + rng.Float64()
	}
	binary := lattice(t, 12, 12)
	binY := make([]float64, binary.Len())
	for i := range binY {
		binY[i] = math.Exp(rng.Float64() * 3) // skewed
	}
	cases := []struct {
		name string
		g    *weights.Graph
		y    []float64
		opt  Options
	}{
		{"SAR on rook 20×20, signs only", rook, sarY, Options{RotationGap: -1}},
		{"SAR on rook 20×20, rotations in repeated eigenvalues (default)", rook, sarY, Options{}},
		{"irregular with islands", irrRow, irrY, Options{}},
		{"skewed on binary rook 12×12", binary, binY, Options{}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) { checkDenseSurrogates(t, c.g, c.y, c.opt) })
	}
}

// checkDenseSurrogates draws 200 surrogates of y on a complete basis of g
// and checks that each keeps Moran's I, the mean and the variance, that
// islands get island values, and that the surrogates are not y.
func checkDenseSurrogates(t *testing.T, g *weights.Graph, y []float64, opt Options) {
	b, o := prepared(t, g, opt, y)
	if o.MoranTolerance() > 1e-12 {
		t.Errorf("complete basis: tolerance %g", o.MoranTolerance())
	}
	i0 := moranLinked(t, b, g, y)
	m0, v0 := meanVar(y)
	s := b.NewScratch()
	out := make([]float64, len(y))
	rng := shuffle.NewStream(9, 9, 0)
	var worstI, worstM, worstV, corr float64
	const draws = 200
	for d := 0; d < draws; d++ {
		o.Draw(&rng, out, s)
		worstI = math.Max(worstI, math.Abs(moranLinked(t, b, g, out)-i0))
		m, v := meanVar(out)
		worstM = math.Max(worstM, math.Abs(m-m0)/math.Max(1, math.Abs(m0)))
		worstV = math.Max(worstV, math.Abs(v-v0)/v0)
		corr += correlation(out, y) / draws
		for _, i := range b.Islands() {
			found := false
			for _, j := range b.Islands() {
				found = found || out[i] == y[j]
			}
			if !found {
				t.Fatalf("island %d got %v, not an island value", i, out[i])
			}
		}
	}
	t.Logf("I %.6f; worst |ΔI| %.2g, |Δmean| %.2g, |Δvar|/var %.2g; mean correlation with the outcome %.3f",
		i0, worstI, worstM, worstV, corr)
	if worstI > 1e-9 || worstM > 1e-12 || worstV > 1e-12 {
		t.Errorf("not preserved: ΔI %g, Δmean %g, Δvar %g", worstI, worstM, worstV)
	}
	// The surrogates are not the outcome: over random signs the
	// correlation with it, Σ±c_k²/Σc_k², has mean 0 and standard
	// deviation √Σc_k⁴/Σc_k² per draw.
	var c2, c4 float64
	for _, c := range o.coef {
		c2 += c * c
		c4 += c * c * c * c
	}
	if sd := math.Sqrt(c4) / c2 / math.Sqrt(draws); math.Abs(corr) > 5*sd+0.01 {
		t.Errorf("mean correlation with the outcome %v", corr)
	}
}

func correlation(a, b []float64) float64 {
	ma, va := meanVar(a)
	mb, vb := meanVar(b)
	var s float64
	for i := range a {
		s += (a[i] - ma) * (b[i] - mb)
	}
	return s / float64(len(a)-1) / math.Sqrt(va*vb)
}

// On the sparse path the quadratic form of the stored part is kept
// exactly and the residual subspace is filled at random, so |ΔI| stays
// within Outcome.MoranTolerance for every draw (the bound derived at
// MoranTolerance); White typically lands near the mean eigenvalue of the
// residual subspace, Matched hits the outcome residual's Moran quotient,
// so its I agrees to 1e-8 in (nearly) every draw.
func TestSparseSurrogateMoranTolerance(t *testing.T) {
	for name, g := range map[string]*weights.Graph{
		"rook 20×20":      lattice(t, 20, 20).RowStandardised(),
		"irregular 20×20": irregular(t, 20, 20, 8).RowStandardised(),
	} {
		field := newSAR(g, 0.8)
		rng := shuffle.NewStream(4, 4, 0)
		y := field.draw(t, &rng)
		for _, mode := range []Residual{White, Matched} {
			b, o := prepared(t, g, Options{Method: Sparse, Top: 60, Bottom: 30, Residual: mode}, y)
			tol := o.MoranTolerance()
			i0 := moranLinked(t, b, g, y)
			m0, v0 := meanVar(y)
			s := b.NewScratch()
			out := make([]float64, len(y))
			var worst, sum, worstMV float64
			exact := 0
			const draws = 300
			for d := 0; d < draws; d++ {
				o.Draw(&rng, out, s)
				di := moranLinked(t, b, g, out) - i0
				worst = math.Max(worst, math.Abs(di))
				sum += di
				if math.Abs(di) <= 1e-8 {
					exact++
				}
				m, v := meanVar(out)
				worstMV = math.Max(worstMV, math.Max(math.Abs(m-m0)/math.Max(1, math.Abs(m0)), math.Abs(v-v0)/v0))
			}
			t.Logf("%s, %s: I %.4f, residual share %.3f, gap %.3f…%.3f, tolerance %.3f; mean ΔI %+.4f, worst |ΔI| %.2g, %d/%d draws within 1e-8",
				name, mode, i0, o.ResidualShare(), b.Info().Gap[0], b.Info().Gap[1], tol, sum/draws, worst, exact, draws)
			if worst > tol {
				t.Errorf("%s, %s: |ΔI| %g beyond the tolerance %g", name, mode, worst, tol)
			}
			if worstMV > 1e-12 {
				t.Errorf("%s, %s: mean or variance moved by %g", name, mode, worstMV)
			}
			if mode == Matched && exact < draws*95/100 {
				t.Errorf("%s: only %d of %d matched draws keep I to 1e-8", name, exact, draws)
			}
		}
	}
}

// Draw and Surrogate allocate nothing, and the same stream gives the same
// surrogate.
func TestDrawAllocatesNothingAndRepeats(t *testing.T) {
	g := irregular(t, 20, 20, 1).RowStandardised()
	y := make([]float64, g.Len())
	for i := range y {
		y[i] = math.Sin(float64(i) / 7)
	}
	for _, opt := range []Options{{}, {Method: Sparse, Top: 40, Bottom: 20}, {Method: Sparse, Top: 40, Bottom: 20, Residual: White}, {RotationGap: 0.01}} {
		b, o := prepared(t, g, opt, y)
		s := b.NewScratch()
		out := make([]float64, len(y))
		rng := shuffle.NewStream(1, 2, 3)
		if a := testing.AllocsPerRun(50, func() { o.Draw(&rng, out, s) }); a != 0 {
			t.Errorf("%+v: Draw allocates %v times", opt, a)
		}
		if a := testing.AllocsPerRun(50, func() { _ = b.Surrogate(y, &rng, out, s) }); a != 0 {
			t.Errorf("%+v: Surrogate allocates %v times", opt, a)
		}
		first := make([]float64, len(y))
		r1 := shuffle.NewStream(5, 6, 7)
		o.Draw(&r1, first, s)
		r2 := shuffle.NewStream(5, 6, 7)
		if err := b.Surrogate(y, &r2, out, b.NewScratch()); err != nil {
			t.Fatal(err)
		}
		for i := range out {
			if out[i] != first[i] {
				t.Fatalf("%+v: same stream, different surrogate at %d", opt, i)
			}
		}
	}
	b, _ := NewBasis(g, Options{})
	if _, err := b.Prepare(y[:10]); err == nil {
		t.Error("short outcome accepted")
	}
	bad := append([]float64(nil), y...)
	bad[3] = math.NaN()
	if _, err := b.Prepare(bad); err == nil {
		t.Error("NaN accepted")
	}
}

// matchQuotient solves q(γ) = target exactly when it can, and otherwise
// lands on the reachable extreme nearest the target.
func TestMatchQuotient(t *testing.T) {
	q := func(gg, a, b, c, gm float64) float64 {
		return (a + 2*gm*b + gm*gm*c) / (gg + 2*gm*a + gm*gm*b)
	}
	// g = (1, 0), Ω = diag(0.2, 0.9) rotated: any consistent moments from
	// a 2-D example: g = (1, 1)/√2 in the eigenbasis.
	l1, l2 := 0.9, -0.3
	gg := 1.0
	a := (l1 + l2) / 2
	b := (l1*l1 + l2*l2) / 2
	c := (l1*l1*l1 + l2*l2*l2) / 2
	for _, target := range []float64{-0.25, 0, 0.3, 0.85} {
		gm := matchQuotient(gg, a, b, c, target)
		if got := q(gg, a, b, c, gm); math.Abs(got-target) > 1e-12 {
			t.Errorf("target %v: γ %v gives %v", target, gm, got)
		}
	}
	// Out of reach (above l1): the nearest extreme, l1.
	gm := matchQuotient(gg, a, b, c, 1.5)
	if got := q(gg, a, b, c, gm); math.Abs(got-l1) > 1e-9 {
		t.Errorf("out of reach: γ %v gives %v, want %v", gm, got, l1)
	}
}

// The residual direction by the eigenpairs (residualByEigenpairs, used
// when the basis converged) is the one the explicit projections give
// (residual's other branch), up to the basis's residuals: the same
// surrogates from the same streams, to 1e-6 of their spread, on the
// sparse basis of a 3,000-area region, matched and white.
func TestResidualByEigenpairsMatchesProjection(t *testing.T) {
	g := regionGraph(t, 3000)
	for _, treatment := range []Residual{Matched, White} {
		b, err := NewBasis(g, Options{Residual: treatment})
		if err != nil {
			t.Fatal(err)
		}
		if !b.info.Converged || b.info.Complete {
			t.Fatalf("the basis should be sparse and converged: %+v", b.info)
		}
		y, _ := benchColumns(g.Len())
		o, err := b.Prepare(y)
		if err != nil {
			t.Fatal(err)
		}
		if o.rnorm == 0 {
			t.Fatal("no residual part to draw")
		}
		fast, slow := make([]float64, g.Len()), make([]float64, g.Len())
		s := b.NewScratch()
		for d := range 20 {
			rng := shuffle.NewStream(7, 3, d)
			o.Draw(&rng, fast, s)
			b.info.Converged = false
			rng = shuffle.NewStream(7, 3, d)
			o.Draw(&rng, slow, s)
			b.info.Converged = true
			var diff, spread float64
			for i := range fast {
				diff = math.Max(diff, math.Abs(fast[i]-slow[i]))
				spread = math.Max(spread, math.Abs(slow[i]-o.mean))
			}
			if d == 0 {
				t.Logf("%v: largest difference %.2g of the spread", treatment, diff/spread)
			}
			if diff > 1e-6*spread {
				t.Fatalf("%v, draw %d: surrogates differ by %g (spread %g)", treatment, d, diff, spread)
			}
		}
	}
}
