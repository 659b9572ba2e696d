package compare

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/rates"
	"github.com/areatest/areatest/spatial/shuffle"
)

// A comparison of rates (Input.Events set) runs on the same machinery as
// any other: the outcome of each area is its rate events/population, the
// label shuffles move each area with its own events and population and
// compare the groups' pooled rates (rates.Statistic), and the parts that
// need a continuous outcome with a spatial pattern — the spectral
// surrogates, the SAR check, the effective sample size and the spatial
// check — work on the empirical-Bayes standardised rates z_i = (r_i −
// b)/σ_i of Assunção & Reis (1999). A surrogate z* is mapped back to rates
// b + z*_i σ_i (at least 0) and so to events, so that every surrogate gets
// the very statistic of the observed counts.

// DefaultPer is the multiplier rates are shown with when RateOptions.Per
// is 0: "per 100,000".
const DefaultPer = 100000

// RatesInfo describes a comparison of rates.
type RatesInfo struct {
	Events     string  `json:"events"`
	Population string  `json:"population"`
	Per        float64 `json:"per"`
	// MapRate is the pooled rate of all tested areas, per Per.
	MapRate float64       `json:"map_rate"`
	Groups  []PooledGroup `json:"groups"`
	// Unstable counts the tested areas with fewer than UnstableBelow
	// events, whose rates swing widely by chance; UnstableIDs names the
	// first of them.
	UnstableBelow float64  `json:"unstable_below"`
	Unstable      int      `json:"unstable"`
	UnstableIDs   []string `json:"unstable_ids,omitempty"`
	// Missing describes, per group, the areas without counts, when some are.
	Missing []MissingCounts `json:"missing,omitempty"`
	// Spatial says how the spatially constrained parts treat counts.
	Spatial string `json:"spatial"`
}

// PooledGroup is one group's events over its population.
type PooledGroup struct {
	Level string `json:"level"`
	rates.Pooled
	// PerRate is Rate × Per.
	PerRate float64 `json:"rate_per"`
}

// MissingCounts describes one group's areas without counts: how many of
// its areas lack them, and the median population of the areas that have a
// population but no event count, against that of the tested areas.
type MissingCounts struct {
	Level   string  `json:"level"`
	Areas   int     `json:"areas"`
	Missing int     `json:"missing"`
	Share   float64 `json:"share"`
	// MedianPopulationMissing is the median population of the group's
	// areas with a population but no event count (0 when none has one),
	// MedianPopulationPresent that of its areas with both.
	MedianPopulationMissing float64 `json:"median_population_missing,omitempty"`
	MedianPopulationPresent float64 `json:"median_population_present"`
}

// rateState is what a comparison of rates keeps beside the ordinary
// comparison: the tested areas' counts, the statistic of pooled rates (0
// when a statistic of the area rates was asked for) and their
// empirical-Bayes scores.
type rateState struct {
	counts *rates.Counts
	stat   rates.Statistic
	eb     rates.EBScores
	// scoreStat is the statistic of the spectral row (and of its SAR
	// check): the difference in mean empirical-Bayes scores between two
	// groups, the F ratio of the scores for more. Surrogates of the scores
	// mapped back to rates, so that they would carry the pooled rates'
	// statistic itself, were measured to reject far too often where rates
	// cluster and populations are unequal (32% of 40 true nulls at
	// ρ = 0.9 in TestRateRatioSize's setting): a score surrogate spreads
	// the small areas' Poisson noise, and the weaker clustering it
	// implies, over the large areas that dominate a pooled rate. The
	// scores' own statistic is what their surrogates are a valid null for.
	scoreStat groups.Statistic
}

// scoreAlt is the alternative of the scores' statistic: the comparison's
// for the difference in means (higher scores go with a higher rate), the
// upper tail for the F ratio.
func (rs *rateState) scoreAlt(alt shuffle.Alternative) shuffle.Alternative {
	if rs.scoreStat.Directional() {
		return alt
	}
	return shuffle.Greater
}

// withRates fills the outcome of a comparison of counts: each area's rate,
// missing where a count is, and the areas whose counts make no rate
// marked with the reason (left out when the options say so, otherwise the
// first is an error naming it).
func withRates(in Input, opt RateOptions) (Input, error) {
	e, p := in.Events, in.Population
	if p == nil || len(e.Values) != len(in.IDs) || len(p.Values) != len(in.IDs) {
		return in, errors.New("compare: events and population must both be given, one per area")
	}
	if len(in.Covariates) > 0 {
		return in, dataErr("adjusting a comparison of rates for covariates is not supported in this version")
	}
	n := len(in.IDs)
	in.OutcomeName = e.Name + " per " + p.Name
	in.Outcome, in.OutcomeMissing = make([]float64, n), make([]bool, n)
	in.countProblem = make([]string, n)
	for i := range n {
		if e.Missing[i] || p.Missing[i] {
			in.OutcomeMissing[i] = true
			continue
		}
		in.Outcome[i] = e.Values[i] / p.Values[i]
		ps := rates.Check(e.Values[i:i+1], p.Values[i:i+1], opt.EventsAbovePopulation)
		if len(ps) == 0 {
			continue
		}
		if !opt.LeaveOutBadCounts {
			return in, dataErr("area %q: %s", in.IDs[i], ps[0].Reason)
		}
		in.countProblem[i] = ps[0].Kind
	}
	return in, nil
}

// prepareRates sets up the rate state of the tested areas and describes
// the groups' pooled rates; it runs after the levels and the statistic
// are chosen.
func (c *comparison) prepareRates(res *Result) error {
	in, opt := c.in, c.opt.Rates
	ev, pop := make([]float64, len(c.keep)), make([]float64, len(c.keep))
	for k, i := range c.keep {
		ev[k], pop[k] = in.Events.Values[i], in.Population.Values[i]
	}
	counts, err := rates.NewCounts(ev, pop, true) // checked per area by withRates
	if err != nil {
		return dataErr("%v", strings.TrimPrefix(err.Error(), "rates: "))
	}
	eb, err := rates.EBStandardise(ev, pop)
	if err != nil {
		return dataErr("%v", err)
	}
	c.rates = &rateState{counts: counts, stat: c.rateStat, eb: eb, scoreStat: groups.DiffMeans}
	if c.k() > 2 {
		c.rates.scoreStat = groups.OneWayF
	}
	per := cmp.Or(opt.Per, DefaultPer)
	info := &RatesInfo{Events: in.Events.Name, Population: in.Population.Name, Per: per, MapRate: eb.Mean * per,
		UnstableBelow: cmp.Or(opt.UnstableBelow, rates.DefaultUnstable)}
	pooled, err := rates.Pool(ev, pop, c.lab, c.k())
	if err != nil {
		return err
	}
	for g, pg := range pooled {
		info.Groups = append(info.Groups, PooledGroup{Level: c.levels[g], Pooled: pg, PerRate: pg.Rate * per})
	}
	for _, k := range rates.Unstable(ev, info.UnstableBelow) {
		if info.Unstable++; len(info.UnstableIDs) < 5 {
			info.UnstableIDs = append(info.UnstableIDs, in.IDs[c.keep[k]])
		}
	}
	info.Spatial = "The spectral surrogates, their SAR check, the effective sample size and the spatial check use the empirical-Bayes standardised rates (Assunção & Reis 1999): the spectral row tests the " + c.rates.scoreStat.String() + " of those scores between the groups, the label shuffles the statistic of the pooled rates; the false-positive check of the label shuffles maps each surrogate of the scores back to counts."
	info.Missing = c.missingCounts()
	res.Rates = info
	rateWarnings(res, info)
	return nil
}

// missingCounts counts, per group, the areas with a group but without an
// event count or population; nil when none lacks them.
func (c *comparison) missingCounts() []MissingCounts {
	in := c.in
	var out []MissingCounts
	any := false
	for _, level := range c.levels {
		m := MissingCounts{Level: level}
		var missingPop, presentPop []float64
		for i := range in.IDs {
			if in.GroupMissing[i] || in.Group[i] != level {
				continue
			}
			m.Areas++
			switch {
			case in.Events.Missing[i] || in.Population.Missing[i]:
				m.Missing++
				if !in.Population.Missing[i] {
					missingPop = append(missingPop, in.Population.Values[i])
				}
			default:
				presentPop = append(presentPop, in.Population.Values[i])
			}
		}
		m.MedianPopulationMissing, m.MedianPopulationPresent = median(missingPop), median(presentPop)
		m.Share = float64(m.Missing) / float64(max(m.Areas, 1))
		any = any || m.Missing > 0
		out = append(out, m)
	}
	if !any {
		return nil
	}
	return out
}

// rateWarnings says what a reader of rates must know: how many rates rest
// on few events, and whether the areas without counts differ between the
// groups.
func rateWarnings(res *Result, info *RatesInfo) {
	if info.Unstable > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%s of %s tested areas have fewer than %g events (%s): their rates are unstable, and a few chance events move them widely; the pooled rates and the empirical-Bayes scores weigh them by their populations.",
			numtext.Count(info.Unstable), numtext.Count(res.Input.Tested), info.UnstableBelow, listIDs(info.UnstableIDs, info.Unstable, 5)))
	}
	if len(info.Missing) == 0 {
		return
	}
	lo, hi := info.Missing[0], info.Missing[0]
	for _, m := range info.Missing {
		if m.Share < lo.Share {
			lo = m
		}
		if m.Share > hi.Share {
			hi = m
		}
	}
	if hi.Share-lo.Share >= 0.1 {
		sizes := ""
		if hi.MedianPopulationMissing > 0 {
			sizes = fmt.Sprintf(" (in %s the areas without counts have a median population of %s, those with counts %s)",
				hi.Level, numtext.Count(int(math.Round(hi.MedianPopulationMissing))), numtext.Count(int(math.Round(hi.MedianPopulationPresent))))
		}
		res.Warnings = append(res.Warnings, fmt.Sprintf("Counts are missing (suppressed or absent) for %.0f%% of the areas of %s but %.0f%% of those of %s%s: the comparison may be biased by which areas are missing.",
			100*hi.Share, hi.Level, 100*lo.Share, lo.Level, sizes))
	}
}

// median is the median of v (0 for none).
func median(v []float64) float64 {
	if len(v) == 0 {
		return 0
	}
	s := slices.Sorted(slices.Values(v))
	if n := len(s); n%2 == 1 {
		return s[n/2]
	}
	return (s[len(s)/2-1] + s[len(s)/2]) / 2
}

// rateNull is nullTest for a comparison of pooled rates: a null outcome is
// a vector of empirical-Bayes scores, mapped back to events.
type rateNull struct {
	counts *rates.Counts
	stat   rates.Statistic
	alt    shuffle.Alternative
	labels []int32
	k      int
	b      float64
	sd     []float64
	events []float64
	eval   shuffle.Evaluator
}

func newRateNull(rs *rateState, labels []int32, k int, alt shuffle.Alternative) *rateNull {
	n := len(labels)
	counts, _ := rates.NewCounts(rs.counts.Events, rs.counts.Population, true) // a copy; checked before
	r := &rateNull{counts: counts, stat: rs.stat, alt: alt, labels: labels, k: k, b: rs.eb.Mean, sd: rs.eb.SD, events: make([]float64, n)}
	r.eval = counts.Factory(rs.stat, k)()
	return r
}

// toEvents maps scores to the events they stand for: the rate b + z σ_i,
// at least 0, times the population.
func (r *rateNull) toEvents(z []float64, events []float64) {
	for i, v := range z {
		events[i] = max(r.b+v*r.sd[i], 0) * r.counts.Population[i]
	}
}

func (r *rateNull) load(z []float64) ([]float64, error) {
	r.toEvents(z, r.events)
	r.counts.SetEvents(r.events)
	return z, nil
}

func (r *rateNull) observed() float64 { return r.eval(r.labels) }
func (r *rateNull) scale() float64    { return rateScale(r.observed()) }

func (r *rateNull) shuffled(strata []int32, B int, seed, purpose uint64) (float64, error) {
	res, err := shuffle.Run(shuffle.Plan{Scheme: "check", Labels: r.labels, Strata: strata, Permutations: B, ExactLimit: -1,
		Seed: seed, Purpose: purpose, Workers: 1, Alternative: r.alt, Scale: r.scale()}, r.counts.Factory(r.stat, r.k))
	if err != nil {
		return 0, err
	}
	return res.PValue, nil
}

// onSurrogates evaluates the statistic of a surrogate of the scores: its
// events, pooled by the fixed groups. The comparison itself does not draw
// on it (its spectral row and SAR check test the scores, see
// rateState.scoreStat); it completes the test for the checks' interface.
func (r *rateNull) onSurrogates() shuffle.OutcomeEvaluator {
	events := make([]float64, len(r.labels))
	ev, pop := make([]float64, r.k), make([]float64, r.k)
	return func(z []float64) float64 {
		r.toEvents(z, events)
		for g := range ev {
			ev[g], pop[g] = 0, 0
		}
		for i, l := range r.labels {
			ev[l] += events[i]
			pop[l] += r.counts.Population[i]
		}
		return r.stat.FromGroups(ev, pop)
	}
}

// rateScale is the tie scale of the rate statistic's tests: its observed
// size.
func rateScale(observed float64) float64 { return math.Max(math.Abs(observed), 1e-300) }
