package sar

import (
	"math"
	"math/rand/v2"
	"sync"
	"testing"

	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/samples/region"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

var regionOnce sync.Map

// regionGraph is the binary queen graph of the demo generator's region at
// n areas (invented data; a layer of irregular areas of any size).
func regionGraph(tb testing.TB, n int) *weights.Graph {
	if g, ok := regionOnce.Load(n); ok {
		return g.(*weights.Graph)
	}
	cfg := region.DefaultConfig()
	cfg.Areas = n
	r, err := region.Build(cfg)
	if err != nil {
		tb.Fatal(err)
	}
	g, err := weights.ContiguityGraph(r.Geoms, weights.Queen)
	if err != nil {
		tb.Fatal(err)
	}
	regionOnce.Store(n, g)
	return g
}

func prepare(tb testing.TB, g *weights.Graph, opt Options) *Weights {
	tb.Helper()
	p, err := Prepare(g, opt)
	if err != nil {
		tb.Fatal(err)
	}
	return p
}

// denseW is the row-standardised W of g as a dense matrix.
func denseW(g *weights.Graph) *mat.Dense {
	rs := g.RowStandardised()
	return testkit.Dense(rs.Offsets, rs.Neighbours, rs.Weights)
}

// denseLogDet is ln|I − ρW| by gonum's LU factorisation.
func denseLogDet(w *mat.Dense, rho float64) float64 {
	n, _ := w.Dims()
	a := mat.NewDense(n, n, nil)
	a.Scale(-rho, w)
	for i := 0; i < n; i++ {
		a.Set(i, i, a.At(i, i)+1)
	}
	var lu mat.LU
	lu.Factorize(a)
	ld, sign := lu.LogDet()
	if sign < 0 {
		return math.NaN()
	}
	return ld
}

// sarFields draws count fields (I − ρW)⁻¹(μ + σε) with the dense generator
// of testkit and normals from math/rand/v2: a route independent of this
// package.
func sarFields(tb testing.TB, w *mat.Dense, rho, mu, sigma2 float64, count int, seed uint64) [][]float64 {
	n, _ := w.Dims()
	gen := testkit.NewSAR(w, rho)
	rng := rand.New(rand.NewPCG(seed, 7))
	out := make([][]float64, count)
	eps := make([]float64, n)
	for k := range out {
		for i := range eps {
			eps[i] = mu + math.Sqrt(sigma2)*rng.NormFloat64()
		}
		out[k] = gen.Field(tb, eps)
	}
	return out
}

// moranRow is Moran's I of y under the row-standardised W (n/S0 = 1).
func moranRow(w *mat.Dense, y []float64) float64 {
	n := len(y)
	var m float64
	for _, v := range y {
		m += v
	}
	m /= float64(n)
	z := make([]float64, n)
	for i, v := range y {
		z[i] = v - m
	}
	var num, den float64
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			num += z[i] * w.At(i, j) * z[j]
		}
		den += z[i] * z[i]
	}
	return num / den
}

func meanSD(x []float64) (mean, sd float64) {
	m, v := testkit.MeanVar(x)
	return m, math.Sqrt(v)
}
