package shuffle

import (
	"fmt"

	"gonum.org/v1/gonum/stat/distuv"
)

// Alternative is the direction of a test.
type Alternative int

const (
	// TwoSided counts departures in either direction.
	TwoSided Alternative = iota
	// Greater counts null values at least as large as the observed one.
	Greater
	// Less counts null values at most as large as the observed one.
	Less
)

func (a Alternative) String() string {
	switch a {
	case Greater:
		return "greater"
	case Less:
		return "less"
	case Folded:
		return "folded"
	}
	return "two-sided"
}

// ParseAlternative reads "two-sided", "greater" or "less".
func ParseAlternative(s string) (Alternative, error) {
	switch s {
	case "two-sided":
		return TwoSided, nil
	case "greater":
		return Greater, nil
	case "less":
		return Less, nil
	}
	return TwoSided, fmt.Errorf("alternative must be two-sided, greater or less, not %q", s)
}

// ClopperPearson returns the exact (Clopper & Pearson 1934) confidence
// interval for a binomial proportion with k successes in n trials.
func ClopperPearson(k, n int, level float64) (lo, hi float64) {
	alpha := 1 - level
	if k > 0 {
		lo = distuv.Beta{Alpha: float64(k), Beta: float64(n - k + 1)}.Quantile(alpha / 2)
	}
	hi = 1
	if k < n {
		hi = distuv.Beta{Alpha: float64(k + 1), Beta: float64(n - k)}.Quantile(1 - alpha/2)
	}
	return lo, hi
}
