package autocorr

import (
	"errors"
	"fmt"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// MoranGearyMany prepares several variables measured on the same areas for
// one shared shuffle of the areas: each draw moves whole areas, and every
// variable's Moran's I and Geary's C are computed on that same arrangement.
// Statistic 2c is Moran's I of xs[c], statistic 2c+1 its Geary's C (one-sided
// in the direction of clustering when alt is not two-sided: I greater, C
// less). Shuffling once for all variables is what makes screening a layer of
// many columns cheap; each variable's p-value is still an ordinary
// permutation p-value.
//
// Geary's numerator comes out of Moran's cross product:
//
//	Σ_ij w_ij (z_i − z_j)² = Σ_i z_i² (w_i· + w_·i) − 2 Σ_ij w_ij z_i z_j,
//
// so the second statistic costs one pass over the areas.
func MoranGearyMany(xs [][]float64, g *weights.Graph, alt shuffle.Alternative) (labels []int32, stats []shuffle.Statistic, f shuffle.ManyFactory, err error) {
	n := g.Len()
	if len(xs) == 0 {
		return nil, nil, nil, errors.New("no variables")
	}
	zs := make([][]float64, len(xs))
	ss := make([]float64, len(xs))
	for c, x := range xs {
		if err := checkColumn(x, g); err != nil {
			return nil, nil, nil, fmt.Errorf("variable %d: %w", c, err)
		}
		if zs[c], ss[c], err = centre(x); err != nil {
			return nil, nil, nil, fmt.Errorf("variable %d: %w", c, err)
		}
	}
	s0 := sumWeights(g)
	if s0 == 0 {
		return nil, nil, nil, errNoLinks
	}
	rc := make([]float64, n) // w_i· + w_·i
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			rc[i] += w[k]
			rc[j] += w[k]
		}
	}
	pi, pj, pw := symmetricPairs(g)
	labels = make([]int32, n)
	for i := range labels {
		labels[i] = int32(i)
	}
	moranAlt, gearyAlt := alt, alt
	if alt == shuffle.Greater {
		gearyAlt = shuffle.Less
	} else if alt == shuffle.Less {
		gearyAlt = shuffle.Greater
	}
	for range xs {
		stats = append(stats, shuffle.Statistic{Alternative: moranAlt, Scale: 1}, shuffle.Statistic{Alternative: gearyAlt, Scale: 1})
	}
	nf := float64(n)
	f = func() shuffle.ManyEvaluator {
		zp := make([]float64, n)
		return func(lab []int32, out []float64) {
			for c, z := range zs {
				var a float64
				for i, l := range lab {
					v := z[l]
					zp[i] = v
					a += v * v * rc[i]
				}
				var x float64
				for k, w := range pw {
					x += w * zp[pi[k]] * zp[pj[k]]
				}
				out[2*c] = nf / s0 * x / ss[c]
				out[2*c+1] = (nf - 1) * (a - 2*x) / (2 * s0 * ss[c])
			}
		}
	}
	return labels, stats, f, nil
}
