package sar

import (
	"fmt"
	"math"

	"github.com/areatest/areatest/internal/parallel"
	"github.com/areatest/areatest/spatial/shuffle"
)

// width is the number of fields ForDraws solves at once: one pass over the
// links serves them all, which is where a sparse solve spends its time.
const width = 4

// block is one worker's space for width solves side by side; vectors are
// interleaved, entry i of column c at i*width + c.
type block struct {
	rhs, u, r, d, q []float64
	eps, y          []float64
	rr, stop        [width]float64
}

func (m *Model) newBlock() *block {
	n := m.w.n * width
	return &block{rhs: make([]float64, n), u: make([]float64, n), r: make([]float64, n),
		d: make([]float64, n), q: make([]float64, n), eps: make([]float64, m.w.n), y: make([]float64, m.w.n)}
}

// ForDraws simulates count fields, field k from the stream (seed, purpose,
// k) exactly as Simulate draws it (the same values, up to rounding), and
// hands each to f(k, y) on the worker that drew it. Fields are solved width
// at a time. f runs concurrently on up to Options.Workers goroutines and
// must not keep y, which is reused. The first error is returned.
func (m *Model) ForDraws(count int, seed, purpose uint64, f func(k int, y []float64)) error {
	blocks := (count + width - 1) / width
	errs := make([]error, blocks)
	parallel.ForBlocks(blocks, m.w.workers, func() func(int) {
		bl := m.newBlock()
		var rng shuffle.Stream
		return func(b int) {
			cols := min(width, count-b*width)
			for c := 0; c < width; c++ {
				if c < cols {
					rng.Reset(seed, purpose, b*width+c)
				}
				m.blockColumn(bl, c, c < cols, &rng)
			}
			if errs[b] = m.solveBlock(bl); errs[b] != nil {
				return
			}
			for c := 0; c < cols; c++ {
				for i, v := range m.w.sq {
					bl.y[i] = bl.u[i*width+c] / v
				}
				f(b*width+c, bl.y)
			}
		}
	})
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}

// blockColumn fills column c's right-hand side D^{1/2}(μ1 + σε) from rng,
// or zero for a column past the last field.
func (m *Model) blockColumn(bl *block, c int, used bool, rng *shuffle.Stream) {
	if !used {
		for i := range bl.eps {
			bl.rhs[i*width+c] = 0
		}
		return
	}
	rng.Normals(bl.eps)
	sd := math.Sqrt(m.Sigma2)
	for i, e := range bl.eps {
		bl.rhs[i*width+c] = m.w.sq[i] * (m.Intercept + sd*e)
	}
}

// solveBlock runs conjugate gradients on every column as Solve does, each
// with its own step lengths; a converged column takes steps of length 0.
func (m *Model) solveBlock(bl *block) error {
	copy(bl.u, bl.rhs)
	m.blockOperatorDot(bl.u, bl.r)
	for i, v := range bl.rhs {
		bl.r[i] = v - bl.r[i]
	}
	copy(bl.d, bl.r)
	bl.rr, bl.stop = [width]float64{}, [width]float64{}
	for i, v := range bl.r {
		bl.rr[i%width] += v * v
		bl.stop[i%width] += bl.rhs[i] * bl.rhs[i]
	}
	for c := range bl.stop {
		bl.stop[c] *= Tolerance * Tolerance
	}
	limit := 10 * (m.w.n + 100)
	for it := 0; it < limit; it++ {
		var step, beta [width]float64
		active := false
		dq := m.blockOperatorDot(bl.d, bl.q)
		for c := range step {
			if bl.rr[c] > bl.stop[c] {
				step[c], active = bl.rr[c]/dq[c], true
			}
		}
		if !active {
			return nil
		}
		next := blockUpdate(&step, bl.d, bl.q, bl.u, bl.r)
		for c := range beta {
			if step[c] != 0 {
				beta[c] = next[c] / bl.rr[c]
				bl.rr[c] = next[c]
			}
		}
		for i, v := range bl.r {
			bl.d[i] = v + beta[i%width]*bl.d[i]
		}
	}
	return fmt.Errorf("sar: the solve did not converge in %d steps (ρ = %v)", limit, m.Rho)
}

// blockOperatorDot sets dst = (I − ρS)x column by column and returns each
// column's xᵀdst.
func (m *Model) blockOperatorDot(x, dst []float64) [width]float64 {
	p := m.w
	var xd [width]float64
	for i := 0; i < p.n; i++ {
		var t [width]float64
		for k := p.off[i]; k < p.off[i+1]; k++ {
			w, j := p.s[k], int(p.nb[k])*width
			xs := x[j : j+width : j+width]
			t[0] += w * xs[0]
			t[1] += w * xs[1]
			t[2] += w * xs[2]
			t[3] += w * xs[3]
		}
		at := i * width
		xi, di := x[at:at+width:at+width], dst[at:at+width:at+width]
		for c := range t {
			v := xi[c] - m.Rho*t[c]
			di[c] = v
			xd[c] += xi[c] * v
		}
	}
	return xd
}

// blockUpdate is update for every column, with its own step.
func blockUpdate(step *[width]float64, d, q, u, r []float64) [width]float64 {
	var rr [width]float64
	for i, v := range d {
		c := i % width
		u[i] += step[c] * v
		ri := r[i] - step[c]*q[i]
		r[i] = ri
		rr[c] += ri * ri
	}
	return rr
}
