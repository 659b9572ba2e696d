package compare

import (
	"fmt"
	"slices"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/weights"
)

// SpectralScheme names the spatially constrained scheme in results.
const SpectralScheme = "spectral surrogates"

// spectral adds the spatially constrained scheme (Moran spectral
// randomisation of the outcome, Wagner & Dray 2015) and measures the free
// shuffle's false-positive rate on surrogates with the outcome's spatial
// structure and no link to the grouping, and that of every other
// label-shuffle row on the same surrogates.
func (c *comparison) spectral(res *Result) error {
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
	o, err := basis.Prepare(c.y)
	if err != nil {
		return err
	}
	res.Spectral = &SpectralInfo{Info: info, ResidualShare: o.ResidualShare(), MoranTolerance: o.MoranTolerance()}
	if opt.Surrogates > 0 {
		if err := c.surrogateTest(o, res); err != nil {
			return err
		}
	}
	if opt.FalsePositives > 0 {
		rates, err := FalsePositivesOf(o, c.stat, c.lab, c.k(), c.checks, FPROptions{
			Surrogates: opt.FalsePositives, Permutations: opt.FalsePositiveShuffles, Alpha: opt.Alpha,
			Alternative: c.alt, Seed: opt.Seed, Purpose: streamFalsePositives, Workers: opt.Workers,
			Progress: opt.progress("false-positive check")})
		if err != nil {
			return err
		}
		for j, row := range c.checkRows {
			res.Tests[row].FalsePositives = &rates[j]
		}
		res.FalsePositiveRate = &rates[0]
		if opt.Surrogates > 0 {
			return c.sarCheck(r.Graph, basis, res)
		}
	}
	return nil
}

// surrogateTest adds the spectral surrogate test of the group statistic.
func (c *comparison) surrogateTest(o *surrogate.Outcome, res *Result) error {
	scale := 1.0
	if c.stat.InOutcomeUnits() {
		scale = slices.Max(c.y) - slices.Min(c.y)
	}
	gs, err := NewGroupStatistic(c.stat, c.lab, c.k())
	if err != nil {
		return err
	}
	opt := c.opt
	sp, err := GroupTest(o, gs, res.Statistic.Observed, shuffle.SurrogatePlan{
		Scheme: SpectralScheme, Draws: opt.Surrogates, Seed: opt.Seed, Purpose: streamSurrogates,
		Workers: opt.Workers, Alternative: c.alt, Scale: scale, Progress: opt.progress("spectral surrogates")})
	if err != nil {
		return err
	}
	res.Tests = append(res.Tests, TestRow{Result: sp})
	return nil
}
