package autocorr

import (
	"errors"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// GearysC returns Geary's contiguity ratio of x on g (Geary 1954, The
// Incorporated Statistician 5:115–145; Cliff & Ord 1981, ch. 1):
//
//	C = (n − 1) Σ_i Σ_j w_ij (x_i − x_j)² / (2 S0 Σ_i z_i²),  z = x − mean(x)
//
// C is near 1 without spatial pattern, below 1 when neighbours are alike
// and above 1 when they differ. Only w_ij + w_ji enters, so a graph and its
// symmetric part give the same C. A constant x is ErrConstant.
func GearysC(x []float64, g *weights.Graph) (float64, error) {
	if err := checkColumn(x, g); err != nil {
		return 0, err
	}
	z, ss, err := centre(x)
	if err != nil {
		return 0, err
	}
	s0 := sumWeights(g)
	if s0 == 0 {
		return 0, errNoLinks
	}
	var num float64
	for i := 0; i < g.Len(); i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			d := z[i] - z[j]
			num += w[k] * d * d
		}
	}
	return float64(len(x)-1) * num / (2 * s0 * ss), nil
}

// GearyMoments returns E[C] = 1 and the variance of Geary's C under
// normality and under randomisation (Cliff & Ord 1981, ch. 1, eqs. 1.39
// and 1.40 as recalled; the formulas hold for any weights, the sample
// kurtosis b2 entering as for Moran's I, and the tests check the
// randomisation variance by exact enumeration and the normality one by
// simulation):
//
//	Var_N = [(2 S1 + S2)(n − 1) − 4 S0²] / [2 (n + 1) S0²]
//	Var_R = {(n−1) S1 [n² − 3n + 3 − (n−1) b2]
//	         − ¼ (n−1) S2 [n² + 3n − 6 − (n² − n + 2) b2]
//	         + S0² [n² − 3 − (n−1)² b2]} / [n (n−2)(n−3) S0²]
//
// with b2 = n Σ z⁴ / (Σ z²)². It needs at least four areas.
func GearyMoments(x []float64, g *weights.Graph) (Moments, error) {
	if err := checkColumn(x, g); err != nil {
		return Moments{}, err
	}
	if len(x) < 4 {
		return Moments{}, errors.New("the moments of Geary's C need at least four areas")
	}
	z, ss, err := centre(x)
	if err != nil {
		return Moments{}, err
	}
	s0, s1, s2 := weightSums(g)
	if s0 == 0 {
		return Moments{}, errNoLinks
	}
	n := float64(len(x))
	var q float64
	for _, v := range z {
		q += v * v * v * v
	}
	b2 := n * q / (ss * ss)
	varN := ((2*s1+s2)*(n-1) - 4*s0*s0) / (2 * (n + 1) * s0 * s0)
	varR := ((n-1)*s1*(n*n-3*n+3-(n-1)*b2) -
		0.25*(n-1)*s2*(n*n+3*n-6-(n*n-n+2)*b2) +
		s0*s0*(n*n-3-(n-1)*(n-1)*b2)) /
		(n * (n - 2) * (n - 3) * s0 * s0)
	return Moments{Expected: 1, VarianceNormality: varN, VarianceRandomisation: varR}, nil
}

// GearyPermutation prepares x for the shuffle machinery like Permutation
// does for Moran's I: labels are codes of distinct values and the evaluator
// returns Geary's C of the arrangement without allocating. Small C means
// positive autocorrelation, so the one-sided test for clustering is
// shuffle.Less.
func GearyPermutation(x []float64, g *weights.Graph) (labels []int32, f shuffle.Factory, err error) {
	if err := checkColumn(x, g); err != nil {
		return nil, nil, err
	}
	z, ss, err := centre(x)
	if err != nil {
		return nil, nil, err
	}
	s0 := sumWeights(g)
	if s0 == 0 {
		return nil, nil, errNoLinks
	}
	labels, values := valueCodes(z)
	// Σ_ij w_ij (z_i − z_j)² = Σ_{i<j} (w_ij + w_ji)(z_i − z_j)²: each pair
	// once, as for Moran's I.
	pi, pj, pw := symmetricPairs(g)
	scale := float64(len(z)-1) / (2 * s0 * ss)
	n := len(z)
	f = func() shuffle.Evaluator {
		zp := make([]float64, n)
		return func(lab []int32) float64 {
			for i, l := range lab {
				zp[i] = values[l]
			}
			var total float64
			for k, w := range pw {
				d := zp[pi[k]] - zp[pj[k]]
				total += w * d * d
			}
			return scale * total
		}
	}
	return labels, f, nil
}

// GearyTest is Geary's C of one variable with its moments and permutation
// test.
type GearyTest struct {
	GearysC float64 `json:"gearys_c"`
	Moments
	// ZNormality and ZRandomisation are (C − 1)/sd under each null; a
	// negative z means neighbours are more alike than chance.
	ZNormality     float64        `json:"z_normality"`
	ZRandomisation float64        `json:"z_randomisation"`
	Permutation    shuffle.Result `json:"permutation"`
}

// RunGeary computes Geary's C of x on g with its moments (from four areas
// up) and a permutation test planned by plan, whose Labels are filled in
// here. With plan.Alternative = shuffle.Less the test is for positive
// autocorrelation.
func RunGeary(x []float64, g *weights.Graph, plan shuffle.Plan) (GearyTest, error) {
	var t GearyTest
	var err error
	if t.GearysC, err = GearysC(x, g); err != nil {
		return t, err
	}
	if len(x) >= 4 {
		if t.Moments, err = GearyMoments(x, g); err != nil {
			return t, err
		}
		t.ZNormality = zScore(t.GearysC, 1, t.VarianceNormality)
		t.ZRandomisation = zScore(t.GearysC, 1, t.VarianceRandomisation)
	}
	labels, f, err := GearyPermutation(x, g)
	if err != nil {
		return t, err
	}
	plan.Labels = labels
	plan.Scale = 1
	t.Permutation, err = shuffle.Run(plan, f)
	return t, err
}
