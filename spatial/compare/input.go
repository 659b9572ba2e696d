package compare

import (
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/weights"
)

// Input is what one comparison needs. All slices have one entry per area of
// the layer, in layer order.
type Input struct {
	IDs []string
	// Outcome values, with OutcomeMissing marking areas without one.
	OutcomeName    string
	Outcome        []float64
	OutcomeMissing []bool
	// Group labels as text, with GroupMissing marking areas without one.
	GroupName    string
	Group        []string
	GroupMissing []bool
	// Strata labels, optional (nil when no strata were asked for).
	StrataName    string
	Strata        []string
	StrataMissing []bool
	// Graph is the neighbour graph of all areas of the layer, before any
	// scaling.
	Graph *weights.Graph
	// Scaling is applied to the graph among the tested areas before the
	// spatial check; empty means row-standardised.
	Scaling weights.Scaling
	// KeepIslands keeps areas without neighbours in the spatial check, with
	// a spatial lag of zero, instead of leaving them out.
	KeepIslands bool
	// Covariates, when given, make every scheme test the group effect
	// adjusted for them (Freedman & Lane 1983).
	Covariates []Covariate
}

// Covariate is a numeric column to adjust for.
type Covariate struct {
	Name    string
	Values  []float64
	Missing []bool
}

// Options tune the comparison.
type Options struct {
	// Statistic, when nil, is chosen from the number of groups: difference
	// in medians for two, Kruskal–Wallis H for more.
	Statistic *groups.Statistic
	// Contrast names the two levels A and B of a two-group contrast, A − B.
	// With more than two levels in the data it restricts the test to them.
	Contrast    []string
	Alternative shuffle.Alternative
	// Permutations is the number of Monte Carlo shuffles B per scheme, at
	// most shuffle.MaxPermutations.
	Permutations int
	// ExactLimit as in shuffle.Plan.
	ExactLimit int
	Seed       uint64
	Workers    int
	// Alpha is the level at which the spatial check calls clustering
	// significant.
	Alpha float64
	// Zones adds a shuffle within automatic contiguous zones when no strata
	// are given and at least ZoneMinAreas areas are tested.
	Zones bool
	// Surrogates is the number of spectral surrogates of the outcome for
	// the spatially constrained scheme (0: not run), at most MaxSurrogates.
	Surrogates int
	// FalsePositives is the number of surrogates on which the free
	// shuffle's false-positive rate is measured (0: not measured; at most
	// MaxFalsePositiveChecks), with FalsePositiveShuffles Monte Carlo
	// shuffles each (0: DefaultCheckShuffles; at most MaxCheckShuffles),
	// enough for a p-value at or below Alpha (see CheckShufflesError).
	FalsePositives, FalsePositiveShuffles int
	// SARChecks and SARCheckSurrogates are the number of outcomes
	// simulated from the fitted SAR model on which the spectral
	// surrogates' false-positive rate is measured, and the surrogates of
	// each one's test (0: DefaultSARChecks and DefaultSARCheckSurrogates).
	// The check runs when the spectral surrogates and the false-positive
	// check both do.
	SARChecks, SARCheckSurrogates int
	// Basis tunes the eigenbasis of the surrogates.
	Basis surrogate.Options
	// KeepNull keeps every row's null values (TestRow.Null: the shuffles
	// of the free and within-strata or zones rows, adjusted ones with
	// covariates, and the spectral surrogates' values), for a picture of
	// the null distributions. The false-positive and SAR checks keep
	// nothing: their rows carry the rates. At most 8 bytes per draw and
	// row; off, memory does not grow with the draws.
	KeepNull bool
	// Progress, when set, gives the progress callback for a named stage of
	// the work (see shuffle.Plan.Progress).
	Progress func(stage string) func(done, total int)
}

// checkShuffles is FalsePositiveShuffles with its default.
func (o Options) checkShuffles() int {
	if o.FalsePositiveShuffles == 0 {
		return DefaultCheckShuffles
	}
	return o.FalsePositiveShuffles
}

func (o Options) progress(stage string) func(done, total int) {
	if o.Progress == nil {
		return nil
	}
	return o.Progress(stage)
}
