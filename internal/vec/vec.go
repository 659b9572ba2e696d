// Package vec holds the few dense-vector kernels the iterative methods of
// spatial/ share (the eigenbasis of the surrogates, the range of Moran's
// I): a dot product, y += a·x and centring. They sit below every layer,
// like internal/parallel, so that each package need not keep a copy.
package vec

// Dot returns Σ a_i b_i, summed in order (b at least as long as a).
func Dot(a, b []float64) float64 {
	var s float64
	b = b[:len(a)]
	for i, v := range a {
		s += v * b[i]
	}
	return s
}

// Axpy sets y += a·x, element by element (x at least as long as y); the
// loop is unrolled by four for speed, each element computed as in the
// plain loop.
func Axpy(a float64, x, y []float64) {
	n := len(y)
	x = x[:n]
	i := 0
	for ; i+4 <= n; i += 4 {
		y[i] += a * x[i]
		y[i+1] += a * x[i+1]
		y[i+2] += a * x[i+2]
		y[i+3] += a * x[i+3]
	}
	for ; i < n; i++ {
		y[i] += a * x[i]
	}
}

// Centre subtracts the mean of v from every entry and returns the mean.
func Centre(v []float64) float64 {
	var s float64
	for _, x := range v {
		s += x
	}
	s /= float64(len(v))
	for i := range v {
		v[i] -= s
	}
	return s
}
