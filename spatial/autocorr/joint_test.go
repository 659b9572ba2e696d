package autocorr

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// The joint evaluator gives the same Moran's I and Geary's C as the
// one-variable functions, for the observed arrangement and for shuffled
// ones.
func TestMoranGearyManyMatchesSingle(t *testing.T) {
	g := latticeGraph(7, 8)
	for _, w := range []string{"binary", "row"} {
		gr := g
		if w == "row" {
			gr = g.RowStandardised()
		}
		xs := [][]float64{make([]float64, 56), make([]float64, 56)}
		for i := range xs[0] {
			xs[0][i] = float64(i/8) + 0.3*math.Sin(float64(i))
			xs[1][i] = math.Cos(float64(i) * 2.1)
		}
		labels, stats, f, err := MoranGearyMany(xs, gr, shuffle.TwoSided)
		if err != nil {
			t.Fatal(err)
		}
		if len(stats) != 4 {
			t.Fatalf("%d statistics", len(stats))
		}
		out := make([]float64, 4)
		eval := f()
		perm := append([]int32(nil), labels...)
		rng := shuffle.NewStream(5, 0, 0)
		for trial := 0; trial < 3; trial++ {
			eval(perm, out)
			for c, x := range xs {
				moved := make([]float64, len(x))
				for i, l := range perm {
					moved[i] = x[l]
				}
				i, _ := MoransI(moved, gr)
				cc, _ := GearysC(moved, gr)
				if math.Abs(out[2*c]-i) > 1e-12 || math.Abs(out[2*c+1]-cc) > 1e-12 {
					t.Fatalf("%s trial %d variable %d: joint (%v, %v), single (%v, %v)", w, trial, c, out[2*c], out[2*c+1], i, cc)
				}
			}
			for k := len(perm) - 1; k > 0; k-- {
				j := rng.IntN(k + 1)
				perm[k], perm[j] = perm[j], perm[k]
			}
		}
	}
}
