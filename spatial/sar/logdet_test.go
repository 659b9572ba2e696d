package sar

import (
	"math"
	"testing"

	"github.com/areatest/areatest/weights"
)

// withIsland is a 5×6 queen lattice, a linked pair and an area with no
// neighbour (three components, one an island): rows 0–4 of a 7×6 queen
// lattice, and cells 0, 1 and 4 of its last row.
func withIsland(t *testing.T) *weights.Graph {
	keep := []int{36, 37, 40}
	for i := 29; i >= 0; i-- {
		keep = append([]int{i}, keep...)
	}
	g := weights.Lattice(7, 6, weights.Queen).Subset(keep)
	if len(g.Islands()) != 1 {
		t.Fatalf("islands %v", g.Islands())
	}
	return g
}

// The eigenvalue form agrees with gonum's LU log-determinant of the dense
// I − ρW, across the admissible interval, with and without islands, and for
// a graph handed over already row-standardised.
func TestExactLogDetAgainstLU(t *testing.T) {
	for name, g := range map[string]*weights.Graph{
		"rook 6x7":  weights.Lattice(6, 7, weights.Rook),
		"island":    withIsland(t),
		"region 80": regionGraph(t, 80),
		"row-std":   weights.Lattice(4, 9, weights.Queen).RowStandardised(),
	} {
		p := prepare(t, g, Options{})
		if p.Method() != Eigenvalues {
			t.Fatalf("%s: method %v", name, p.Method())
		}
		w := denseW(g)
		lo, hi := p.Interval()
		if !(lo < -1+1e-9 && math.Abs(hi-1) < 1e-9) {
			t.Errorf("%s: interval (%v, %v)", name, lo, hi)
		}
		for _, rho := range []float64{-0.95, -0.4, 0, 0.3, 0.8, 0.99} {
			got, se := p.LogDet(rho)
			want := denseLogDet(w, rho)
			if math.Abs(got-want) > 1e-9*(1+math.Abs(want)) || se != 0 {
				t.Errorf("%s ρ=%v: log-det %v, LU %v", name, rho, got, want)
			}
		}
	}
}

// A rook lattice is bipartite, so λ_min = −1 exactly; the interval's lower
// end is −1.
func TestBipartiteInterval(t *testing.T) {
	p := prepare(t, weights.Lattice(5, 8, weights.Rook), Options{})
	if lo, _ := p.Interval(); math.Abs(lo+1) > 1e-9 {
		t.Errorf("lower end %v, want −1", lo)
	}
}

func TestPrepareRejects(t *testing.T) {
	asym, _ := weights.FromEntries(3, []weights.Link{{From: 0, To: 1, Weight: 1}, {From: 1, To: 2, Weight: 1}, {From: 2, To: 1, Weight: 1}}, "t", "w")
	uneven, _ := weights.FromEntries(3, []weights.Link{{From: 0, To: 1, Weight: 1}, {From: 1, To: 0, Weight: 2},
		{From: 1, To: 2, Weight: 1}, {From: 2, To: 1, Weight: 1}}, "t", "w")
	empty, _ := weights.FromLinks(4, nil, "t")
	for name, g := range map[string]*weights.Graph{"asymmetric": asym, "uneven": uneven, "empty": empty, "nil": nil} {
		if _, err := Prepare(g, Options{}); err == nil {
			t.Errorf("%s: no error", name)
		}
	}
}

// quadratureError compares the quadrature with the exact log-determinant
// on g over ρ in [−0.9, 0.99] and returns the largest error and the largest
// error in units of the reported standard error.
func quadratureError(t *testing.T, g *weights.Graph, opt Options) (worst, worstZ float64) {
	exact := prepare(t, g, Options{ExactLimit: g.Len()})
	opt.ExactLimit = -1
	q := prepare(t, g, opt)
	if q.Method() != Quadrature {
		t.Fatal("not the quadrature")
	}
	for rho := -0.9; rho < 0.995; rho += 0.01 {
		want, _ := exact.LogDet(rho)
		got, se := q.LogDet(rho)
		worst = math.Max(worst, math.Abs(got-want))
		worstZ = math.Max(worstZ, (math.Abs(got-want)-1e-9)/se)
		_, d := q.logDetDerivatives(rho)
		_, e := exact.logDetDerivatives(rho)
		if math.Abs(d-e) > 0.05*math.Abs(e)+1 {
			t.Errorf("ρ=%.2f: curvature %v, exact %v", rho, d, e)
		}
	}
	return worst, worstZ
}

// The quadrature against the exact eigenvalues where both run, on layers
// of 900 and 1,000 areas whose log-determinant at ρ = 0.99 is −200 and
// −174: over ρ in [−0.9, 0.99] the error stays within 4 of its own
// standard errors (a Monte Carlo error, fixed by the seed), and below 2 in
// absolute terms (1% of the value); fits to SAR fields at ρ = 0.5 and 0.9
// land within 0.2 of their standard errors of the exact fit (measured
// 0.02–0.09 with the default 48 probes).
func TestQuadratureAgainstExact(t *testing.T) {
	for name, g := range map[string]*weights.Graph{
		"rook 30x30":  weights.Lattice(30, 30, weights.Rook),
		"region 1000": regionGraph(t, 1000),
	} {
		worst, z := quadratureError(t, g, Options{Seed: 11})
		t.Logf("%s: largest error %.3g, %.2f standard errors", name, worst, z)
		if worst > 2 || z > 4 {
			t.Errorf("%s: largest error %v (%v standard errors)", name, worst, z)
		}
		exact := prepare(t, g, Options{ExactLimit: g.Len()})
		quad := prepare(t, g, Options{ExactLimit: -1, Seed: 11})
		w := denseW(g)
		for _, rho := range []float64{0.5, 0.9} {
			y := sarFields(t, w, rho, 1, 1, 1, 5)[0]
			me, err := exact.Fit(y)
			if err != nil {
				t.Fatal(err)
			}
			mq, err := quad.Fit(y)
			if err != nil {
				t.Fatal(err)
			}
			d := (mq.Rho - me.Rho) / me.RhoSE
			t.Logf("%s ρ=%v: exact %.4f, quadrature %.4f (%.3f standard errors)", name, rho, me.Rho, mq.Rho, d)
			if math.Abs(d) > 0.2 || math.Abs(mq.RhoSE/me.RhoSE-1) > 0.05 {
				t.Errorf("%s ρ=%v: exact %v ± %v, quadrature %v ± %v", name, rho, me.Rho, me.RhoSE, mq.Rho, mq.RhoSE)
			}
		}
	}
}

// The quadrature depends on the seed only, not on the number of workers.
func TestQuadratureIndependentOfWorkers(t *testing.T) {
	g := regionGraph(t, 300)
	one := prepare(t, g, Options{ExactLimit: -1, Seed: 4, Workers: 1})
	two := prepare(t, g, Options{ExactLimit: -1, Seed: 4, Workers: 2})
	other := prepare(t, g, Options{ExactLimit: -1, Seed: 5, Workers: 2})
	a, _ := one.LogDet(0.9)
	b, _ := two.LogDet(0.9)
	c, _ := other.LogDet(0.9)
	if a != b || a == c {
		t.Errorf("seed 4: %v with 1 worker, %v with 2; seed 5: %v", a, b, c)
	}
}
