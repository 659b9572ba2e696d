package sar

import (
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/areatest/areatest/weights"
)

// Options tunes how Prepare evaluates the log-determinant. The zero value
// takes the defaults.
type Options struct {
	// ExactLimit is the largest number of areas whose log-determinant comes
	// from the dense eigenvalues; above it the Lanczos quadrature is used
	// (0: DefaultExactLimit; negative: never exact).
	ExactLimit int
	// Probes is the number of random probe vectors of the quadrature (0:
	// DefaultProbes) and Steps the Lanczos steps per probe (0:
	// DefaultSteps).
	Probes, Steps int
	// Seed fixes the probe vectors, so that a fit is reproducible.
	Seed uint64
	// Workers bounds the goroutines of the quadrature and of ForDraws (0
	// or less: GOMAXPROCS). Results do not depend on it.
	Workers int
}

// Defaults of Options.
const (
	DefaultExactLimit = 1200
	DefaultProbes     = 48
	DefaultSteps      = 40
)

// Method names how the log-determinant was evaluated.
type Method int

// The methods of Weights.
const (
	// Eigenvalues: exact, from the dense spectrum (Ord 1975).
	Eigenvalues Method = iota
	// Quadrature: stochastic Lanczos quadrature (Ubaru, Chen & Saad 2017).
	Quadrature
)

// String names the method in words.
func (m Method) String() string {
	if m == Eigenvalues {
		return "exact eigenvalues"
	}
	return "Lanczos quadrature"
}

// Weights is a neighbour graph prepared for SAR models: the row-standardised
// matrix W = D⁻¹C of a symmetric C, its symmetric twin S = D^{-1/2} C
// D^{-1/2} (similar to W, so with the same eigenvalues), and what the
// log-determinant ln|I − ρW| needs. It is read-only after Prepare and can
// serve many fits and draws at once.
type Weights struct {
	n       int
	off, nb []int32
	w, s    []float64 // row-standardised and symmetric weights, per link
	sq      []float64 // √d_i (1 for an island)
	comp    []int32   // component of each area, −1 for an island
	unit    []float64 // per area: its entry of its component's unit eigenvector of S for eigenvalue 1
	ncomp   int
	method  Method
	values  []float64 // the eigenvalues of W (Eigenvalues)
	quad    *quadrature
	lo, hi  float64 // the admissible interval of ρ
	workers int
}

// Prepare checks g and readies it for fits and draws. g must be a symmetric
// matrix C (binary or with symmetric weights), or the row-standardised form
// of a symmetric binary graph (every row's weights equal); the model's W is
// the row-standardised C either way. Areas without a neighbour are allowed:
// their row of W is empty.
func Prepare(g *weights.Graph, opt Options) (*Weights, error) {
	if g == nil || g.Len() < 3 {
		return nil, errors.New("sar: need a graph of at least 3 areas")
	}
	c, err := symmetricBase(g)
	if err != nil {
		return nil, err
	}
	if len(g.Neighbours) == 0 {
		return nil, errors.New("sar: the graph has no links")
	}
	p := &Weights{n: g.Len(), off: g.Offsets, nb: g.Neighbours, workers: opt.Workers}
	p.scale(c)
	p.components()
	limit := opt.ExactLimit
	if limit == 0 {
		limit = DefaultExactLimit
	}
	if p.n <= limit {
		err = p.exact()
	} else {
		err = p.sparse(opt)
	}
	if err != nil {
		return nil, err
	}
	return p, nil
}

// Len returns the number of areas.
func (p *Weights) Len() int { return p.n }

// Method returns how the log-determinant is evaluated.
func (p *Weights) Method() Method { return p.method }

// Interval returns the open interval of ρ that Fit searches: (1/λ_min, 1)
// with the exact eigenvalues, (−1, 1) with the quadrature (λ_min ≥ −1 for
// every row-standardised W, so it lies inside the admissible interval).
func (p *Weights) Interval() (lo, hi float64) { return p.lo, p.hi }

// symmetricBase returns the weights of the symmetric C behind g, per link.
func symmetricBase(g *weights.Graph) ([]float64, error) {
	symmetric, pattern, rowsEqual := true, true, true
	for i := 0; i < g.Len(); i++ {
		nb, w := g.Row(i)
		for k, j := range nb {
			if !(w[k] > 0) || math.IsInf(w[k], 0) {
				return nil, fmt.Errorf("sar: link %d→%d has weight %v; weights must be positive and finite", i, j, w[k])
			}
			if w[k] != w[0] {
				rowsEqual = false
			}
			back, wb := g.Row(int(j))
			at, ok := slices.BinarySearch(back, int32(i))
			if !ok {
				pattern = false
				break
			}
			if math.Abs(wb[at]-w[k]) > 1e-12*math.Max(wb[at], w[k]) {
				symmetric = false
			}
		}
	}
	switch {
	case !pattern:
		return nil, errors.New("sar: the graph is not symmetric (a link i→j without j→i)")
	case symmetric:
		return g.Weights, nil
	case rowsEqual:
		one := make([]float64, len(g.Weights))
		for k := range one {
			one[k] = 1
		}
		return one, nil
	}
	return nil, errors.New("sar: the weights are neither symmetric nor a row-standardised binary graph")
}

// scale derives W = D⁻¹C and S = D^{-1/2} C D^{-1/2} from C's weights c.
func (p *Weights) scale(c []float64) {
	p.w = make([]float64, len(c))
	p.s = make([]float64, len(c))
	p.sq = make([]float64, p.n)
	for i := 0; i < p.n; i++ {
		var d float64
		for k := p.off[i]; k < p.off[i+1]; k++ {
			d += c[k]
		}
		p.sq[i] = 1
		if d > 0 {
			p.sq[i] = math.Sqrt(d)
		}
	}
	for i := 0; i < p.n; i++ {
		for k := p.off[i]; k < p.off[i+1]; k++ {
			j := p.nb[k]
			p.w[k] = c[k] / (p.sq[i] * p.sq[i])
			p.s[k] = c[k] / (p.sq[i] * p.sq[j])
		}
	}
}

// components labels the connected components with links. On each, S has
// the eigenvalue 1 with the eigenvector D^{1/2}1 (restricted to it), since
// W1 = 1 there; unit holds those vectors normalised.
func (p *Weights) components() {
	p.comp = make([]int32, p.n)
	p.unit = make([]float64, p.n)
	for i := range p.comp {
		p.comp[i] = -1
	}
	var stack, members []int32
	for i := 0; i < p.n; i++ {
		if p.comp[i] >= 0 || p.off[i] == p.off[i+1] {
			continue
		}
		id := int32(p.ncomp)
		p.ncomp++
		p.comp[i] = id
		stack = append(stack[:0], int32(i))
		members = members[:0]
		var norm float64
		for len(stack) > 0 {
			a := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			members = append(members, a)
			norm += p.sq[a] * p.sq[a]
			for _, b := range p.nb[p.off[a]:p.off[a+1]] {
				if p.comp[b] < 0 {
					p.comp[b] = id
					stack = append(stack, b)
				}
			}
		}
		norm = math.Sqrt(norm)
		for _, a := range members {
			p.unit[a] = p.sq[a] / norm
		}
	}
}

// applyS sets dst = S x.
func (p *Weights) applyS(x, dst []float64) {
	for i := 0; i < p.n; i++ {
		var t float64
		for k := p.off[i]; k < p.off[i+1]; k++ {
			t += p.s[k] * x[p.nb[k]]
		}
		dst[i] = t
	}
}

// deflate removes from x its components along the eigenvectors of S for
// the eigenvalue 1 (one per component), using tmp (ncomp long).
func (p *Weights) deflate(x, tmp []float64) {
	clear(tmp)
	for i, c := range p.comp {
		if c >= 0 {
			tmp[c] += p.unit[i] * x[i]
		}
	}
	for i, c := range p.comp {
		if c >= 0 {
			x[i] -= tmp[c] * p.unit[i]
		}
	}
}
