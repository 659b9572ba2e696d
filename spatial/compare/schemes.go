package compare

import (
	"fmt"
	"strings"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/rates"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// ZoneMinAreas is the number of tested areas from which compare adds a
// shuffle within automatic contiguous zones when no strata are given.
const ZoneMinAreas = 300

// runShuffles adds the label-shuffle schemes: the free shuffle first, then
// the shuffle within the strata, or, without strata on a large enough
// layer, within automatic contiguous zones.
func (c *comparison) runShuffles(t *tester, res *Result) error {
	free, err := t.run("free", nil, streamFree, "free shuffle")
	if err != nil {
		return err
	}
	c.addRow(res, free, nil)
	in := c.in
	if in.Strata != nil {
		strata, count := codes(c.keep, in.Strata)
		if count < 2 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("%s has a single level among the tested areas, so the within-%s shuffle is the free shuffle.", in.StrataName, in.StrataName))
		}
		within, err := t.run("within "+in.StrataName, strata, streamStrata, "shuffle within "+in.StrataName)
		if err != nil {
			return err
		}
		c.addRow(res, within, strata)
		if mixedStrata(strata, c.lab) == 0 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("No level of %s holds areas of more than one group, so shuffling within %s cannot move a label: its p-value is 1 by construction.", in.StrataName, in.StrataName))
		}
		return nil
	}
	if !c.opt.Zones || len(c.keep) < ZoneMinAreas {
		return nil
	}
	zones, err := weights.Zones(in.Graph.Subset(c.keep), 0)
	if err != nil {
		return err
	}
	count := len(weights.ZoneSizes(zones))
	within, err := t.run(fmt.Sprintf("within %d automatic zones", count), zones, streamZones, "shuffle within zones")
	if err != nil {
		return err
	}
	c.addRow(res, within, zones)
	res.Zones = &ZonesInfo{Zones: count, Sizes: weights.ZoneSizes(zones)}
	if mixedStrata(zones, c.lab) == 0 {
		res.Warnings = append(res.Warnings, "No automatic zone holds areas of more than one group, so the within-zone shuffle cannot move a label: its p-value is 1 by construction.")
	}
	return nil
}

// addRow appends a label-shuffle row to the result and notes its scheme
// (strata per tested area, nil for the free shuffle) for the
// false-positive check.
func (c *comparison) addRow(res *Result, r shuffle.Result, strata []int32) {
	c.checks = append(c.checks, CheckScheme{Name: r.Scheme, Strata: strata})
	c.checkRows = append(c.checkRows, len(res.Tests))
	res.Tests = append(res.Tests, TestRow{Result: r})
}

// mixedStrata counts strata that hold more than one group.
func mixedStrata(strata, labels []int32) int {
	first := map[int32]int32{}
	mixed := map[int32]bool{}
	for i, s := range strata {
		if l, ok := first[s]; !ok {
			first[s] = labels[i]
		} else if l != labels[i] {
			mixed[s] = true
		}
	}
	return len(mixed)
}

// tester runs the group statistic under one shuffle scheme after another:
// on the once-sorted outcome, or, with covariates, by Freedman–Lane on the
// residuals of the covariates-only model.
type tester struct {
	opt  Options
	data *groups.Data
	stat groups.Statistic
	alt  shuffle.Alternative
	// fl is set when the test adjusts for covariates.
	fl      *shuffle.FreedmanLane
	flEval  shuffle.Factory
	flAlt   shuffle.Alternative
	covName string
	// counts is set when the test compares pooled rates: the shuffles
	// move the labels lab (area order) over the areas' counts.
	counts   *rates.Counts
	rateStat rates.Statistic
	lab      []int32
	k        int
}

// run tests the statistic with labels exchanged only within strata (given
// per tested area in layer order; nil for the free shuffle).
func (t *tester) run(scheme string, strata []int32, purpose uint64, stage string) (shuffle.Result, error) {
	plan := shuffle.Plan{Scheme: scheme, Permutations: t.opt.Permutations, ExactLimit: t.opt.ExactLimit,
		Seed: t.opt.Seed, Purpose: purpose, Workers: t.opt.Workers, KeepNull: t.opt.KeepNull, Progress: t.opt.progress(stage), Shard: t.opt.Shard}
	if t.fl != nil {
		plan.Labels, plan.Strata, plan.Alternative, plan.Scale = t.fl.Labels(), strata, t.flAlt, 1
		plan.Scheme = scheme + ", adjusted for " + t.covName
		return shuffle.Run(plan, t.flEval)
	}
	if t.counts != nil {
		plan.Labels, plan.Strata, plan.Alternative = t.lab, strata, t.alt
		plan.Scale = rateScale(t.counts.Value(t.rateStat, t.lab, t.k))
		return shuffle.Run(plan, t.counts.Factory(t.rateStat, t.k))
	}
	plan.Labels, plan.Alternative = t.data.Labels, t.alt
	plan.Scale = 1
	if t.stat.InOutcomeUnits() {
		plan.Scale = t.data.Y[len(t.data.Y)-1] - t.data.Y[0]
	}
	if strata != nil {
		// The group statistics see areas in sorted order of the outcome.
		sorted := make([]int32, len(strata))
		for pos, o := range t.data.Order {
			sorted[pos] = strata[o]
		}
		plan.Strata = sorted
	}
	return shuffle.Run(plan, t.data.Factory(t.stat))
}

// testAlt is the alternative of the test the rows report: the group
// statistic's, or, with covariates, that of the adjusted t or F.
func (t *tester) testAlt() shuffle.Alternative {
	if t.fl != nil {
		return t.flAlt
	}
	return t.alt
}

// null returns the factory of one goroutine's copy of the test the rows
// report, for the false-positive and SAR checks.
func (t *tester) null(c *comparison) func() (nullTest, error) {
	if t.counts != nil {
		return func() (nullTest, error) { return newRateNull(c.rates, c.lab, c.k(), t.alt), nil }
	}
	if t.fl != nil {
		two := c.k() == 2
		return func() (nullTest, error) { return newAdjustedNull(t.fl, two, t.flAlt) }
	}
	gs, err := NewGroupStatistic(c.stat, c.lab, c.k())
	return func() (nullTest, error) {
		if err != nil {
			return nil, err
		}
		return newGroupNull(gs, c.alt), nil
	}
}

// spectralNull is null for the spectral row's own check (the SAR check):
// the same test, except for a comparison of pooled rates, whose spectral
// row tests the empirical-Bayes scores (rateState.scoreStat).
func (t *tester) spectralNull(c *comparison) func() (nullTest, error) {
	if t.counts == nil {
		return t.null(c)
	}
	gs, err := NewGroupStatistic(c.rates.scoreStat, c.lab, c.k())
	alt := c.rates.scoreAlt(t.alt)
	return func() (nullTest, error) {
		if err != nil {
			return nil, err
		}
		return newGroupNull(gs, alt), nil
	}
}

// target is the vector whose spectral surrogates stand for the null: the
// outcome, or, with covariates, its residuals from the covariates-only
// model (the part of it the test permutes).
func (t *tester) target(c *comparison) []float64 {
	if t.fl != nil {
		return t.fl.Residuals()
	}
	return c.spatialY()
}

// adjustFor switches the tester to the Freedman–Lane test of the group
// effect adjusted for the covariates: the t of the group coefficient for
// two groups, the partial F for more.
func (t *tester) adjustFor(c *comparison, res *Result) error {
	var cols [][]float64
	var names []string
	for _, cov := range c.in.Covariates {
		col := make([]float64, len(c.keep))
		for j, i := range c.keep {
			col[j] = cov.Values[i]
		}
		if err := c.checkMagnitude(cov.Name, col); err != nil {
			return err
		}
		cols = append(cols, col)
		names = append(names, cov.Name)
	}
	fl, err := shuffle.NewFreedmanLane(c.y, cols, c.lab, c.k())
	if err != nil {
		return dataErr("adjusting for %s: %w", strings.Join(names, ", "), err)
	}
	t.fl, t.covName = fl, strings.Join(names, ", ")
	info := &CovariateInfo{Covariates: names}
	if c.k() == 2 {
		if t.flEval, err = fl.TFactory(); err != nil {
			return err
		}
		t.flAlt = t.opt.Alternative
		info.Statistic = "t of the group effect"
		info.Observed, info.ClassicalP, _ = fl.ClassicalT(t.flAlt)
	} else {
		t.flEval, t.flAlt = fl.Factory(), shuffle.Greater
		info.Statistic = "partial F of the group effect"
		info.Observed, info.ClassicalP = fl.PartialF()
	}
	info.Method = "Freedman–Lane: residuals of the model with the covariates alone are shuffled"
	res.Adjusted = info
	return nil
}
