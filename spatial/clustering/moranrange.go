package clustering

import (
	"fmt"
	"slices"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/autocorr"
)

// AutoRangeAreas is the largest number of areas on which Autocorr computes
// the range of Moran's I without Options.MoranRange. The range costs about
// n^1.5 (its Lanczos iteration needs about 3√n steps on square lattices,
// whose extreme eigenvalues crowd together fastest), while the
// rest of a run grows about as n, so past some size it would dominate the
// run. The limit keeps it under a tenth of a default run (9,999 shuffles)
// on the worst case, a square grid. Measured on a shared 2-core machine
// (BenchmarkBoundsQueen* in spatial/autocorr, BenchmarkScaleAutocorr* in
// cmd/areatest): 16 ms on 3,136 cells (5% of the run), 82 ms on 10,000
// (8%), 255 ms on 19,881 (13%), 1.7 s on 85,264.
const AutoRangeAreas = 10_000

// rangeCache keeps the range of the last graph it was computed on, so that
// variables analysed on the same areas share one computation.
type rangeCache struct {
	areas  []int
	bounds autocorr.Bounds
}

// moranRange sets v.Bounds, or says in v.RangeSkipped why it was not
// computed.
func (v *Variable) moranRange(s *sample) error {
	n := len(s.r.Used)
	if n > AutoRangeAreas && !s.opt.MoranRange {
		v.RangeSkipped = fmt.Sprintf("%s areas, more than the %s up to which it is computed unasked",
			numtext.Count(n), numtext.Count(AutoRangeAreas))
		if s.opt.RangeAdvice != "" {
			v.RangeSkipped += "; " + s.opt.RangeAdvice
		}
		return nil
	}
	c := &s.res.ranges
	if c.areas == nil || !slices.Equal(c.areas, s.r.Areas) {
		b, err := autocorr.MoranBounds(s.r.Graph)
		if err != nil {
			return err
		}
		c.areas, c.bounds = s.r.Areas, b
	}
	b := c.bounds
	v.Bounds = &b
	return nil
}
