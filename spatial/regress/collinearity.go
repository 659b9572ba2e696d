package regress

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// Rules of thumb for multicollinearity, common in practice but not tests:
// a condition number of the scaled design over 30 (Belsley, Kuh & Welsch
// 1980, Regression Diagnostics, ch. 3, who call 30 to 100 moderate to
// strong dependence) and a variance inflation factor over 10.
const (
	ConditionLimit = 30
	VIFLimit       = 10
)

// Collinearity measures how nearly the covariates are linear combinations
// of each other, which inflates the standard errors of their coefficients.
type Collinearity struct {
	// ConditionNumber is the ratio of the largest to the smallest singular
	// value of the design (intercept included) with every column scaled to
	// unit length, not centred (Belsley, Kuh & Welsch 1980). It is 1 for
	// orthogonal columns of equal length.
	ConditionNumber float64 `json:"condition_number"`
	// VIF holds, per covariate, 1/(1 − R²_j), R²_j that of the covariate
	// regressed on the intercept and the other covariates.
	VIF []float64 `json:"variance_inflation"`
	// Warnings name, in words, the figures over ConditionLimit and
	// VIFLimit, each marked as a rule of thumb; empty when none is.
	Warnings []string `json:"collinearity_warnings"`
}

// collinearity computes the condition number and VIFs from R of the QR of
// the design X, its column norms, R⁻¹ and the covariate columns.
//
// Scaling X's columns by D = diag(1/‖x_j‖) scales R's the same way (the QR
// of XD is Q·RD), so the singular values of the scaled design are those of
// the k×k RD: no n×k decomposition is needed. With an intercept in X,
// [(XᵀX)⁻¹]_jj = 1/RSS_j, RSS_j the residual sum of squares of x_j on the
// other columns, so VIF_j = TSS_j/RSS_j = TSS_j · Σ_l (R⁻¹)_jl².
func collinearity(r *mat.Dense, norms []float64, rinv *mat.Dense, x [][]float64, names []string) Collinearity {
	k := len(norms)
	scaled := mat.NewDense(k, k, nil)
	for i := 0; i < k; i++ {
		for j := i; j < k; j++ {
			scaled.Set(i, j, r.At(i, j)/norms[j])
		}
	}
	var svd mat.SVD
	var c Collinearity
	c.ConditionNumber = math.Inf(1)
	if svd.Factorize(scaled, mat.SVDNone) {
		s := svd.Values(nil)
		if s[k-1] > 0 {
			c.ConditionNumber = s[0] / s[k-1]
		}
	}
	c.VIF = make([]float64, len(x))
	for j, col := range x {
		var mean, tss, a float64
		for _, v := range col {
			mean += v
		}
		mean /= float64(len(col))
		for _, v := range col {
			tss += (v - mean) * (v - mean)
		}
		for l := j + 1; l < k; l++ {
			a += rinv.At(j+1, l) * rinv.At(j+1, l)
		}
		c.VIF[j] = tss * a
	}
	c.Warnings = c.warnings(names)
	return c
}

// warnings words the figures over the rules of thumb.
func (c Collinearity) warnings(names []string) []string {
	var out []string
	if c.ConditionNumber > ConditionLimit {
		out = append(out, fmt.Sprintf("The condition number of the scaled design is %.3g, over %d (a rule of thumb, not a test): some covariates are close to linear combinations of others, and their coefficients are poorly determined.", c.ConditionNumber, ConditionLimit))
	}
	for j, v := range c.VIF {
		if v > VIFLimit {
			out = append(out, fmt.Sprintf("The variance inflation factor of %s is %.3g, over %d (a rule of thumb, not a test): the other covariates explain %.0f%% of its variation, which inflates its standard error.", names[j], v, VIFLimit, 100*(1-1/v)))
		}
	}
	return out
}
