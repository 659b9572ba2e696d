package autocorr

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"github.com/areatest/areatest/weights"
)

// errNoLinks is returned when every area is an island, so no statistic of
// neighbouring pairs exists.
var errNoLinks = errors.New("the neighbour graph has no links")

// checkColumn rejects a column that does not match the graph or holds a
// value that is not a finite number: NaN would otherwise flow silently into
// every sum.
func checkColumn(x []float64, g *weights.Graph) error {
	if len(x) != g.Len() {
		return fmt.Errorf("%d values for a graph of %d areas", len(x), g.Len())
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("value %d is %v, not a finite number", i, v)
		}
	}
	return nil
}

// valueCodes gives each area the code of its distinct value, codes in
// ascending order of value. Shuffling codes instead of positions means tied
// values never count as different arrangements, which keeps exact
// enumeration exact.
func valueCodes(v []float64) (labels []int32, values []float64) {
	order := make([]int, len(v))
	for i := range order {
		order[i] = i
	}
	sort.Slice(order, func(a, b int) bool { return v[order[a]] < v[order[b]] })
	labels = make([]int32, len(v))
	for k, i := range order {
		if k == 0 || v[i] != v[order[k-1]] {
			values = append(values, v[i])
		}
		labels[i] = int32(len(values) - 1)
	}
	return labels, values
}

// zScore is (stat − mean)/sqrt(variance), or 0 when the variance is not
// positive (the statistic cannot vary, so it departs from nothing); JSON has
// no NaN.
func zScore(stat, mean, variance float64) float64 {
	if !(variance > 0) {
		return 0
	}
	return (stat - mean) / math.Sqrt(variance)
}
