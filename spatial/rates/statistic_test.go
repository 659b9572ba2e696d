package rates

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// The rate ratio's null by exact enumeration: 8 areas, 4 in each group,
// all C(8,4) = 70 ways to choose group 0 listed here by brute force; the
// exact p-value of shuffle.Run (which enumerates the 70 distinct
// arrangements itself) equals the share of them at least as extreme, one-
// and two-sided (two-sided = 2·min of the one-sided, capped at 1).
func TestRateRatioExactNull(t *testing.T) {
	e := []float64{3, 9, 4, 15, 2, 7, 1, 11}
	p := []float64{1000, 2000, 1500, 2500, 900, 3000, 800, 1800}
	labels := []int32{0, 0, 0, 0, 1, 1, 1, 1}
	c, err := NewCounts(e, p, false)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range []Statistic{RateRatio, RateDifference, RateHomogeneity} {
		observed := c.Value(s, labels, 2)
		var ge, le, total int
		for mask := 0; mask < 256; mask++ {
			if popcount(mask) != 4 {
				continue
			}
			lab := make([]int32, 8)
			for i := range lab {
				if mask&(1<<i) == 0 {
					lab[i] = 1
				}
			}
			v := c.Value(s, lab, 2)
			total++
			if v >= observed-1e-12*math.Abs(observed) {
				ge++
			}
			if v <= observed+1e-12*math.Abs(observed) {
				le++
			}
		}
		if total != 70 {
			t.Fatalf("%d arrangements", total)
		}
		for _, alt := range []shuffle.Alternative{shuffle.Greater, shuffle.Less, shuffle.TwoSided} {
			if !s.Directional() && alt != shuffle.Greater {
				continue
			}
			res, err := shuffle.Run(shuffle.Plan{Labels: labels, Permutations: 999, Alternative: alt, Scale: math.Abs(observed)}, c.Factory(s, 2))
			if err != nil {
				t.Fatal(err)
			}
			want := map[shuffle.Alternative]float64{shuffle.Greater: float64(ge) / 70, shuffle.Less: float64(le) / 70}
			want[shuffle.TwoSided] = math.Min(1, 2*math.Min(want[shuffle.Greater], want[shuffle.Less]))
			if !res.Exact || math.Abs(res.PValue-want[alt]) > 1e-12 {
				t.Errorf("%v %v: p %v (exact %v), enumeration %v", s, alt, res.PValue, res.Exact, want[alt])
			}
		}
	}
	// The ratio itself: group 0 has 31 events in 7,000, group 1 21 in 6,500.
	if r := c.Value(RateRatio, labels, 2); math.Abs(r-(31.0/7000)/(21.0/6500)) > 1e-15 {
		t.Errorf("ratio %v", r)
	}
}

func popcount(m int) int {
	n := 0
	for ; m > 0; m &= m - 1 {
		n++
	}
	return n
}

func TestNewCountsRefuses(t *testing.T) {
	for _, c := range []struct{ e, p []float64 }{
		{[]float64{1, 2}, []float64{1}},
		{[]float64{0, 0}, []float64{1, 2}},
		{[]float64{3, 1}, []float64{2, 5}},
	} {
		if _, err := NewCounts(c.e, c.p, false); err == nil {
			t.Errorf("%v / %v accepted", c.e, c.p)
		}
	}
	if _, err := ParseStatistic("Rate-Ratio"); err != nil {
		t.Error(err)
	}
}

// The homogeneity X² against scipy: events 31, 21, 12 over 7,000, 6,500
// and 2,500 people; scipy 1.10.1 (Debian) gives, by
//
//	b = 64/16000; scipy.stats.chisquare([31, 21, 12], [b*7000, b*6500, b*2500]).statistic
//
// 1.6829670329670332. Ratio and difference are checked against numpy in
// tests/rates_states_test.go.
func TestHomogeneityAgainstScipy(t *testing.T) {
	got := RateHomogeneity.FromGroups([]float64{31, 21, 12}, []float64{7000, 6500, 2500})
	if math.Abs(got-1.6829670329670332) > 1e-13 {
		t.Errorf("X² = %.17g, scipy 1.6829670329670332", got)
	}
}
