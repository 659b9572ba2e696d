package autocorr

import (
	"math"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// bivariateParts returns c = Wᵀz_x (c_j = Σ_i w_ij z_x,i), the centred y
// and the factor n / (S0 √(Σz_x² Σz_y²)), so that I_xy = factor · Σ_j c_j z_y,j.
func bivariateParts(x, y []float64, g *weights.Graph) (c, zy []float64, factor, ssy float64, err error) {
	if err = checkColumn(x, g); err != nil {
		return
	}
	if err = checkColumn(y, g); err != nil {
		return
	}
	zx, ssx, err := centre(x)
	if err != nil {
		return
	}
	zy, ssy, err = centre(y)
	if err != nil {
		return
	}
	s0 := sumWeights(g)
	if s0 == 0 {
		err = errNoLinks
		return
	}
	c = make([]float64, len(x))
	for i := 0; i < g.Len(); i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			c[j] += w[k] * zx[i]
		}
	}
	factor = float64(len(x)) / (s0 * math.Sqrt(ssx*ssy))
	return c, zy, factor, ssy, nil
}

// BivariateMoransI returns the bivariate Moran's I of x against the spatial
// lag of y (Wartenberg 1985, Geogr. Anal. 17:263–283, in the standardised
// form):
//
//	I_xy = (n / S0) Σ_i z_x,i Σ_j w_ij z_y,j / √(Σ z_x² Σ z_y²)
//
// with z the centred variables: how well an area's x goes with the y of its
// neighbours. It is not symmetric in x and y unless W is. A constant x or y
// is ErrConstant.
func BivariateMoransI(x, y []float64, g *weights.Graph) (float64, error) {
	c, zy, factor, _, err := bivariateParts(x, y, g)
	if err != nil {
		return 0, err
	}
	var s float64
	for j, v := range c {
		s += v * zy[j]
	}
	return factor * s, nil
}

// BivariateMoments returns the expectation and variance of I_xy when y is
// shuffled over the areas with x held in place. I_xy is then a linear
// permutation statistic Σ_j c_j z_y,π(j), whose moments are exact (Wald &
// Wolfowitz 1944, Ann. Math. Stat. 15:358–372):
//
//	E = factor · Σ c_j · mean(z_y) = 0
//	Var = factor² · Σ_j (c_j − c̄)² · Σ_j z_y,j² / (n − 1)
//
// Unlike univariate Moran's I, E is exactly 0: x is not shuffled with y.
func BivariateMoments(x, y []float64, g *weights.Graph) (expected, variance float64, err error) {
	c, _, factor, ssy, err := bivariateParts(x, y, g)
	if err != nil {
		return 0, 0, err
	}
	var mean float64
	for _, v := range c {
		mean += v
	}
	mean /= float64(len(c))
	var q float64
	for _, v := range c {
		q += (v - mean) * (v - mean)
	}
	return 0, factor * factor * q * ssy / float64(len(c)-1), nil
}

// BivariatePermutation prepares the permutation test of I_xy: the labels
// are the codes of the distinct values of y, so the shuffle moves y's values
// over the areas while x stays where it is. That is the null of no
// association between x and the neighbouring y beyond what x's own map
// holds; shuffling the pairs (x_i, y_i) together instead would keep the
// areal correlation of x and y and test only its spatial placement. Because
// x is fixed, Wᵀz_x is computed once and each shuffle costs one dot product
// over the areas, not a pass over the links.
func BivariatePermutation(x, y []float64, g *weights.Graph) (labels []int32, f shuffle.Factory, err error) {
	c, zy, factor, _, err := bivariateParts(x, y, g)
	if err != nil {
		return nil, nil, err
	}
	labels, values := valueCodes(zy)
	for j := range c {
		c[j] *= factor
	}
	f = func() shuffle.Evaluator {
		return func(lab []int32) float64 {
			var s float64
			for j, l := range lab {
				s += c[j] * values[l]
			}
			return s
		}
	}
	return labels, f, nil
}

// BivariateTest is the bivariate Moran's I of x and the lag of y with its
// moments and permutation test (y shuffled, x fixed).
type BivariateTest struct {
	BivariateI            float64        `json:"bivariate_i"`
	Expected              float64        `json:"expected"`
	VarianceRandomisation float64        `json:"variance_randomisation"`
	ZRandomisation        float64        `json:"z_randomisation"`
	Permutation           shuffle.Result `json:"permutation"`
}

// RunBivariate computes I_xy with its moments and a permutation test
// planned by plan, whose Labels are filled in here.
func RunBivariate(x, y []float64, g *weights.Graph, plan shuffle.Plan) (BivariateTest, error) {
	var t BivariateTest
	var err error
	if t.BivariateI, err = BivariateMoransI(x, y, g); err != nil {
		return t, err
	}
	if t.Expected, t.VarianceRandomisation, err = BivariateMoments(x, y, g); err != nil {
		return t, err
	}
	t.ZRandomisation = zScore(t.BivariateI, t.Expected, t.VarianceRandomisation)
	labels, f, err := BivariatePermutation(x, y, g)
	if err != nil {
		return t, err
	}
	plan.Labels = labels
	plan.Scale = 1
	t.Permutation, err = shuffle.Run(plan, f)
	return t, err
}
