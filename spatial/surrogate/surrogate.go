package surrogate

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"

	"github.com/areatest/areatest/internal/vec"
	"github.com/areatest/areatest/spatial/shuffle"
)

// Outcome is an outcome written in a basis, ready for many surrogates: its
// mean and norm over the linked areas, its coefficient on every stored
// eigenvector, the norm and Moran quotient of its residual, and the values
// of the islands. It is read-only once made, so goroutines share it.
type Outcome struct {
	b      *Basis
	mean   float64   // over the linked areas
	norm   float64   // ‖y − mean‖ over the linked areas
	coef   []float64 // ⟨y − mean, v_k⟩
	rnorm  float64   // ‖r‖, r the part of y − mean outside the stored vectors
	rquot  float64   // rᵀΩr / rᵀr
	island []float64 // values of the islands, in island order
}

// Scratch is one worker's working space for drawing surrogates; make one
// per goroutine with Basis.NewScratch.
type Scratch struct {
	coef    []float64 // randomised coefficients (m)
	proj    []float64 // projections of a random vector (m)
	lin     []float64 // the surrogate over the linked areas (L)
	g, h, t []float64 // residual directions (L)
	island  []float64
	prep    Outcome // for Basis.Surrogate
}

// NewScratch returns working space for one goroutine.
func (b *Basis) NewScratch() *Scratch {
	L := len(b.linked)
	return &Scratch{coef: make([]float64, b.m), proj: make([]float64, b.m), lin: make([]float64, L),
		g: make([]float64, L), h: make([]float64, L), t: make([]float64, L),
		island: make([]float64, len(b.islands)),
		prep:   Outcome{coef: make([]float64, b.m), island: make([]float64, len(b.islands))}}
}

// Prepare writes y (one value per area of the graph, in graph order) in
// the basis. Values must be finite.
func (b *Basis) Prepare(y []float64) (*Outcome, error) {
	o := &Outcome{coef: make([]float64, b.m), island: make([]float64, len(b.islands))}
	if err := b.prepareInto(y, o, make([]float64, len(b.linked))); err != nil {
		return nil, err
	}
	return o, nil
}

func (b *Basis) prepareInto(y []float64, o *Outcome, z []float64) error {
	if len(y) != b.n {
		return fmt.Errorf("surrogate: %d values for a graph of %d areas", len(y), b.n)
	}
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("surrogate: value %d is %v", i, v)
		}
	}
	o.b = b
	L := len(b.linked)
	for k, i := range b.linked {
		z[k] = y[i]
	}
	o.mean = vec.Centre(z)
	o.norm = math.Sqrt(vec.Dot(z, z))
	for k, i := range b.islands {
		o.island[k] = y[i]
	}
	V := blas64.General{Rows: L, Cols: b.m, Stride: b.m, Data: b.vecs}
	blas64.Gemv(blas.Trans, 1, V, blasVec(z), 0, blasVec(o.coef))
	o.rnorm, o.rquot = 0, 0
	if b.m < L-1 {
		// r = z − V c: what the stored vectors leave of the outcome.
		blas64.Gemv(blas.NoTrans, -1, V, blasVec(o.coef), 1, blasVec(z))
		vec.Centre(z)
		rr := vec.Dot(z, z)
		if rr > 1e-28*o.norm*o.norm {
			o.rnorm = math.Sqrt(rr)
			o.rquot = b.op.quad(z) / rr
		}
	}
	return nil
}

// Len is the length of the outcome (every area of the graph).
func (o *Outcome) Len() int { return o.b.n }

// ResidualShare is the share of the outcome's variance over the linked
// areas that lies outside the stored eigenvectors (0 for a complete basis).
func (o *Outcome) ResidualShare() float64 {
	if o.norm == 0 {
		return 0
	}
	return (o.rnorm / o.norm) * (o.rnorm / o.norm)
}

// MoranTolerance bounds |I(surrogate) − I(outcome)| over every possible
// draw, Moran's I taken over the linked areas. With z = y − mean split
// into its part z_B on the stored vectors and the residual r:
//
//	zᵀΩz = z_BᵀΩz_B + 2 z_BᵀΩr + rᵀΩr.
//
// The stored vectors are exactly Ω-orthogonal, so sign flips (and
// rotations inside a group of equal eigenvalues) keep the first term. The
// cross term is at most 2√m·η·‖z_B‖‖r‖, η the largest residual norm of a
// stored vector (about 1e-10 once converged). The last term lies between
// the smallest and the largest eigenvalue of the residual subspace times
// ‖r‖², the interval Info().Gap, for the outcome and for any surrogate. So
//
//	|ΔI| ≤ (n/S0)·[s·(λ_hi − λ_lo) + 4√m·η·√(s(1−s)) + spread],
//
// s = ResidualShare(), spread the largest eigenvalue spread inside a
// rotation group. This holds for White and for Matched; Matched draws reach
// the outcome's residual quotient exactly whenever the two-term family can
// (nearly always — the tests measure it), and then ΔI is the cross term
// alone. For a complete basis with the default rotation groups (repeated
// eigenvalues only) the bound is at rounding level.
func (o *Outcome) MoranTolerance() float64 {
	b := o.b
	s := o.ResidualShare()
	bound := b.spread
	if s > 0 {
		gap := b.gapRange()
		width := (gap[1] - gap[0]) / b.MoranScale()
		eta := b.info.MaxResidual
		bound += s*width + 4*math.Sqrt(float64(b.m))*eta*math.Sqrt(s*(1-s))
	}
	return b.MoranScale() * bound
}

// Draw writes one surrogate into out (one value per area). It draws only
// from rng and allocates nothing.
//
// Over the linked areas the surrogate is mean + Σ_k ±|c_k| v_k (signs
// independent and fair; with rotation groups, each group's coefficient
// vector replaced by a uniformly random one of the same length), plus, for
// an incomplete basis, a random direction of the residual subspace with the
// residual's norm (see Residual). It is then re-centred and scaled to the
// outcome's norm, so that mean and variance hold to rounding. The islands
// get their own values in a random order.
func (o *Outcome) Draw(rng *shuffle.Stream, out []float64, s *Scratch) {
	b := o.b
	L := len(b.linked)
	V := blas64.General{Rows: L, Cols: b.m, Stride: b.m, Data: b.vecs}
	o.randomCoefficients(rng, s.coef)
	if o.rnorm > 0 {
		// The residual direction, nearly in the residual subspace; its
		// small components on the stored vectors (s.proj) are taken off
		// through the coefficients, so that one product with V writes
		// both parts.
		f := o.residual(rng, s)
		for k, p := range s.proj {
			s.coef[k] -= f * p
		}
		blas64.Gemv(blas.NoTrans, 1, V, blasVec(s.coef), 0, blasVec(s.lin))
		for i, v := range s.g {
			s.lin[i] += f * v
		}
	} else {
		blas64.Gemv(blas.NoTrans, 1, V, blasVec(s.coef), 0, blasVec(s.lin))
	}
	vec.Centre(s.lin)
	f := 1.0
	if n := math.Sqrt(vec.Dot(s.lin, s.lin)); n > 0 {
		f = o.norm / n
	}
	for k, i := range b.linked {
		out[i] = o.mean + f*s.lin[k]
	}
	if len(b.islands) > 0 {
		isl := s.island[:len(o.island)]
		copy(isl, o.island)
		for i := len(isl) - 1; i > 0; i-- {
			j := rng.IntN(i + 1)
			isl[i], isl[j] = isl[j], isl[i]
		}
		for k, i := range b.islands {
			out[i] = isl[k]
		}
	}
}

// randomCoefficients writes the randomised coefficients: a fair sign per
// eigenvector, or per rotation group a random vector of the group's length.
func (o *Outcome) randomCoefficients(rng *shuffle.Stream, dst []float64) {
	groups := o.b.groups
	var bits uint64
	left := 0
	for gi := 0; gi+1 < len(groups); gi++ {
		a, e := int(groups[gi]), int(groups[gi+1])
		if e-a == 1 {
			if left == 0 {
				bits, left = rng.Uint64(), 64
			}
			c := o.coef[a]
			if bits&1 == 1 {
				c = -c
			}
			dst[a] = c
			bits >>= 1
			left--
			continue
		}
		// A uniformly random direction in the group's span (normalised
		// Gaussian), with the group's share of the variance.
		seg := dst[a:e]
		rng.Normals(seg)
		want := math.Sqrt(vec.Dot(o.coef[a:e], o.coef[a:e]))
		scaleTo(seg, want)
	}
}

// residual writes into s.g a random direction of the residual subspace
// and into s.proj its (rounding-level) components on the stored vectors,
// and returns the factor f for which f·(s.g − V s.proj) has the norm of the
// outcome's residual. The direction is a Gaussian vector, centred and
// cleared of its components on the stored vectors (one pass of classical
// Gram–Schmidt suffices: a random vector is far from their span); for
// Matched it is coloured as g + γh, h = M W* g, with γ chosen so that its
// Moran quotient equals the outcome residual's. The residual subspace is
// invariant under Ω up to the convergence tolerance, so h lies in it up to
// that tolerance, and the last projection removes the rest.
func (o *Outcome) residual(rng *shuffle.Stream, s *Scratch) float64 {
	if o.b.info.Converged {
		return o.residualByEigenpairs(rng, s)
	}
	b := o.b
	L := len(b.linked)
	V := blas64.General{Rows: L, Cols: b.m, Stride: b.m, Data: b.vecs}
	g, h := s.g, s.h
	rng.Normals(g)
	vec.Centre(g)
	blas64.Gemv(blas.Trans, 1, V, blasVec(g), 0, blasVec(s.proj))
	blas64.Gemv(blas.NoTrans, -1, V, blasVec(s.proj), 1, blasVec(g))
	if b.resid == Matched {
		b.op.apply(g, h)
		vec.Centre(h)
		// For g in the residual subspace R and h = P W* g (P the
		// projection on R):
		//   gᵀW*g = gᵀh = a,  gᵀW*h = hᵀh = bb,  hᵀW*h = c,
		// so the quotient of g + γh is (a + 2γbb + γ²c)/(gg + 2γa + γ²bb).
		gg := vec.Dot(g, g)
		a := vec.Dot(g, h)
		bb := vec.Dot(h, h)
		c := b.op.quad(h)
		gamma := matchQuotient(gg, a, bb, c, o.rquot)
		for i := range g {
			g[i] += gamma * h[i]
		}
		blas64.Gemv(blas.Trans, 1, V, blasVec(g), 0, blasVec(s.proj))
	} else {
		for k := range s.proj {
			s.proj[k] = 0
		}
	}
	// ‖g − V proj‖² = ‖g‖² − ‖proj‖², V having orthonormal columns.
	n2 := vec.Dot(g, g) - vec.Dot(s.proj, s.proj)
	if !(n2 > 0) {
		return 0
	}
	return o.rnorm / math.Sqrt(n2)
}

// residualByEigenpairs is residual for a basis whose vectors are
// eigenvectors of Ω to the basis's tolerance (Info.Converged): with
// ΩV = VΛ, the projection of g off the stored vectors and of Ω applied
// to it need not be formed. With p = Vᵀg, g_r = g − Vp and h = Ωg,
//
//	‖g_r‖² = ‖g‖² − ‖p‖²,          g_rᵀΩg_r = gᵀh − Σλp²,
//	‖Ωg_r‖² = ‖h‖² − Σλ²p²,         (Ωg_r)ᵀΩ(Ωg_r) = hᵀΩh − Σλ³p²,
//
// and the residual direction g_r + γΩg_r is (g + γh) − V(p + γΛp): s.g
// receives g + γh and s.proj p + γΛp, which Draw takes off through the
// coefficients. One product with V instead of three (the one of Draw
// aside), for the same direction up to the basis's residuals.
func (o *Outcome) residualByEigenpairs(rng *shuffle.Stream, s *Scratch) float64 {
	b := o.b
	L := len(b.linked)
	V := blas64.General{Rows: L, Cols: b.m, Stride: b.m, Data: b.vecs}
	g, h, p := s.g, s.h, s.proj
	rng.Normals(g)
	vec.Centre(g)
	blas64.Gemv(blas.Trans, 1, V, blasVec(g), 0, blasVec(p))
	n2 := vec.Dot(g, g) - vec.Dot(p, p)
	if b.resid == Matched {
		b.op.apply(g, h)
		vec.Centre(h)
		var l1, l2, l3 float64
		for k, pk := range p {
			l := b.values[k]
			w := l * pk * pk
			l1, l2, l3 = l1+w, l2+l*w, l3+l*l*w
		}
		a := vec.Dot(g, h) - l1
		bb := vec.Dot(h, h) - l2
		c := b.op.quad(h) - l3
		gamma := matchQuotient(n2, a, bb, c, o.rquot)
		for i := range g {
			g[i] += gamma * h[i]
		}
		for k := range p {
			p[k] += gamma * b.values[k] * p[k]
		}
		n2 += 2*gamma*a + gamma*gamma*bb
	}
	if !(n2 > 0) {
		return 0
	}
	return o.rnorm / math.Sqrt(n2)
}

// matchQuotient returns the γ of smallest magnitude for which
// q(γ) = (a + 2γb + γ²c)/(gg + 2γa + γ²b) equals target; when no γ reaches
// it, the γ of the attainable extreme nearest to target.
func matchQuotient(gg, a, b, c, target float64) float64 {
	// q(γ) = target  ⇔  A2 γ² + 2 A1 γ + A0 = 0.
	A2, A1, A0 := c-target*b, b-target*a, a-target*gg
	disc := A1*A1 - A2*A0
	if disc >= 0 {
		if A1 == 0 && A2 == 0 {
			return 0
		}
		// Numerically stable roots: q1 = −(A1 + sign(A1)√disc),
		// γ = q1/A2 and A0/q1.
		q1 := -(A1 + math.Copysign(math.Sqrt(disc), A1))
		best := math.Inf(1)
		if A2 != 0 {
			best = q1 / A2
		}
		if q1 != 0 {
			if r := A0 / q1; math.Abs(r) < math.Abs(best) {
				best = r
			}
		}
		if !math.IsInf(best, 0) && !math.IsNaN(best) {
			return best
		}
		return 0
	}
	// Out of reach: the extremes of q are the roots μ of
	// (gg·b − a²)μ² − (gg·c − a·b)μ + (a·c − b²) = 0; take the one nearer
	// the target, reached at γ = (μ·gg − a)/(b − μ·a).
	qa, qb, qc := gg*b-a*a, -(gg*c - a*b), a*c-b*b
	d := qb*qb - 4*qa*qc
	if !(qa > 0) || d < 0 {
		return 0
	}
	sq := math.Sqrt(d)
	mu1, mu2 := (-qb-sq)/(2*qa), (-qb+sq)/(2*qa)
	mu := mu1
	if math.Abs(mu2-target) < math.Abs(mu1-target) {
		mu = mu2
	}
	den := b - mu*a
	if den == 0 {
		return 0
	}
	return (mu*gg - a) / den
}

// Surrogate writes one surrogate of y into out, using s for all working
// space (no allocation). For many surrogates of one outcome, Prepare it once
// and call Outcome.Draw, which saves writing y in the basis every time.
func (b *Basis) Surrogate(y []float64, rng *shuffle.Stream, out []float64, s *Scratch) error {
	if len(out) != b.n {
		return fmt.Errorf("surrogate: output of length %d for %d areas", len(out), b.n)
	}
	if s == nil {
		return errors.New("surrogate: no scratch space")
	}
	if err := b.prepareInto(y, &s.prep, s.t); err != nil {
		return err
	}
	s.prep.Draw(rng, out, s)
	return nil
}

// NewDraw returns, for the shuffle machinery, a draw of surrogates of o
// with its own scratch space; call it once per goroutine.
func (o *Outcome) NewDraw() shuffle.OutcomeDraw {
	s := o.b.NewScratch()
	return func(rng *shuffle.Stream, out []float64) { o.Draw(rng, out, s) }
}

func blasVec(v []float64) blas64.Vector { return blas64.Vector{N: len(v), Inc: 1, Data: v} }
