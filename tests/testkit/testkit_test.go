package testkit

import (
	"math"
	"os"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// A path of three areas, 0 – 1 – 2, row-standardised.
var (
	pathOffsets    = []int32{0, 1, 3, 4}
	pathNeighbours = []int32{1, 0, 2, 1}
	pathWeights    = []float64{1, 0.5, 0.5, 1}
)

func TestDense(t *testing.T) {
	d := Dense(pathOffsets, pathNeighbours, pathWeights)
	want := mat.NewDense(3, 3, []float64{0, 1, 0, 0.5, 0, 0.5, 0, 1, 0})
	if !mat.Equal(d, want) {
		t.Errorf("got %v, want %v", mat.Formatted(d), mat.Formatted(want))
	}
}

// M W* M is symmetric, its rows sum to zero (M1 = 0), and it is the
// symmetric part of W centred on both sides.
func TestDoublyCentred(t *testing.T) {
	w := Dense(pathOffsets, pathNeighbours, pathWeights)
	s := DoublyCentred(w)
	var ws, sym, m1 mat.Dense
	ws.Add(w, w.T())
	ws.Scale(0.5, &ws)
	m := Centring(3)
	m1.Mul(m, &ws)
	sym.Mul(&m1, m)
	for i := 0; i < 3; i++ {
		var row float64
		for j := 0; j < 3; j++ {
			row += s.At(i, j)
			if math.Abs(s.At(i, j)-sym.At(i, j)) > 1e-15 {
				t.Errorf("(%d, %d): %v, M W* M %v", i, j, s.At(i, j), sym.At(i, j))
			}
		}
		if math.Abs(row) > 1e-15 {
			t.Errorf("row %d sums to %v", i, row)
		}
	}
}

// A SAR field solves (I − ρW)y = ε, and with ρ = 0 it is ε itself.
func TestSAR(t *testing.T) {
	w := Dense(pathOffsets, pathNeighbours, pathWeights)
	eps := []float64{0.3, -1.2, 0.7}
	y := NewSAR(w, 0.6).Field(t, eps)
	for i := range y {
		var wy float64
		for j := range y {
			wy += w.At(i, j) * y[j]
		}
		if r := y[i] - 0.6*wy - eps[i]; math.Abs(r) > 1e-15 {
			t.Errorf("area %d: residual %g", i, r)
		}
	}
	if y0 := NewSAR(w, 0).Field(t, eps); !mat.Equal(mat.NewVecDense(3, y0), mat.NewVecDense(3, eps)) {
		t.Errorf("ρ = 0: %v, want %v", y0, eps)
	}
	if eps[0] != 0.3 || eps[1] != -1.2 || eps[2] != 0.7 {
		t.Errorf("eps changed to %v", eps)
	}
}

func TestTestdata(t *testing.T) {
	if _, err := os.Stat(Testdata(t, "us-states.geojson")); err != nil {
		t.Error(err)
	}
	var refs struct{ Versions map[string]string }
	LoadJSON(t, "scipy/refs.json", &refs)
	if len(refs.Versions) == 0 {
		t.Error("scipy/refs.json: no versions")
	}
}

func TestMeanVar(t *testing.T) {
	if m, v := MeanVar([]float64{1, 2, 3, 6}); m != 3 || v != 14.0/3 {
		t.Errorf("mean %v, variance %v; want 3 and 14/3", m, v)
	}
}
