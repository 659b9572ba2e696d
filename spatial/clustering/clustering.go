package clustering

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Column is one numeric attribute, with its missing mask.
type Column struct {
	Name    string
	Values  []float64
	Missing []bool
}

// Categories is one categorical attribute (text labels), for join counts.
type Categories struct {
	Name    string
	Labels  []string
	Missing []bool
}

// Input is the layer as the statistics see it: ids, the unscaled
// neighbour graph of all areas, and the columns asked for.
type Input struct {
	File        string
	IDs         []string
	Graph       *weights.Graph
	Scaling     weights.Scaling
	KeepIslands bool
	Numeric     []Column
	Categorical []Categories
	// Against, when set, adds the bivariate Moran's I of every numeric
	// variable against the spatial lag of this one.
	Against *Column
	// Events and Population, when both set, add the rate events/population
	// with its raw and empirical-Bayes standardised Moran's I.
	Events, Population *Column
	// Lags > 0 adds a correlogram over neighbour orders 1..Lags.
	Lags int
	// DistanceClasses, when given (binary graphs of all areas, class by
	// class, e.g. from weights.DistanceClasses), make the correlogram run
	// over these distance classes instead of neighbour orders.
	DistanceClasses []*weights.Graph
}

// Options tune the permutation tests.
type Options struct {
	Permutations int
	ExactLimit   int
	Seed         uint64
	Workers      int
	// Alternative: two-sided, or greater for "more clustered than chance"
	// (for Geary's C that is the lower tail; the tool turns it round).
	Alternative shuffle.Alternative
	// Adjust is the multiple-testing method Screen applies across columns.
	Adjust shuffle.Adjustment
	// Progress, when set, gives the progress callback of a named stage.
	Progress func(stage string) func(done, total int)
	// MoranRange computes the range of Moran's I at any size; without it
	// Autocorr computes it up to AutoRangeAreas areas only.
	MoranRange bool
	// RangeAdvice ends the note on a range not computed: how to ask for
	// it (the tool's words; the library names no flag).
	RangeAdvice string
	// Shard, when set, runs one part of every shuffle's blocks or replays
	// the parts (see shuffle.Shard); nil runs everything.
	Shard *shuffle.Shard
}

// Statistic is one global statistic with its moments and tests.
type Statistic struct {
	Value    float64 `json:"value"`
	Expected float64 `json:"expected"`
	// Variances and z-scores under normality and randomisation, where
	// published; analytic p-values from the normal approximation.
	VarianceNormality     float64 `json:"variance_normality,omitempty"`
	VarianceRandomisation float64 `json:"variance_randomisation"`
	ZNormality            float64 `json:"z_normality,omitempty"`
	ZRandomisation        float64 `json:"z_randomisation"`
	PNormality            float64 `json:"p_normality,omitempty"`
	PRandomisation        float64 `json:"p_randomisation"`
	// Permutation is the permutation test from the shared machinery.
	Permutation shuffle.Result `json:"permutation"`
}

// Variable is everything Autocorr reports for one numeric variable.
type Variable struct {
	Name string `json:"variable"`
	// Areas is the number of areas the statistics use; Missing how many
	// lacked a value, Islands how many were left out for having no
	// neighbour among the areas with values.
	Areas   int       `json:"areas"`
	Missing int       `json:"missing"`
	Islands int       `json:"islands_left_out"`
	MoransI Statistic `json:"morans_i"`
	// Bounds is the range Moran's I can take on these weights; nil when
	// it was not computed (RangeSkipped says why).
	Bounds       *autocorr.Bounds `json:"morans_i_range,omitempty"`
	RangeSkipped string           `json:"morans_i_range_skipped,omitempty"`
	GearysC      Statistic        `json:"gearys_c"`
	GeneralG     *Statistic       `json:"general_g,omitempty"`
	// GeneralGSkipped says why General G was not computed.
	GeneralGSkipped string         `json:"general_g_skipped,omitempty"`
	Bivariate       *Bivariate     `json:"bivariate,omitempty"`
	Correlogram     []autocorr.Lag `json:"correlogram,omitempty"`
	// CorrelogramClasses names the classes of the correlogram, one per lag
	// ("order 2", "distance class 0–25 km").
	CorrelogramClasses []string         `json:"correlogram_classes,omitempty"`
	Weights            *weights.Summary `json:"weights,omitempty"`
}

// Bivariate is the bivariate Moran's I of a variable against the spatial lag
// of another.
type Bivariate struct {
	Against string `json:"against"`
	Areas   int    `json:"areas"`
	Statistic
}

// Joins is the join-count analysis of one categorical variable.
type Joins struct {
	Name    string            `json:"variable"`
	Areas   int               `json:"areas"`
	Missing int               `json:"missing"`
	Levels  []string          `json:"levels"`
	Test    autocorr.JoinTest `json:"joins"`
}

// Rate is the clustering of events/population, raw and standardised.
type Rate struct {
	Events     string `json:"events"`
	Population string `json:"population"`
	Areas      int    `json:"areas"`
	Missing    int    `json:"missing"`
	// Raw is Moran's I of the raw rates; EB of the empirical-Bayes scores.
	Raw      Statistic        `json:"raw"`
	EB       Statistic        `json:"empirical_bayes"`
	MeanRate float64          `json:"mean_rate"`
	Floored  []string         `json:"variance_floored_ids"`
	AboveOne []string         `json:"rate_above_one_ids"`
	Smallest float64          `json:"smallest_population"`
	Largest  float64          `json:"largest_population"`
	Weights  *weights.Summary `json:"weights,omitempty"`
}

// Result is the document `areatest autocorr` writes.
type Result struct {
	Version   string          `json:"version"`
	Seed      uint64          `json:"seed"`
	Input     string          `json:"input"`
	Areas     int             `json:"areas"`
	Weights   weights.Summary `json:"weights"`
	Variables []Variable      `json:"variables"`
	Joins     []Joins         `json:"join_counts,omitempty"`
	Rate      *Rate           `json:"rate,omitempty"`
	// Warnings start with the weights' own (Weights.Warnings), then those
	// of the statistics.
	Warnings []string `json:"warnings"`
	Cautions []string `json:"cautions"`
	// IslandsLeftOut counts the areas without a neighbour that every
	// statistic leaves out (Input.KeepIslands unset). The warning about
	// them is the caller's to word, after the weights' warnings, since how
	// to keep them is a setting of the caller's.
	IslandsLeftOut int `json:"-"`
	// ranges shares the range of Moran's I between variables on the same
	// areas.
	ranges rangeCache
}

// Cautions are printed with every clustering result.
var Cautions = []string{
	"Clustering describes a pattern across areas; it does not say what causes it.",
	"Results for areas do not carry over to the individuals living in them (the ecological fallacy).",
	"Rates from areas with small populations are unstable; prefer the empirical-Bayes result for rates.",
	"This tool supports, and does not replace, the judgement of trained epidemiologists and local rules of practice.",
}

// normalP turns a z-score into the p-value of the alternative.
func normalP(z float64, alt shuffle.Alternative) float64 {
	if math.IsNaN(z) || math.IsInf(z, 0) {
		return math.NaN()
	}
	std := distuv.UnitNormal
	switch alt {
	case shuffle.Greater:
		return std.Survival(z)
	case shuffle.Less:
		return std.CDF(z)
	}
	return 2 * std.Survival(math.Abs(z))
}

// flip turns an alternative round, for statistics (Geary's C) whose small
// values mean clustering.
func flip(a shuffle.Alternative) shuffle.Alternative {
	switch a {
	case shuffle.Greater:
		return shuffle.Less
	case shuffle.Less:
		return shuffle.Greater
	}
	return a
}

// errTooFew is returned when too few areas with data have neighbours.
var errTooFew = errors.New("fewer than 4 areas with a value have a neighbour among themselves")

func (in *Input) restrict(keep []int) (*weights.Restricted, error) {
	r, err := weights.Restrict(in.Graph, keep, in.IDs, in.Scaling, in.KeepIslands)
	if err != nil {
		return nil, err
	}
	if len(r.Used) < 4 || r.Graph.Links() == 0 {
		return r, errTooFew
	}
	return r, nil
}

func plan(opt Options, purpose uint64, alt shuffle.Alternative) shuffle.Plan {
	return shuffle.Plan{Scheme: "free", Permutations: opt.Permutations, ExactLimit: opt.ExactLimit,
		Seed: opt.Seed, Purpose: purpose, Workers: opt.Workers, Alternative: alt, Shard: opt.Shard}
}

// planFor is plan with the progress callback of a named stage.
func planFor(opt Options, stage string, purpose uint64, alt shuffle.Alternative) shuffle.Plan {
	p := plan(opt, purpose, alt)
	if opt.Progress != nil {
		p.Progress = opt.Progress(stage)
	}
	return p
}

func fromMoran(t autocorr.Test, alt shuffle.Alternative) Statistic {
	s := Statistic{Value: t.MoransI, Expected: t.Expected, VarianceNormality: t.VarianceNormality,
		VarianceRandomisation: t.VarianceRandomisation, ZRandomisation: t.ZRandomisation, Permutation: t.Permutation}
	if t.VarianceNormality > 0 {
		s.ZNormality = (t.MoransI - t.Expected) / math.Sqrt(t.VarianceNormality)
		s.PNormality = normalP(s.ZNormality, alt)
	}
	s.PRandomisation = normalP(s.ZRandomisation, alt)
	return s
}

func named(err error, name string) error {
	return fmt.Errorf("column %q: %w", name, err)
}

// Shuffles is the number of shuffles per test of the result: every test
// of one run draws the same number.
func (r *Result) Shuffles() int {
	for _, v := range r.Variables {
		return v.MoransI.Permutation.Permutations
	}
	if r.Rate != nil {
		return r.Rate.Raw.Permutation.Permutations
	}
	for _, j := range r.Joins {
		return j.Test.Different.Permutation.Permutations
	}
	return 0
}

// RangeShare is how far Moran's I lies from its expected value towards the
// bound of Bounds on its side, as a fraction; towardsMax says the side is
// the maximum. It is 0 when the range was not computed.
func (v *Variable) RangeShare() (share float64, towardsMax bool) {
	i, e := v.MoransI.Value, v.MoransI.Expected
	switch {
	case v.Bounds == nil:
		return 0, i >= e
	case i >= e && v.Bounds.Max != e:
		return (i - e) / (v.Bounds.Max - e), true
	case i >= e:
		return 0, true
	case v.Bounds.Min == e:
		return 0, false
	}
	return -(i - e) / (v.Bounds.Min - e), false
}
