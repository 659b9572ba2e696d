package weights

import (
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// Kernel shapes against their defining formulas: triangular 1−u, bisquare
// (1−u²)², Gaussian exp(−u²/2), each zero beyond u = 1 (definitions; the
// Gaussian's truncation is this package's choice, documented at Gaussian).
func TestKernelFormulas(t *testing.T) {
	cases := []struct {
		kind KernelKind
		u    float64
		want float64
	}{
		{Triangular, 0, 1}, {Triangular, 0.25, 0.75}, {Triangular, 0.5, 0.5}, {Triangular, 1, 0}, {Triangular, 1.5, 0},
		{Bisquare, 0, 1}, {Bisquare, 0.5, 0.5625}, {Bisquare, 0.8, 0.1296}, {Bisquare, 1, 0}, {Bisquare, 2, 0},
		{Gaussian, 0, 1}, {Gaussian, 0.5, math.Exp(-0.125)}, {Gaussian, 1, math.Exp(-0.5)}, {Gaussian, 1.0000001, 0},
	}
	for _, c := range cases {
		if got := c.kind.value(c.u); math.Abs(got-c.want) > 1e-15 {
			t.Errorf("%v K(%v) = %v, want %v", c.kind, c.u, got, c.want)
		}
	}
	// exp(−½) = 0.6065306597126334 (e^−0.5, handbook value).
	if math.Abs(Gaussian.value(1)-0.6065306597126334) > 1e-16 {
		t.Error("Gaussian at the bandwidth")
	}
}

func kernelFormula(kind KernelKind, u float64) float64 {
	switch kind {
	case Bisquare:
		return (1 - u*u) * (1 - u*u)
	case Gaussian:
		return math.Exp(-u * u / 2)
	}
	return 1 - u
}

// Fixed and adaptive kernels against exhaustive search and the formulas. The
// adaptive bandwidth of area i is the distance to its k-th nearest neighbour
// (from the exhaustive ranking); links run to the areas within it, with those
// exactly at it dropped where the kernel is zero there.
func TestKernelAgainstBruteForce(t *testing.T) {
	pts := randomGeo(800, 21)
	D := distMatrix(pts, Geographic)
	for _, c := range []struct {
		bandwidth float64
		k         int
	}{{900, 0}, {3000, 0}, {0, 6}, {0, 15}} {
		h := func(int) float64 { return c.bandwidth }
		if c.k > 0 {
			bw := make([]float64, len(pts))
			for i := range pts {
				bw[i] = bruteRanked(pts, i, c.k, Geographic)[c.k-1].d
			}
			h = func(i int) float64 { return bw[i] }
		}
		rows, dist := bruteWithin(D, h)
		for _, kind := range []KernelKind{Triangular, Bisquare, Gaussian} {
			g, err := Kernel(pts, kind, c.bandwidth, c.k, Geographic)
			if err != nil {
				t.Fatal(err)
			}
			checkGraph(t, g)
			for i := range rows {
				var keep []int32
				var w []float64
				for x, j := range rows[i] {
					if v := kernelFormula(kind, dist[i][x]/h(i)); v > 0 {
						keep = append(keep, j)
						w = append(w, v)
					}
				}
				if c.k > 0 && kind == Gaussian && len(keep) < c.k {
					t.Fatalf("Gaussian adaptive: area %d has %d links, want at least %d", i, len(keep), c.k)
				}
				nb, gw := g.Row(i)
				if len(nb) != len(keep) {
					t.Fatalf("%v %+v area %d: neighbours %v, want %v", kind, c, i, nb, keep)
				}
				for x := range nb {
					if nb[x] != keep[x] || math.Abs(gw[x]-w[x]) > 1e-12 {
						t.Fatalf("%v %+v area %d: %v %v, want %v %v", kind, c, i, nb, gw, keep, w)
					}
				}
			}
		}
	}
}

func TestKernelKinds(t *testing.T) {
	pts := gridPoints(5, orb.Point{0, 0}, 1)
	for _, c := range []struct {
		kind KernelKind
		bw   float64
		k    int
		m    Metric
		want string
	}{
		{Bisquare, 0, 10, Planar, "bisquare kernel (adaptive, 10 neighbours)"},
		{Gaussian, 0, 1, Planar, "Gaussian kernel (adaptive, 1 neighbour)"},
		{Triangular, 2.5, 0, Planar, "triangular kernel (bandwidth 2.5 (layer units))"},
		{Gaussian, 300, 0, Geographic, "Gaussian kernel (bandwidth 300 km)"},
	} {
		g, err := Kernel(pts, c.kind, c.bw, c.k, c.m)
		if err != nil {
			t.Fatal(err)
		}
		if g.Kind != c.want || g.Scaling != "weighted" {
			t.Errorf("kind %q transform %q, want %q", g.Kind, g.Scaling, c.want)
		}
	}
	for _, s := range []string{"triangular", "Bisquare", " GAUSSIAN "} {
		if _, err := ParseKernelKind(s); err != nil {
			t.Error(err)
		}
	}
	if _, err := ParseKernelKind("epanechnikov"); err == nil {
		t.Error("unknown kernel accepted")
	}
}

func TestKernelErrors(t *testing.T) {
	grid := gridPoints(4, orb.Point{0, 0}, 1)
	for _, c := range []struct {
		kind KernelKind
		bw   float64
		k    int
		pts  []orb.Point
		want string
	}{
		{Bisquare, 1, 4, grid, "not both"},
		{Bisquare, 0, 0, grid, "positive distance"},
		{Bisquare, -1, 0, grid, "positive distance"},
		{Bisquare, math.NaN(), 0, grid, "positive distance"},
		{Bisquare, 0, -3, grid, "at least 1"},
		{Triangular, 0, 1, grid, "at least 2 neighbours"},
		{Gaussian, 0, 16, grid, "at most n−1 = 15"},
		// The four rook neighbours of every lattice site sit exactly at the
		// bandwidth (edge and corner sites have fewer than four at distance
		// 1, so use k = 2: every site's two nearest are at distance 1).
		{Bisquare, 0, 2, grid, "gives no area a neighbour"},
		{Triangular, 0.5, 0, grid, "gives no area a neighbour"},
		{Gaussian, 0, 2, []orb.Point{{0, 0}, {0, 0}, {0, 0}, {5, 5}}, "adaptive bandwidth is zero"},
	} {
		_, err := Kernel(c.pts, c.kind, c.bw, c.k, Planar)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v bandwidth %v k %d: error %v, want %q", c.kind, c.bw, c.k, err, c.want)
		}
	}
}
