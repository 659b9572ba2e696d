package local

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// iidLayer draws independent standard normal values: no spatial structure.
func iidLayer(n int, layer uint64) []float64 {
	r := rand.New(rand.NewPCG(0x5eed, layer))
	x := make([]float64, n)
	for i := range x {
		x[i] = r.NormFloat64()
	}
	return x
}

// Under an i.i.d. null (no spatial structure; 200 layers of independent
// normal values on a 15×15 rook lattice, fixed seeds), the conditional
// permutation test is exact: with B = 199 the two-sided p-value is at most
// 0.05 for exactly 10 of the 200 ranks the observed value can take, so 5%
// of areas are flagged without adjustment; the folded p-value (the observed
// tail, not doubled) flags 20 of 200 ranks, 10% — it is the pseudo p-value
// of a one-sided test in the direction the data chose, and must be read
// against alpha/2 for a two-sided 5% level (Anselin 1995's conditional
// approach; counting, common knowledge). Areas of one layer share values
// and neighbours, so their flags are correlated: the interval treats the
// layer as the independent unit, from the spread of the 200 per-layer
// fractions (mean ± 3.29 standard errors, 99.9% normal), not as 45,000
// Bernoulli trials.
func TestLocalNullFalseFlags(t *testing.T) {
	const m, layers = 15, 200
	g := weights.Lattice(m, m, weights.Rook)
	for _, c := range []struct {
		alt  shuffle.Alternative
		want float64
	}{{shuffle.TwoSided, 0.05}, {shuffle.Folded, 0.10}} {
		frac := make([]float64, layers)
		for l := range frac {
			x := iidLayer(m*m, uint64(l))
			res, err := Run(Moran, x, nil, g, Options{Permutations: 199, Seed: uint64(l) + 1, Alternative: c.alt})
			if err != nil {
				t.Fatal(err)
			}
			for _, r := range res {
				if r.P <= 0.05 {
					frac[l]++
				}
			}
			frac[l] /= float64(len(res))
		}
		var mean, v float64
		for _, f := range frac {
			mean += f
		}
		mean /= layers
		for _, f := range frac {
			v += (f - mean) * (f - mean)
		}
		se := math.Sqrt(v / (layers - 1) / layers)
		naive := math.Sqrt(c.want * (1 - c.want) / (layers * m * m))
		t.Logf("%s: %.4f of areas flagged at 5%%, want %.2f; layer-level se %.4f (as if independent areas: %.4f)",
			c.alt.String(), mean, c.want, se, naive)
		if math.Abs(mean-c.want) > 3.29*se {
			t.Errorf("%s: %.4f of areas flagged, want %.2f ± %.4f", c.alt.String(), mean, c.want, 3.29*se)
		}
	}
}

// Under the same i.i.d. null, with Benjamini–Hochberg over each layer's
// areas (Benjamini & Hochberg 1995: under the complete null the false
// discovery rate is the chance of any flag, and is at most alpha for
// independent or positively dependent p-values), the fraction of layers
// with any area flagged at 5% is at most 5% plus its binomial allowance:
// at most the 99.9% quantile of Binomial(200, 0.05) layers, the layers
// being independent. Layers of 10×10 areas with B = 4,999 two-sided
// draws, so that the smallest possible p-value, 2/5,000, is below BH's
// first threshold 0.05/100 and a flag can happen at all.
func TestLocalNullBenjaminiHochberg(t *testing.T) {
	const m, layers = 10, 200
	g := weights.Lattice(m, m, weights.Rook)
	limit := binomialQuantile(layers, 0.05, 0.999)
	any := 0
	for l := 0; l < layers; l++ {
		x := iidLayer(m*m, 1000+uint64(l))
		res, err := Run(Moran, x, nil, g, Options{Permutations: 4999, Seed: 7 + uint64(l),
			Alternative: shuffle.TwoSided, Adjustment: shuffle.BenjaminiHochberg})
		if err != nil {
			t.Fatal(err)
		}
		for _, r := range res {
			if r.AdjustedP <= 0.05 {
				any++
				break
			}
		}
	}
	t.Logf("%d of %d layers with a flag after Benjamini–Hochberg (at most %d allowed)", any, layers, limit)
	if any > limit {
		t.Errorf("%d of %d null layers have a flag, more than %d", any, layers, limit)
	}
}
