package regress

import (
	"fmt"
	"math"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// ExactLimit is the largest number of areas for which Moran computes the
// exact p-value: it needs the eigenvalues of a dense (n − k)×(n − k)
// matrix, O(n³) time (about 3 s at 1,500 areas on a 2-core machine,
// BenchmarkExact1500; 0.6 s at 900)
// and 8n² bytes.
const ExactLimit = 1500

// ResidualMoran is Moran's I of the residuals of a fit, with its moments
// under the regression's projection and normal errors.
type ResidualMoran struct {
	// I = (n/S0) · eᵀWe / eᵀe.
	I float64 `json:"morans_i"`
	// Mean and Variance are the exact moments of I when the errors are
	// independent normal with one variance (Cliff & Ord 1981): the
	// residuals are e = Mε, not ε, so E[I] is not −1/(n − 1) but depends
	// on the covariates.
	Mean     float64 `json:"expected"`
	Variance float64 `json:"variance"`
	// Z is (I − Mean)/√Variance; P its p-value from the normal
	// distribution for the alternative chosen.
	Z float64 `json:"z"`
	P float64 `json:"p"`
	// Alternative is the direction of P and ExactP.
	Alternative string `json:"alternative"`
	// Exact says whether ExactP was computed (n ≤ ExactLimit): the
	// p-value of I under normal errors without the normal approximation,
	// by Imhof's (1961) inversion of the characteristic function, accurate
	// to about 1e-12 absolute (so a tiny ExactP is "below 1e-10", not its
	// digits). ExactP is 0 when not computed.
	Exact  bool    `json:"exact_computed"`
	ExactP float64 `json:"exact_p"`
}

// Moran returns Moran's I of the residuals on the graph g (the areas of the
// fit, in its order, weighted as the caller chose), its exact mean and
// variance under normal errors and the regression's projection
// M = I − X(XᵀX)⁻¹Xᵀ, and the p-values for the alternative alt: by the
// normal approximation always, and exact when there are at most ExactLimit
// areas.
//
// The moments, for e = Mε with ε ~ N(0, σ²I) and k coefficients (Cliff &
// Ord 1981, Spatial Processes, sect. 8.3; Anselin 1988, Spatial
// Econometrics, eq. 8.3–8.4), written here from memory and checked by
// simulation (TestMomentsAgainstSimulation) and against a dense numpy
// implementation on the states (tests/regress_states_test.go):
//
//	E[I]   = (n/S0) · tr(MW) / (n − k)
//	E[I²]  = (n/S0)² · [tr(MWMWᵀ) + tr(MWMW) + tr(MW)²] / ((n − k)(n − k + 2))
//	Var[I] = E[I²] − E[I]²
//
// They follow because I·S0/n = εᵀMWMε / εᵀMε is independent of its
// denominator (Pitman–Koopmans), so its moments are ratios of the moments
// of the two quadratic forms. The traces come from the sparse graph (see
// traces).
func (f *Fit) Moran(g *weights.Graph, alt shuffle.Alternative) (ResidualMoran, error) {
	if err := f.checkGraph(g); err != nil {
		return ResidualMoran{}, err
	}
	t := f.traces(g)
	if t.s0 == 0 {
		return ResidualMoran{}, fmt.Errorf("regress: the weights of the neighbour graph sum to zero")
	}
	n := float64(f.Areas)
	m := float64(f.DF)
	scale := n / t.s0
	we := make([]float64, f.Areas)
	lag(g, f.Residuals, we)
	var cross float64
	for i, e := range f.Residuals {
		cross += e * we[i]
	}
	r := ResidualMoran{I: scale * cross / f.rss, Alternative: alt.String()}
	r.Mean = scale * t.mw / m
	second := scale * scale * (t.mwmwt + t.mwmw + t.mw*t.mw) / (m * (m + 2))
	r.Variance = second - r.Mean*r.Mean
	if !(r.Variance > 0) {
		return r, fmt.Errorf("regress: the residual Moran's I has no variance on this graph and design")
	}
	r.Z = (r.I - r.Mean) / math.Sqrt(r.Variance)
	// The tails by the complementary error function, which keeps their
	// digits far out (the normal's Survival underflows to 0 above z ≈ 8.3).
	upper, lower := 0.5*math.Erfc(r.Z/math.Sqrt2), 0.5*math.Erfc(-r.Z/math.Sqrt2)
	r.P = sided(alt, upper, lower)
	if f.Areas <= ExactLimit {
		upper, err := f.exactUpper(g, r.I*t.s0/n)
		if err != nil {
			return r, err
		}
		r.Exact = true
		r.ExactP = sided(alt, upper, 1-upper)
	}
	return r, nil
}

// sided combines the upper and lower tail probabilities for alt.
func sided(alt shuffle.Alternative, upper, lower float64) float64 {
	switch alt {
	case shuffle.Greater:
		return upper
	case shuffle.Less:
		return lower
	default:
		return math.Min(1, 2*math.Min(upper, lower))
	}
}
