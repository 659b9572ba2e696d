package local

import (
	"errors"
	"strings"
	"testing"

	"github.com/areatest/areatest/spatial/autocorr"
)

// TestTooLargeValues: every local statistic refuses values too large to
// square (the check of autocorr.Centre) with an autocorr.TooLargeError,
// marking the second variable of the cross local Moran as such, instead of
// a constant-variable error or NaN moments.
func TestTooLargeValues(t *testing.T) {
	g := lattice(t, 4, 4, false, 0)
	small := make([]float64, 16)
	big := make([]float64, 16)
	for i := range small {
		small[i] = float64(i%4) + 0.5*float64(i/4)
		big[i] = 1e100 * float64(1+i%3) // squares 1e200, their squares 1e400
	}
	opt := DefaultOptions()
	opt.Permutations = 99
	for _, c := range []struct {
		name   string
		kind   Kind
		x, y   []float64
		second bool
	}{
		{"moran", Moran, big, nil, false},
		{"geary", Geary, big, nil, false},
		{"gi", Gi, big, nil, false},
		{"gi-star", GiStar, big, nil, false},
		{"cross x", CrossMoran, big, small, false},
		{"cross y", CrossMoran, small, big, true},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := Run(c.kind, c.x, c.y, g, opt)
			if !errors.Is(err, autocorr.ErrTooLarge) || strings.HasPrefix(err.Error(), "second variable") != c.second {
				t.Errorf("got %v", err)
			}
		})
	}
	if _, _, err := MoranMoments(big, g); !errors.Is(err, autocorr.ErrTooLarge) {
		t.Errorf("moments: %v", err)
	}
}
