package compare

import (
	"strings"

	"github.com/areatest/areatest/spatial/effective"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/weights"
)

// Result is everything a report shows. The text report, the JSON document
// and any later view render this one struct.
type Result struct {
	Version string    `json:"version"`
	Seed    uint64    `json:"seed"`
	Input   InputInfo `json:"input"`
	// Weights summarises the neighbour graph among the tested areas.
	Weights weights.Summary `json:"weights"`
	Groups  []GroupResult   `json:"groups"`
	// Statistic describes the group statistic and its observed value.
	Statistic StatisticInfo `json:"statistic"`
	// Tests holds one entry per shuffle scheme, the free shuffle first.
	Tests           []TestRow       `json:"tests"`
	Autocorrelation Autocorrelation `json:"autocorrelation"`
	Excluded        []Exclusion     `json:"excluded"`
	Warnings        []string        `json:"warnings"`
	Cautions        []string        `json:"cautions"`
	// Adjusted describes the covariate adjustment, when asked for.
	Adjusted *CovariateInfo `json:"adjusted,omitempty"`
	// Rates describes a comparison of rates: the groups' pooled rates,
	// the unstable rates and the missing counts.
	Rates *RatesInfo `json:"rates,omitempty"`
	// Zones describes the automatic zones of the within-zone shuffle.
	Zones *ZonesInfo `json:"zones,omitempty"`
	// EffectiveSampleSize is the modified t-test of outcome against
	// grouping: how many independent areas the data are worth.
	EffectiveSampleSize *EffectiveInfo `json:"effective_sample_size,omitempty"`
	// Spectral describes the eigenbasis behind the spectral surrogates.
	Spectral *SpectralInfo `json:"spectral_basis,omitempty"`
	// FalsePositiveRate is the measured share of true nulls the free
	// shuffle rejects on surrogates with the outcome's spatial pattern:
	// Tests[0].FalsePositives, kept here for readers of earlier versions.
	FalsePositiveRate *FalsePositiveRate `json:"false_positive_rate,omitempty"`
	// SARCheck describes the SAR model behind the spectral row's measured
	// false-positive rate, when the check ran or was skipped.
	SARCheck *SARCheckInfo `json:"sar_check,omitempty"`
	// Recommended names the p-value to read and why.
	Recommended Recommendation `json:"recommended"`
}

// TestRow is one p-value of the comparison: a scheme's test and, for a
// label-shuffle row when the false-positive check ran, the rate at which
// that very shuffle rejected true nulls on the check's surrogates.
type TestRow struct {
	shuffle.Result
	// FalsePositives is nil when the check did not run. For the
	// spectral surrogates it is measured on outcomes simulated from the
	// SAR model fitted to the outcome (Result.SARCheck), not on
	// surrogates, which would be circular: Surrogates counts the
	// simulated outcomes and Permutations the surrogates of each test.
	FalsePositives *FalsePositiveRate `json:"false_positive_rate,omitempty"`
	// Calibrated is the spectral row's p-value calibrated to the SAR
	// null generator, set with its measured rate.
	Calibrated *Calibration `json:"calibrated,omitempty"`
}

// Unsound reports whether the row's measured false-positive rate lies
// above its level: the whole 95% interval above Alpha.
func (t TestRow) Unsound() bool {
	return t.FalsePositives != nil && t.FalsePositives.Interval[0] > t.FalsePositives.Alpha
}

// NullPattern names what the surrogates and the SAR model keep the spatial
// pattern of: the outcome, or, with covariates, its residuals from them
// ("the residuals of rate from income").
func (r *Result) NullPattern() string {
	if r.Rates != nil {
		return "the empirical-Bayes standardised rates of " + r.Rates.Events + " per " + r.Rates.Population
	}
	if r.Adjusted != nil {
		return "the residuals of " + r.Input.Outcome + " from " + strings.Join(r.Adjusted.Covariates, ", ")
	}
	return r.Input.Outcome
}

// SpectralInfo describes the eigenbasis of the spectral surrogates and how
// faithfully surrogates keep the outcome's Moran's I.
type SpectralInfo struct {
	surrogate.Info
	// ResidualShare is the share of the outcome's variance outside the
	// stored eigenvectors (0 for a complete basis), MoranTolerance the
	// guaranteed bound on how far a surrogate's Moran's I can move.
	ResidualShare  float64 `json:"residual_share"`
	MoranTolerance float64 `json:"morans_i_tolerance"`
}

// Recommendation is the p-value the tool advises reading.
type Recommendation struct {
	Scheme string  `json:"scheme"`
	PValue float64 `json:"p_value"`
	Reason string  `json:"reason"`
}

// CovariateInfo describes the Freedman–Lane adjustment.
type CovariateInfo struct {
	Covariates []string `json:"covariates"`
	Method     string   `json:"method"`
	Statistic  string   `json:"statistic"`
	Observed   float64  `json:"observed"`
	// ClassicalP is the p-value of the same statistic from its t or F
	// distribution, exact for independent normal errors.
	ClassicalP float64 `json:"classical_p_value"`
}

// ZonesInfo describes automatic contiguous zones.
type ZonesInfo struct {
	Zones int   `json:"zones"`
	Sizes []int `json:"sizes"`
}

// EffectiveInfo is the modified t-test of the outcome against a group
// indicator (group Level against the rest).
type EffectiveInfo struct {
	effective.Result
	Level   string             `json:"level"`
	Note    string             `json:"note,omitempty"`
	ByGroup []EffectiveByGroup `json:"by_group,omitempty"`
}

// EffectiveByGroup is the modified t-test of one group against the others.
type EffectiveByGroup struct {
	Level string `json:"level"`
	effective.Result
}

// InputInfo says what was read and which columns were used.
type InputInfo struct {
	File    string `json:"file"`
	Areas   int    `json:"areas"`
	Tested  int    `json:"tested"`
	Outcome string `json:"outcome"`
	Group   string `json:"group"`
	Strata  string `json:"strata,omitempty"`
}

// GroupResult is one group's size and outcome summary.
type GroupResult struct {
	Level string `json:"level"`
	groups.Summary
}

// StatisticInfo names the group statistic and gives its observed value.
type StatisticInfo struct {
	Name     string  `json:"name"`
	Label    string  `json:"label"`
	Observed float64 `json:"observed"`
	// Contrast is [A, B] for a two-group statistic, read as A − B.
	Contrast []string `json:"contrast,omitempty"`
	// Units says whether Observed is in the outcome's units.
	InOutcomeUnits bool `json:"in_outcome_units"`
}

// Autocorrelation is the spatial check: Moran's I of the outcome and of each
// group indicator, with permutation p-values.
type Autocorrelation struct {
	Outcome VariableMoran   `json:"outcome"`
	Group   []VariableMoran `json:"group"`
	// Clustered is true when both the outcome and some group indicator show
	// significant positive autocorrelation at Alpha.
	Clustered bool    `json:"clustered"`
	Alpha     float64 `json:"alpha"`
	// Skipped, when set, says why the check could not run (too few tested
	// areas with a neighbour); Clustered is then false for want of a
	// check, not because nothing clusters.
	Skipped string `json:"skipped,omitempty"`
}

// VariableMoran is Moran's I of one variable.
type VariableMoran struct {
	Variable     string  `json:"variable"`
	MoransI      float64 `json:"morans_i"`
	Expected     float64 `json:"expected"`
	PValue       float64 `json:"p_value"`
	Permutations int     `json:"permutations"`
	Exact        bool    `json:"exact"`
}

// Exclusion counts the areas left out for one reason.
type Exclusion struct {
	Reason string   `json:"reason"`
	Areas  int      `json:"areas"`
	IDs    []string `json:"ids"`
}

// Cautions are printed with every result.
var Cautions = []string{
	"An association between areas is not evidence that one thing causes the other.",
	"Results for areas do not carry over to the individuals living in them (the ecological fallacy).",
	"Rates from areas with small populations are unstable and can dominate a comparison.",
	"This tool supports, and does not replace, the judgement of trained epidemiologists and local rules of practice.",
}
