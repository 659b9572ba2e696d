package regress

import (
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// jarqueBera tests the residuals e for normality (Jarque & Bera 1980,
// Econ. Lett. 6:255–259): JB = n/6 · (S² + (K − 3)²/4) with the sample
// skewness S = m3/m2^{3/2} and kurtosis K = m4/m2², m_r the r-th moment
// about the mean, divided by n; χ² with 2 degrees of freedom for large n.
func jarqueBera(e []float64) Test {
	n := float64(len(e))
	var mean float64
	for _, v := range e {
		mean += v
	}
	mean /= n
	var m2, m3, m4 float64
	for _, v := range e {
		d := v - mean
		d2 := d * d
		m2 += d2
		m3 += d2 * d
		m4 += d2 * d2
	}
	m2, m3, m4 = m2/n, m3/n, m4/n
	s := m3 / math.Pow(m2, 1.5)
	k := m4 / (m2 * m2)
	jb := n / 6 * (s*s + (k-3)*(k-3)/4)
	return chiSquare(jb, 2)
}

// heteroskedasticity returns the Breusch–Pagan test (Breusch & Pagan 1979,
// Econometrica 47:1287–1294) and its studentised form (Koenker 1981,
// J. Econometrics 17:107–112) of whether the residual variance depends on
// the covariates: both regress the squared residuals u_i = e_i² on the
// intercept and the covariates, with explained sum of squares ESS and R²,
// and
//
//	BP = ESS / (2 ū²),  Koenker = n R²,
//
// χ² with k − 1 degrees of freedom. BP is ESS/2 of the regression of
// u/ū, which assumes normal errors (E u² = 3σ⁴); Koenker's form replaces
// that fourth moment by the sample's and keeps its level when the errors
// are not normal. The auxiliary regression shares the model's design, so
// its fit is a projection on the stored basis: ESS = ‖Qᵀ(u − ū)‖². Without
// covariates there is nothing to test: both are 0 on 0 degrees of freedom,
// with p-value 1.
func (f *Fit) heteroskedasticity() (bp, koenker Test) {
	if f.k == 1 {
		return Test{P: 1}, Test{P: 1}
	}
	n := f.Areas
	u := make([]float64, n)
	var mean float64
	for i, e := range f.Residuals {
		u[i] = e * e
		mean += u[i]
	}
	mean /= float64(n)
	var tss float64
	for i := range u {
		u[i] -= mean
		tss += u[i] * u[i]
	}
	if tss == 0 { // every residual of one size: no variation to explain
		return chiSquare(0, float64(f.k-1)), chiSquare(0, float64(f.k-1))
	}
	c := make([]float64, f.k)
	f.project(u, c)
	var ess float64
	for _, v := range c {
		ess += v * v
	}
	df := float64(f.k - 1)
	return chiSquare(ess/(2*mean*mean), df), chiSquare(float64(n)*ess/tss, df)
}

// chiSquare returns the statistic with its upper-tail χ² p-value.
func chiSquare(stat, df float64) Test {
	return Test{Statistic: stat, DF: df, P: distuv.ChiSquared{K: df}.Survival(stat)}
}
