package vec

import (
	"testing"

	_ "github.com/areatest/areatest/tests/testkit"
)

// Worked by hand: (1,2,3)·(4,5,6) = 32; y = (1,1,1,1,1) + 2·(1..5);
// centring (1,2,3,6) subtracts its mean 3.
func TestKernels(t *testing.T) {
	if d := Dot([]float64{1, 2, 3}, []float64{4, 5, 6, 7}); d != 32 {
		t.Errorf("Dot = %v", d)
	}
	y := []float64{1, 1, 1, 1, 1}
	Axpy(2, []float64{1, 2, 3, 4, 5}, y)
	for i, w := range []float64{3, 5, 7, 9, 11} {
		if y[i] != w {
			t.Errorf("Axpy: y[%d] = %v", i, y[i])
		}
	}
	v := []float64{1, 2, 3, 6}
	if m := Centre(v); m != 3 || v[0] != -2 || v[3] != 3 {
		t.Errorf("Centre: mean %v, %v", m, v)
	}
}
