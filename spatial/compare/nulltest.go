package compare

import (
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
)

// nullTest is one goroutine's copy of the comparison's test, as the
// false-positive check and the SAR check run it on outcomes that are null
// by construction: the group statistic on the outcome, or, with
// covariates, the Freedman–Lane test of the group effect adjusted for them.
// Both checks use it, so that a new kind of test needs one implementation
// here and no second loop.
type nullTest interface {
	// load makes y the outcome under test and returns the vector whose
	// spectral surrogates the surrogate test draws: y itself, or, with
	// covariates, the residuals of the covariates-only model (owned by the
	// test; valid until the next load).
	load(y []float64) ([]float64, error)
	// observed is the statistic of the loaded outcome, scale the tie
	// scale of its surrogate test.
	observed() float64
	scale() float64
	// shuffled is the p-value of the label-shuffle test of the loaded
	// outcome, by B Monte Carlo shuffles (never enumerated, so that the
	// check costs B per outcome), within strata (area order) when set.
	shuffled(strata []int32, B int, seed, purpose uint64) (float64, error)
	// onSurrogates evaluates the statistic of a surrogate of the vector
	// load returned.
	onSurrogates() shuffle.OutcomeEvaluator
}

// groupNull is nullTest for the group statistic: the outcome is sorted
// once per load (groups.Data.Reprepare).
type groupNull struct {
	data *groups.Data
	buf  []int32
	stat groups.Statistic
	alt  shuffle.Alternative
	gs   *GroupStatistic
}

func newGroupNull(gs *GroupStatistic, alt shuffle.Alternative) *groupNull {
	n := len(gs.labels)
	// The labels were checked by NewGroupStatistic, so Prepare cannot fail.
	data, _ := groups.Prepare(make([]float64, n), gs.labels, gs.k)
	return &groupNull{data: data, buf: make([]int32, n), stat: gs.stat, alt: alt, gs: gs}
}

func (g *groupNull) load(y []float64) ([]float64, error) { return y, g.data.Reprepare(y) }
func (g *groupNull) observed() float64                   { return g.data.Observed(g.stat) }

func (g *groupNull) scale() float64 {
	if g.stat.InOutcomeUnits() {
		return g.data.Y[len(g.data.Y)-1] - g.data.Y[0]
	}
	return 1
}

func (g *groupNull) shuffled(strata []int32, B int, seed, purpose uint64) (float64, error) {
	return shuffleSorted(g.data, strata, g.buf, g.stat, g.alt, B, seed, purpose)
}

func (g *groupNull) onSurrogates() shuffle.OutcomeEvaluator { return g.gs.Factory()() }

// adjustedNull is nullTest for the Freedman–Lane test: a clone of the
// comparison's design refitted to each outcome.
type adjustedNull struct {
	fl     *shuffle.FreedmanLane
	two    bool // the t of two groups, else the partial F
	alt    shuffle.Alternative
	labels []int32
	eval   shuffle.Factory
	stat   shuffle.OutcomeEvaluator
}

// newAdjustedNull clones fl; two and alt are the comparison's choice of
// statistic and its alternative.
func newAdjustedNull(fl *shuffle.FreedmanLane, two bool, alt shuffle.Alternative) (*adjustedNull, error) {
	a := &adjustedNull{fl: fl.Clone(), two: two, alt: alt}
	a.labels, a.stat = a.fl.Labels(), a.fl.OnOutcomes(two)()
	if !two {
		a.eval = a.fl.Factory()
		return a, nil
	}
	var err error
	a.eval, err = a.fl.TFactory()
	return a, err
}

func (a *adjustedNull) load(y []float64) ([]float64, error) {
	a.fl.Refit(y)
	return a.fl.ResidualsView(), nil
}

func (a *adjustedNull) observed() float64 { return a.stat(a.fl.ResidualsView()) }
func (a *adjustedNull) scale() float64    { return 1 }

func (a *adjustedNull) shuffled(strata []int32, B int, seed, purpose uint64) (float64, error) {
	res, err := shuffle.Run(shuffle.Plan{Scheme: "check", Labels: a.labels, Strata: strata, Permutations: B, ExactLimit: -1,
		Seed: seed, Purpose: purpose, Workers: 1, Alternative: a.alt, Scale: 1}, a.eval)
	if err != nil {
		return 0, err
	}
	return res.PValue, nil
}

func (a *adjustedNull) onSurrogates() shuffle.OutcomeEvaluator { return a.fl.OnOutcomes(a.two)() }
