package surrogate

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/lapack64"

	"github.com/areatest/areatest/internal/vec"
	"github.com/areatest/areatest/spatial/shuffle"
)

// sparse finds the eigenvectors at both ends of the spectrum of Ω by
// Chebyshev-filtered subspace iteration (Zhou, Saad, Tiago & Chelikowsky
// 2006, J. Comput. Phys. 219:172–184; the scaled filter of Zhou & Saad 2007,
// SIAM J. Matrix Anal. Appl. 29:954–971), one block per end, then one
// Rayleigh–Ritz step on both blocks together.
//
// Why not single-vector Lanczos, as the bounds of Moran's I use: a Krylov
// space grown from one vector holds one direction of each repeated
// eigenvalue, and regular grids of areas have many repeated eigenvalues, so
// Lanczos would silently drop eigenvectors. A block of vectors resolves
// repeats up to its width. And on a sparse graph a product with the weights
// costs far less than orthogonalising against a long Krylov basis, so
// spending many cheap products on a polynomial filter is the faster road to
// a few hundred eigenvectors.
func (b *Basis) sparse(opt Options) error {
	L := len(b.linked)
	top, bot := opt.Top, opt.Bottom
	if top < 0 || bot < 0 {
		return fmt.Errorf("surrogate: negative number of eigenvectors (%d, %d)", top, bot)
	}
	if top == 0 && bot == 0 {
		total := min(DefaultVectors, L-1, maxBasisFloats/L)
		top = (2*total + 2) / 3
		bot = total - top
	}
	if top+bot > L-1 {
		return fmt.Errorf("surrogate: %d eigenvectors asked for, but %d areas have only %d orthogonal to 1", top+bot, L, L-1)
	}
	if top+bot == 0 {
		return errors.New("surrogate: the sparse path needs at least one eigenvector")
	}
	tol := opt.Tolerance
	if !(tol > 0) {
		tol = 1e-9
	}
	maxIter := opt.MaxIterations
	if maxIter <= 0 {
		maxIter = 60
	}
	lo, hi := spectrumBounds(b.op, opt.Seed)
	norm := math.Max(math.Abs(lo), math.Abs(hi))
	var blocks [][]float64
	var counts []int
	ok := true
	for end, want := range []int{top, bot} {
		if want == 0 {
			continue
		}
		sign, loB, hiB := 1.0, lo, hi
		if end == 1 {
			sign, loB, hiB = -1, -hi, -lo
		}
		room := L - 1 - want
		if end == 0 {
			room -= bot // keep the two blocks apart
		}
		guard := max(0, min(max(10, want/5), room))
		rng := shuffle.NewStream(opt.Seed, basisPurpose, end)
		x, it, prods, conv := filteredSubspace(b.op, want, guard, sign, loB, hiB, tol*norm, maxIter, &rng)
		b.info.Iterations += it
		b.info.Products += prods
		ok = ok && conv
		blocks = append(blocks, x)
		counts = append(counts, want)
	}
	// Rayleigh–Ritz on the union of both ends: the stored vectors are then
	// exactly Ω-orthogonal (vᵢᵀΩvⱼ = 0 for i ≠ j to rounding), which is
	// what keeps the quadratic form of a sign-flipped combination equal to
	// the outcome's, converged or not.
	m := top + bot
	v := make([]float64, L*m)
	col := 0
	for k, x := range blocks {
		p := len(x) / L
		for i := 0; i < L; i++ {
			copy(v[i*m+col:i*m+col+counts[k]], x[i*p:i*p+counts[k]])
		}
		col += counts[k]
	}
	orthonormalise(v, L, m)
	vals, res := rayleighRitz(b.op, v, L, m, 1)
	b.m, b.vecs, b.values = m, v, vals
	b.info.Top, b.info.Bottom = top, bot
	for _, r := range res {
		b.info.MaxResidual = math.Max(b.info.MaxResidual, r)
	}
	b.info.Converged = ok && b.info.MaxResidual <= 10*tol*norm
	return nil
}

// filteredSubspace returns a block (L × (want+guard), row-major) whose
// first want columns approximate the eigenvectors of sign·Ω with the
// largest eigenvalues, the spectrum of sign·Ω lying in [lo, hi]. Each
// iteration applies a Chebyshev polynomial that stays within [−1, 1] on
// [lo, cut] — cut being the innermost Ritz value of the block, so the
// unwanted part of the spectrum is damped — and grows fast above it, then
// orthonormalises and takes Ritz vectors. It stops when the residual norms
// of the wanted columns are at most tol.
func filteredSubspace(op *symOp, want, guard int, sign, lo, hi, tol float64, maxIter int, rng *shuffle.Stream) (x []float64, iters, products int, converged bool) {
	L := op.n
	p := want + guard
	x = make([]float64, L*p)
	rng.Normals(x)
	centreColumns(x, L, p)
	orthonormalise(x, L, p)
	theta, res := rayleighRitz(op, x, L, p, sign)
	products++
	y0 := make([]float64, L*p)
	y1 := make([]float64, L*p)
	y2 := make([]float64, L*p)
	for iters = 1; iters <= maxIter; iters++ {
		cut := theta[p-1]
		if !(cut > lo) || cut >= hi {
			cut = lo + (hi-lo)/2
		}
		e, c := (cut-lo)/2, (cut+lo)/2
		ts := (hi - c) / e
		// The degree keeps the ratio of the largest to the smallest
		// amplification within the block below 1e10: far beyond that the
		// columns collapse onto the leading eigenvectors in floating
		// point and the weaker wanted directions are lost (they come back
		// in later iterations, but slowly). Tried on the 3,000-area
		// region: 1e6…1e14 and caps of 25…100 all converge, in 2–3 s.
		deg := int(math.Acosh(1e10) / math.Acosh(ts))
		deg = max(4, min(deg, 60))
		// Scaled three-term recurrence: Y_k = T_k(t(A)) X / T_k(t(hi)),
		// t(λ) = (λ − c)/e, so no value exceeds about 1 in magnitude.
		copy(y0, x)
		s1 := 1 / ts
		op.applyBlock(y0, y1, p, sign)
		for i := range y1 {
			y1[i] = (y1[i] - c*y0[i]) * (s1 / e)
		}
		s := s1
		for k := 2; k <= deg; k++ {
			sNew := 1 / (2/s1 - s)
			op.applyBlock(y1, y2, p, sign)
			a, bb := 2*sNew/e, s*sNew
			for i := range y2 {
				y2[i] = a*(y2[i]-c*y1[i]) - bb*y0[i]
			}
			y0, y1, y2 = y1, y2, y0
			s = sNew
		}
		products += deg
		copy(x, y1)
		orthonormalise(x, L, p)
		theta, res = rayleighRitz(op, x, L, p, sign)
		products++
		worst := 0.0
		for _, r := range res[:want] {
			worst = math.Max(worst, r)
		}
		if worst <= tol {
			return x, iters, products, true
		}
	}
	return x, maxIter, products, false
}

// orthonormalise replaces the columns of the n×p row-major block by an
// orthonormal basis of their span (Householder QR, which stays orthonormal
// however ill-conditioned the block), re-centred so that rounding does not
// drift the basis towards 1.
func orthonormalise(x []float64, n, p int) {
	a := blas64.General{Rows: n, Cols: p, Stride: p, Data: x}
	tau := make([]float64, p)
	work := make([]float64, 1)
	lapack64.Geqrf(a, tau, work, -1)
	work = make([]float64, int(work[0]))
	lapack64.Geqrf(a, tau, work, len(work))
	lapack64.Orgqr(a, tau, work, -1)
	if int(work[0]) > len(work) {
		work = make([]float64, int(work[0]))
	}
	lapack64.Orgqr(a, tau, work, len(work))
	centreColumns(x, n, p)
}

// rayleighRitz replaces the orthonormal block x (n×p) by the Ritz vectors
// of sign·Ω in its span, in descending order of Ritz value, and returns the
// Ritz values of sign·Ω and the residual norms ‖sign·Ω v − θ v‖.
func rayleighRitz(op *symOp, x []float64, n, p int, sign float64) (theta, res []float64) {
	ax := make([]float64, n*p)
	op.applyBlock(x, ax, p, sign)
	X := blas64.General{Rows: n, Cols: p, Stride: p, Data: x}
	AX := blas64.General{Rows: n, Cols: p, Stride: p, Data: ax}
	h := blas64.General{Rows: p, Cols: p, Stride: p, Data: make([]float64, p*p)}
	blas64.Gemm(blas.Trans, blas.NoTrans, 1, X, AX, 0, h)
	for i := 0; i < p; i++ {
		for j := i + 1; j < p; j++ {
			v := (h.Data[i*p+j] + h.Data[j*p+i]) / 2
			h.Data[i*p+j], h.Data[j*p+i] = v, v
		}
	}
	w := make([]float64, p)
	sym := blas64.Symmetric{N: p, Stride: p, Data: h.Data, Uplo: blas.Upper}
	work := make([]float64, 1)
	lapack64.Syev(lapack.EVCompute, sym, w, work, -1)
	work = make([]float64, int(work[0]))
	if !lapack64.Syev(lapack.EVCompute, sym, w, work, len(work)) {
		// Syev on a small symmetric matrix does not fail in practice; keep
		// the block as it is rather than return garbage.
		theta = make([]float64, p)
		res = make([]float64, p)
		for k := range res {
			res[k] = math.Inf(1)
		}
		return theta, res
	}
	// Columns of h are eigenvectors in ascending order; reverse them.
	s := blas64.General{Rows: p, Cols: p, Stride: p, Data: make([]float64, p*p)}
	theta = make([]float64, p)
	for c := 0; c < p; c++ {
		src := p - 1 - c
		theta[c] = w[src]
		for i := 0; i < p; i++ {
			s.Data[i*p+c] = h.Data[i*p+src]
		}
	}
	nx := make([]float64, n*p)
	NX := blas64.General{Rows: n, Cols: p, Stride: p, Data: nx}
	blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, X, s, 0, NX)
	copy(x, nx)
	blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, AX, s, 0, NX) // NX = Ω·(new x)
	res = make([]float64, p)
	for i := 0; i < n; i++ {
		xr, ar := x[i*p:(i+1)*p], nx[i*p:(i+1)*p]
		for c := range res {
			d := ar[c] - theta[c]*xr[c]
			res[c] += d * d
		}
	}
	for c := range res {
		res[c] = math.Sqrt(res[c])
	}
	return theta, res
}

// spectrumBounds returns an interval that holds every eigenvalue of Ω on
// the complement of 1: the extreme Ritz values of a short Lanczos run with
// full reorthogonalisation, widened by their residual norms and a margin of
// 1% of the width (Ritz values lie inside the spectrum, so they must be
// pushed out), and clipped to the Gershgorin bound of W*.
func spectrumBounds(op *symOp, seed uint64) (lo, hi float64) {
	n := op.n
	steps := min(n-1, 40)
	rng := shuffle.NewStream(seed, basisPurpose, 2)
	q := make([]float64, n)
	rng.Normals(q)
	vec.Centre(q)
	scaleTo(q, 1)
	basis := make([]float64, 0, n*steps)
	alpha := make([]float64, 0, steps)
	beta := make([]float64, 0, steps)
	w := make([]float64, n)
	for k := 0; k < steps; k++ {
		basis = append(basis, q...)
		op.apply(q, w)
		vec.Centre(w)
		alpha = append(alpha, vec.Dot(q, w))
		for pass := 0; pass < 2; pass++ {
			for j := 0; j <= k; j++ {
				qj := basis[j*n : (j+1)*n]
				c := vec.Dot(qj, w)
				for i := range w {
					w[i] -= c * qj[i]
				}
			}
			vec.Centre(w)
		}
		bk := math.Sqrt(vec.Dot(w, w))
		if bk <= 1e-12*(math.Abs(alpha[k])+1e-300) || k == steps-1 {
			beta = append(beta, bk)
			break
		}
		beta = append(beta, bk)
		for i := range q {
			q[i] = w[i] / bk
		}
	}
	k := len(alpha)
	t := blas64.Symmetric{N: k, Stride: k, Data: make([]float64, k*k), Uplo: blas.Upper}
	for i := 0; i < k; i++ {
		t.Data[i*k+i] = alpha[i]
		if i+1 < k {
			t.Data[i*k+i+1] = beta[i]
		}
	}
	ev := make([]float64, k)
	work := make([]float64, 1)
	lapack64.Syev(lapack.EVCompute, t, ev, work, -1)
	work = make([]float64, int(work[0]))
	if !lapack64.Syev(lapack.EVCompute, t, ev, work, len(work)) {
		return -op.gersh, op.gersh
	}
	last := beta[k-1]
	rlo := last * math.Abs(t.Data[(k-1)*k+0])
	rhi := last * math.Abs(t.Data[(k-1)*k+k-1])
	width := ev[k-1] - ev[0]
	lo = math.Max(-op.gersh, ev[0]-rlo-0.01*width)
	hi = math.Min(op.gersh, ev[k-1]+rhi+0.01*width)
	return lo, hi
}

// scaleTo scales v to length l (leaves a zero vector alone).
func scaleTo(v []float64, l float64) {
	s := math.Sqrt(vec.Dot(v, v))
	if s == 0 {
		return
	}
	f := l / s
	for i := range v {
		v[i] *= f
	}
}
