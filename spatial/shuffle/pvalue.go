package shuffle

import (
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/areatest/areatest/internal/choice"
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

// alternatives are the names ParseAlternative reads.
var alternatives = []choice.Name[Alternative]{{Name: "two-sided", Value: TwoSided}, {Name: "greater", Value: Greater}, {Name: "less", Value: Less}}

// ParseAlternative reads "two-sided", "greater" or "less", in any case.
func ParseAlternative(s string) (Alternative, error) {
	return choice.Parse("alternative", s, alternatives...)
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
