package compare

import (
	"cmp"
	"fmt"
	"slices"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/weights"
)

// SpectralScheme names the spatially constrained scheme in results.
const SpectralScheme = "spectral surrogates"

// spectral adds the spatially constrained scheme (Moran spectral
// randomisation of the outcome, Wagner & Dray 2015; with covariates, of
// its residuals from the covariates-only model) and measures every
// label-shuffle row's false-positive rate on surrogates with that spatial
// structure and no link to the grouping, then the spectral row's own on
// outcomes simulated from a SAR model (sarCheck).
func (c *comparison) spectral(t *tester, res *Result) error {
	in, opt := c.in, c.opt
	// Every tested area enters; the basis sets islands apart (their values
	// are permuted among themselves) unless they are kept.
	r, err := weights.Restrict(in.Graph, c.keep, in.IDs, in.Scaling, true)
	if err != nil {
		return err
	}
	bo := opt.Basis
	bo.Seed, bo.KeepIslands = opt.Seed, in.KeepIslands
	basis, err := surrogate.NewBasis(r.Graph, bo)
	if err != nil {
		res.Warnings = append(res.Warnings, fmt.Sprintf("Spectral surrogates were skipped: %v.", err))
		return nil
	}
	info := basis.Info()
	target := t.target(c)
	o, err := basis.Prepare(target)
	if err != nil {
		return err
	}
	res.Spectral = &SpectralInfo{Info: info, ResidualShare: o.ResidualShare(), MoranTolerance: o.MoranTolerance()}
	if opt.Surrogates > 0 {
		if err := c.surrogateTest(t, o, res); err != nil {
			return err
		}
	}
	if opt.FalsePositives > 0 {
		alpha := cmp.Or(opt.Alpha, 0.05)
		rates, err := falsePositives(o, t.null(c), c.checks, opt.FalsePositives, opt.checkShuffles(), alpha, FPROptions{
			Seed: opt.Seed, Purpose: streamFalsePositives, Workers: opt.Workers, Progress: opt.progress("false-positive check"), Shard: opt.Shard})
		if err != nil {
			return err
		}
		for j, row := range c.checkRows {
			res.Tests[row].FalsePositives = &rates[j]
		}
		res.FalsePositiveRate = &rates[0]
		if opt.Surrogates > 0 {
			return c.sarCheck(t, r.Graph, basis, target, res)
		}
	}
	return nil
}

// surrogateTest adds the spectral surrogate test of the reported
// statistic: the group statistic of the outcome's surrogates, or, with
// covariates, the adjusted statistic of its residuals' surrogates.
func (c *comparison) surrogateTest(t *tester, o *surrogate.Outcome, res *Result) error {
	opt := c.opt
	plan := shuffle.SurrogatePlan{Scheme: SpectralScheme, Draws: opt.Surrogates, Seed: opt.Seed, Purpose: streamSurrogates,
		Workers: opt.Workers, Alternative: t.testAlt(), Scale: 1, KeepNull: opt.KeepNull, Progress: opt.progress("spectral surrogates"), Shard: opt.Shard}
	var sp shuffle.Result
	var err error
	switch {
	case t.fl != nil:
		sp, err = shuffle.RunSurrogates(plan, res.Adjusted.Observed, o.NewDraw, t.fl.OnOutcomes(c.k() == 2), o.Len())
	case t.counts != nil:
		// The scores' own statistic (see scoreStatistic).
		z := c.rates.eb.Scores
		plan.Scale, plan.Alternative = slices.Max(z)-slices.Min(z), c.rates.scoreAlt(t.alt)
		var gs *GroupStatistic
		if gs, err = NewGroupStatistic(c.rates.scoreStat, c.lab, c.k()); err != nil {
			return err
		}
		sp, err = GroupTest(o, gs, gs.Value(z), plan)
	default:
		if c.stat.InOutcomeUnits() {
			plan.Scale = slices.Max(c.y) - slices.Min(c.y)
		}
		var gs *GroupStatistic
		if gs, err = NewGroupStatistic(c.stat, c.lab, c.k()); err != nil {
			return err
		}
		sp, err = GroupTest(o, gs, res.Statistic.Observed, plan)
	}
	if err != nil {
		return err
	}
	res.Tests = append(res.Tests, TestRow{Result: sp})
	return nil
}
