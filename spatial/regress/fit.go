package regress

import (
	"fmt"
	"math"
	"slices"

	"gonum.org/v1/gonum/lapack/lapack64"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// Coefficient is one term of the fitted model with its t test.
type Coefficient struct {
	// Name is "intercept" or the covariate's name.
	Name string `json:"name"`
	// Estimate is the least-squares coefficient.
	Estimate float64 `json:"estimate"`
	// SE is its standard error, s·√[(XᵀX)⁻¹]_jj with s the residual
	// standard error.
	SE float64 `json:"standard_error"`
	// T is Estimate / SE.
	T float64 `json:"t"`
	// P is the two-sided p-value of T from Student's t with the residual
	// degrees of freedom.
	P float64 `json:"p"`
}

// Test is a test statistic with its reference distribution's degrees of
// freedom (χ² unless said otherwise) and its p-value.
type Test struct {
	Statistic float64 `json:"statistic"`
	DF        float64 `json:"df"`
	P         float64 `json:"p"`
}

// Fit is an ordinary least-squares fit y = Xβ + e of an outcome on an
// intercept and covariates, with the diagnostics that need no neighbour
// graph. Moran and LagrangeMultipliers add those that do.
type Fit struct {
	// Coefficients holds the intercept first, then the covariates in the
	// order given.
	Coefficients []Coefficient `json:"coefficients"`
	// Areas is the number of areas n; DF the residual degrees of freedom
	// n − k, with k the number of coefficients.
	Areas int `json:"areas"`
	DF    int `json:"residual_df"`
	// R2 is 1 − RSS/TSS (TSS about the mean); AdjR2 is
	// 1 − (1 − R²)(n − 1)/(n − k).
	R2    float64 `json:"r_squared"`
	AdjR2 float64 `json:"adjusted_r_squared"`
	// F tests all covariates together, on k − 1 and n − k degrees of
	// freedom, with p-value FP. Without covariates there is nothing to
	// test: F is 0 and FP 1.
	F  float64 `json:"f"`
	FP float64 `json:"f_p"`
	// SigmaHat is the residual standard error s = √(RSS/(n − k)).
	SigmaHat float64 `json:"residual_standard_error"`
	// Fitted are Xβ̂, Residuals e = y − Xβ̂, and Standardised the
	// internally studentised residuals e_i / (s√(1 − h_ii)), h_ii the
	// leverage of area i, which share one variance under the model (0 for
	// an area of leverage 1, whose residual is 0). Per area, so left out
	// of JSON: they go to per-area outputs.
	Fitted       []float64 `json:"-"`
	Residuals    []float64 `json:"-"`
	Standardised []float64 `json:"-"`
	Collinearity
	// JarqueBera tests normality of the residuals (χ², 2 df).
	JarqueBera Test `json:"jarque_bera"`
	// BreuschPagan and Koenker test whether the residual variance depends
	// on the covariates (χ², k − 1 df); see heteroskedasticity.go.
	BreuschPagan Test `json:"breusch_pagan"`
	Koenker      Test `json:"koenker"`

	// y is the outcome; basis the thin orthonormal Q of the design (row i
	// at basis[i*k:(i+1)*k]), whose columns span the intercept and the
	// covariates; rss the residual sum of squares.
	y     []float64
	basis []float64
	k     int
	rss   float64
}

// OLS fits y on an intercept and the covariate columns x (each one value
// per area; none at all fits the mean only), named by names (nil for x1,
// x2, …). Errors: *ValueError for mismatched lengths or values that are not
// finite numbers, *TooFewAreasError without a residual degree of freedom,
// *CollinearError for a design without a unique fit.
//
// The fit is by Householder QR of the design (LAPACK's dgeqrf through
// gonum), never by the normal equations, whose condition is the square of
// the design's.
func OLS(y []float64, x [][]float64, names []string) (*Fit, error) {
	names, err := checkInputs(y, x, names)
	if err != nil {
		return nil, err
	}
	n, k := len(y), len(x)+1
	design := mat.NewDense(n, k, nil)
	for i := 0; i < n; i++ {
		design.Set(i, 0, 1)
		for c, col := range x {
			design.Set(i, c+1, col[i])
		}
	}
	norms := make([]float64, k)
	for j := range norms {
		norms[j] = mat.Norm(design.ColView(j), 2)
	}
	r, err := factorise(design, norms, names)
	if err != nil {
		return nil, err
	}
	f := &Fit{Areas: n, DF: n - k, y: append([]float64(nil), y...), k: k, basis: design.RawMatrix().Data}
	rinv := f.solve(r)
	f.summarise(names, rinv)
	f.Collinearity = collinearity(r, norms, rinv, x, names)
	f.JarqueBera = jarqueBera(f.Residuals)
	f.BreuschPagan, f.Koenker = f.heteroskedasticity()
	return f, nil
}

// checkInputs checks lengths and values and returns the names to use.
func checkInputs(y []float64, x [][]float64, names []string) ([]string, error) {
	n, k := len(y), len(x)+1
	if names == nil {
		names = make([]string, len(x))
		for c := range names {
			names[c] = fmt.Sprintf("x%d", c+1)
		}
	}
	if len(names) != len(x) {
		return nil, &ValueError{Column: "covariate names", Index: -1, Problem: fmt.Sprintf("%d names for %d covariates", len(names), len(x))}
	}
	if n-k < 1 {
		return nil, &TooFewAreasError{Areas: n, Coefficients: k}
	}
	if err := finite("outcome", y); err != nil {
		return nil, err
	}
	if slices.Min(y) == slices.Max(y) {
		return nil, &ValueError{Column: "outcome", Index: -1, Problem: "it is constant, so there is nothing to explain"}
	}
	for c, col := range x {
		if len(col) != n {
			return nil, &ValueError{Column: names[c], Index: -1, Problem: fmt.Sprintf("%d values for %d areas", len(col), n)}
		}
		if err := finite(names[c], col); err != nil {
			return nil, err
		}
	}
	return names, nil
}

// finite rejects NaN and infinities, which would flow silently into every
// sum.
func finite(name string, v []float64) error {
	for i, x := range v {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return &ValueError{Column: name, Index: i, Problem: fmt.Sprintf("%v is not a finite number", x)}
		}
	}
	return nil
}

// factorise overwrites the design with the thin Q of its Householder QR
// and returns R (k×k, upper triangular). A column whose part orthogonal to
// the columns before it is this small relative to its length is a linear
// combination of them, up to rounding.
func factorise(design *mat.Dense, norms []float64, names []string) (*mat.Dense, error) {
	const collinear = 1e-9
	raw := design.RawMatrix()
	k := raw.Cols
	tau := make([]float64, k)
	work := []float64{0}
	lapack64.Geqrf(raw, tau, work, -1)
	work = make([]float64, int(work[0]))
	lapack64.Geqrf(raw, tau, work, len(work))
	r := mat.NewDense(k, k, nil)
	for i := 0; i < k; i++ {
		for j := i; j < k; j++ {
			r.Set(i, j, raw.Data[i*raw.Stride+j])
		}
	}
	for j := 1; j < k; j++ {
		if !(math.Abs(r.At(j, j)) > collinear*norms[j]) {
			return nil, &CollinearError{Covariate: names[j-1]}
		}
	}
	work = []float64{0}
	lapack64.Orgqr(raw, tau, work, -1)
	work = make([]float64, int(work[0]))
	lapack64.Orgqr(raw, tau, work, len(work))
	return r, nil
}

// solve computes the residuals (y projected off the design twice: the
// second pass removes what rounding left in its span), the fitted values
// and the coefficients from Qᵀy and R, and returns R⁻¹.
func (f *Fit) solve(r *mat.Dense) *mat.Dense {
	n, k := f.Areas, f.k
	e := append([]float64(nil), f.y...)
	qty := make([]float64, k)
	c := make([]float64, k)
	for range 2 {
		f.project(e, c)
		for j := range c {
			qty[j] += c[j]
		}
		f.subtract(e, c)
	}
	f.Residuals = e
	f.Fitted = make([]float64, n)
	for i := range e {
		f.Fitted[i] = f.y[i] - e[i]
		f.rss += e[i] * e[i]
	}
	rinv := invertUpper(r)
	beta := make([]float64, k)
	for i := 0; i < k; i++ {
		for j := i; j < k; j++ {
			beta[i] += rinv.At(i, j) * qty[j]
		}
	}
	f.Coefficients = make([]Coefficient, k)
	for j := range beta {
		f.Coefficients[j].Estimate = beta[j]
	}
	return rinv
}

// project sets c = Qᵀv.
func (f *Fit) project(v, c []float64) {
	k := f.k
	for j := range c {
		c[j] = 0
	}
	for i, x := range v {
		row := f.basis[i*k : i*k+k]
		for j, q := range row {
			c[j] += q * x
		}
	}
}

// subtract sets v = v − Qc.
func (f *Fit) subtract(v, c []float64) {
	k := f.k
	for i := range v {
		row := f.basis[i*k : i*k+k]
		var s float64
		for j, q := range row {
			s += q * c[j]
		}
		v[i] -= s
	}
}

// residualise sets v = Mv = v − QQᵀv, the part of v the design does not
// explain; c is scratch of length k.
func (f *Fit) residualise(v, c []float64) {
	f.project(v, c)
	f.subtract(v, c)
}

// summarise fills the standard errors, t and p of the coefficients, R²,
// the F test, the residual standard error and the standardised residuals.
func (f *Fit) summarise(names []string, rinv *mat.Dense) {
	n, k := f.Areas, f.k
	df := float64(f.DF)
	s2 := f.rss / df
	f.SigmaHat = math.Sqrt(s2)
	tdist := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}
	for j := range f.Coefficients {
		c := &f.Coefficients[j]
		c.Name = "intercept"
		if j > 0 {
			c.Name = names[j-1]
		}
		// [(XᵀX)⁻¹]_jj = Σ_l (R⁻¹)_jl², since (XᵀX)⁻¹ = R⁻¹R⁻ᵀ.
		var a float64
		for l := j; l < k; l++ {
			a += rinv.At(j, l) * rinv.At(j, l)
		}
		c.SE = math.Sqrt(s2 * a)
		c.T = c.Estimate / c.SE
		c.P = math.Min(1, 2*tdist.Survival(math.Abs(c.T)))
	}
	var mean, tss float64
	for _, v := range f.y {
		mean += v
	}
	mean /= float64(n)
	for _, v := range f.y {
		tss += (v - mean) * (v - mean)
	}
	f.R2 = 1 - f.rss/tss
	f.AdjR2 = 1 - (1-f.R2)*float64(n-1)/df
	f.F, f.FP = 0, 1
	if k > 1 {
		f.F = ((tss - f.rss) / float64(k-1)) / s2
		f.FP = distuv.F{D1: float64(k - 1), D2: df}.Survival(f.F)
	}
	f.Standardised = make([]float64, n)
	for i, e := range f.Residuals {
		var h float64
		for _, q := range f.basis[i*k : i*k+k] {
			h += q * q
		}
		if h < 1-1e-12 {
			f.Standardised[i] = e / (f.SigmaHat * math.Sqrt(1-h))
		}
	}
}

// invertUpper returns the inverse of the upper-triangular R by back
// substitution, column by column.
func invertUpper(r *mat.Dense) *mat.Dense {
	k, _ := r.Dims()
	inv := mat.NewDense(k, k, nil)
	for j := 0; j < k; j++ {
		inv.Set(j, j, 1/r.At(j, j))
		for i := j - 1; i >= 0; i-- {
			var s float64
			for l := i + 1; l <= j; l++ {
				s += r.At(i, l) * inv.At(l, j)
			}
			inv.Set(i, j, -s/r.At(i, i))
		}
	}
	return inv
}
