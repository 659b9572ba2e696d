package autocorr

import (
	"math"

	"github.com/areatest/areatest/internal/vec"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// symOperator is a symmetric linear map on a subspace of Rⁿ: Project maps
// onto the subspace, Apply sets y = A v for v in it.
type symOperator interface {
	Len() int
	Apply(v, y []float64)
	Project(v []float64)
}

// centredSym is M W* M, W* = (W + Wᵀ)/2, on the vectors orthogonal to 1,
// applied without forming it: every vector is kept centred, so M v = v on
// the way in and M is one subtraction of the mean on the way out. W* is
// kept in compressed rows of its own, so a product gathers along each row
// and writes each entry of y once (the transpose of W on the fly would
// scatter into y, about half again as slow on large layers).
type centredSym struct {
	offsets    []int
	neighbours []int32
	weights    []float64
}

// newCentredSym builds the rows of W*: row i merges i's links (w_ij / 2)
// with the links into i (w_ji / 2), both sorted by neighbour.
func newCentredSym(g *weights.Graph) centredSym {
	n := g.Len()
	inCount := make([]int, n+1)
	for _, j := range g.Neighbours {
		inCount[j+1]++
	}
	for i := 0; i < n; i++ {
		inCount[i+1] += inCount[i]
	}
	// The links into each area, by source in increasing order.
	inFrom := make([]int32, len(g.Neighbours))
	inW := make([]float64, len(g.Neighbours))
	fill := append([]int(nil), inCount[:n]...)
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			inFrom[fill[j]], inW[fill[j]] = int32(i), w[k]
			fill[j]++
		}
	}
	c := centredSym{offsets: make([]int, n+1), neighbours: make([]int32, 0, 2*g.Links()), weights: make([]float64, 0, 2*g.Links())}
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		from, fw := inFrom[inCount[i]:inCount[i+1]], inW[inCount[i]:inCount[i+1]]
		a, b := 0, 0
		for a < len(nb) || b < len(from) {
			switch {
			case b == len(from) || (a < len(nb) && nb[a] < from[b]):
				c.add(nb[a], w[a]/2)
				a++
			case a == len(nb) || from[b] < nb[a]:
				c.add(from[b], fw[b]/2)
				b++
			default:
				c.add(nb[a], w[a]/2+fw[b]/2)
				a, b = a+1, b+1
			}
		}
		c.offsets[i+1] = len(c.neighbours)
	}
	return c
}

func (c *centredSym) add(j int32, w float64) {
	c.neighbours = append(c.neighbours, j)
	c.weights = append(c.weights, w)
}

func (c centredSym) Len() int { return len(c.offsets) - 1 }

// Apply sets y = M W* v.
func (c centredSym) Apply(v, y []float64) {
	c.gather(v, y)
	vec.Centre(y)
}

// gather sets y = W* v.
func (c centredSym) gather(v, y []float64) {
	for i := range y {
		var acc float64
		a, b := c.offsets[i], c.offsets[i+1]
		for k, j := range c.neighbours[a:b] {
			acc += c.weights[a+k] * v[j]
		}
		y[i] = acc
	}
}

func (c centredSym) Project(v []float64) { vec.Centre(v) }

// extremes is what lanczosBounds finds: the Rayleigh quotients lo and hi
// of two explicit vectors, their residual norms ‖Ay − ρy‖ (for unit y),
// the number of Lanczos steps, and whether both residuals are within the
// tolerance.
type extremes struct {
	lo, hi, rlo, rhi float64
	steps            int
	converged        bool
}

// lanczosBounds finds the smallest and largest eigenvalues of op by the
// Lanczos iteration (Lanczos 1950, J. Res. Natl. Bur. Stand. 45:255–282)
// without reorthogonalisation, in two passes (Cullum & Willoughby 1985,
// Lanczos Algorithms for Large Symmetric Eigenvalue Computations, vol. 1;
// Golub & Van Loan, Matrix Computations, §10.3 — cited from memory).
//
// The first pass keeps three vectors and the tridiagonal T_k, so a step
// costs one product and a few vector operations whatever k is: the cost
// of the earlier version, which orthogonalised each vector against every
// earlier one, grew as n·k², and k itself grows as √n on lattices. In
// floating point the vectors lose orthogonality once a Ritz value has
// converged and T_k then shows copies of it ("ghosts"), but its extreme
// eigenvalues still converge to the extreme eigenvalues of op (Paige 1980,
// Linear Algebra Appl. 34:235–258), and the ghosts do not matter here: only
// the two extreme values are wanted, not their multiplicities. Repeated
// eigenvalues — lattices have many — are no obstacle for the same reason:
// the Krylov space holds one direction of each eigenspace, and that is
// enough to find its eigenvalue.
//
// Every few steps the extreme eigenvalues of T_k are found by Sturm
// bisection and their residual estimates β_k|s_k| (s the eigenvector of
// T_k) are compared with tol·max|θ|. Once both pass, the second pass reruns
// the same recurrence from the same start vector — bit for bit the same
// vectors — and sums the two Ritz vectors y = Σ s_j q_j. Their Rayleigh
// quotients are returned, and their residuals computed afresh, so the
// result does not rest on the first pass's estimates: each returned value
// is attained by an actual vector (so lies inside the true range), and an
// eigenvalue of op lies within its residual of it (Krylov–Weinstein). If a
// residual misses the tolerance, the first pass goes on (up to three
// times). The start vector comes from a seeded stream.
func lanczosBounds(op symOperator, seed uint64, tol float64, maxIter int) extremes {
	n := op.Len()
	q0 := make([]float64, n)
	rng := shuffle.NewStream(seed, boundsPurpose, 0)
	for i := range q0 {
		q0[i] = rng.Float64() - 0.5
	}
	op.Project(q0)
	normalise(q0)
	run := newLanczos(op, q0)
	target := tol
	var e extremes
	for round := 0; round < 3; round++ {
		ok := run.until(target, maxIter)
		e = ritzPair(op, q0, run)
		top := math.Max(math.Abs(e.lo), math.Abs(e.hi))
		e.converged = e.rlo <= tol*top && e.rhi <= tol*top
		if e.converged || !ok || run.breakdown {
			return e
		}
		// The estimates passed but the residuals did not: ask more of
		// the estimates, by the factor they fell short.
		target *= tol * top / math.Max(e.rlo, e.rhi) / 2
	}
	return e
}

// ritzPair is the second pass: it rebuilds the Ritz vectors of the
// extreme eigenvalues of run's T_k and measures them.
func ritzPair(op symOperator, q0 []float64, run *lanczos) extremes {
	n, k := op.Len(), len(run.alpha)
	slo := tridiagonalVector(run.alpha, run.beta[:k-1], run.lo)
	shi := tridiagonalVector(run.alpha, run.beta[:k-1], run.hi)
	ylo, yhi := make([]float64, n), make([]float64, n)
	again := newLanczos(op, q0)
	for j := 0; j < k; j++ {
		vec.Axpy(slo[j], again.q, ylo)
		vec.Axpy(shi[j], again.q, yhi)
		if j+1 < k {
			again.step()
		}
	}
	e := extremes{steps: k}
	e.lo, e.rlo = rayleigh(op, ylo, again.w)
	e.hi, e.rhi = rayleigh(op, yhi, again.w)
	return e
}

// rayleigh returns the Rayleigh quotient ρ of y and the residual norm
// ‖Ay − ρy‖ of y scaled to unit length; work is scratch of y's length.
func rayleigh(op symOperator, y, work []float64) (rho, res float64) {
	op.Project(y)
	normalise(y)
	op.Apply(y, work)
	rho = vec.Dot(y, work)
	vec.Axpy(-rho, y, work)
	return rho, math.Sqrt(vec.Dot(work, work))
}
