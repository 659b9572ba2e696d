package report

import (
	"testing"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/clustering"
)

// The sentence on the range of Moran's I says how the range was found: a
// dense range as before (exact), an iterative one with its tolerance
// rounded up, an unconverged one as approximate, a skipped one with the
// library's note.
func TestRangeSentence(t *testing.T) {
	i := clustering.Statistic{Value: 0.5, Expected: -0.01}
	for _, c := range []struct {
		name string
		v    clustering.Variable
		want string
	}{
		{"dense", clustering.Variable{MoransI: i, Bounds: &autocorr.Bounds{Min: -0.7, Max: 1.01, Method: "dense", Converged: true}},
			"Moran's I can range from -0.7 to 1.01 on these weights (de Jong et al. 1984); 0.5 is 50% of the way from its expected value to the maximum."},
		{"iterative", clustering.Variable{MoransI: i, Bounds: &autocorr.Bounds{Min: -0.7, Max: 1.01, Method: "lanczos", Iterations: 300, Converged: true, Tolerance: 6.2e-7}},
			"Moran's I can range from -0.7 to 1.01 on these weights (de Jong et al. 1984; found by iteration, each end exact to within 7e-07); 0.5 is 50% of the way from its expected value to the maximum."},
		{"approximate", clustering.Variable{MoransI: i, Bounds: &autocorr.Bounds{Min: -0.7, Max: 1.01, Method: "lanczos", Iterations: 5000, Tolerance: 0.003}},
			"Moran's I can range from -0.7 to 1.01 on these weights (de Jong et al. 1984; approximate: the iteration stopped at 5,000 steps, and the true range is at least this wide); 0.5 is 50% of the way from its expected value to the maximum."},
		{"skipped", clustering.Variable{MoransI: i, RangeSkipped: "85,000 areas, more than the 10,000 up to which it is computed unasked; ask for it with --moran-range"},
			"The range of Moran's I on these weights was not computed (85,000 areas, more than the 10,000 up to which it is computed unasked; ask for it with --moran-range)."},
	} {
		if got := rangeSentence(c.v); got != c.want {
			t.Errorf("%s:\n got %s\nwant %s", c.name, got, c.want)
		}
	}
}

// Rounding up to one significant digit never states less than achieved.
func TestRoundUp(t *testing.T) {
	for x, want := range map[float64]string{6.2e-7: "7e-07", 7e-7: "7e-07", 9.5e-7: "1e-06", 1e-6: "1e-06", 1.01e-6: "2e-06", 0: "0"} {
		if got := roundUp(x); got != want {
			t.Errorf("roundUp(%v) = %s, want %s", x, got, want)
		}
	}
}
