package autocorr

import (
	"errors"
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"

	"github.com/areatest/areatest/internal/vec"
	"github.com/areatest/areatest/weights"
)

// Bounds is the range that Moran's I can take on a graph, over every
// possible variable (de Jong, Sprenger & van Veen 1984, Geogr. Anal.
// 16:17–24).
type Bounds struct {
	Min float64 `json:"min"`
	Max float64 `json:"max"`
	// Method is "dense" (every eigenvalue) or "lanczos" (the two extreme
	// ones by a sparse iteration).
	Method string `json:"method"`
	// Iterations is the number of Lanczos steps; 0 for dense.
	Iterations int `json:"iterations"`
	// Converged is false when the Lanczos iteration stopped at its step
	// limit before Tolerance reached the tolerance asked for. Min and Max
	// are values of I that real variables attain either way (see
	// lanczosBounds), so the true range is at least this wide.
	Converged bool `json:"converged"`
	// Tolerance, for the Lanczos path, bounds the distance (in units of I)
	// from Min and from Max to an eigenvalue of the centred weights, from
	// the residuals of the variables that attain them; 0 for dense, which
	// is exact to rounding.
	Tolerance float64 `json:"tolerance,omitempty"`
}

// DenseBoundsLimit is the largest number of areas for which MoranBounds
// finds every eigenvalue of the dense n×n matrix; above it a Lanczos
// iteration finds the two extreme ones.
const DenseBoundsLimit = 500

// DefaultBoundsTolerance is the tolerance MoranBounds asks of the Lanczos
// path, relative to the larger of |Min| and |Max|: six digits, two more
// than any report prints.
const DefaultBoundsTolerance = 1e-6

// boundsPurpose separates the start vector's stream from the shuffles.
const boundsPurpose = 0xb0d5

// BoundsOptions tune MoranBoundsWith; the zero value is MoranBounds.
type BoundsOptions struct {
	// Sparse takes the Lanczos path at any size (for checks against the
	// dense one).
	Sparse bool
	// Tolerance is relative to max(|Min|, |Max|); 0 means
	// DefaultBoundsTolerance.
	Tolerance float64
	// MaxIterations caps the Lanczos steps; 0 means lanczosStepLimit.
	MaxIterations int
}

// MoranBounds returns the smallest and largest values of Moran's I on g.
// For a centred z, I = (n/S0) zᵀWz / zᵀz, and zᵀWz = zᵀW*z with W* =
// (W + Wᵀ)/2, so only the symmetric part of W matters: a row-standardised
// W is not symmetric, and its bounds are those of W*. Over z ⊥ 1, the
// extremes of the Rayleigh quotient are the extreme eigenvalues of M W* M,
// M = I − 11ᵀ/n, on the subspace orthogonal to 1 (de Jong, Sprenger & van
// Veen 1984), so
//
//	I_min = (n/S0) λ_min,  I_max = (n/S0) λ_max.
//
// Either bound is attained by a variable proportional to its eigenvector.
//
// Why W* and not the similar symmetric matrix D^{1/2} W D^{-1/2} of a
// row-standardised W = D⁻¹B: that matrix has the eigenvalues of W, which
// are the extremes of zᵀBz / zᵀDz, a different quotient; I divides by zᵀz.
//
// Up to DenseBoundsLimit areas every eigenvalue is found (gonum's EigenSym);
// above it, the two extremes by Lanczos from a fixed start vector, so the
// result is the same on every run and for any number of workers.
func MoranBounds(g *weights.Graph) (Bounds, error) {
	return MoranBoundsWith(g, BoundsOptions{})
}

// MoranBoundsWith is MoranBounds with its method and tolerance chosen.
func MoranBoundsWith(g *weights.Graph, opt BoundsOptions) (Bounds, error) {
	n := g.Len()
	if n < 2 {
		return Bounds{}, errors.New("the bounds of Moran's I need at least two areas")
	}
	s0 := sumWeights(g)
	if s0 == 0 {
		return Bounds{}, errNoLinks
	}
	scale := float64(n) / s0
	if n <= DenseBoundsLimit && !opt.Sparse {
		lo, hi, err := denseBounds(g)
		if err != nil {
			return Bounds{}, err
		}
		return Bounds{Min: scale * lo, Max: scale * hi, Method: "dense", Converged: true}, nil
	}
	tol := opt.Tolerance
	if !(tol > 0) {
		tol = DefaultBoundsTolerance
	}
	steps := opt.MaxIterations
	if steps <= 0 {
		steps = lanczosStepLimit(n)
	}
	e := lanczosBounds(newCentredSym(g), 1, tol, steps)
	return Bounds{Min: scale * e.lo, Max: scale * e.hi, Method: "lanczos", Iterations: e.steps,
		Converged: e.converged, Tolerance: scale * math.Max(e.rlo, e.rhi)}, nil
}

// lanczosStepLimit caps the Lanczos steps. Without a stored basis a step
// costs two products (one per pass) and a few vector operations, so the
// cap is about time, not memory: 5,000 steps are several seconds on 100,000
// areas, while square lattices, whose extreme gaps shrink fastest, need
// 2.5√n to 3.6√n steps (measured from 3,136 to 85,264 cells; 737 at the
// largest) and the generated region fewer.
func lanczosStepLimit(n int) int {
	return max(2, min(n-1, 5000))
}

// denseBounds returns the extreme eigenvalues of M W* M on the subspace
// orthogonal to 1. On the whole space M W* M has one more eigenvalue, 0,
// with eigenvector 1; one copy of the eigenvalue nearest 0 is dropped.
func denseBounds(g *weights.Graph) (lo, hi float64, err error) {
	n := g.Len()
	a := mat.NewSymDense(n, nil)
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			a.SetSym(i, int(j), a.At(i, int(j))+w[k]/2)
		}
	}
	// Double centring: A_ij − rowmean_i − rowmean_j + grand mean.
	row := make([]float64, n)
	var grand float64
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			row[i] += a.At(i, j)
		}
		grand += row[i]
		row[i] /= float64(n)
	}
	grand /= float64(n * n)
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			a.SetSym(i, j, a.At(i, j)-row[i]-row[j]+grand)
		}
	}
	var es mat.EigenSym
	if !es.Factorize(a, false) {
		return 0, 0, errors.New("the eigen-decomposition of the weights did not converge")
	}
	vals := es.Values(nil)
	sort.Float64s(vals)
	drop := 0
	for k, v := range vals {
		if math.Abs(v) < math.Abs(vals[drop]) {
			drop = k
		}
	}
	rest := append(append([]float64(nil), vals[:drop]...), vals[drop+1:]...)
	return rest[0], rest[len(rest)-1], nil
}

// normalise scales v to unit length, dividing by its largest entry first so
// that the huge vectors of inverse iteration cannot overflow the sum.
func normalise(v []float64) {
	var m float64
	for _, x := range v {
		m = math.Max(m, math.Abs(x))
	}
	if m == 0 {
		return
	}
	for i := range v {
		v[i] /= m
	}
	s := 1 / math.Sqrt(vec.Dot(v, v))
	for i := range v {
		v[i] *= s
	}
}
