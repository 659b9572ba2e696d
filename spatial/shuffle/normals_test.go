package shuffle

import (
	"math"
	"testing"
)

// Stream.Normals draws standard normals: over 200,000 draws the mean is 0,
// the variance 1 and the fourth moment 3 (the standard normal's moments,
// common knowledge), within a few standard errors; the same stream gives
// the same draws, also for an odd length.
func TestNormals(t *testing.T) {
	var s Stream
	s.Reset(7, 3, 0)
	x := make([]float64, 200_001)
	s.Normals(x)
	var m1, m2, m4 float64
	for _, v := range x {
		m1 += v
		m2 += v * v
		m4 += v * v * v * v
	}
	n := float64(len(x))
	m1, m2, m4 = m1/n, m2/n, m4/n
	// Standard errors: 1/√n for the mean, √2/√n for the variance, √96/√n
	// for the fourth moment (Var x⁴ = 105 − 9).
	if math.Abs(m1) > 4/math.Sqrt(n) || math.Abs(m2-1) > 4*math.Sqrt(2/n) || math.Abs(m4-3) > 4*math.Sqrt(96/n) {
		t.Fatalf("moments %.4f %.4f %.4f", m1, m2, m4)
	}
	var again Stream
	again.Reset(7, 3, 0)
	y := make([]float64, len(x))
	again.Normals(y)
	for i := range x {
		if x[i] != y[i] {
			t.Fatalf("draw %d differs on the same stream", i)
		}
	}
}
