package rates

import (
	"fmt"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/spatial/shuffle"
)

// Statistic compares the pooled rates of groups of areas.
type Statistic int

const (
	// RateRatio is the pooled rate of group 0 over that of group 1.
	RateRatio Statistic = iota + 1
	// RateDifference is the pooled rate of group 0 minus that of group 1.
	RateDifference
	// RateHomogeneity is, for any number of groups, Pearson's X² of the
	// groups' events against those their populations would have at the
	// map's rate: Σ_g (E_g − b P_g)² / (b P_g). It grows with any
	// difference between the groups' rates, so only its upper tail is
	// evidence.
	RateHomogeneity
)

// ParseStatistic reads a statistic's name: rate-ratio, rate-difference or
// rate-homogeneity.
func ParseStatistic(s string) (Statistic, error) {
	return choice.Parse("statistic", s, choice.Name[Statistic]{Name: "rate-ratio", Value: RateRatio},
		choice.Name[Statistic]{Name: "rate-difference", Value: RateDifference},
		choice.Name[Statistic]{Name: "rate-homogeneity", Value: RateHomogeneity})
}

// String names the statistic in words.
func (s Statistic) String() string {
	switch s {
	case RateRatio:
		return "ratio of pooled rates"
	case RateDifference:
		return "difference in pooled rates"
	case RateHomogeneity:
		return "homogeneity X² of the groups' rates"
	}
	return fmt.Sprintf("rate statistic %d", int(s))
}

// Flag is the statistic's name as ParseStatistic reads it.
func (s Statistic) Flag() string {
	switch s {
	case RateRatio:
		return "rate-ratio"
	case RateDifference:
		return "rate-difference"
	}
	return "rate-homogeneity"
}

// TwoGroupsOnly reports a statistic that compares exactly two groups.
func (s Statistic) TwoGroupsOnly() bool { return s != RateHomogeneity }

// Directional reports a statistic whose sign (or side of 1) says which
// group's rate is higher, so that one-sided tests mean something.
func (s Statistic) Directional() bool { return s != RateHomogeneity }

// Counts are the events and populations of the areas a statistic compares,
// checked once (Check) so that evaluations need not.
type Counts struct {
	Events, Population []float64
	// totals over all areas
	events, population float64
}

// NewCounts checks the counts (see Check; aboveAllowed lets events exceed
// population) and sums them.
func NewCounts(events, population []float64, aboveAllowed bool) (*Counts, error) {
	if len(events) != len(population) {
		return nil, fmt.Errorf("rates: %d events for %d populations", len(events), len(population))
	}
	if ps := Check(events, population, aboveAllowed); len(ps) > 0 {
		return nil, fmt.Errorf("rates: area %d: %s", ps[0].Index+1, ps[0].Reason)
	}
	c := &Counts{Events: append([]float64(nil), events...), Population: population}
	for i := range events {
		c.events += events[i]
		c.population += population[i]
	}
	if c.events == 0 {
		return nil, fmt.Errorf("rates: there are no events, so every rate is zero")
	}
	return c, nil
}

// Value computes the statistic for the grouping labels (0..k−1 per area).
func (c *Counts) Value(s Statistic, labels []int32, k int) float64 {
	return c.Factory(s, k)()(labels)
}

// Factory returns evaluators of the statistic for shuffle.Run: each reads
// the labels of an arrangement (the group of each area, with its own events
// and population) and allocates nothing.
func (c *Counts) Factory(s Statistic, k int) shuffle.Factory {
	return func() shuffle.Evaluator {
		ev, pop := make([]float64, k), make([]float64, k)
		return func(labels []int32) float64 {
			for g := range ev {
				ev[g], pop[g] = 0, 0
			}
			for i, l := range labels {
				ev[l] += c.Events[i]
				pop[l] += c.Population[i]
			}
			return s.FromGroups(ev, pop)
		}
	}
}

// SetEvents replaces the event counts (a null outcome mapped back to
// counts, say) without checking them again, and sums them anew.
func (c *Counts) SetEvents(events []float64) {
	copy(c.Events, events)
	c.events = 0
	for _, e := range c.Events {
		c.events += e
	}
}

// FromGroups computes the statistic from each group's events and
// population: the one formula behind every evaluation.
func (s Statistic) FromGroups(ev, pop []float64) float64 {
	switch s {
	case RateRatio:
		return (ev[0] / pop[0]) / (ev[1] / pop[1])
	case RateDifference:
		return ev[0]/pop[0] - ev[1]/pop[1]
	}
	var te, tp float64
	for g := range ev {
		te += ev[g]
		tp += pop[g]
	}
	b := te / tp
	var x2 float64
	for g := range ev {
		want := b * pop[g]
		x2 += (ev[g] - want) * (ev[g] - want) / want
	}
	return x2
}
