package tests

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/weights"
)

// The sparse (Lanczos) path of the range of Moran's I, forced on the 49
// states' queen graph, agrees with numpy.linalg.eigh of M W* M
// (testdata/scipy/autocorr_refs.json) to its stated tolerance, binary and
// row-standardised, and with the dense path.
func TestStatesBoundsSparseAgainstNumpy(t *testing.T) {
	r := loadAutocorrRefs(t)
	g := statesQueen(t, r)
	for name, w := range map[string]*weights.Graph{"binary": g, "row": g.RowStandardised()} {
		want := r.Bounds[name]
		b, err := autocorr.MoranBoundsWith(w, autocorr.BoundsOptions{Sparse: true, Tolerance: 1e-10})
		if err != nil {
			t.Fatal(err)
		}
		tol := b.Tolerance + 1e-12
		if b.Method != "lanczos" || !b.Converged || b.Tolerance > 1e-10*math.Abs(want.Max) ||
			math.Abs(b.Min-want.Min) > tol || math.Abs(b.Max-want.Max) > tol {
			t.Errorf("%s: %+v, numpy [%v, %v]", name, b, want.Min, want.Max)
		}
		dense, _ := autocorr.MoranBounds(w)
		if math.Abs(b.Min-dense.Min) > tol || math.Abs(b.Max-dense.Max) > tol {
			t.Errorf("%s: sparse %+v, dense %+v", name, b, dense)
		}
	}
}
