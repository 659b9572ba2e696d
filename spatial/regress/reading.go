package regress

import (
	"fmt"
	"strings"
)

// Suggestion is what the LM tests point to, by the decision rule that
// Anselin, Bera, Florax & Yoon (1996) published with the robust tests.
type Suggestion int

const (
	// NoDependence: neither the error nor the lag test rejects.
	NoDependence Suggestion = iota
	// ErrorModel: the evidence points to spatially autocorrelated errors.
	ErrorModel
	// LagModel: the evidence points to a spatially lagged outcome.
	LagModel
	// BothKinds: both robust tests reject; the larger points to the
	// stronger kind, and a model with both terms is worth considering.
	BothKinds
	// Unclear: both plain tests reject but neither robust one does.
	Unclear
)

// String names the suggestion in a few words.
func (s Suggestion) String() string {
	switch s {
	case ErrorModel:
		return "spatial error model"
	case LagModel:
		return "spatial lag model"
	case BothKinds:
		return "both kinds of dependence"
	case Unclear:
		return "dependence of unclear kind"
	default:
		return "no spatial dependence left"
	}
}

// Suggest applies the decision rule at level alpha: if neither plain test
// rejects, nothing is left; if one does, its kind; if both do, the robust
// tests decide — the one that rejects, or when both do, both kinds (the
// larger robust statistic the stronger), or when neither does, unclear.
func Suggest(lm LM, alpha float64) Suggestion {
	e, l := lm.Error.P < alpha, lm.Lag.P < alpha
	switch {
	case !e && !l:
		return NoDependence
	case e && !l:
		return ErrorModel
	case l && !e:
		return LagModel
	}
	re, rl := lm.RobustError.P < alpha, lm.RobustLag.P < alpha
	switch {
	case re && rl:
		return BothKinds
	case re:
		return ErrorModel
	case rl:
		return LagModel
	}
	return Unclear
}

// Caution is the sentence every reading of the LM tests ends with.
const Caution = "These tests are diagnostics that point to the next model to try, not a choice of model by themselves: a pattern left in the residuals can also come from a missing covariate or the wrong form of one, and association between areas is not causation."

// Reading words the LM tests at level alpha: which tests reject, what the
// decision rule suggests, and Caution.
func Reading(lm LM, alpha float64) string {
	var b strings.Builder
	names := []struct {
		name string
		t    Test
	}{{"error", lm.Error}, {"lag", lm.Lag}, {"robust error", lm.RobustError}, {"robust lag", lm.RobustLag}, {"joint", lm.Joint}}
	var rejected []string
	for _, x := range names {
		if x.t.P < alpha {
			rejected = append(rejected, x.name)
		}
	}
	if len(rejected) == 0 {
		fmt.Fprintf(&b, "No Lagrange multiplier test rejects at the %g level. ", alpha)
	} else {
		fmt.Fprintf(&b, "At the %g level these Lagrange multiplier tests reject: %s. ", alpha, strings.Join(rejected, ", "))
	}
	switch Suggest(lm, alpha) {
	case NoDependence:
		b.WriteString("Neither the error nor the lag test finds spatial dependence left in the residuals, so least squares may be adequate on this graph.")
	case ErrorModel:
		b.WriteString("The evidence points to spatially autocorrelated errors: a spatial error model is the one to try next.")
	case LagModel:
		b.WriteString("The evidence points to a spatially lagged outcome: a spatial lag model is the one to try next.")
	case BothKinds:
		kind := "error"
		if lm.RobustLag.Statistic > lm.RobustError.Statistic {
			kind = "lag"
		}
		fmt.Fprintf(&b, "Both robust tests reject, so both kinds of dependence may be present; the %s term is the stronger (larger robust statistic), and a model with both terms is worth considering.", kind)
	case Unclear:
		b.WriteString("Both plain tests reject but neither robust test does, so dependence is present but its kind is unclear; the two may be hard to tell apart on this graph.")
	}
	b.WriteString(" ")
	b.WriteString(Caution)
	return b.String()
}
