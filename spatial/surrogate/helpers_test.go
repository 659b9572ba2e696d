package surrogate

import (
	"math"
	"sort"
	"testing"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// lattice is rook contiguity on an r×c grid, binary weights.
func lattice(tb testing.TB, r, c int) *weights.Graph { return weights.Lattice(r, c, weights.Rook) }

// irregular is an r×c rook lattice with a share of its links dropped and
// some diagonal (queen) links added at random, so that no symmetry of the
// grid survives and no eigenvalue repeats; cells that end up without a link
// become islands.
func irregular(tb testing.TB, r, c int, seed uint64) *weights.Graph {
	rng := shuffle.NewStream(seed, 77, 0)
	var pairs [][2]int32
	for i := 0; i < r; i++ {
		for j := 0; j < c; j++ {
			k := int32(i*c + j)
			if j+1 < c && rng.Float64() > 0.15 {
				pairs = append(pairs, [2]int32{k, k + 1})
			}
			if i+1 < r && rng.Float64() > 0.15 {
				pairs = append(pairs, [2]int32{k, k + int32(c)})
			}
			if i+1 < r && j+1 < c && rng.Float64() < 0.3 {
				pairs = append(pairs, [2]int32{k, k + int32(c) + 1})
			}
		}
	}
	g, err := weights.FromLinks(r*c, pairs, "test graph")
	if err != nil {
		tb.Fatal(err)
	}
	return g
}

// sarField draws fields y = (I − ρW)⁻¹ε on g, ε standard normal from the
// test's stream (testkit.SAR: one factorisation, one solve per draw).
type sarField struct {
	sar *testkit.SAR
	n   int
}

func newSAR(g *weights.Graph, rho float64) *sarField {
	return &sarField{sar: testkit.NewSAR(testkit.Dense(g.Offsets, g.Neighbours, g.Weights), rho), n: g.Len()}
}

func (s *sarField) draw(tb testing.TB, rng *shuffle.Stream) []float64 {
	e := make([]float64, s.n)
	rng.Normals(e)
	return s.sar.Field(tb, e)
}

// medianSplit labels the areas above the median of x as group 0 (A).
func medianSplit(x []float64) []int32 {
	s := append([]float64(nil), x...)
	sort.Float64s(s)
	med := s[len(s)/2]
	lab := make([]int32, len(x))
	for i, v := range x {
		if v < med {
			lab[i] = 1
		}
	}
	return lab
}

// prepared is the basis of g with options opt and the outcome y prepared
// on it.
func prepared(tb testing.TB, g *weights.Graph, opt Options, y []float64) (*Basis, *Outcome) {
	tb.Helper()
	b, err := NewBasis(g, opt)
	if err != nil {
		tb.Fatal(err)
	}
	o, err := b.Prepare(y)
	if err != nil {
		tb.Fatal(err)
	}
	return b, o
}

// moranLinked is Moran's I of y over the linked areas of b (Moran 1950),
// computed by spatial/autocorr on the graph restricted to them.
func moranLinked(tb testing.TB, b *Basis, g *weights.Graph, y []float64) float64 {
	keep := make([]int, len(b.Linked()))
	x := make([]float64, len(keep))
	for k, i := range b.Linked() {
		keep[k] = int(i)
		x[k] = y[i]
	}
	v, err := autocorr.MoransI(x, g.Subset(keep))
	if err != nil {
		tb.Fatal(err)
	}
	return v
}

// meanVar is the mean and sample variance of y.
func meanVar(y []float64) (m, v float64) { return testkit.MeanVar(y) }

// ksDistance is the two-sample Kolmogorov–Smirnov statistic
// sup_x |F_a(x) − F_b(x)| (Smirnov 1939), by one merge of the sorted
// samples; tied values are passed together.
func ksDistance(a, b []float64) float64 {
	x := append([]float64(nil), a...)
	y := append([]float64(nil), b...)
	sort.Float64s(x)
	sort.Float64s(y)
	var i, j int
	var d float64
	for i < len(x) && j < len(y) {
		v := math.Min(x[i], y[j])
		for i < len(x) && x[i] == v {
			i++
		}
		for j < len(y) && y[j] == v {
			j++
		}
		d = math.Max(d, math.Abs(float64(i)/float64(len(x))-float64(j)/float64(len(y))))
	}
	return d
}

// groupTest is the spectral surrogate test of a two-group statistic with
// the grouping lab held fixed, as the comparison runs it
// (compare.GroupTest, which imports this package and so cannot be used
// here).
func groupTest(tb testing.TB, o *Outcome, stat groups.Statistic, lab []int32, observed float64, p shuffle.SurrogatePlan) shuffle.Result {
	if _, err := groups.Prepare(make([]float64, len(lab)), lab, 2); err != nil {
		tb.Fatal(err)
	}
	res, err := shuffle.RunSurrogates(p, observed, o.NewDraw, func() shuffle.OutcomeEvaluator {
		d, _ := groups.Prepare(make([]float64, len(lab)), lab, 2) // checked above
		return d.OnOutcomes(stat)
	}, o.Len())
	if err != nil {
		tb.Fatal(err)
	}
	return res
}

// groupValue is the observed value of a two-group statistic.
func groupValue(tb testing.TB, stat groups.Statistic, y []float64, lab []int32) float64 {
	d, err := groups.Prepare(y, lab, 2)
	if err != nil {
		tb.Fatal(err)
	}
	return d.Observed(stat)
}
