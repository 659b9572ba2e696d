package shuffle

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// FreedmanLane tests a group effect on an outcome adjusting for covariates,
// by permuting the residuals of the model without the groups (Freedman &
// Lane 1983, J. Bus. Econ. Stat. 1:292–298).
//
// The reduced model y = Zγ + e (Z: an intercept and the covariates) is fitted
// by least squares once. A permutation Π of the areas gives the permuted
// outcome y* = Zγ̂ + Π ê: the fitted values stay with their areas, the
// residuals move. The full model y* = Zγ + Xβ + e (X: the indicators of
// groups 0..k−2; group k−1 is the reference) is refitted and the group terms
// judged by their partial F, or for two groups by the t of the group
// coefficient. Shuffling the outcome itself would also shuffle the part of
// it the covariates explain, and test "no effect of groups or covariates";
// shuffling residuals keeps that part in place, so only the group effect is
// under test. The test is exact only without covariates (then it is the
// ordinary permutation test of the F); with them it is exact only
// asymptotically, because the permuted residuals are estimates, not the
// true errors.
//
// The permutation comes from the shuffle machinery: Labels gives the
// observed arrangement 0..n−1, the plan permutes it (freely, within strata,
// or by any other scheme that permutes labels), and the evaluator reads
// labels[i] as the area whose residual goes to area i. Everything that does
// not depend on Π is computed once. Because M_Z y* = M_Z Π ê and M_F y* =
// M_F Π ê (M the residual-maker of Z or of the full design F = [Z X]), with
// v = Π ê and Q = [Q_Z Q_X] an orthonormal basis of F whose first columns
// span Z,
//
//	RSS_reduced(y*) = ‖v‖² − ‖Q_Zᵀ v‖²,   RSS_full(y*) = RSS_reduced − ‖Q_Xᵀ v‖²,
//
// and ‖v‖² = ‖ê‖² never changes. A draw therefore costs one pass over the
// areas with (columns of Q) multiply-adds, and allocates nothing.
type FreedmanLane struct {
	n, p, q int // areas, columns of Z (intercept included), group columns (k − 1)
	// resid is ê = M_Z y; fitted is Zγ̂ = y − ê.
	resid, fitted []float64
	// basis holds Q without its first column, row by row: row i is
	// basis[i*(m):(i+1)*m] with m = p − 1 + q. The first column of Q is the
	// constant 1/√n (the intercept comes first in Z), and 1ᵀΠê = 1ᵀê = 0
	// for every Π, so it never contributes and is left out.
	basis []float64
	// ss is ‖ê‖².
	ss float64
	// df is the residual degrees of freedom of the full model, n − p − q.
	df int
	// sign is +1 or −1 so that Q_X's column, for two groups, points along
	// the component of the group-0 indicator orthogonal to Z: then the t
	// has the sign of the group coefficient (adjusted mean of group 0 minus
	// that of group 1).
	sign float64
}

// NewFreedmanLane prepares the test of the grouping labels (0..k−1, one per
// area) on the outcome y adjusting for covariates, each a column with one
// value per area (nil or empty for none: then it is the ordinary
// permutation test of the one-way F). Every group needs an area, the full
// model at least one residual degree of freedom, and no covariate may be a
// linear combination of the intercept and the others (nor may the grouping
// be one of the covariates'): such a design has no unique fit.
func NewFreedmanLane(y []float64, covariates [][]float64, labels []int32, k int) (*FreedmanLane, error) {
	if err := checkFreedmanLane(y, covariates, labels, k); err != nil {
		return nil, err
	}
	n, p, q := len(y), 1+len(covariates), k-1
	design := flDesign(covariates, labels, p, q)
	diag, err := orthonormalise(design, p, q)
	if err != nil {
		return nil, err
	}
	f := &FreedmanLane{n: n, p: p, q: q, df: n - p - q, sign: 1}
	if q == 1 && diag[p] < 0 {
		f.sign = -1
	}
	f.fit(y, design)
	return f, nil
}

// checkFreedmanLane checks the sizes and values of the inputs.
func checkFreedmanLane(y []float64, covariates [][]float64, labels []int32, k int) error {
	n := len(y)
	if len(labels) != n {
		return fmt.Errorf("shuffle: %d group labels for %d outcome values", len(labels), n)
	}
	if k < 2 {
		return fmt.Errorf("shuffle: need at least two groups, have %d", k)
	}
	if n-1-len(covariates)-(k-1) < 1 {
		return fmt.Errorf("shuffle: %d areas are too few for an intercept, %d covariate(s) and %d groups: the model needs more areas than coefficients", n, len(covariates), k)
	}
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("shuffle: outcome value %d is %v", i, v)
		}
	}
	sizes := make([]int, k)
	for i, l := range labels {
		if l < 0 || int(l) >= k {
			return fmt.Errorf("shuffle: group label %d of area %d is out of range 0..%d", l, i, k-1)
		}
		sizes[l]++
	}
	for g, s := range sizes {
		if s == 0 {
			return fmt.Errorf("shuffle: group %d has no area", g)
		}
	}
	for c, col := range covariates {
		if len(col) != n {
			return fmt.Errorf("shuffle: covariate %d has %d values for %d areas", c+1, len(col), n)
		}
		for i, v := range col {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return fmt.Errorf("shuffle: covariate %d, value %d is %v", c+1, i, v)
			}
		}
	}
	return nil
}

// flDesign builds the full design F = [1, covariates, indicators of groups
// 0..k−2], p columns for the intercept and covariates, q for the groups.
func flDesign(covariates [][]float64, labels []int32, p, q int) *mat.Dense {
	n := len(labels)
	design := mat.NewDense(n, p+q, nil)
	for i := 0; i < n; i++ {
		design.Set(i, 0, 1)
		if g := int(labels[i]); g < q {
			design.Set(i, p+g, 1)
		}
	}
	for c, col := range covariates {
		for i, v := range col {
			design.Set(i, 1+c, v)
		}
	}
	return design
}

// orthonormalise overwrites the design with the thin Q of its Householder
// QR and returns the diagonal of R. Householder QR keeps the nested column
// spaces: the first p columns of Q span Z, the next q the part of the
// indicators orthogonal to Z. A design without a unique fit is an error.
func orthonormalise(design *mat.Dense, p, q int) ([]float64, error) {
	m := p + q
	norms := make([]float64, m)
	for j := 0; j < m; j++ {
		norms[j] = mat.Norm(design.ColView(j), 2)
	}
	raw := design.RawMatrix()
	tau := make([]float64, m)
	work := []float64{0}
	lapack64.Geqrf(raw, tau, work, -1)
	work = make([]float64, int(work[0]))
	lapack64.Geqrf(raw, tau, work, len(work))
	diag := make([]float64, m)
	for j := range diag {
		diag[j] = raw.Data[j*raw.Stride+j]
	}
	// A column whose part orthogonal to the columns before it is this small
	// relative to its length is a linear combination of them, up to
	// rounding.
	const collinear = 1e-9
	for j := 0; j < m; j++ {
		if math.Abs(diag[j]) > collinear*norms[j] && norms[j] > 0 {
			continue
		}
		switch {
		case j < p:
			return nil, fmt.Errorf("shuffle: covariate %d is constant or a linear combination of the intercept and the covariates before it, so the model has no unique fit", j)
		case q == 1:
			return nil, errors.New("shuffle: the covariates determine the grouping completely, so no group effect can be told apart from theirs")
		default:
			return nil, fmt.Errorf("shuffle: the covariates and the other groups determine group %d completely, so no group effect can be told apart from theirs", j-p)
		}
	}
	work = []float64{0}
	lapack64.Orgqr(raw, tau, work, -1)
	work = make([]float64, int(work[0]))
	lapack64.Orgqr(raw, tau, work, len(work))
	return diag, nil
}

// fit computes the residuals and fitted values of the reduced model and
// stores Q without its first column, from the thin n×m Q.
func (f *FreedmanLane) fit(y []float64, Q *mat.Dense) {
	n, p := f.n, f.p
	f.resid, f.fitted = make([]float64, n), make([]float64, n)
	// ê = y − Q_Z Q_Zᵀ y, projected twice ("twice is enough": the second
	// pass removes what rounding left in the span of Z).
	copy(f.resid, y)
	for range 2 {
		for j := 0; j < p; j++ {
			var c float64
			for i := 0; i < n; i++ {
				c += Q.At(i, j) * f.resid[i]
			}
			for i := 0; i < n; i++ {
				f.resid[i] -= c * Q.At(i, j)
			}
		}
	}
	for i := range y {
		f.fitted[i] = y[i] - f.resid[i]
		f.ss += f.resid[i] * f.resid[i]
	}
	m := p + f.q
	w := m - 1
	f.basis = make([]float64, n*w)
	for i := 0; i < n; i++ {
		for j := 1; j < m; j++ {
			f.basis[i*w+j-1] = Q.At(i, j)
		}
	}
}

// Len returns the number of areas.
func (f *FreedmanLane) Len() int { return f.n }

// Labels returns the observed arrangement for Plan.Labels: area i holds its
// own residual, labels 0..n−1. Because every label differs, exact
// enumeration visits all n! orderings (Π m_s! within strata), which the
// default ExactLimit allows up to 9 areas.
func (f *FreedmanLane) Labels() []int32 {
	out := make([]int32, f.n)
	for i := range out {
		out[i] = int32(i)
	}
	return out
}

// DF returns the degrees of freedom of the partial F: k − 1 for the group
// terms and n − p − (k − 1) for the residuals of the full model, with p the
// number of covariates plus one.
func (f *FreedmanLane) DF() (groups, residual int) { return f.q, f.df }

// Outcome writes into dst (length n) the permuted outcome
// y*_i = (Zγ̂)_i + ê_{labels[i]} for the arrangement labels, for statistics
// that need y* itself; the evaluators never form it.
func (f *FreedmanLane) Outcome(labels []int32, dst []float64) {
	for i, u := range labels {
		dst[i] = f.fitted[i] + f.resid[u]
	}
}

// project fills c with Qᵀv (first column left out) for v_i = ê_{labels[i]}.
func (f *FreedmanLane) project(labels []int32, c []float64) {
	for j := range c {
		c[j] = 0
	}
	w := len(c)
	switch w {
	case 1:
		// Two groups, no covariates: one column; the common case of the
		// plain permutation test gets a loop without the inner one.
		var s float64
		for i, u := range labels {
			s += f.basis[i] * f.resid[u]
		}
		c[0] = s
	case 2:
		var s0, s1 float64
		for i, u := range labels {
			v := f.resid[u]
			s0 += f.basis[2*i] * v
			s1 += f.basis[2*i+1] * v
		}
		c[0], c[1] = s0, s1
	case 3:
		var s0, s1, s2 float64
		for i, u := range labels {
			v := f.resid[u]
			row := f.basis[3*i : 3*i+3]
			s0 += row[0] * v
			s1 += row[1] * v
			s2 += row[2] * v
		}
		c[0], c[1], c[2] = s0, s1, s2
	default:
		for i, u := range labels {
			v := f.resid[u]
			row := f.basis[i*w : i*w+w]
			for j, b := range row {
				c[j] += b * v
			}
		}
	}
}

// sums returns the group sum of squares ‖Q_Xᵀv‖² and the residual sum of
// squares of the full model for the projections c.
func (f *FreedmanLane) sums(c []float64) (between, rss float64) {
	reduced := f.ss
	for _, v := range c[:f.p-1] {
		reduced -= v * v
	}
	for _, v := range c[f.p-1:] {
		between += v * v
	}
	return between, reduced - between
}

func (f *FreedmanLane) fRatio(c []float64) float64 {
	between, rss := f.sums(c)
	return (between / float64(f.q)) / (rss / float64(f.df))
}

func (f *FreedmanLane) tRatio(c []float64) float64 {
	_, rss := f.sums(c)
	return f.sign * c[len(c)-1] / math.Sqrt(rss/float64(f.df))
}

// Factory returns evaluators of the partial F of the group terms for the
// arrangement labels (see the type's documentation). F grows with any group
// effect, so test it with Alternative Greater and Scale 1.
func (f *FreedmanLane) Factory() Factory {
	return func() Evaluator {
		c := make([]float64, f.p-1+f.q)
		return func(labels []int32) float64 {
			f.project(labels, c)
			return f.fRatio(c)
		}
	}
}

// TFactory returns evaluators of the t of the group coefficient for two
// groups: the adjusted mean of group 0 minus that of group 1, over its
// standard error. Its square is the partial F; its sign allows one-sided
// tests.
func (f *FreedmanLane) TFactory() (Factory, error) {
	if f.q != 1 {
		return nil, fmt.Errorf("shuffle: the t of the group coefficient needs two groups, not %d", f.q+1)
	}
	return func() Evaluator {
		c := make([]float64, f.p)
		return func(labels []int32) float64 {
			f.project(labels, c)
			return f.tRatio(c)
		}
	}, nil
}

// PartialF returns the observed partial F of the group terms and its p-value
// from the F distribution with DF() degrees of freedom: the classical test,
// exact for independent normal errors.
func (f *FreedmanLane) PartialF() (F, p float64) {
	c := make([]float64, f.p-1+f.q)
	f.project(f.Labels(), c)
	F = f.fRatio(c)
	return F, distuv.F{D1: float64(f.q), D2: float64(f.df)}.Survival(F)
}

// ClassicalT returns, for two groups, the observed t of the group
// coefficient and its p-value from Student's t with DF() residual degrees of
// freedom for the alternative alt.
func (f *FreedmanLane) ClassicalT(alt Alternative) (t, p float64, err error) {
	if f.q != 1 {
		return 0, 0, fmt.Errorf("shuffle: the t of the group coefficient needs two groups, not %d", f.q+1)
	}
	c := make([]float64, f.p)
	f.project(f.Labels(), c)
	t = f.tRatio(c)
	dist := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(f.df)}
	switch alt {
	case Greater:
		p = dist.Survival(t)
	case Less:
		p = dist.CDF(t)
	default:
		p = math.Min(1, 2*dist.Survival(math.Abs(t)))
	}
	return t, p, nil
}

// Residuals returns ê = M_Z y, the residuals of the covariates-only model
// that the test permutes (a copy).
func (f *FreedmanLane) Residuals() []float64 { return append([]float64(nil), f.resid...) }

// ResidualsView returns ê itself, valid until the next Refit, for loops
// that must not allocate.
func (f *FreedmanLane) ResidualsView() []float64 { return f.resid }

// Clone returns a test of the same design (covariates and grouping) that
// shares its basis and can be Refit to other outcomes without disturbing
// f: one per goroutine.
func (f *FreedmanLane) Clone() *FreedmanLane {
	g := *f
	g.resid = append([]float64(nil), f.resid...)
	g.fitted = append([]float64(nil), f.fitted...)
	return &g
}

// Refit makes y (length n) the outcome under test, with the design kept:
// the residuals and fitted values of the covariates-only model are
// recomputed from the stored basis (the first p columns of Q span the
// intercept and the covariates), twice as in the first fit. It allocates
// nothing, so that a check can test many outcomes on one design.
func (f *FreedmanLane) Refit(y []float64) {
	n, w := f.n, f.p-1+f.q
	copy(f.resid, y)
	for range 2 {
		var mean float64
		for _, v := range f.resid {
			mean += v
		}
		mean /= float64(n)
		for i := range f.resid {
			f.resid[i] -= mean
		}
		for j := 0; j < f.p-1; j++ {
			var c float64
			for i := 0; i < n; i++ {
				c += f.basis[i*w+j] * f.resid[i]
			}
			for i := 0; i < n; i++ {
				f.resid[i] -= c * f.basis[i*w+j]
			}
		}
	}
	f.ss = 0
	for i, v := range y {
		f.fitted[i] = v - f.resid[i]
		f.ss += f.resid[i] * f.resid[i]
	}
}

// OnOutcomes returns evaluators of the test's statistic — the t of the
// group coefficient when t is set (two groups), else the partial F — for
// the grouping and covariates of f and any outcome v given whole, for the
// spectral surrogates of the residuals: the statistic of v is that of the
// full model fitted to v, which depends on v only through M_Z v, so a
// surrogate of ê is tested as the outcome fitted values + surrogate
// would be. An evaluation allocates nothing.
func (f *FreedmanLane) OnOutcomes(t bool) func() OutcomeEvaluator {
	return func() OutcomeEvaluator {
		w := f.p - 1 + f.q
		c := make([]float64, w)
		return func(v []float64) float64 {
			var mean float64
			for _, x := range v {
				mean += x
			}
			mean /= float64(len(v))
			var ss float64
			for j := range c {
				c[j] = 0
			}
			for i, x := range v {
				d := x - mean
				ss += d * d
				row := f.basis[i*w : i*w+w]
				for j, b := range row {
					c[j] += b * d
				}
			}
			reduced := ss
			for _, cj := range c[:f.p-1] {
				reduced -= cj * cj
			}
			var between float64
			for _, cj := range c[f.p-1:] {
				between += cj * cj
			}
			rss := reduced - between
			if t {
				return f.sign * c[w-1] / math.Sqrt(rss/float64(f.df))
			}
			return (between / float64(f.q)) / (rss / float64(f.df))
		}
	}
}
