package regress

import "github.com/areatest/areatest/weights"

// Result is one run of the residual diagnostics on a layer, as Analyse
// returns it: what was fitted on which areas, the fit, and what its
// residuals keep. The text report and the JSON document are two views of
// it; the per-area values sit in Fit (in the order of Rows).
type Result struct {
	// Version is the caller's release, written into the outputs.
	Version string `json:"version"`
	Input   Inputs `json:"input"`
	// Indicators describe how each text covariate became indicator
	// columns.
	Indicators []Indicator `json:"indicators"`
	// Excluded counts the areas of the layer left out, by reason, in the
	// order the reasons first occur.
	Excluded []Exclusion `json:"left_out"`
	// Weights summarises the neighbour graph among the areas with data
	// (islands included), with the scaling the tests use.
	Weights weights.Summary `json:"weights"`
	// IslandsLeftOut counts the areas with data left out for having no
	// neighbour among them; IslandsKept those kept with a zero spatial lag.
	IslandsLeftOut int           `json:"islands_left_out"`
	IslandsKept    int           `json:"islands_kept"`
	Fit            *Fit          `json:"fit"`
	Moran          ResidualMoran `json:"residual_moran"`
	// LM holds the Lagrange multiplier tests; nil, with LMNotComputed
	// saying why, when the design makes them undefined (ErrNoLagSignal).
	LM            *LM    `json:"lagrange_multipliers"`
	LMNotComputed string `json:"lagrange_multipliers_not_computed,omitempty"`
	// Alpha is the level of Suggestion and Reading.
	Alpha      float64 `json:"alpha"`
	Suggestion string  `json:"suggestion,omitempty"`
	Reading    string  `json:"reading"`
	// Draws describes the random draws of whatever the caller drew from
	// the result (nothing in the diagnostics themselves is random); nil
	// when there were none.
	Draws    *Draws   `json:"random_draws"`
	Warnings []string `json:"warnings"`
	Cautions []string `json:"cautions"`
	// Written lists the files the caller wrote from the result.
	Written []string `json:"written,omitempty"`
	// Rows[k] is the layer row of area k of the fit.
	Rows []int `json:"-"`
}

// Inputs say what was read and which columns were used.
type Inputs struct {
	File string `json:"file"`
	// Areas is the number of areas in the layer, Used the number in the
	// fit and the spatial tests.
	Areas   int    `json:"areas"`
	Used    int    `json:"used"`
	Outcome string `json:"outcome"`
	// Covariates are the columns as given; the fit's terms (Fit's
	// coefficients) replace each text one by its indicators.
	Covariates []string `json:"covariates"`
}

// Indicator says how a text covariate entered the model: one 0/1 column
// per level but the baseline, named "column=level".
type Indicator struct {
	Column   string `json:"column"`
	Baseline string `json:"baseline"`
	// Levels are the other levels, in order, each a column of the fit.
	Levels []string `json:"levels"`
	Terms  []string `json:"terms"`
}

// LevelOrder says how the levels of a text covariate are ordered, the
// first being the baseline.
const LevelOrder = "levels sorted by character code, the first is the baseline"

// Exclusion counts the areas left out for one reason.
type Exclusion struct {
	Reason string   `json:"reason"`
	Areas  int      `json:"areas"`
	IDs    []string `json:"ids"`
}

// Draws are the random draws behind a result's companions (a map of local
// statistics of the residuals): the seed, the draws and what they are for.
type Draws struct {
	Seed         uint64 `json:"seed"`
	Permutations int    `json:"permutations"`
	For          string `json:"for"`
}

// Cautions are printed with every result.
var Cautions = []string{
	"A coefficient is an association across areas, not evidence that the covariate causes the outcome.",
	"Results for areas do not carry over to the individuals living in them (the ecological fallacy).",
	"Rates from areas with small populations are unstable: their residuals are large by chance and can drive both the fit and the spatial tests.",
	"This tool supports, and does not replace, the judgement of trained epidemiologists and local rules of practice.",
}
