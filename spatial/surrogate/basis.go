package surrogate

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/internal/vec"
	"github.com/areatest/areatest/weights"
)

// Method chooses how the eigenvectors are found.
type Method int

const (
	// Auto uses Dense up to Options.DenseLimit areas and Sparse above.
	Auto Method = iota
	// Dense finds every eigenvector from the dense matrix: exact, O(n³).
	Dense
	// Sparse finds the eigenvectors at both ends of the spectrum by a
	// filtered subspace iteration on the sparse graph; the rest of the
	// space is treated as described at Residual.
	Sparse
)

func (m Method) String() string {
	switch m {
	case Dense:
		return "dense"
	case Sparse:
		return "sparse"
	}
	return "auto"
}

// Residual says how a surrogate fills the part of the space that a sparse
// basis does not cover (orthogonal to 1 and to the computed eigenvectors).
type Residual int

const (
	// Matched fills it with a random direction of the residual subspace
	// coloured by one power of the weights, (I + γΩ)g for Gaussian g, with
	// γ chosen draw by draw so that its Moran quotient equals that of the
	// outcome's residual, and scaled to the residual's norm. Moran's I of
	// the surrogate then equals the outcome's (to the convergence
	// tolerance) whenever that quotient can be reached, which is nearly
	// always; see Basis.Tolerance.
	Matched Residual = iota
	// White fills it with an uncoloured random direction of the residual
	// subspace, scaled to the residual's norm: the plain treatment, whose
	// Moran quotient sits near the mean eigenvalue of the residual
	// subspace, whatever the outcome's was.
	White
)

func (r Residual) String() string {
	if r == White {
		return "white"
	}
	return "matched"
}

// DefaultDenseLimit is the largest number of areas for which Auto finds
// every eigenvector. A dense eigen-decomposition with vectors takes about
// 1.2 s at 1,000 areas on the 2-core development machine and grows as n³.
const DefaultDenseLimit = 1000

// DefaultVectors is the number of eigenvectors the sparse path finds, two
// thirds at the positive end (where the variance of positively
// autocorrelated outcomes sits) and one third at the negative end.
const DefaultVectors = 300

// maxBasisFloats caps the stored sparse basis at 128 MB; the iteration
// holds about four such blocks per end while it runs.
const maxBasisFloats = 16_000_000

// basisPurpose separates the streams of the start vectors from every test's.
const basisPurpose = 0x5e1f_ba51

// Options tune NewBasis. The zero value is the default.
type Options struct {
	// Method: Auto (default), Dense or Sparse.
	Method Method
	// DenseLimit replaces DefaultDenseLimit for Auto.
	DenseLimit int
	// Top and Bottom are the numbers of eigenvectors the sparse path finds
	// at the positive and the negative end of the spectrum. Both zero
	// means DefaultVectors split two to one, capped at n − 1 in all and at
	// 128 MB of storage.
	Top, Bottom int
	// Tolerance is the residual norm ‖Ωv − λv‖ at which a sparse
	// eigenvector counts as converged, relative to the largest |λ|
	// (default 1e-9).
	Tolerance float64
	// MaxIterations bounds the filtered subspace iterations per end
	// (default 60).
	MaxIterations int
	// Seed fixes the start vectors of the sparse path.
	Seed uint64
	// KeepIslands keeps areas without neighbours in the eigenbasis (their
	// rows of W* are zero). By default they are set apart: a surrogate
	// permutes their values among themselves, because the graph says
	// nothing about how they relate to anyone (the same default as the
	// tool's spatial check, which leaves islands out).
	KeepIslands bool
	// RotationGap groups eigenvectors whose eigenvalues lie within
	// RotationGap of their neighbour in order (at most 8 vectors a group);
	// a surrogate replaces each group's coefficients by a uniformly random
	// vector of the same length instead of flipping their signs one by
	// one. Inside a repeated eigenvalue the eigenvectors are an arbitrary
	// basis of the eigenspace, and sign flips in one basis give other
	// surrogates than in another (on a 20×20 lattice the null of a group
	// statistic visibly depends on it); a random rotation does not. Zero
	// means the default: 1e-9 times the largest |λ|, which groups only
	// repeated eigenvalues and so keeps Moran's I to rounding. A negative
	// value means sign flips only (the "singleton" randomisation of Wagner
	// & Dray 2015). A larger gap also rotates nearly equal eigenvalues;
	// Moran's I then changes by at most (n/S0)·(spread of λ in a group).
	RotationGap float64
	// Residual: Matched (default) or White.
	Residual Residual
}

// Basis holds the eigenvectors of Ω = M W* M for one graph, built once and
// shared, read-only, by every surrogate and goroutine of a run.
type Basis struct {
	n       int     // areas of the graph
	linked  []int32 // areas in the eigenbasis, in order
	islands []int32 // areas set apart
	op      *symOp  // W* among the linked areas
	m       int     // stored eigenvectors
	vecs    []float64
	values  []float64
	groups  []int32 // start of each rotation group, plus len(values)
	s0      float64 // sum of the weights among the linked areas
	spread  float64 // largest eigenvalue spread inside a rotation group
	info    Info
	resid   Residual
}

// Info describes how a basis was found; JSON-ready.
type Info struct {
	// Method is "dense" or "sparse".
	Method string `json:"method"`
	// Areas in the eigenbasis and Islands set apart.
	Areas   int `json:"areas"`
	Islands int `json:"islands"`
	// Vectors is the number of eigenvectors stored (n − 1 when Complete),
	// Top and Bottom how many of them come from each end.
	Vectors  int  `json:"vectors"`
	Top      int  `json:"top"`
	Bottom   int  `json:"bottom"`
	Complete bool `json:"complete"`
	// Iterations of the filtered subspace iteration, both ends together;
	// Products is the number of block products with the weights.
	Iterations int `json:"iterations"`
	Products   int `json:"products"`
	// MaxResidual is the largest ‖Ωv − λv‖ over the stored vectors, and
	// Converged whether every one met the tolerance.
	MaxResidual float64 `json:"max_residual"`
	Converged   bool    `json:"converged"`
	// Gap is the range of eigenvalues of the residual subspace, in units
	// of Moran's I: [(n/S0)·λ of the innermost bottom vector, (n/S0)·λ of
	// the innermost top vector]. Zero for a complete basis.
	Gap [2]float64 `json:"gap"`
	// Residual is "matched" or "white" (the treatment of the residual
	// subspace; "none" for a complete basis).
	Residual string `json:"residual"`
}

// NewBasis finds the eigenvectors of M W* M for the graph g (with the
// scaling the statistics use, e.g. row-standardised). Areas with no link
// in either direction are islands, set apart unless opt.KeepIslands.
func NewBasis(g *weights.Graph, opt Options) (*Basis, error) {
	if g == nil || g.Len() < 3 {
		return nil, errors.New("surrogate: need a graph of at least three areas")
	}
	n := g.Len()
	linkedIn := make([]bool, n)
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			if w[k] != 0 {
				linkedIn[i], linkedIn[j] = true, true
			}
		}
	}
	b := &Basis{n: n, resid: opt.Residual}
	for i := 0; i < n; i++ {
		if linkedIn[i] || opt.KeepIslands {
			b.linked = append(b.linked, int32(i))
		} else {
			b.islands = append(b.islands, int32(i))
		}
	}
	L := len(b.linked)
	if L < 3 {
		return nil, fmt.Errorf("surrogate: only %d areas have a neighbour; spectral surrogates need at least three", L)
	}
	b.op = newSymOp(g, b.linked)
	for _, w := range b.op.w {
		b.s0 += w
	}
	if !(b.s0 > 0) {
		return nil, errors.New("surrogate: the graph has no links of positive weight")
	}
	method := opt.Method
	if method == Auto {
		limit := opt.DenseLimit
		if limit <= 0 {
			limit = DefaultDenseLimit
		}
		method = Dense
		if L > limit {
			method = Sparse
		}
	}
	b.info = Info{Method: method.String(), Areas: L, Islands: len(b.islands), Residual: "none"}
	switch method {
	case Dense:
		if err := b.dense(); err != nil {
			return nil, err
		}
	case Sparse:
		if err := b.sparse(opt); err != nil {
			return nil, err
		}
	default:
		return nil, fmt.Errorf("surrogate: unknown method %d", method)
	}
	b.info.Vectors = b.m
	b.info.Complete = b.m == L-1
	if !b.info.Complete {
		b.info.Residual = opt.Residual.String()
		b.info.Gap = b.gapRange()
	}
	gap := opt.RotationGap
	if gap == 0 {
		gap = 1e-9 * math.Max(math.Abs(b.values[0]), math.Abs(b.values[b.m-1]))
	}
	b.makeGroups(gap)
	return b, nil
}

// gapRange returns the interval that holds the eigenvalues of the residual
// subspace, in Moran's I units: between the innermost computed vector of
// each end, or, when an end has none, the bound of the whole spectrum.
func (b *Basis) gapRange() [2]float64 {
	scale := float64(len(b.linked)) / b.s0
	lo, hi := -b.op.gersh, b.op.gersh
	if b.info.Top > 0 {
		hi = b.values[b.info.Top-1]
	}
	if b.info.Bottom > 0 {
		lo = b.values[b.m-b.info.Bottom]
	}
	return [2]float64{scale * lo, scale * hi}
}

// dense finds every eigenvector of Ω orthogonal to 1. Ω has 1 as an
// eigenvector with eigenvalue 0, and when 0 is a repeated eigenvalue a
// general solver may return any mixture of 1 and the others; so the
// problem is first deflated exactly. A Householder reflection H maps
// 1/√n to −e_n; since H M H = I − e_n e_nᵀ, the leading (n−1)×(n−1) block
// of H W* H is Ω in a basis of the complement of 1. Its eigenvectors,
// padded with a zero and reflected back, are orthogonal to 1 by
// construction.
func (b *Basis) dense() error {
	L := len(b.linked)
	op := b.op
	a := make([]float64, L*L)
	for i := 0; i < L; i++ {
		for k := op.off[i]; k < op.off[i+1]; k++ {
			a[i*L+int(op.nb[k])] = op.w[k]
		}
	}
	// u = 1/√L + e_L, so H = I − β u uᵀ with β = 2/uᵀu.
	u := make([]float64, L)
	inv := 1 / math.Sqrt(float64(L))
	for i := range u {
		u[i] = inv
	}
	u[L-1] += 1
	beta := 2 / vec.Dot(u, u)
	// H A H = A − u wᵀ − w uᵀ with p = β A u, w = p − (β uᵀp/2) u.
	p := make([]float64, L)
	for i := 0; i < L; i++ {
		p[i] = beta * vec.Dot(a[i*L:(i+1)*L], u)
	}
	kk := beta * vec.Dot(u, p) / 2
	for i := range p {
		p[i] -= kk * u[i]
	}
	d := L - 1
	sym := mat.NewSymDense(d, nil)
	raw := sym.RawSymmetric()
	for i := 0; i < d; i++ {
		for j := i; j < d; j++ {
			raw.Data[i*raw.Stride+j] = a[i*L+j] - u[i]*p[j] - p[i]*u[j]
		}
	}
	var es mat.EigenSym
	if !es.Factorize(sym, true) {
		return errors.New("surrogate: the eigen-decomposition of the weights did not converge")
	}
	vals := es.Values(nil)
	var ev mat.Dense
	es.VectorsTo(&ev)
	// Back to the area coordinates: v = H [x; 0] = [x; 0] − β u (u[:d]·x).
	// Stored in descending order of eigenvalue, row-major L × d.
	b.m = d
	b.values = make([]float64, d)
	b.vecs = make([]float64, L*d)
	for c := 0; c < d; c++ {
		src := d - 1 - c
		b.values[c] = vals[src]
		var t float64
		for i := 0; i < d; i++ {
			t += u[i] * ev.At(i, src)
		}
		t *= beta
		for i := 0; i < d; i++ {
			b.vecs[i*d+c] = ev.At(i, src) - t*u[i]
		}
		b.vecs[(L-1)*d+c] = -t * u[L-1]
	}
	b.info.Top = d
	b.info.MaxResidual = 0
	b.info.Converged = true
	return nil
}

// makeGroups splits the stored eigenvectors into rotation groups.
func (b *Basis) makeGroups(gap float64) {
	const maxGroup = 8
	b.groups = b.groups[:0]
	for k := 0; k < b.m; k++ {
		start := len(b.groups) == 0 || !(gap > 0) ||
			math.Abs(b.values[k-1]-b.values[k]) > gap ||
			k-int(b.groups[len(b.groups)-1]) >= maxGroup ||
			(b.info.Top > 0 && k == b.info.Top) // never mix the two ends
		if start {
			b.groups = append(b.groups, int32(k))
		} else {
			first := b.groups[len(b.groups)-1]
			b.spread = math.Max(b.spread, math.Abs(b.values[first]-b.values[k]))
		}
	}
	b.groups = append(b.groups, int32(b.m))
}

// Info describes how the basis was found.
func (b *Basis) Info() Info { return b.info }

// Len is the number of areas of the graph (linked areas and islands).
func (b *Basis) Len() int { return b.n }

// Values returns the eigenvalues of the stored eigenvectors, in descending
// order; (n/S0)·λ is Moran's I of the eigenvector (n linked areas, S0 the
// sum of their weights). The slice must not be modified.
func (b *Basis) Values() []float64 { return b.values }

// Vector writes eigenvector k (one entry per linked area, in order) into
// dst, reusing its storage when it is large enough, and returns it.
func (b *Basis) Vector(k int, dst []float64) []float64 {
	L := len(b.linked)
	if cap(dst) < L {
		dst = make([]float64, L)
	}
	dst = dst[:L]
	for i := 0; i < L; i++ {
		dst[i] = b.vecs[i*b.m+k]
	}
	return dst
}

// Linked returns the areas in the eigenbasis (indices into the graph, in
// order). The slice must not be modified.
func (b *Basis) Linked() []int32 { return b.linked }

// Islands returns the areas set apart (indices into the graph, in order).
// The slice must not be modified.
func (b *Basis) Islands() []int32 { return b.islands }

// MoranScale is n/S0 among the linked areas: Moran's I of a centred z is
// MoranScale · zᵀW*z / zᵀz.
func (b *Basis) MoranScale() float64 { return float64(len(b.linked)) / b.s0 }
