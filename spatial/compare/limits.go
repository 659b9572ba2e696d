package compare

import (
	"fmt"
	"math"

	"github.com/areatest/areatest/spatial/shuffle"
)

// The most surrogates and checks a comparison takes: Run and
// FalsePositives refuse more with a *shuffle.CountError before any work, so
// that no setting can make a run exhaust memory or go on for days. The
// label shuffles are bounded by shuffle.MaxPermutations.
const (
	// MaxSurrogates bounds Options.Surrogates. 100,000 spectral surrogates
	// resolve the spatially constrained p-value to 10⁻⁵, plenty for the one
	// p-value they give; each costs a pass over the eigenbasis (about half
	// a millisecond on 3,000 areas), so the maximum takes about a minute
	// there.
	MaxSurrogates = 100_000
	// MaxFalsePositiveChecks bounds Options.FalsePositives
	// (FPROptions.Surrogates). 10,000 surrogates measure a 5% rate to about
	// ±0.4% (95% interval), more than enough to tell a sound test from an
	// inflated one.
	MaxFalsePositiveChecks = 10_000
	// MaxCheckShuffles bounds Options.FalsePositiveShuffles
	// (FPROptions.Permutations). Each check is one free-shuffle test whose
	// p-value is only compared with alpha; 10,000 shuffles resolve it to
	// 10⁻⁴, well below any alpha in use. With MaxFalsePositiveChecks the
	// whole check is at most 10⁸ shuffles: about half an hour on 3,000
	// areas and two cores (the default 500 × 199 takes two seconds).
	MaxCheckShuffles = 10_000
)

// checkCounts refuses counts above their maxima.
func (o Options) checkCounts() error {
	for _, c := range []struct {
		what       string
		count, max int
	}{
		{"permutations", o.Permutations, shuffle.MaxPermutations},
		{"spectral surrogates", o.Surrogates, MaxSurrogates},
		{"false-positive surrogates", o.FalsePositives, MaxFalsePositiveChecks},
		{"shuffles per false-positive check", o.FalsePositiveShuffles, MaxCheckShuffles},
		{"SAR-simulated outcomes", o.SARChecks, MaxFalsePositiveChecks},
		{"surrogates per SAR-simulated outcome", o.SARCheckSurrogates, MaxCheckShuffles},
	} {
		if err := shuffle.CheckCount(c.what, c.count, c.max); err != nil {
			return err
		}
	}
	return nil
}

// CheckShufflesError is a false-positive check whose shuffle tests could
// never reject: with B shuffles the smallest Monte Carlo p-value is
// 1/(1 + B), twice that two-sided, and when it is above alpha every check
// would pass and the measured rate be 0 by construction.
type CheckShufflesError struct {
	Shuffles int
	Alpha    float64
	// Smallest is the smallest p-value the shuffles can give, Need the
	// fewest shuffles whose smallest p-value is at most Alpha.
	Smallest float64
	Need     int
}

func (e *CheckShufflesError) Error() string {
	return "the false-positive check " + e.Facts()
}

// Facts says what is wrong: "cannot reject: with B shuffles …".
func (e *CheckShufflesError) Facts() string {
	return fmt.Sprintf("cannot reject at the %g level: with %d shuffles per check the smallest p-value is %.3g; it needs at least %d",
		e.Alpha, e.Shuffles, e.Smallest, e.Need)
}

// checkShuffles returns a *CheckShufflesError when B shuffles under alt
// cannot give a p-value at or below alpha. The p-values are computed as
// the test computes them, so the bound holds for the very comparison the
// test makes.
func checkShuffles(B int, alpha float64, alt shuffle.Alternative) error {
	smallest := func(b int) float64 {
		p := 1 / float64(1+b)
		if alt == shuffle.TwoSided {
			p = math.Min(1, 2*p)
		}
		return p
	}
	if smallest(B) <= alpha {
		return nil
	}
	m := 1.0
	if alt == shuffle.TwoSided {
		m = 2
	}
	// m/(1 + need) ≤ alpha, from the formula, then settled against the
	// test's own rounding by a step or two; far beyond any count a run
	// takes, the formula alone.
	needF := math.Ceil(m/alpha) - 1
	if needF > 1e15 {
		return &CheckShufflesError{Shuffles: B, Alpha: alpha, Smallest: smallest(B), Need: int(math.Min(needF, 1<<50))}
	}
	need := int(needF)
	for need > 1 && smallest(need-1) <= alpha {
		need--
	}
	for smallest(need) > alpha {
		need++
	}
	return &CheckShufflesError{Shuffles: B, Alpha: alpha, Smallest: smallest(B), Need: need}
}
