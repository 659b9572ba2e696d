package regress

import (
	"fmt"

	"github.com/areatest/areatest/weights"
)

// traces holds the traces of products of W and the residual-maker
// M = I − QQᵀ that the moments of the residual Moran's I and the LM tests
// need, computed from the sparse graph and the n×k basis Q alone, in
// O(links·k + n·k²), never from an n×n matrix.
//
// With H = QQᵀ, WQ and WᵀQ (n×k) and B = QᵀWQ (k×k), and tr W = 0 (a graph
// has no self-links):
//
//	tr(MW)     = −tr B
//	tr(MWMWᵀ)  = tr(WWᵀ) − ‖WᵀQ‖² − ‖WQ‖² + ‖B‖²
//	tr(MWMW)   = tr(W²) − 2 Σ (WᵀQ)∘(WQ) + tr(B²)
//
// expanding (I − H)W(I − H)W' and using tr(HWWᵀ) = ‖WᵀQ‖², tr(WHWᵀ) =
// ‖WQ‖², tr(HWHWᵀ) = tr(BBᵀ), tr(HW²) = tr(WHW) = tr((WᵀQ)ᵀWQ),
// tr(HWHW) = tr(B²) (‖·‖ the Frobenius norm).
type traces struct {
	s0      float64 // sum of all weights
	wwt, ww float64 // tr(WWᵀ) = Σ w_ij², tr(W²) = Σ w_ij w_ji
	mw      float64 // tr(MW)
	mwmwt   float64 // tr(MWMWᵀ)
	mwmw    float64 // tr(MWMW)
}

// checkGraph rejects a graph that does not match the fit or has no links.
func (f *Fit) checkGraph(g *weights.Graph) error {
	if g == nil || g.Len() != f.Areas {
		size := 0
		if g != nil {
			size = g.Len()
		}
		return fmt.Errorf("regress: a neighbour graph of %d areas for a fit of %d", size, f.Areas)
	}
	if g.Links() == 0 {
		return fmt.Errorf("regress: the neighbour graph has no links")
	}
	return nil
}

// lag sets dst = Wv.
func lag(g *weights.Graph, v, dst []float64) {
	for i := range dst {
		nb, w := g.Row(i)
		var s float64
		for t, j := range nb {
			s += w[t] * v[j]
		}
		dst[i] = s
	}
}

// weightTraces returns S0, tr(WWᵀ) = Σ w_ij² and tr(W²) = Σ_ij w_ij w_ji.
// For the last, column i of W (the links into i, gathered once by a
// counting pass) meets row i scattered into a work vector: O(links).
func weightTraces(g *weights.Graph) (s0, wwt, ww float64) {
	n := g.Len()
	start := make([]int32, n+1) // column pointers of W
	for _, j := range g.Neighbours {
		start[j+1]++
	}
	for j := 0; j < n; j++ {
		start[j+1] += start[j]
	}
	from := make([]int32, len(g.Neighbours))
	into := make([]float64, len(g.Neighbours))
	fill := append([]int32(nil), start[:n]...)
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for t, j := range nb {
			s0 += w[t]
			wwt += w[t] * w[t]
			from[fill[j]], into[fill[j]] = int32(i), w[t]
			fill[j]++
		}
	}
	row := make([]float64, n)
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		for t, j := range nb {
			row[j] = w[t]
		}
		for s := start[i]; s < start[i+1]; s++ { // w_ji for the j linking into i
			ww += row[from[s]] * into[s]
		}
		for _, j := range nb {
			row[j] = 0
		}
	}
	return s0, wwt, ww
}

// traces computes the traces for the graph g (checked by the caller).
func (f *Fit) traces(g *weights.Graph) traces {
	n, k := f.Areas, f.k
	var t traces
	t.s0, t.wwt, t.ww = weightTraces(g)
	wq := make([]float64, n*k)  // WQ, row by row
	wtq := make([]float64, n*k) // WᵀQ, row by row
	for i := 0; i < n; i++ {
		nb, w := g.Row(i)
		qi := f.basis[i*k : i*k+k]
		out := wq[i*k : i*k+k]
		for s, j := range nb {
			qj := f.basis[int(j)*k : int(j)*k+k]
			back := wtq[int(j)*k : int(j)*k+k]
			for a := 0; a < k; a++ {
				out[a] += w[s] * qj[a]
				back[a] += w[s] * qi[a]
			}
		}
	}
	b := make([]float64, k*k) // B = QᵀWQ
	var nwq, nwtq, cross float64
	for i := 0; i < n; i++ {
		qi, wi, ti := f.basis[i*k:i*k+k], wq[i*k:i*k+k], wtq[i*k:i*k+k]
		for a := 0; a < k; a++ {
			nwq += wi[a] * wi[a]
			nwtq += ti[a] * ti[a]
			cross += ti[a] * wi[a]
			for c := 0; c < k; c++ {
				b[a*k+c] += qi[a] * wi[c]
			}
		}
	}
	var trB, bb, bbt float64
	for a := 0; a < k; a++ {
		trB += b[a*k+a]
		for c := 0; c < k; c++ {
			bbt += b[a*k+c] * b[a*k+c]
			bb += b[a*k+c] * b[c*k+a]
		}
	}
	t.mw = -trB
	t.mwmwt = t.wwt - nwtq - nwq + bbt
	t.mwmw = t.ww - 2*cross + bb
	return t
}
