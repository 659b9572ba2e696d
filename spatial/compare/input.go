package compare

import (
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/rates"
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
	// Events and Population, when Events is set, make the comparison one of
	// rates (rates.go): the outcome is each area's rate, and the groups are
	// compared by their pooled rates. The Outcome fields are then left
	// empty.
	Events     *Count
	Population *Count
	// countProblem gives, per area, why its counts make no rate (set by
	// withRates when such areas are left out).
	countProblem []string
}

// Count is a column of counts: events, or the population at risk.
type Count struct {
	Name    string
	Values  []float64
	Missing []bool
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
	// Shard, when set, runs one part of every random stage's blocks or
	// replays the parts (see shuffle.Shard); nil runs everything. It does
	// not go with KeepNull.
	Shard *shuffle.Shard
	// Progress, when set, gives the progress callback for a named stage of
	// the work (see shuffle.Plan.Progress).
	Progress func(stage string) func(done, total int)
	// Rates tune a comparison of rates (Input.Events set).
	Rates RateOptions
}

// RateOptions tune a comparison of rates.
type RateOptions struct {
	// Statistic compares the groups' pooled rates; 0 chooses the rate
	// ratio for two groups and the homogeneity X² for more, unless
	// Options.Statistic asks for a statistic of the area rates instead.
	Statistic rates.Statistic
	// Per is the multiplier rates are shown with (100,000: "per 100,000");
	// 0 means 100,000.
	Per float64
	// EventsAbovePopulation allows more events than population (repeat
	// events, person-time).
	EventsAbovePopulation bool
	// LeaveOutBadCounts leaves out areas whose counts make no rate (a
	// population not above zero, a negative count, more events than
	// population), each with its reason, instead of failing on the first.
	LeaveOutBadCounts bool
	// UnstableBelow is the number of events below which an area's rate is
	// flagged as unstable; 0 means rates.DefaultUnstable (20).
	UnstableBelow float64
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
