package rates

import (
	"errors"
	"fmt"

	"github.com/areatest/areatest/weights"
)

// GlobalEB returns the empirical-Bayes smoothed rates of Marshall (1991),
// each raw rate shrunk towards the map's rate b = Σe/Σp by its own
// reliability:
//
//	a = max(0, s² − b/p̄),   C_i = a / (a + b/p_i),   θ_i = b + C_i (r_i − b)
//
// with s² = Σ p_i (r_i − b)² / Σ p_i and p̄ the mean population (the moment
// estimators of EBStandardise). A small area's rate moves far towards b, a
// large area's hardly at all; with a = 0 every rate becomes b.
func GlobalEB(events, population []float64) ([]float64, error) {
	s, err := EBStandardise(events, population)
	if err != nil {
		return nil, err
	}
	a := max(s.Between, 0)
	out := make([]float64, len(events))
	for i, r := range s.Rates {
		out[i] = shrink(r, s.Mean, a, population[i])
	}
	return out, nil
}

// shrink is θ = b + C (r − b) with C = a / (a + b/p); with a = b = 0 (no
// events around) the rate is b.
func shrink(r, b, a, p float64) float64 {
	if a == 0 {
		return b
	}
	return b + a/(a+b/p)*(r-b)
}

// SpatialEB returns the spatial empirical-Bayes smoothed rates: Marshall's
// estimator with the prior taken from each area's neighbourhood N_i, the
// area and its neighbours in g (their links, not their weights):
//
//	b_i = Σ_{N_i} e / Σ_{N_i} p,   s_i² = Σ_{N_i} p_j (r_j − b_i)² / Σ_{N_i} p_j,
//	a_i = max(0, s_i² − b_i / p̄_i),   θ_i = b_i + a_i/(a_i + b_i/p_i) (r_i − b_i)
//
// with p̄_i the mean population of N_i. An area without neighbours keeps
// its raw rate (its neighbourhood is itself), and is listed in alone.
func SpatialEB(events, population []float64, g *weights.Graph) (smoothed []float64, alone []int, err error) {
	r, err := Raw(events, population)
	if err != nil {
		return nil, nil, err
	}
	if g == nil || g.Len() != len(r) {
		return nil, nil, errors.New("rates: the graph and the counts disagree in length")
	}
	smoothed = make([]float64, len(r))
	for i := range r {
		nb, _ := g.Row(i)
		if len(nb) == 0 {
			smoothed[i], alone = r[i], append(alone, i)
			continue
		}
		var se, sp float64
		se, sp = events[i], population[i]
		for _, j := range nb {
			se += events[j]
			sp += population[j]
		}
		b := se / sp
		s2 := population[i] * (r[i] - b) * (r[i] - b)
		for _, j := range nb {
			s2 += population[j] * (r[j] - b) * (r[j] - b)
		}
		s2 /= sp
		mean := sp / float64(len(nb)+1)
		smoothed[i] = shrink(r[i], b, max(s2-b/mean, 0), population[i])
	}
	return smoothed, alone, nil
}

// Validate is Check as one error: the first problem, naming the area by
// ids (nil: by position), with the count of the others.
func Validate(events, population []float64, aboveAllowed bool, ids []string) error {
	ps := Check(events, population, aboveAllowed)
	if len(ps) == 0 {
		return nil
	}
	name := fmt.Sprintf("area %d", ps[0].Index+1)
	if ids != nil {
		name = fmt.Sprintf("area %q", ids[ps[0].Index])
	}
	more := ""
	if len(ps) > 1 {
		more = fmt.Sprintf(" (and %d more areas)", len(ps)-1)
	}
	return fmt.Errorf("%s: %s%s", name, ps[0].Reason, more)
}
