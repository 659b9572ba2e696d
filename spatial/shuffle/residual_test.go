package shuffle_test

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
)

// flData draws n areas with two normal covariates, k groups of nearly equal
// size in random order, and y = 1 + 0.8·z1 − 0.5·z2 + effect·[group 0] + ε,
// ε standard normal: no spatial structure, normal errors.
func flData(n, k int, effect float64, seed uint64) (y []float64, cov [][]float64, lab []int32) {
	rng := rand.New(rand.NewPCG(seed, 77))
	z1, z2 := make([]float64, n), make([]float64, n)
	y = make([]float64, n)
	lab = make([]int32, n)
	for i := range lab {
		lab[i] = int32(i % k)
	}
	rng.Shuffle(n, func(a, b int) { lab[a], lab[b] = lab[b], lab[a] })
	for i := range y {
		z1[i] = rng.NormFloat64()
		z2[i] = rng.NormFloat64() + 0.5*z1[i]
		y[i] = 1 + 0.8*z1[i] - 0.5*z2[i] + rng.NormFloat64()
		if lab[i] == 0 {
			y[i] += effect
		}
		// Let the covariates differ between groups too, so that adjusting
		// for them matters.
		z1[i] += 0.4 * float64(lab[i])
	}
	return y, [][]float64{z1, z2}, lab
}

// lstsqRSS fits y on the columns of x (n×m) by least squares with gonum's
// QR solver and returns the residual sum of squares: an independent route
// to the regression the Freedman–Lane evaluator shortcuts.
func lstsqRSS(t *testing.T, x *mat.Dense, y []float64) float64 {
	t.Helper()
	var qr mat.QR
	qr.Factorize(x)
	var b mat.VecDense
	if err := qr.SolveVecTo(&b, false, mat.NewVecDense(len(y), y)); err != nil {
		t.Fatal(err)
	}
	var fit mat.VecDense
	fit.MulVec(x, &b)
	var rss float64
	for i, v := range y {
		d := v - fit.AtVec(i)
		rss += d * d
	}
	return rss
}

// design builds [1, covariates, indicators of groups 0..k−2], and the
// reduced [1, covariates].
func design(cov [][]float64, lab []int32, k int) (full, reduced *mat.Dense) {
	n := len(lab)
	p := 1 + len(cov)
	full = mat.NewDense(n, p+k-1, nil)
	reduced = mat.NewDense(n, p, nil)
	for i := 0; i < n; i++ {
		full.Set(i, 0, 1)
		reduced.Set(i, 0, 1)
		for c, col := range cov {
			full.Set(i, 1+c, col[i])
			reduced.Set(i, 1+c, col[i])
		}
		if g := int(lab[i]); g < k-1 {
			full.Set(i, p+g, 1)
		}
	}
	return full, reduced
}

// bruteF computes the Freedman–Lane statistic for one permutation the long
// way: fit the reduced model to y, form y* = ŷ + ê[perm], fit both models to
// y* and take the partial F from their residual sums of squares.
func bruteF(t *testing.T, y []float64, cov [][]float64, lab []int32, k int, perm []int32) float64 {
	t.Helper()
	full, reduced := design(cov, lab, k)
	n := len(y)
	var qr mat.QR
	qr.Factorize(reduced)
	var g mat.VecDense
	if err := qr.SolveVecTo(&g, false, mat.NewVecDense(n, y)); err != nil {
		t.Fatal(err)
	}
	var fit mat.VecDense
	fit.MulVec(reduced, &g)
	ystar := make([]float64, n)
	for i, u := range perm {
		ystar[i] = fit.AtVec(i) + (y[u] - fit.AtVec(int(u)))
	}
	rssR := lstsqRSS(t, reduced, ystar)
	rssF := lstsqRSS(t, full, ystar)
	_, p := reduced.Dims()
	df := n - p - (k - 1)
	return ((rssR - rssF) / float64(k-1)) / (rssF / float64(df))
}

// Per permutation, the evaluator's partial F equals the one from refitting
// both models to the permuted outcome; the identity permutation gives the
// classical partial F of the data.
func TestFreedmanLaneStatisticMatchesRefit(t *testing.T) {
	for _, k := range []int{2, 3, 5} {
		y, cov, lab := flData(30, k, 0.5, uint64(k))
		fl, err := shuffle.NewFreedmanLane(y, cov, lab, k)
		if err != nil {
			t.Fatal(err)
		}
		eval := fl.Factory()()
		perm := fl.Labels()
		rng := rand.New(rand.NewPCG(1, uint64(k)))
		for draw := 0; draw < 20; draw++ {
			got := eval(perm)
			want := bruteF(t, y, cov, lab, k, perm)
			if math.Abs(got-want) > 1e-9*math.Max(1, want) {
				t.Fatalf("k=%d draw %d: F = %.15g, refit gives %.15g", k, draw, got, want)
			}
			ystar := make([]float64, len(y))
			fl.Outcome(perm, ystar)
			if draw == 0 {
				for i := range y {
					if math.Abs(ystar[i]-y[i]) > 1e-12 {
						t.Fatalf("identity permutation: y*[%d] = %v, y = %v", i, ystar[i], y[i])
					}
				}
			}
			rng.Shuffle(len(perm), func(a, b int) { perm[a], perm[b] = perm[b], perm[a] })
		}
		if k == 2 {
			tf, err := fl.TFactory()
			if err != nil {
				t.Fatal(err)
			}
			tv := tf()(fl.Labels())
			F, _ := fl.PartialF()
			if math.Abs(tv*tv-F) > 1e-9*F {
				t.Fatalf("t² = %v, F = %v", tv*tv, F)
			}
			// The effect of group 0 is positive in the data, and strong
			// enough to show in the sign of t.
			if tv <= 0 {
				t.Fatalf("t = %v, want the sign of group 0's positive effect", tv)
			}
		}
	}
}

// On data without spatial structure and with normal errors the classical
// partial F-test is exact, and the Freedman–Lane permutation p-value should
// agree with it up to Monte Carlo error and the method's small-sample
// approximation: |Δp| < 0.02 with 9,999 permutations, for two and three
// groups on six seeds each, and the same for the t of two groups.
func TestFreedmanLaneMatchesClassicalF(t *testing.T) {
	for _, c := range []struct {
		k      int
		effect float64
	}{{2, 0.3}, {3, 0.4}} {
		for seed := uint64(1); seed <= 6; seed++ {
			y, cov, lab := flData(40, c.k, c.effect, 100*seed+uint64(c.k))
			fl, err := shuffle.NewFreedmanLane(y, cov, lab, c.k)
			if err != nil {
				t.Fatal(err)
			}
			F, pF := fl.PartialF()
			res, err := shuffle.Run(shuffle.Plan{Scheme: "free", Labels: fl.Labels(), Permutations: 9999,
				Seed: seed, Alternative: shuffle.Greater, Scale: 1}, fl.Factory())
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("k=%d seed %d: F = %.3f, classical p = %.4f, Freedman–Lane p = %.4f", c.k, seed, F, pF, res.PValue)
			if math.Abs(res.Observed-F) > 1e-12*F || math.Abs(res.PValue-pF) > 0.02 {
				t.Errorf("k=%d seed %d: permutation p %.4f vs classical %.4f", c.k, seed, res.PValue, pF)
			}
			if c.k != 2 {
				continue
			}
			tf, _ := fl.TFactory()
			for _, alt := range []shuffle.Alternative{shuffle.TwoSided, shuffle.Greater} {
				_, pT, _ := fl.ClassicalT(alt)
				rt, err := shuffle.Run(shuffle.Plan{Labels: fl.Labels(), Permutations: 9999, Seed: seed,
					Purpose: 2, Alternative: alt, Scale: 1}, tf)
				if err != nil {
					t.Fatal(err)
				}
				if math.Abs(rt.PValue-pT) > 0.02 {
					t.Errorf("k=2 seed %d %v: permutation p of t %.4f vs classical %.4f", seed, alt, rt.PValue, pT)
				}
			}
		}
	}
}

// Without covariates the reduced model is the mean, y* = ȳ + Π(y − ȳ) = Πy,
// and the statistic is the one-way F of the permuted outcome: the ordinary
// permutation test of F. Checked value by value against the group
// statistics, and by exact enumeration: 8! = 40,320 orderings of the areas
// against the C(8,3)·C(5,3) = 560 distinct splits the group machinery
// enumerates give the same p-value.
func TestFreedmanLaneWithoutCovariatesIsPermutationF(t *testing.T) {
	y := []float64{3.1, 4.7, 2.2, 5.9, 4.4, 1.8, 6.3, 3.9}
	lab := []int32{0, 1, 0, 2, 1, 0, 2, 1}
	fl, err := shuffle.NewFreedmanLane(y, nil, lab, 3)
	if err != nil {
		t.Fatal(err)
	}
	eval := fl.Factory()()
	perm := fl.Labels()
	rng := rand.New(rand.NewPCG(5, 5))
	for draw := 0; draw < 50; draw++ {
		py := make([]float64, len(y))
		for i, u := range perm {
			py[i] = y[u]
		}
		d, err := groups.Prepare(py, lab, 3)
		if err != nil {
			t.Fatal(err)
		}
		if got, want := eval(perm), d.Observed(groups.OneWayF); math.Abs(got-want) > 1e-10*math.Max(1, want) {
			t.Fatalf("draw %d: F = %v, one-way F of the permuted outcome %v", draw, got, want)
		}
		rng.Shuffle(len(perm), func(a, b int) { perm[a], perm[b] = perm[b], perm[a] })
	}
	exact, err := shuffle.Run(shuffle.Plan{Labels: fl.Labels(), Permutations: 1, Alternative: shuffle.Greater, Scale: 1}, fl.Factory())
	if err != nil {
		t.Fatal(err)
	}
	d, _ := groups.Prepare(y, lab, 3)
	ref, err := shuffle.Run(shuffle.Plan{Labels: d.Labels, Permutations: 1, Alternative: shuffle.Greater, Scale: 1}, d.Factory(groups.OneWayF))
	if err != nil {
		t.Fatal(err)
	}
	if !exact.Exact || exact.Permutations != 40320 || !ref.Exact || ref.Permutations != 560 {
		t.Fatalf("exact %v/%d, reference exact %v/%d", exact.Exact, exact.Permutations, ref.Exact, ref.Permutations)
	}
	if math.Abs(exact.PValue-ref.PValue) > 1e-12 {
		t.Fatalf("Freedman–Lane exact p %v, permutation F exact p %v", exact.PValue, ref.PValue)
	}
}

// By hand: eight areas, the four of group 0 holding the four highest values.
// Without covariates the t of group 0's coefficient is Student's pooled t,
// which grows with the difference in means, so only the orderings that give
// group 0 the top four values reach it: 4!·4! of the 8! orderings, p = 1/70
// one-sided (the tea-tasting count, Fisher 1935). The F, which also counts
// the mirror split (group 0 holding the four lowest), gives 2/70.
func TestFreedmanLaneExactByHand(t *testing.T) {
	y := []float64{8, 7, 6, 5, 4, 3, 2, 1}
	lab := []int32{0, 0, 0, 0, 1, 1, 1, 1}
	fl, err := shuffle.NewFreedmanLane(y, nil, lab, 2)
	if err != nil {
		t.Fatal(err)
	}
	tf, _ := fl.TFactory()
	rt, err := shuffle.Run(shuffle.Plan{Labels: fl.Labels(), Permutations: 1, Alternative: shuffle.Greater, Scale: 1}, tf)
	if err != nil {
		t.Fatal(err)
	}
	if !rt.Exact || rt.Permutations != 40320 || rt.AtLeast != 576 || math.Abs(rt.PValue-1.0/70) > 1e-15 {
		t.Fatalf("t: exact %v over %d, %d at least as large, p = %v; want 576 of 40320, p = 1/70", rt.Exact, rt.Permutations, rt.AtLeast, rt.PValue)
	}
	// Pooled t by hand: means 6.5 and 2.5, each group's sum of squares 5,
	// s² = 10/6, t = 4/√(s²·(1/4 + 1/4)) = 4/√(5/6).
	if want := 4 / math.Sqrt(5.0/6); math.Abs(rt.Observed-want) > 1e-12 {
		t.Fatalf("t = %v, want %v", rt.Observed, want)
	}
	rf, err := shuffle.Run(shuffle.Plan{Labels: fl.Labels(), Permutations: 1, Alternative: shuffle.Greater, Scale: 1}, fl.Factory())
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(rf.PValue-2.0/70) > 1e-15 {
		t.Fatalf("F: p = %v, want 2/70", rf.PValue)
	}
}

// With a covariate, exact enumeration through Run (7! = 5,040 orderings)
// against a brute-force loop that refits both models to every permuted
// outcome; and within strata Run enumerates only the orderings inside them.
func TestFreedmanLaneExactWithCovariate(t *testing.T) {
	y := []float64{2.3, 4.1, 3.3, 6.0, 5.2, 3.9, 7.4}
	z := []float64{1, 2, 3, 4, 5, 6, 7}
	lab := []int32{1, 0, 1, 0, 1, 0, 0}
	cov := [][]float64{z}
	fl, err := shuffle.NewFreedmanLane(y, cov, lab, 2)
	if err != nil {
		t.Fatal(err)
	}
	res, err := shuffle.Run(shuffle.Plan{Labels: fl.Labels(), Permutations: 1, Alternative: shuffle.Greater, Scale: 1, KeepNull: true}, fl.Factory())
	if err != nil {
		t.Fatal(err)
	}
	if !res.Exact || res.Permutations != 5040 {
		t.Fatalf("exact %v over %d", res.Exact, res.Permutations)
	}
	// Brute force over the same orderings, in Run's order.
	obs := bruteF(t, y, cov, lab, 2, fl.Labels())
	perm := fl.Labels()
	var atLeast int
	idx := 0
	for {
		v := bruteF(t, y, cov, lab, 2, perm)
		if math.Abs(v-res.Null[idx]) > 1e-9*math.Max(1, v) {
			t.Fatalf("ordering %d: %v, brute force %v", idx, res.Null[idx], v)
		}
		if v >= obs-1e-9*math.Max(1, obs) {
			atLeast++
		}
		idx++
		if !nextPerm(perm) {
			break
		}
	}
	if idx != 5040 || res.AtLeast != atLeast {
		t.Fatalf("brute force: %d orderings, %d at least the observed; Run counted %d", idx, atLeast, res.AtLeast)
	}
	t.Logf("F = %.4f, exact p = %d/5040 = %.4f", res.Observed, atLeast, res.PValue)

	strata := []int32{0, 0, 0, 1, 1, 1, 1}
	within, err := shuffle.Run(shuffle.Plan{Labels: fl.Labels(), Strata: strata, Permutations: 1, Alternative: shuffle.Greater, Scale: 1}, fl.Factory())
	if err != nil {
		t.Fatal(err)
	}
	if !within.Exact || within.Permutations != 6*24 {
		t.Fatalf("within strata: exact %v over %d, want 3!·4! = 144", within.Exact, within.Permutations)
	}
}

// nextPerm steps s to its next lexicographic permutation, false after the
// last.
func nextPerm(s []int32) bool {
	i := len(s) - 2
	for i >= 0 && s[i] >= s[i+1] {
		i--
	}
	if i < 0 {
		return false
	}
	j := len(s) - 1
	for s[j] <= s[i] {
		j--
	}
	s[i], s[j] = s[j], s[i]
	for a, b := i+1, len(s)-1; a < b; a, b = a+1, b-1 {
		s[a], s[b] = s[b], s[a]
	}
	return true
}

// A draw allocates nothing.
func TestFreedmanLaneDrawAllocatesNothing(t *testing.T) {
	for _, nc := range []int{0, 1, 2, 4} {
		y, cov, lab := flData(50, 3, 0.3, 9)
		fl, err := shuffle.NewFreedmanLane(y, cov[:min(nc, 2)], lab, 3)
		if nc == 4 {
			extra := [][]float64{cov[0], cov[1], make([]float64, 50), make([]float64, 50)}
			for i := 0; i < 50; i++ {
				extra[2][i] = float64(i % 7)
				extra[3][i] = math.Sin(float64(i))
			}
			fl, err = shuffle.NewFreedmanLane(y, extra, lab, 3)
		}
		if err != nil {
			t.Fatal(err)
		}
		eval := fl.Factory()()
		perm := fl.Labels()
		if a := testing.AllocsPerRun(100, func() { eval(perm) }); a != 0 {
			t.Fatalf("%d covariates: %v allocations per draw", nc, a)
		}
	}
}

func TestFreedmanLaneErrors(t *testing.T) {
	y := []float64{1, 2, 3, 4, 5, 6}
	lab := []int32{0, 0, 0, 1, 1, 1}
	z := []float64{1, 3, 2, 5, 4, 6}
	cases := []struct {
		name string
		y    []float64
		cov  [][]float64
		lab  []int32
		k    int
	}{
		{"labels length", y, nil, lab[:5], 2},
		{"one group", y, nil, lab, 1},
		{"label out of range", y, nil, []int32{0, 0, 0, 1, 1, 2}, 2},
		{"empty group", y, nil, lab, 3},
		{"NaN outcome", []float64{1, 2, math.NaN(), 4, 5, 6}, nil, lab, 2},
		{"covariate length", y, [][]float64{z[:4]}, lab, 2},
		{"infinite covariate", y, [][]float64{{1, 2, math.Inf(1), 4, 5, 6}}, lab, 2},
		{"constant covariate", y, [][]float64{{2, 2, 2, 2, 2, 2}}, lab, 2},
		{"collinear covariates", y, [][]float64{z, {2, 6, 4, 10, 8, 12}}, lab, 2},
		{"grouping is a covariate", y, [][]float64{{1, 1, 1, 0, 0, 0}}, lab, 2},
		{"no residual degrees of freedom", y, [][]float64{z, {1, 0, 0, 1, 0, 1}, {0, 1, 1, 0, 0, 1}, {3, 1, 4, 1, 5, 9}}, lab, 2},
	}
	for _, c := range cases {
		if _, err := shuffle.NewFreedmanLane(c.y, c.cov, c.lab, c.k); err == nil {
			t.Errorf("%s: no error", c.name)
		} else {
			t.Logf("%s: %v", c.name, err)
		}
	}
	fl, err := shuffle.NewFreedmanLane(y, nil, []int32{0, 1, 2, 0, 1, 2}, 3)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := fl.TFactory(); err == nil {
		t.Error("t of a coefficient for three groups: no error")
	}
}

// Refit of a clone to another outcome gives the test that NewFreedmanLane
// of that outcome gives, and OnOutcomes' statistic of an outcome equals
// the partial F (or t) of both models fitted to it with gonum's QR — the
// route the spectral surrogates of the residuals take.
func TestFreedmanLaneRefitAndOnOutcomes(t *testing.T) {
	for _, k := range []int{2, 3} {
		y, cov, lab := flData(40, k, 0.3, uint64(10+k))
		fl, err := shuffle.NewFreedmanLane(y, cov, lab, k)
		if err != nil {
			t.Fatal(err)
		}
		other, _, _ := flData(40, k, 1.0, uint64(20+k))
		fresh, err := shuffle.NewFreedmanLane(other, cov, lab, k)
		if err != nil {
			t.Fatal(err)
		}
		clone := fl.Clone()
		clone.Refit(other)
		want, _ := fresh.PartialF()
		got, _ := clone.PartialF()
		if math.Abs(got-want) > 1e-9*want {
			t.Errorf("k=%d: refitted F %v, fresh %v", k, got, want)
		}
		if orig, _ := fl.PartialF(); math.Abs(orig-want) < 1e-6 {
			t.Errorf("k=%d: the original test changed with its clone", k)
		}
		full, reduced := design(cov, lab, k)
		rssR, rssF := lstsqRSS(t, reduced, other), lstsqRSS(t, full, other)
		df := len(other) - 1 - len(cov) - (k - 1)
		brute := ((rssR - rssF) / float64(k-1)) / (rssF / float64(df))
		if v := fl.OnOutcomes(false)()(other); math.Abs(v-brute) > 1e-9*brute {
			t.Errorf("k=%d: OnOutcomes F %v, refit by QR %v", k, v, brute)
		}
		if k == 2 {
			tv := fl.OnOutcomes(true)()(other)
			tf, _ := fresh.TFactory()
			if w := tf()(fresh.Labels()); math.Abs(tv-w) > 1e-9*math.Abs(w) {
				t.Errorf("OnOutcomes t %v, fresh test's t %v", tv, w)
			}
		}
		res := fl.Residuals()
		if v, w := fl.OnOutcomes(false)()(res), fl.OnOutcomes(false)()(y); math.Abs(v-w) > 1e-9*w {
			t.Errorf("k=%d: the statistic of the residuals %v differs from the outcome's %v", k, v, w)
		}
	}
}
