package autocorr

import (
	"errors"
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// TestTooLargeIsAnError: values whose squared deviations, or their squares
// again, overflow a float64 (largest finite about 1.8e308, common
// knowledge) are a *TooLargeError naming the value furthest from the mean,
// in every statistic that centres the column, instead of "constant" or a
// NaN variance. Values of 1e60 still work, and give the same Moran's I as
// the same values divided by 1e60 (I is unchanged by scaling, common
// knowledge).
func TestTooLargeIsAnError(t *testing.T) {
	g := latticeGraph(3, 3)
	base := []float64{1, 3, 2, 5, 4, 1, 2, 6, 3}
	scaled := func(s float64) []float64 {
		x := make([]float64, len(base))
		for i, v := range base {
			x[i] = s * v
		}
		return x
	}
	plan := shuffle.Plan{Permutations: 9}
	for _, c := range []struct {
		name string
		x    []float64
	}{
		// 1e300: the first square overflows (and the sum is near the top).
		{"1e300", scaled(1e300)},
		// 1e100: squares are fine (1e200), their squares (1e400) are not.
		{"1e100", scaled(1e100)},
		// One huge value among small ones.
		{"one value", append(append([]float64{}, base[:7]...), 1e160, 3)},
		// The sum overflows though each value is finite.
		{"sum", []float64{1.5e308, 1.6e308, 1.7e308, 1.5e308, 1.6e308, 1.7e308, 1.5e308, 1.6e308, 1.7e308}},
	} {
		t.Run(c.name, func(t *testing.T) {
			checks := map[string]error{}
			_, checks["Moran"] = RunTest(c.x, g, plan)
			_, checks["Geary"] = RunGeary(c.x, g, plan)
			_, checks["General G"] = RunGeneralG(c.x, g, plan)
			_, checks["Gi*"] = GiStar(c.x, g)
			_, _, _, checks["many"] = MoranGearyMany([][]float64{base, c.x}, g, shuffle.TwoSided)
			_, _, checks["Centre"] = Centre(c.x)
			for name, err := range checks {
				var tl *TooLargeError
				if !errors.Is(err, ErrTooLarge) || !errors.As(err, &tl) {
					t.Errorf("%s: %v, want a *TooLargeError", name, err)
					continue
				}
				if c.name == "one value" && (tl.Index != 7 || tl.Value != 1e160) {
					t.Errorf("%s: names value %d (%g), want 7 (1e160)", name, tl.Index, tl.Value)
				}
			}
		})
	}
	want, _ := MoransI(base, g)
	got, err := MoransI(scaled(1e60), g)
	if err != nil || math.Abs(got-want) > 1e-12 {
		t.Errorf("1e60: I = %v, %v; want %v", got, err, want)
	}
	if m, err := MoranMoments(scaled(1e60), g); err != nil || math.IsNaN(m.VarianceRandomisation) {
		t.Errorf("1e60: moments %+v, %v", m, err)
	}
	e := &TooLargeError{Index: 3, Value: 1e300}
	if got := e.Error(); got != "the values are too large to square (1e+300 in value 3): the statistics square the deviations from the mean and square them again, which overflows; rescale the column (divide it by a power of ten)" {
		t.Errorf("message %q", got)
	}
	e.Column, e.ID = "income", "D004"
	if got := e.Error(); got != `column "income": the values are too large to square (1e+300 in area "D004"): the statistics square the deviations from the mean and square them again, which overflows; rescale the column (divide it by a power of ten)` {
		t.Errorf("message %q", got)
	}
}
