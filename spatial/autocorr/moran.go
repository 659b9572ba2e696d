package autocorr

import (
	"errors"
	"math"
	"sort"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// ErrConstant is returned for a variable with no variation, whose Moran's I
// is undefined.
var ErrConstant = errors.New("the variable is constant, so its spatial autocorrelation is undefined")

// MoransI returns Moran's I of x on the graph g:
//
//	I = (n / S0) · Σ_i Σ_j w_ij z_i z_j / Σ_i z_i²,  z = x − mean(x)
//
// (Moran 1950; Cliff & Ord 1981, eq. 1.21), with S0 the sum of all weights.
func MoransI(x []float64, g *weights.Graph) (float64, error) {
	z, ss, err := centre(x)
	if err != nil {
		return 0, err
	}
	s0 := sumWeights(g)
	if s0 == 0 {
		return 0, errors.New("the neighbour graph has no links")
	}
	return float64(len(x)) / s0 * crossProduct(z, g) / ss, nil
}

// Centre returns x − mean(x) and its sum of squares. A column with no
// variation is ErrConstant: the test is relative, since a column of
// identical large numbers leaves only rounding noise after centring. A
// column too large for the sums of the statistics is a *TooLargeError
// (CheckMagnitude). Every statistic of the tool that centres a variable
// uses it.
func Centre(x []float64) ([]float64, float64, error) { return centre(x) }

func centre(x []float64) ([]float64, float64, error) {
	if err := CheckMagnitude(x); err != nil {
		return nil, 0, err
	}
	var s float64
	for _, v := range x {
		s += v
	}
	mean := s / float64(len(x))
	z := make([]float64, len(x))
	var ss float64
	for i, v := range x {
		z[i] = v - mean
		ss += z[i] * z[i]
	}
	// Relative test: a column of identical large numbers leaves only
	// rounding noise after centring.
	if ss <= 1e-24*float64(len(x))*(mean*mean+1) {
		return nil, 0, ErrConstant
	}
	return z, ss, nil
}

func sumWeights(g *weights.Graph) float64 {
	var s float64
	for _, w := range g.Weights {
		s += w
	}
	return s
}

// crossProduct returns Σ_i z_i Σ_j w_ij z_j.
func crossProduct(z []float64, g *weights.Graph) float64 {
	var total float64
	for i := 0; i < len(g.Offsets)-1; i++ {
		a, b := g.Offsets[i], g.Offsets[i+1]
		var lag float64
		for k := a; k < b; k++ {
			lag += g.Weights[k] * z[g.Neighbours[k]]
		}
		total += z[i] * lag
	}
	return total
}

// Moments are the expectation and variance of Moran's I under the two null
// hypotheses of Cliff & Ord (1981, eqs. 1.36–1.38): normality (the values are
// independent normal draws) and randomisation (every arrangement of the
// observed values is equally likely).
type Moments struct {
	Expected              float64 `json:"expected"`
	VarianceNormality     float64 `json:"variance_normality"`
	VarianceRandomisation float64 `json:"variance_randomisation"`
}

// MoranMoments returns the analytic moments of Moran's I of x on g. It needs
// at least four areas.
func MoranMoments(x []float64, g *weights.Graph) (Moments, error) {
	n := float64(len(x))
	if len(x) < 4 {
		return Moments{}, errors.New("the moments of Moran's I need at least four areas")
	}
	z, ss, err := centre(x)
	if err != nil {
		return Moments{}, err
	}
	var q float64
	for _, v := range z {
		q += v * v * v * v
	}
	b2 := n * q / (ss * ss) // sample kurtosis
	s0, s1, s2 := weightSums(g)
	e := -1 / (n - 1)
	varN := (n*n*s1-n*s2+3*s0*s0)/((n*n-1)*s0*s0) - e*e
	varR := (n*((n*n-3*n+3)*s1-n*s2+3*s0*s0)-b2*((n*n-n)*s1-2*n*s2+6*s0*s0))/
		((n-1)*(n-2)*(n-3)*s0*s0) - e*e
	return Moments{Expected: e, VarianceNormality: varN, VarianceRandomisation: varR}, nil
}

// weightSums returns S0 = Σ w_ij, S1 = ½ Σ (w_ij + w_ji)² and
// S2 = Σ_i (w_i· + w_·i)² (Cliff & Ord 1981).
func weightSums(g *weights.Graph) (s0, s1, s2 float64) {
	n := g.Len()
	rowSum := make([]float64, n)
	colSum := make([]float64, n)
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			s0 += w[k]
			rowSum[i] += w[k]
			colSum[j] += w[k]
			wji := weightOf(g, int(j), int32(i))
			s1 += (w[k] + wji) * (w[k] + wji)
			if wji == 0 { // (j,i) absent: its term (w_ji + w_ij)² is counted here too
				s1 += w[k] * w[k]
			}
		}
	}
	s1 /= 2
	for i := 0; i < n; i++ {
		t := rowSum[i] + colSum[i]
		s2 += t * t
	}
	return
}

// weightOf returns w_ij, or 0 when j is not a neighbour of i.
func weightOf(g *weights.Graph, i int, j int32) float64 {
	nb, w := g.Row(i)
	k := sort.Search(len(nb), func(k int) bool { return nb[k] >= j })
	if k < len(nb) && nb[k] == j {
		return w[k]
	}
	return 0
}

// Test is Moran's I of one variable with its permutation test.
type Test struct {
	MoransI float64 `json:"morans_i"`
	Moments
	// ZRandomisation is (I − E[I]) / sd under randomisation.
	ZRandomisation float64        `json:"z_randomisation"`
	Permutation    shuffle.Result `json:"permutation"`
}

// Permutation prepares x for the shuffle machinery: each area's label is the
// code of its distinct value (so tied values are not counted as different
// arrangements), and the evaluator computes Moran's I of the arrangement.
func Permutation(x []float64, g *weights.Graph) (labels []int32, f shuffle.Factory, err error) {
	z, ss, err := centre(x)
	if err != nil {
		return nil, nil, err
	}
	s0 := sumWeights(g)
	if s0 == 0 {
		return nil, nil, errors.New("the neighbour graph has no links")
	}
	order := make([]int, len(z))
	for i := range order {
		order[i] = i
	}
	sort.Slice(order, func(a, b int) bool { return z[order[a]] < z[order[b]] })
	labels = make([]int32, len(z))
	var values []float64
	for k, i := range order {
		if k == 0 || z[i] != z[order[k-1]] {
			values = append(values, z[i])
		}
		labels[i] = int32(len(values) - 1)
	}
	// Σ_i Σ_j w_ij z_i z_j = Σ_{i<j} (w_ij + w_ji) z_i z_j: visiting each
	// pair once halves the work of every shuffle.
	pi, pj, pw := symmetricPairs(g)
	scale := float64(len(z)) / s0 / ss
	n := len(z)
	f = func() shuffle.Evaluator {
		zp := make([]float64, n)
		return func(lab []int32) float64 {
			for i, l := range lab {
				zp[i] = values[l]
			}
			var total float64
			for k, w := range pw {
				total += w * zp[pi[k]] * zp[pj[k]]
			}
			return scale * total
		}
	}
	return labels, f, nil
}

// symmetricPairs lists each linked pair i < j once with weight w_ij + w_ji,
// in row order so that reads of z stay local.
func symmetricPairs(g *weights.Graph) (pi, pj []int32, pw []float64) {
	for i := 0; i < g.Len(); i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			wji := weightOf(g, int(j), int32(i))
			switch {
			case int(j) > i:
				pi, pj, pw = append(pi, int32(i)), append(pj, j), append(pw, w[k]+wji)
			case wji == 0: // only (i, j) exists, with j < i: no later visit
				pi, pj, pw = append(pi, j), append(pj, int32(i)), append(pw, w[k])
			}
		}
	}
	return pi, pj, pw
}

// RunTest computes Moran's I of x on g with its moments and a permutation
// test planned by plan (whose Labels are filled in here).
func RunTest(x []float64, g *weights.Graph, plan shuffle.Plan) (Test, error) {
	var t Test
	var err error
	if t.MoransI, err = MoransI(x, g); err != nil {
		return t, err
	}
	if len(x) >= 4 {
		if t.Moments, err = MoranMoments(x, g); err != nil {
			return t, err
		}
		if t.VarianceRandomisation > 0 {
			t.ZRandomisation = (t.MoransI - t.Expected) / math.Sqrt(t.VarianceRandomisation)
		}
	}
	labels, f, err := Permutation(x, g)
	if err != nil {
		return t, err
	}
	plan.Labels = labels
	plan.Scale = 1
	t.Permutation, err = shuffle.Run(plan, f)
	return t, err
}
