package sar

import (
	"math"
	"sync"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// model builds a Model with the given parameters on g.
func model(t testing.TB, g *weights.Graph, rho, mu, sigma2 float64) *Model {
	m, err := prepare(t, g, Options{Workers: 2}).Model(rho, mu, sigma2)
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func TestModelRejects(t *testing.T) {
	p := prepare(t, weights.Lattice(4, 4, weights.Rook), Options{})
	for _, c := range [][3]float64{{1, 0, 1}, {-1.5, 0, 1}, {0.5, 0, 0}, {0.5, math.NaN(), 1}, {math.NaN(), 0, 1}} {
		if _, err := p.Model(c[0], c[1], c[2]); err == nil {
			t.Errorf("%v: no error", c)
		}
	}
}

// Solve agrees with testkit's dense LU solve of (I − ρW)y = b, near both
// ends of the interval and on a layer with an island and two components.
func TestSolveAgainstDense(t *testing.T) {
	for name, g := range map[string]*weights.Graph{
		"region 300": regionGraph(t, 300),
		"island":     withIsland(t),
	} {
		w := denseW(g)
		for _, rho := range []float64{-0.9, 0.3, 0.95, 0.995} {
			m := model(t, g, rho, 0, 1)
			b := sarFields(t, w, 0, 2, 1, 1, 9)[0] // plain normals around 2
			want := testkit.NewSAR(w, rho).Field(t, b)
			got := make([]float64, len(b))
			it, err := m.Solve(b, got, m.NewScratch())
			if err != nil {
				t.Fatal(err)
			}
			var worst, scale float64
			for i := range got {
				worst = math.Max(worst, math.Abs(got[i]-want[i]))
				scale = math.Max(scale, math.Abs(want[i]))
			}
			if worst > 1e-8*scale {
				t.Errorf("%s ρ=%v: largest difference %v (scale %v) after %d steps", name, rho, worst, scale, it)
			}
		}
	}
}

// simulated draws count fields of m through ForDraws.
func simulated(t *testing.T, m *Model, count int, seed uint64) [][]float64 {
	out := make([][]float64, count)
	var mu sync.Mutex
	err := m.ForDraws(count, seed, 1, func(k int, y []float64) {
		c := append([]float64(nil), y...)
		mu.Lock()
		out[k] = c
		mu.Unlock()
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// sarCovariance is σ²((I − ρW)ᵀ(I − ρW))⁻¹, densely.
func sarCovariance(t *testing.T, w *mat.Dense, rho, sigma2 float64) *mat.Dense {
	n, _ := w.Dims()
	a := mat.NewDense(n, n, nil)
	a.Scale(-rho, w)
	for i := 0; i < n; i++ {
		a.Set(i, i, a.At(i, i)+1)
	}
	var ata, inv mat.Dense
	ata.Mul(a.T(), a)
	if err := inv.Inverse(&ata); err != nil {
		t.Fatal(err)
	}
	inv.Scale(sigma2, &inv)
	return &inv
}

// Simulated fields on a 4×5 queen lattice: the mean of every area is
// μ/(1 − ρ) (W1 = 1) and the sample covariance is σ²((I − ρW)ᵀ(I −
// ρW))⁻¹ from a dense inverse, each entry within 4.5 of its standard
// error √((Σ_ii Σ_jj + Σ_ij²)/N) over N = 20,000 draws (normal theory).
func TestSimulateMoments(t *testing.T) {
	g := weights.Lattice(4, 5, weights.Queen)
	const rho, mu, sigma2, draws = 0.7, 1.5, 2.0, 20000
	m := model(t, g, rho, mu, sigma2)
	sigma := sarCovariance(t, denseW(g), rho, sigma2)
	ys := simulated(t, m, draws, 21)
	n := g.Len()
	mean := make([]float64, n)
	for _, y := range ys {
		for i, v := range y {
			mean[i] += v / draws
		}
	}
	for i := 0; i < n; i++ {
		if se := math.Sqrt(sigma.At(i, i) / draws); math.Abs(mean[i]-mu/(1-rho)) > 4.5*se {
			t.Errorf("area %d: mean %v, want %v ± %v", i, mean[i], mu/(1-rho), se)
		}
		for j := 0; j <= i; j++ {
			var c float64
			for _, y := range ys {
				c += (y[i] - mean[i]) * (y[j] - mean[j])
			}
			c /= draws - 1
			want := sigma.At(i, j)
			se := math.Sqrt((sigma.At(i, i)*sigma.At(j, j) + want*want) / draws)
			if math.Abs(c-want) > 4.5*se {
				t.Errorf("cov(%d,%d) = %v, want %v ± %v", i, j, c, want, se)
			}
		}
	}
}

// Moran's I of fields from Simulate and of fields from the independent
// dense generator (testkit.NewSAR, math/rand/v2 normals) agree in mean
// and spread on an irregular layer at ρ = 0.8: a two-sample z-test of the
// means below 4, and standard deviations within 10%.
func TestSimulateMoranMatchesDenseGenerator(t *testing.T) {
	g := regionGraph(t, 150)
	w := denseW(g)
	const rho, draws = 0.8, 3000
	m := model(t, g, rho, 0.5, 1)
	ours := make([]float64, draws)
	for k, y := range simulated(t, m, draws, 5) {
		ours[k] = moranRow(w, y)
	}
	theirs := make([]float64, draws)
	for k, y := range sarFields(t, w, rho, 0.5, 1, draws, 6) {
		theirs[k] = moranRow(w, y)
	}
	m1, s1 := meanSD(ours)
	m2, s2 := meanSD(theirs)
	z := (m1 - m2) / math.Sqrt((s1*s1+s2*s2)/draws)
	t.Logf("Moran's I: ours %.4f ± %.4f, dense %.4f ± %.4f (z %.2f)", m1, s1, m2, s2, z)
	if math.Abs(z) > 4 || math.Abs(s1/s2-1) > 0.1 {
		t.Errorf("Moran's I: ours %v ± %v, dense %v ± %v", m1, s1, m2, s2)
	}
}

// Draws depend only on (seed, purpose, draw), not on the workers, and a
// draw allocates nothing.
func TestDrawsReproducibleAndAllocationFree(t *testing.T) {
	g := regionGraph(t, 300)
	m := model(t, g, 0.9, 1, 1)
	a := simulated(t, m, 12, 3)
	m.w.workers = 1
	b := simulated(t, m, 12, 3)
	for k := range a {
		for i := range a[k] {
			if a[k][i] != b[k][i] {
				t.Fatalf("draw %d area %d: %v with 2 workers, %v with 1", k, i, a[k][i], b[k][i])
			}
		}
	}
	s := m.NewScratch()
	y := make([]float64, g.Len())
	rng := shuffle.NewStream(1, 2, 3)
	if n := testing.AllocsPerRun(20, func() {
		if err := m.Simulate(&rng, y, s); err != nil {
			t.Fatal(err)
		}
	}); n != 0 {
		t.Errorf("%v allocations per draw", n)
	}
}

// ForDraws solves four fields at a time, yet field k is what Simulate
// draws from the stream (seed, purpose, k), to rounding; a count that is
// not a multiple of four leaves a partly empty last block.
func TestForDrawsMatchesSimulate(t *testing.T) {
	g := regionGraph(t, 300)
	m := model(t, g, 0.95, 1, 2)
	blocked := simulated(t, m, 7, 8)
	s := m.NewScratch()
	y := make([]float64, g.Len())
	for k, want := range blocked {
		rng := shuffle.NewStream(8, 1, k)
		if err := m.Simulate(&rng, y, s); err != nil {
			t.Fatal(err)
		}
		for i := range y {
			if math.Abs(y[i]-want[i]) > 1e-12*(1+math.Abs(want[i])) {
				t.Fatalf("field %d area %d: Simulate %v, ForDraws %v", k, i, y[i], want[i])
			}
		}
	}
}
