package numtext

import (
	"math"
	"testing"
)

// Grouping by threes with commas is the common English convention (common
// knowledge, no source).
func TestCount(t *testing.T) {
	for _, c := range []struct {
		n    int64
		want string
	}{
		{0, "0"}, {7, "7"}, {999, "999"}, {1000, "1,000"}, {9999, "9,999"}, {123456, "123,456"},
		{1234567, "1,234,567"}, {-1, "-1"}, {-1000, "-1,000"}, {-123456789, "-123,456,789"},
		{math.MaxInt64, "9,223,372,036,854,775,807"}, {math.MinInt64, "-9,223,372,036,854,775,808"},
	} {
		if got := Count(c.n); got != c.want {
			t.Errorf("Count(%d) = %q, want %q", c.n, got, c.want)
		}
	}
	if got := Count(int32(-4096)); got != "-4,096" {
		t.Errorf("int32: %q", got)
	}
}

// One format for lengths: 3 significant digits, as %.3g writes them.
func TestLength(t *testing.T) {
	for _, c := range []struct {
		v    float64
		want string
	}{
		{7.38014772241653e-07, "7.38e-07"},
		{0.0125, "0.0125"},
		{25, "25"},
		{1234.5, "1.23e+03"},
		{0, "0"},
	} {
		if got := Length(c.v); got != c.want {
			t.Errorf("Length(%v) = %q, want %q", c.v, got, c.want)
		}
	}
}
