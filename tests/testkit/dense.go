package testkit

import "gonum.org/v1/gonum/mat"

// Dense returns the n×n matrix of a graph stored in compressed rows, n =
// len(offsets) − 1: row i holds weights[offsets[i]:offsets[i+1]] in the
// columns neighbours[offsets[i]:offsets[i+1]]. Tests hand it a graph's
// Offsets, Neighbours and Weights to compare with a formula written with
// dense matrices, or with a library that takes one.
func Dense(offsets, neighbours []int32, weights []float64) *mat.Dense {
	n := len(offsets) - 1
	d := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		for k := offsets[i]; k < offsets[i+1]; k++ {
			d.Set(i, int(neighbours[k]), weights[k])
		}
	}
	return d
}

// Centring returns the n×n centring matrix M = I − 11ᵀ/n.
func Centring(n int) *mat.Dense {
	m := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			v := -1 / float64(n)
			if i == j {
				v++
			}
			m.Set(i, j, v)
		}
	}
	return m
}

// DoublyCentred returns M W* M with W* = (W + Wᵀ)/2 and M the centring
// matrix: the matrix whose eigenvalues, scaled by n/S0, bound Moran's I (de
// Jong, Sprenger & van Veen 1984) and whose eigenvectors are the spatial
// patterns of W (Dray, Legendre & Peres-Neto 2006, eq. 4). The product is
// symmetrised entry by entry, so rounding leaves no asymmetry.
func DoublyCentred(w mat.Matrix) *mat.SymDense {
	n, _ := w.Dims()
	sym := mat.NewDense(n, n, nil)
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			sym.Set(i, j, w.At(i, j)/2+w.At(j, i)/2)
		}
	}
	m := Centring(n)
	var mw, mwm mat.Dense
	mw.Mul(m, sym)
	mwm.Mul(&mw, m)
	s := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			s.SetSym(i, j, (mwm.At(i, j)+mwm.At(j, i))/2)
		}
	}
	return s
}
