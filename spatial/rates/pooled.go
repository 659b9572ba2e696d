package rates

import (
	"fmt"
	"math"
)

// Pooled is a group of areas taken together: its events over its
// population.
type Pooled struct {
	Areas      int     `json:"areas"`
	Events     float64 `json:"events"`
	Population float64 `json:"population"`
	// Rate is Events / Population (per person; multiply for "per 100,000").
	Rate float64 `json:"rate"`
}

// Pool sums events and population over the areas of each group (labels[i]
// in 0..k−1 is area i's) and gives each group's pooled rate.
func Pool(events, population []float64, labels []int32, k int) ([]Pooled, error) {
	if len(events) != len(population) || len(labels) != len(events) {
		return nil, fmt.Errorf("rates: %d events, %d populations and %d labels", len(events), len(population), len(labels))
	}
	out := make([]Pooled, k)
	for i, l := range labels {
		if l < 0 || int(l) >= k {
			return nil, fmt.Errorf("rates: label %d of area %d is outside 0..%d", l, i, k-1)
		}
		out[l].Areas++
		out[l].Events += events[i]
		out[l].Population += population[i]
	}
	for g := range out {
		out[g].Rate = out[g].Events / out[g].Population
		if out[g].Population == 0 {
			out[g].Rate = math.NaN()
		}
	}
	return out, nil
}

// Ratio is the rate ratio a.Rate / b.Rate (NaN when b has no events).
func Ratio(a, b Pooled) float64 { return a.Rate / b.Rate }

// Difference is the rate difference a.Rate − b.Rate.
func Difference(a, b Pooled) float64 { return a.Rate - b.Rate }

// DefaultUnstable is the number of events below which a rate is flagged as
// unstable: rates on fewer than 20 events, a rule of common practice in
// public health statistics (common knowledge: a Poisson count of 20 has a
// relative standard error of about 22%).
const DefaultUnstable = 20

// Unstable lists the areas whose events are fewer than threshold.
func Unstable(events []float64, threshold float64) []int {
	var out []int
	for i, e := range events {
		if e < threshold {
			out = append(out, i)
		}
	}
	return out
}

// Problem is what is wrong with one area's counts.
type Problem struct {
	// Index is the area's position; Reason says what is wrong in words
	// ("the population is 0; a rate needs a population above zero"), Kind
	// in a few ("population not above zero"), the same for every area with
	// that problem.
	Index        int
	Reason, Kind string
}

// Check lists the areas whose counts cannot make a rate: a value that is
// not a finite number, a negative count, a population not above zero, or,
// unless aboveAllowed (repeat events, person-time), more events than
// population. Missing values are the caller's to leave out first.
func Check(events, population []float64, aboveAllowed bool) []Problem {
	var out []Problem
	for i := range events {
		e, p := events[i], population[i]
		var why, kind string
		switch {
		case math.IsNaN(e) || math.IsInf(e, 0):
			why, kind = fmt.Sprintf("the event count %v is not a finite number", e), "a count that is not a number"
		case math.IsNaN(p) || math.IsInf(p, 0):
			why, kind = fmt.Sprintf("the population %v is not a finite number", p), "a count that is not a number"
		case p <= 0:
			why, kind = fmt.Sprintf("the population is %v; a rate needs a population above zero", p), "population not above zero"
		case e < 0:
			why, kind = fmt.Sprintf("the event count is %v; counts cannot be negative", e), "negative event count"
		case e > p && !aboveAllowed:
			why, kind = fmt.Sprintf("there are more events (%v) than people (%v)", e, p), "more events than population"
		}
		if why != "" {
			out = append(out, Problem{Index: i, Reason: why, Kind: kind})
		}
	}
	return out
}
