package rates

import (
	"errors"
	"fmt"
	"math"
)

// Raw returns the raw rates events_i / population_i. A population that is
// not above zero, a negative count, or a value that is not a finite number
// is an error naming the area. More events than population is allowed
// (repeated events per person, rates per person-time): EBStandardise lists
// such areas.
func Raw(events, population []float64) ([]float64, error) {
	if len(events) != len(population) {
		return nil, fmt.Errorf("%d event counts for %d populations", len(events), len(population))
	}
	r := make([]float64, len(events))
	for i := range events {
		e, p := events[i], population[i]
		switch {
		case math.IsNaN(e) || math.IsInf(e, 0):
			return nil, fmt.Errorf("area %d: the event count %v is not a finite number", i, e)
		case math.IsNaN(p) || math.IsInf(p, 0):
			return nil, fmt.Errorf("area %d: the population %v is not a finite number", i, p)
		case p <= 0:
			return nil, fmt.Errorf("area %d: the population is %v; a rate needs a population above zero", i, p)
		case e < 0:
			return nil, fmt.Errorf("area %d: the event count is %v; counts cannot be negative", i, e)
		}
		r[i] = e / p
	}
	return r, nil
}

// EBScores are the empirical-Bayes standardised rates of Assunção & Reis
// (1999, Stat. Med. 18:2147–2162).
type EBScores struct {
	// Rates are the raw rates r_i = events_i / population_i.
	Rates []float64 `json:"rates"`
	// Scores are z_i = (r_i − b) / √v_i.
	Scores []float64 `json:"scores"`
	// Mean is b = Σ events / Σ population, the rate of the whole map.
	Mean float64 `json:"mean_rate"`
	// Between is a = s² − b / mean(population), the moment estimate of the
	// variance of the areas' true rates around b; it can come out negative.
	Between float64 `json:"between_variance"`
	// Floored lists the areas where a + b/p_i ≤ 0, whose variance was
	// taken as b/p_i (the Poisson part alone).
	Floored []int `json:"floored,omitempty"`
	// AboveOne lists the areas with more events than population.
	AboveOne []int `json:"above_one,omitempty"`
	// SD holds √v_i, each rate's standard deviation around b under the
	// model (the denominator of its score), so that a score z maps back to
	// the rate b + z·SD[i].
	SD []float64 `json:"-"`
}

// EBStandardise computes the empirical-Bayes standardised rates (Assunção
// & Reis 1999, with the moment estimators of Marshall 1991,
// Appl. Stat. 40:283–294):
//
//	r_i = e_i / p_i,   b = Σe / Σp,   s² = Σ p_i (r_i − b)² / Σ p_i
//	a = s² − b / p̄,   v_i = a + b / p_i,   z_i = (r_i − b) / √v_i
//
// with p̄ the mean population. When v_i ≤ 0 (a is negative and area i
// large) the variance is taken as b / p_i, the Poisson variance of the rate
// with no extra between-area part: that is, a is treated as 0 for that
// area. This is the rule as it is commonly stated for this estimator,
// recalled from memory, not checked against the paper's text; it changes
// nothing when every v_i is positive.
func EBStandardise(events, population []float64) (EBScores, error) {
	r, err := Raw(events, population)
	if err != nil {
		return EBScores{}, err
	}
	n := len(r)
	if n < 2 {
		return EBScores{}, errors.New("empirical-Bayes rates need at least two areas")
	}
	var se, sp float64
	for i := range r {
		se += events[i]
		sp += population[i]
	}
	if se == 0 {
		return EBScores{}, errors.New("there are no events, so every rate is zero and the map has no pattern to test")
	}
	b := se / sp
	var s2 float64
	for i, v := range r {
		s2 += population[i] * (v - b) * (v - b)
	}
	s2 /= sp
	a := s2 - b/(sp/float64(n))
	out := EBScores{Rates: r, Scores: make([]float64, n), Mean: b, Between: a, SD: make([]float64, n)}
	for i, v := range r {
		vi := a + b/population[i]
		if vi <= 0 {
			vi = b / population[i]
			out.Floored = append(out.Floored, i)
		}
		out.SD[i] = math.Sqrt(vi)
		out.Scores[i] = (v - b) / out.SD[i]
		if events[i] > population[i] {
			out.AboveOne = append(out.AboveOne, i)
		}
	}
	return out, nil
}
