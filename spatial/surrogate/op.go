package surrogate

import (
	"math"
	"runtime"

	"github.com/areatest/areatest/internal/parallel"
	"github.com/areatest/areatest/internal/vec"
	"github.com/areatest/areatest/weights"
)

// symOp is W* = (W + Wᵀ)/2 among the areas of the eigenbasis, in
// compressed rows. Moran's I reads only the symmetric part of W (zᵀWz =
// zᵀW*z), so the eigenvectors and every quadratic form use W* alone; storing
// it explicitly turns each product into a gather over one row, which needs
// no locks when rows are split between goroutines.
type symOp struct {
	n   int
	off []int32
	nb  []int32
	w   []float64
	// gersh bounds every eigenvalue of W* in absolute value (the largest
	// absolute row sum, Gershgorin), and so of M W* M too.
	gersh float64
}

// newSymOp builds W* on the areas keep (indices into g, in order); links to
// areas outside keep are dropped, which never happens for islands.
func newSymOp(g *weights.Graph, keep []int32) *symOp {
	pos := make([]int32, g.Len())
	for i := range pos {
		pos[i] = -1
	}
	for k, i := range keep {
		pos[i] = int32(k)
	}
	n := len(keep)
	// Count entries of W + Wᵀ per row (a pair linked both ways is counted
	// twice here and merged below).
	count := make([]int32, n+1)
	for k, i := range keep {
		nb, _ := g.Row(int(i))
		for _, j := range nb {
			if p := pos[j]; p >= 0 {
				count[k+1]++
				count[p+1]++
			}
		}
	}
	for k := 1; k <= n; k++ {
		count[k] += count[k-1]
	}
	nbAll := make([]int32, count[n])
	wAll := make([]float64, count[n])
	fill := append([]int32(nil), count[:n]...)
	for k, i := range keep {
		nb, w := g.Row(int(i))
		for t, j := range nb {
			if p := pos[j]; p >= 0 {
				h := w[t] / 2
				nbAll[fill[k]], wAll[fill[k]] = p, h
				fill[k]++
				nbAll[fill[p]], wAll[fill[p]] = int32(k), h
				fill[p]++
			}
		}
	}
	op := &symOp{n: n, off: make([]int32, n+1)}
	for k := 0; k < n; k++ {
		row := byCol{nbAll[count[k]:count[k+1]], wAll[count[k]:count[k+1]]}
		sortRow(row)
		var abs float64
		for t := range row.j {
			if t > 0 && row.j[t] == row.j[t-1] {
				op.w[len(op.w)-1] += row.w[t]
			} else {
				op.nb = append(op.nb, row.j[t])
				op.w = append(op.w, row.w[t])
			}
			abs += math.Abs(row.w[t])
		}
		op.gersh = math.Max(op.gersh, abs)
		op.off[k+1] = int32(len(op.nb))
	}
	return op
}

type byCol struct {
	j []int32
	w []float64
}

// sortRow orders one short row by column (insertion sort: rows hold a
// handful of entries).
func sortRow(r byCol) {
	for a := 1; a < len(r.j); a++ {
		for b := a; b > 0 && r.j[b] < r.j[b-1]; b-- {
			r.j[b], r.j[b-1] = r.j[b-1], r.j[b]
			r.w[b], r.w[b-1] = r.w[b-1], r.w[b]
		}
	}
}

// apply sets y = W* x for one vector.
func (op *symOp) apply(x, y []float64) {
	for i := 0; i < op.n; i++ {
		var s float64
		for k := op.off[i]; k < op.off[i+1]; k++ {
			s += op.w[k] * x[op.nb[k]]
		}
		y[i] = s
	}
}

// quad returns xᵀW*x.
func (op *symOp) quad(x []float64) float64 {
	var total float64
	for i := 0; i < op.n; i++ {
		var s float64
		for k := op.off[i]; k < op.off[i+1]; k++ {
			s += op.w[k] * x[op.nb[k]]
		}
		total += x[i] * s
	}
	return total
}

// applyBlock sets Y = sign·(M W* M) X for a block of p columns stored row by
// row (n×p), every column of X centred. Rows are split between goroutines;
// each row is a gather of its neighbours' rows, so the result does not
// depend on the split.
func (op *symOp) applyBlock(x, y []float64, p int, sign float64) {
	parallelRows(op.n, p*(int(op.off[op.n])/max(op.n, 1)+1), func(lo, hi int) {
		for i := lo; i < hi; i++ {
			yi := y[i*p : (i+1)*p]
			for c := range yi {
				yi[c] = 0
			}
			for k := op.off[i]; k < op.off[i+1]; k++ {
				vec.Axpy(sign*op.w[k], x[int(op.nb[k])*p:int(op.nb[k]+1)*p], yi)
			}
		}
	})
	centreColumns(y, op.n, p)
}

// centreColumns subtracts from each column of the n×p row-major block its
// mean: M applied column by column.
func centreColumns(x []float64, n, p int) {
	mean := make([]float64, p)
	for i := 0; i < n; i++ {
		row := x[i*p : (i+1)*p]
		for c, v := range row {
			mean[c] += v
		}
	}
	for c := range mean {
		mean[c] /= float64(n)
	}
	for i := 0; i < n; i++ {
		row := x[i*p : (i+1)*p]
		for c := range row {
			row[c] -= mean[c]
		}
	}
}

// parallelRows runs f over [0, n) in contiguous chunks, one per core, when
// the work (n·perRow operations) is large enough to pay for the goroutines;
// otherwise in one call on this goroutine.
func parallelRows(n, perRow int, f func(lo, hi int)) {
	workers := runtime.GOMAXPROCS(0)
	if workers == 1 || n*perRow < 200_000 {
		f(0, n)
		return
	}
	parallel.ForRanges(n, (n+workers-1)/workers, workers, f)
}
