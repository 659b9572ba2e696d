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

// ErrTooLarge is matched (errors.Is) by every *TooLargeError.
var ErrTooLarge = errors.New("the values are too large to square")

// TooLargeError reports a column whose values are too large for the sums
// the statistics need: the mean, the squares of the deviations from it and
// their squares again (the kurtosis in the moments of Moran's I, Geary's C
// and the local statistics), each summed over the areas, must be finite
// float64 numbers (at most about 1.8e308). With a few hundred areas that
// fails for deviations beyond about 1e76; 1e300 fails at the first square.
type TooLargeError struct {
	// Index is the position in the column of the value furthest from the
	// mean, and Value that value.
	Index int
	Value float64
	// Column and ID, when a caller that knows them sets them, name the
	// column and the area of Value in the message.
	Column, ID string
}

// Is makes errors.Is(err, ErrTooLarge) true.
func (e *TooLargeError) Is(target error) bool { return target == ErrTooLarge }

func (e *TooLargeError) Error() string {
	where := fmt.Sprintf("value %d", e.Index)
	if e.ID != "" {
		where = fmt.Sprintf("area %q", e.ID)
	}
	msg := fmt.Sprintf("the values are too large to square (%.4g in %s): the statistics square the deviations from the mean and square them again, which overflows; rescale the column (divide it by a power of ten)", e.Value, where)
	if e.Column != "" {
		msg = fmt.Sprintf("column %q: %s", e.Column, msg)
	}
	return msg
}

// CheckMagnitude returns a *TooLargeError when the values of x, all finite,
// are too large for the statistics' sums (see TooLargeError), and nil
// otherwise. It is the check Centre makes before anything else; callers
// that can name the column and its areas call it first to do so.
func CheckMagnitude(x []float64) error {
	if len(x) == 0 {
		return nil
	}
	var s float64
	far := 0
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil // not a number at all: checkColumn's to report
		}
		s += v
		if math.Abs(v) > math.Abs(x[far]) {
			far = i
		}
	}
	mean := s / float64(len(x))
	if math.IsInf(mean, 0) || math.IsNaN(mean) {
		return &TooLargeError{Index: far, Value: x[far]}
	}
	var q float64
	for i, v := range x {
		d := v - mean
		q += (d * d) * (d * d)
		if math.Abs(d) > math.Abs(x[far]-mean) {
			far = i
		}
	}
	if math.IsInf(q, 0) || math.IsNaN(q) {
		return &TooLargeError{Index: far, Value: x[far]}
	}
	return nil
}
