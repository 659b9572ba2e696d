package local

import (
	"errors"
	"fmt"
	"math"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Kind is one of the per-area statistics.
type Kind int

const (
	// Moran is the local Moran statistic (Anselin 1995, eq. 12):
	//
	//	I_i = (z_i / m2) Σ_j w_ij z_j,  z = x − x̄,  m2 = Σ_i z_i² / n,
	//
	// that is, the standardised value times the spatial lag of the
	// standardised values. Positive when the area resembles its
	// neighbours. Summed over the areas it gives S0 · I, with I the global
	// Moran's I and S0 = Σ_ij w_ij (Anselin 1995, eq. 6 and after; n · I
	// for row-standardised weights without islands).
	Moran Kind = iota
	// CrossMoran relates x at the area to y at its neighbours:
	// I_i = zx_i Σ_j w_ij zy_j, zx and zy the standardised values. Under
	// conditional permutation x_i stays and values of y are drawn into the
	// neighbour slots.
	CrossMoran
	// Geary is the local Geary statistic (Anselin 2019, Geogr. Anal.
	// 51:133–150, eq. 2 on standardised values):
	//
	//	c_i = Σ_j w_ij (zs_i − zs_j)²,  zs = z / √m2.
	//
	// Small when the area resembles its neighbours, large when it differs.
	Geary
	// Gi is the Getis–Ord statistic without the area itself, as the
	// z-score of Ord & Getis (1995, Geogr. Anal. 27:286–306, eq. 3 and
	// the moments beside it):
	//
	//	Gi = (Σ_{j≠i} w_ij x_j − x̄(i) W_i) / (s(i) √(((n−1) S1_i − W_i²)/(n−2)))
	//
	// where x̄(i) and s(i)² = Σ_{j≠i} x_j²/(n−1) − x̄(i)² are the mean and
	// variance of the other n−1 values, W_i = Σ_j w_ij and S1_i = Σ_j w_ij².
	// Positive when the neighbours hold high values.
	Gi
	// GiStar is Gi with the area in its own neighbourhood, self-weight
	// w_ii = 1, and the mean x̄ and variance s² = Σ x²/n − x̄² of all n
	// values (Ord & Getis 1995):
	//
	//	Gi* = (Σ_j w_ij x_j − x̄ W_i*) / (s √((n S1_i* − W_i*²)/(n−1)))
	//
	// with the sums over j including i. The self-weight 1 is on the scale
	// of binary weights, for which the statistic was made; it is also what
	// gonum's stat/spatial.GetisOrdGStar computes with 1 on the diagonal
	// of its locality matrix, and what autocorr.GiStar returns.
	GiStar
)

// String names the statistic in reports.
func (k Kind) String() string {
	switch k {
	case Moran:
		return "local Moran"
	case CrossMoran:
		return "cross local Moran"
	case Geary:
		return "local Geary"
	case Gi:
		return "Getis–Ord Gi"
	case GiStar:
		return "Getis–Ord Gi*"
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// Code is the short name ParseKind reads back.
func (k Kind) Code() string {
	switch k {
	case Moran:
		return "moran"
	case CrossMoran:
		return "cross-moran"
	case Geary:
		return "geary"
	case Gi:
		return "gi"
	case GiStar:
		return "gi-star"
	}
	return ""
}

// ParseKind reads moran, cross-moran, geary, gi or gi-star (case and
// surrounding space ignored).
func ParseKind(s string) (Kind, error) {
	var names []choice.Name[Kind]
	for k := Moran; k <= GiStar; k++ {
		names = append(names, choice.Name[Kind]{Name: k.Code(), Value: k})
	}
	return choice.Parse("local statistic", s, names...)
}

// prepared holds what a kind's evaluator needs: the graph, the values drawn
// into the slots, and per-area constants, so that one evaluation is a
// single pass over the area's slots.
type prepared struct {
	kind Kind
	g    *weights.Graph
	// slot holds the values that move: drawn into neighbour slots.
	slot []float64
	// own is the per-area factor: the standardised value (Moran, Geary,
	// cross) or 1/denominator (Gi, Gi*; 0 where the denominator
	// vanishes, so the statistic is 0 and cannot vary).
	own []float64
	// add is the per-area term added to the neighbour sum (Gi, Gi*).
	add []float64
	// std and stdLag are the standardised value and the lag of the
	// standardised moving values, for the categories.
	std, lag []float64
}

// prepare checks the columns and builds the evaluator constants of kind.
func prepare(kind Kind, x, y []float64, g *weights.Graph) (*prepared, error) {
	if err := check(kind, x, y, g); err != nil {
		return nil, err
	}
	zx, ssx, err := autocorr.Centre(x)
	if err != nil {
		return nil, err
	}
	n := len(x)
	sx := math.Sqrt(ssx / float64(n))
	p := &prepared{kind: kind, g: g, own: make([]float64, n)}
	switch kind {
	case Moran, Geary:
		for i := range zx {
			p.own[i] = zx[i] / sx
		}
		p.slot = p.own
	case CrossMoran:
		if err := p.crossSlots(zx, sx, y); err != nil {
			return nil, err
		}
	case Gi, GiStar:
		// Centred values: Σ_j w_ij x_j − x̄ W_i is then one sum, free of
		// the cancellation of two large terms.
		p.slot = zx
		p.getisOrd(zx, ssx, sx)
	}
	p.axes(zx, sx)
	return p, nil
}

// check rejects a kind, columns or graph the statistics cannot use.
func check(kind Kind, x, y []float64, g *weights.Graph) error {
	if g == nil {
		return errors.New("no neighbour graph")
	}
	if kind < Moran || kind > GiStar {
		return fmt.Errorf("unknown local statistic %d", int(kind))
	}
	if err := checkColumn("x", x, g); err != nil {
		return err
	}
	if (kind == CrossMoran) != (y != nil) {
		if y == nil {
			return errors.New("the cross local Moran needs a second variable")
		}
		return fmt.Errorf("%s takes one variable, not two", kind)
	}
	least := 2
	if kind == Gi {
		least = 3 // its moments divide by n − 2
	}
	if len(x) < least {
		return fmt.Errorf("%s needs at least %d areas, got %d", kind, least, len(x))
	}
	if kind == CrossMoran {
		return checkColumn("y", y, g)
	}
	return nil
}

// crossSlots sets the constants of the cross local Moran: x standardised
// at the area, y standardised in the slots.
func (p *prepared) crossSlots(zx []float64, sx float64, y []float64) error {
	zy, ssy, err := autocorr.Centre(y)
	if err != nil {
		return fmt.Errorf("second variable: %w", err)
	}
	sy := math.Sqrt(ssy / float64(len(y)))
	p.slot = make([]float64, len(y))
	for i := range zx {
		p.own[i] = zx[i] / sx
		p.slot[i] = zy[i] / sy
	}
	return nil
}

// getisOrd sets the per-area terms of Gi and Gi* on the centred values zx
// (sum of squares ssx, standard deviation sx). The denominators depend on
// i's row and value only, which stay fixed under the permutation.
func (p *prepared) getisOrd(zx []float64, ssx, sx float64) {
	n := len(zx)
	fn := float64(n)
	p.add = make([]float64, n)
	for i := 0; i < n; i++ {
		_, w := p.g.Row(i)
		var wi, s1 float64
		for _, v := range w {
			wi += v
			s1 += v * v
		}
		// d is the variance factor under the root of the denominator; a
		// neighbourhood of equal weights on every other area leaves none,
		// and the statistic is then 0, as autocorr.GiStar has it (same
		// relative threshold).
		var d, spread float64
		if p.kind == GiStar {
			wi, s1 = wi+1, s1+1
			p.add[i] = zx[i]
			d = (fn*s1 - wi*wi) / (fn - 1)
			if d > 1e-12*fn*s1 {
				spread = sx
			}
		} else {
			// x̄(i) − x̄ = −z_i/(n−1); s(i)² is the centred sum of squares
			// without area i, about the mean without it.
			p.add[i] = wi * zx[i] / (fn - 1)
			d = ((fn-1)*s1 - wi*wi) / (fn - 2)
			if vi := (ssx - zx[i]*zx[i]*fn/(fn-1)) / (fn - 1); d > 1e-12*(fn-1)*s1 && vi > 1e-24*ssx {
				spread = math.Sqrt(vi)
			}
		}
		if spread > 0 {
			p.own[i] = 1 / (spread * math.Sqrt(d))
		}
	}
}

// axes sets the standardised value and the lag of the standardised moving
// values of every area, for the categories and the Moran scatter.
func (p *prepared) axes(zx []float64, sx float64) {
	n := len(zx)
	p.std = make([]float64, n)
	p.lag = make([]float64, n)
	for i := 0; i < n; i++ {
		p.std[i] = zx[i] / sx
		nb, w := p.g.Row(i)
		var l float64
		if p.kind == CrossMoran {
			for k, j := range nb {
				l += w[k] * p.slot[j]
			}
			p.lag[i] = l
			continue
		}
		for k, j := range nb {
			l += w[k] * zx[j]
		}
		p.lag[i] = l / sx
	}
}

// factory returns the evaluators of the prepared statistic. Each is a
// closure over read-only slices, so workers share them without copies and
// an evaluation allocates nothing.
func (p *prepared) factory() shuffle.LocalFactory {
	off, w, slot, own, add := p.g.Offsets, p.g.Weights, p.slot, p.own, p.add
	switch p.kind {
	case Geary:
		return func() shuffle.LocalEvaluator {
			return func(i int, drawn []int32) float64 {
				wi := w[off[i]:off[i+1]]
				zi := own[i]
				var s float64
				for k, j := range drawn {
					d := zi - slot[j]
					s += wi[k] * d * d
				}
				return s
			}
		}
	case Gi, GiStar:
		return func() shuffle.LocalEvaluator {
			return func(i int, drawn []int32) float64 {
				wi := w[off[i]:off[i+1]]
				s := add[i]
				for k, j := range drawn {
					s += wi[k] * slot[j]
				}
				return s * own[i]
			}
		}
	}
	return func() shuffle.LocalEvaluator {
		return func(i int, drawn []int32) float64 {
			wi := w[off[i]:off[i+1]]
			var s float64
			for k, j := range drawn {
				s += wi[k] * slot[j]
			}
			return own[i] * s
		}
	}
}

// observed evaluates the statistic on the real neighbours.
func (p *prepared) observed() []float64 {
	eval := p.factory()()
	out := make([]float64, p.g.Len())
	for i := range out {
		nb, _ := p.g.Row(i)
		out[i] = eval(i, nb)
	}
	return out
}

// Statistic returns kind's value for every area of g, without inference; y
// is the second variable of the cross local Moran and nil otherwise.
// The values are those Run tests.
func Statistic(kind Kind, x, y []float64, g *weights.Graph) ([]float64, error) {
	p, err := prepare(kind, x, y, g)
	if err != nil {
		return nil, err
	}
	return p.observed(), nil
}

// MoranMoments returns the expectation and variance of every area's local
// Moran under total randomisation (every arrangement of the n values
// equally likely), from Anselin (1995, eqs. 13–14):
//
//	E[I_i]   = −w_i / (n−1)
//	Var[I_i] = w_i(2) (n − b2)/(n−1)
//	         + (w_i² − w_i(2)) (2 b2 − n)/((n−1)(n−2)) − w_i²/(n−1)²
//
// with w_i = Σ_j w_ij, w_i(2) = Σ_j w_ij², w_i² − w_i(2) = Σ_{k≠h} w_ik w_ih
// and b2 = m4/m2² the sample kurtosis (m_r = Σ z^r / n). These moments are
// over the area's own value too; the conditional test keeps it fixed, and
// its mean −w_i z_i²/((n−1) m2) averages to E[I_i] over the n values.
func MoranMoments(x []float64, g *weights.Graph) (expected, variance []float64, err error) {
	if err := checkColumn("x", x, g); err != nil {
		return nil, nil, err
	}
	n := len(x)
	if n < 3 {
		return nil, nil, fmt.Errorf("the moments of local Moran need at least three areas, got %d", n)
	}
	z, ss, err := autocorr.Centre(x)
	if err != nil {
		return nil, nil, err
	}
	fn := float64(n)
	var q float64
	for _, v := range z {
		q += v * v * v * v
	}
	b2 := fn * q / (ss * ss)
	expected = make([]float64, n)
	variance = make([]float64, n)
	for i := 0; i < n; i++ {
		_, w := g.Row(i)
		var wi, w2 float64
		for _, v := range w {
			wi += v
			w2 += v * v
		}
		expected[i] = -wi / (fn - 1)
		variance[i] = w2*(fn-b2)/(fn-1) + (wi*wi-w2)*(2*b2-fn)/((fn-1)*(fn-2)) - wi*wi/((fn-1)*(fn-1))
	}
	return expected, variance, nil
}

// checkColumn rejects a column that does not match the graph or holds a
// value that is not a finite number, which would flow silently into every
// sum.
func checkColumn(name string, x []float64, g *weights.Graph) error {
	if len(x) != g.Len() {
		return fmt.Errorf("%s has %d values for a graph of %d areas", name, len(x), g.Len())
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("%s: value %d is %v, not a finite number", name, i, v)
		}
	}
	return nil
}
