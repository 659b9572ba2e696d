package regress

import (
	"errors"

	"github.com/areatest/areatest/weights"
)

// LM holds the Lagrange multiplier tests of the least-squares residuals
// against the two spatial alternatives: a spatially autocorrelated error
// (y = Xβ + u, u = λWu + ε) and a spatially lagged outcome
// (y = ρWy + Xβ + ε). Each is χ² with 1 degree of freedom under the null
// of no spatial dependence, Joint with 2; all are asymptotic.
type LM struct {
	// Error is the test of λ = 0 (Burridge 1980, JRSS B 42:107–108).
	Error Test `json:"error"`
	// Lag is the test of ρ = 0 (Anselin 1988, Spatial Econometrics).
	Lag Test `json:"lag"`
	// RobustError and RobustLag test each parameter allowing for the
	// other being non-zero nearby (Anselin, Bera, Florax & Yoon 1996, Reg.
	// Sci. Urban Econ. 26:77–104): Error and Lag each also reject when
	// only the other kind of dependence is there; the robust forms much
	// less so.
	RobustError Test `json:"robust_error"`
	RobustLag   Test `json:"robust_lag"`
	// Joint tests λ = ρ = 0 together (Anselin 1988).
	Joint Test `json:"joint"`
}

// ErrNoLagSignal is returned when the spatial lag of the fitted values is
// explained entirely by the design (for example a row-standardised graph
// and no covariates: W1 = 1), so the lag and error alternatives cannot be
// told apart and the robust tests are undefined.
var ErrNoLagSignal = errors.New("regress: the spatial lag of the fitted values lies in the span of the design, so the lag and error tests cannot be told apart (the model needs a covariate that varies across areas)")

// LagrangeMultipliers returns the LM tests of the fit's residuals on the
// graph g (the areas of the fit, in its order, weighted as the caller
// chose; the tests are usually run on a row-standardised graph). With
// σ̂² = eᵀe/n, T = tr(WᵀW + W²), d_λ = eᵀWe/σ̂², d_ρ = eᵀWy/σ̂² and
// D = [‖M W Xβ̂‖² + T σ̂²]/σ̂² (Anselin 1988, ch. 8; Anselin et al. 1996,
// eqs. 13–14 and 20 ff.; written here from memory and checked against a
// dense numpy implementation of the same formulas and by simulation):
//
//	Error       = d_λ² / T
//	Lag         = d_ρ² / D
//	RobustError = (d_λ − (T/D) d_ρ)² / (T − T²/D)
//	RobustLag   = (d_ρ − d_λ)² / (D − T)
//	Joint       = RobustLag + Error  (= RobustError + Lag, an identity)
//
// Everything costs a few passes over the links and the n×k basis.
func (f *Fit) LagrangeMultipliers(g *weights.Graph) (LM, error) {
	if err := f.checkGraph(g); err != nil {
		return LM{}, err
	}
	n := f.Areas
	_, wwt, ww := weightTraces(g)
	t := wwt + ww
	s2 := f.rss / float64(n)
	we := make([]float64, n)
	wy := make([]float64, n)
	lag(g, f.Residuals, we)
	lag(g, f.y, wy)
	var eWe, eWy float64
	for i, e := range f.Residuals {
		eWe += e * we[i]
		eWy += e * wy[i]
	}
	dl, dr := eWe/s2, eWy/s2
	wxb := make([]float64, n)
	lag(g, f.Fitted, wxb)
	var scale float64
	for _, v := range wxb {
		scale += v * v
	}
	f.residualise(wxb, make([]float64, f.k))
	f.residualise(wxb, make([]float64, f.k))
	var mwxb float64
	for _, v := range wxb {
		mwxb += v * v
	}
	if !(t > 0) {
		return LM{}, errors.New("regress: tr(WᵀW + W²) is zero on this graph")
	}
	if !(mwxb > 1e-12*scale) {
		return LM{}, ErrNoLagSignal
	}
	d := (mwxb + t*s2) / s2
	var lm LM
	lm.Error = chiSquare(dl*dl/t, 1)
	lm.Lag = chiSquare(dr*dr/d, 1)
	re := dl - t/d*dr
	lm.RobustError = chiSquare(re*re/(t-t*t/d), 1)
	lm.RobustLag = chiSquare((dr-dl)*(dr-dl)/(d-t), 1)
	lm.Joint = chiSquare(lm.RobustLag.Statistic+lm.Error.Statistic, 2)
	return lm, nil
}
