package autocorr

import (
	"errors"
	"fmt"
	"math"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// ErrNegative is matched (errors.Is) by the error General G returns for a
// column with negative values: G is a share of the products x_i x_j, which
// needs x ≥ 0. Use errors.As with *NegativeError to name the areas.
var ErrNegative = errors.New("General G needs values that are zero or more")

// NegativeError reports the negative values of a column given to General G.
type NegativeError struct {
	// Count is the number of negative values; First is the index of the
	// first one and Value its value.
	Count, First int
	Value        float64
}

// Error names the count and the first negative value.
func (e *NegativeError) Error() string {
	return fmt.Sprintf("General G needs values that are zero or more: %d value(s) are negative, the first at area %d (%v)",
		e.Count, e.First, e.Value)
}

// Is makes errors.Is(err, ErrNegative) true.
func (e *NegativeError) Is(target error) bool { return target == ErrNegative }

// checkNonNegative returns a *NegativeError for a column with negative values
// and ErrConstant for a constant one.
func checkNonNegative(x []float64, g *weights.Graph) (sum, sumSq float64, err error) {
	if err := checkColumn(x, g); err != nil {
		return 0, 0, err
	}
	var neg *NegativeError
	for i, v := range x {
		if v < 0 {
			if neg == nil {
				neg = &NegativeError{First: i, Value: v}
			}
			neg.Count++
		}
		sum += v
		sumSq += v * v
	}
	if neg != nil {
		return 0, 0, neg
	}
	if _, _, err := centre(x); err != nil {
		return 0, 0, err
	}
	// Σ_{i≠j} x_i x_j = (Σx)² − Σx² is zero when at most one value is
	// not zero: then no pair carries any product to share out.
	if sum*sum-sumSq <= 1e-12*sum*sum {
		return 0, 0, errors.New("General G needs at least two areas with values above zero")
	}
	return sum, sumSq, nil
}

// GeneralG returns the General G of Getis & Ord (1992, Geogr. Anal.
// 24:189–206, eq. 1) of x on g:
//
//	G = Σ_{i≠j} w_ij x_i x_j / Σ_{i≠j} x_i x_j,   x ≥ 0
//
// the share of all cross products that falls on linked pairs. G above its
// expectation means high values sit next to high values. A column with a
// negative value is a *NegativeError (errors.Is ErrNegative); a constant
// column is ErrConstant.
func GeneralG(x []float64, g *weights.Graph) (float64, error) {
	sum, sumSq, err := checkNonNegative(x, g)
	if err != nil {
		return 0, err
	}
	if sumWeights(g) == 0 {
		return 0, errNoLinks
	}
	// The graph never holds w_ii, so the numerator is x·Wx.
	return crossProduct(x, g) / (sum*sum - sumSq), nil
}

// GeneralGMoments returns the expectation and the variance of General G
// under randomisation (Getis & Ord 1992, eqs. 4–6 as recalled; the tests
// check both by exact enumeration):
//
//	E[G]  = S0 / (n(n−1))
//	E[G²] = (B0 m2² + B1 m4 + B2 m1² m2 + B3 m1 m3 + B4 m1⁴) / ((m1² − m2)² n(n−1)(n−2)(n−3))
//	B0 = (n² − 3n + 3) S1 − n S2 + 3 S0²
//	B1 = −[(n² − n) S1 − 2n S2 + 6 S0²]
//	B2 = −[2n S1 − (n + 3) S2 + 6 S0²]
//	B3 = 4(n − 1) S1 − 2(n + 1) S2 + 8 S0²
//	B4 = S1 − S2 + S0²
//
// with m_k = Σ x_i^k and S0, S1, S2 the weight sums of Moran's I. It needs
// at least four areas.
func GeneralGMoments(x []float64, g *weights.Graph) (expected, variance float64, err error) {
	if _, _, err := checkNonNegative(x, g); err != nil {
		return 0, 0, err
	}
	if len(x) < 4 {
		return 0, 0, errors.New("the moments of General G need at least four areas")
	}
	s0, s1, s2 := weightSums(g)
	if s0 == 0 {
		return 0, 0, errNoLinks
	}
	// G does not change when x is scaled; scaling by the largest value keeps
	// m1⁴ far from overflow for large counts.
	var top float64
	for _, v := range x {
		top = math.Max(top, v)
	}
	var m1, m2, m3, m4 float64
	for _, v := range x {
		u := v / top
		m1 += u
		m2 += u * u
		m3 += u * u * u
		m4 += u * u * u * u
	}
	n := float64(len(x))
	b0 := (n*n-3*n+3)*s1 - n*s2 + 3*s0*s0
	b1 := -((n*n-n)*s1 - 2*n*s2 + 6*s0*s0)
	b2 := -(2*n*s1 - (n+3)*s2 + 6*s0*s0)
	b3 := 4*(n-1)*s1 - 2*(n+1)*s2 + 8*s0*s0
	b4 := s1 - s2 + s0*s0
	d := m1*m1 - m2
	eg2 := (b0*m2*m2 + b1*m4 + b2*m1*m1*m2 + b3*m1*m3 + b4*m1*m1*m1*m1) /
		(d * d * n * (n - 1) * (n - 2) * (n - 3))
	expected = s0 / (n * (n - 1))
	return expected, eg2 - expected*expected, nil
}

// GeneralGPermutation prepares x for the shuffle machinery: labels are the
// codes of distinct values; the evaluator returns G of the arrangement. The
// denominator does not depend on the arrangement, so each shuffle costs one
// pass over the linked pairs.
func GeneralGPermutation(x []float64, g *weights.Graph) (labels []int32, f shuffle.Factory, err error) {
	sum, sumSq, err := checkNonNegative(x, g)
	if err != nil {
		return nil, nil, err
	}
	if sumWeights(g) == 0 {
		return nil, nil, errNoLinks
	}
	labels, values := valueCodes(x)
	pi, pj, pw := symmetricPairs(g)
	scale := 1 / (sum*sum - sumSq)
	n := len(x)
	f = func() shuffle.Evaluator {
		xp := make([]float64, n)
		return func(lab []int32) float64 {
			for i, l := range lab {
				xp[i] = values[l]
			}
			var total float64
			for k, w := range pw {
				total += w * xp[pi[k]] * xp[pj[k]]
			}
			return scale * total
		}
	}
	return labels, f, nil
}

// GeneralGTest is General G of one variable with its randomisation moments
// and permutation test.
type GeneralGTest struct {
	G                     float64        `json:"general_g"`
	Expected              float64        `json:"expected"`
	VarianceRandomisation float64        `json:"variance_randomisation"`
	ZRandomisation        float64        `json:"z_randomisation"`
	Permutation           shuffle.Result `json:"permutation"`
}

// RunGeneralG computes General G of x on g with its moments (from four
// areas up) and a permutation test planned by plan, whose Labels are filled
// in here.
func RunGeneralG(x []float64, g *weights.Graph, plan shuffle.Plan) (GeneralGTest, error) {
	var t GeneralGTest
	var err error
	if t.G, err = GeneralG(x, g); err != nil {
		return t, err
	}
	if len(x) >= 4 {
		if t.Expected, t.VarianceRandomisation, err = GeneralGMoments(x, g); err != nil {
			return t, err
		}
		t.ZRandomisation = zScore(t.G, t.Expected, t.VarianceRandomisation)
	} else {
		n := float64(len(x))
		t.Expected = sumWeights(g) / (n * (n - 1))
	}
	labels, f, err := GeneralGPermutation(x, g)
	if err != nil {
		return t, err
	}
	plan.Labels = labels
	plan.Scale = t.G
	t.Permutation, err = shuffle.Run(plan, f)
	return t, err
}
