package compare

import (
	"fmt"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
)

// GroupStatistic evaluates one of the group statistics of spatial/groups
// on outcomes that change from draw to draw while the grouping stays
// fixed: the surrogate null turned round from the label shuffles, where the
// outcome stays and the labels move. Each evaluator owns a groups.Data and
// re-sorts every surrogate into it (groups.Data.OnOutcomes), so the
// statistic is computed by the very code the label shuffles use and an
// evaluation allocates nothing.
type GroupStatistic struct {
	stat   groups.Statistic
	labels []int32 // group of each area, in area order
	k      int
}

// NewGroupStatistic fixes the statistic and the grouping: labels[i] in
// 0..k−1 is the group of area i (group 0 is A and group 1 is B for the
// two-group statistics). Every group needs at least two areas.
func NewGroupStatistic(stat groups.Statistic, labels []int32, k int) (*GroupStatistic, error) {
	if stat < groups.DiffMedians || stat > groups.OneWayF {
		return nil, fmt.Errorf("compare: unknown statistic %d", stat)
	}
	if stat.TwoGroupsOnly() && k != 2 {
		return nil, fmt.Errorf("compare: the %s compares two groups, not %d", stat, k)
	}
	// Prepare checks the labels and the group sizes.
	if _, err := groups.Prepare(make([]float64, len(labels)), labels, k); err != nil {
		return nil, fmt.Errorf("compare: %w", err)
	}
	return &GroupStatistic{stat: stat, labels: append([]int32(nil), labels...), k: k}, nil
}

// Value computes the statistic for y (allocates; use Factory in loops).
func (g *GroupStatistic) Value(y []float64) float64 { return g.Factory()()(y) }

// Factory returns evaluators for shuffle.RunSurrogates, one per goroutine,
// each with its own groups.Data; an evaluation allocates nothing.
func (g *GroupStatistic) Factory() func() shuffle.OutcomeEvaluator {
	return func() shuffle.OutcomeEvaluator {
		d, err := groups.Prepare(make([]float64, len(g.labels)), g.labels, g.k)
		if err != nil { // checked by NewGroupStatistic
			panic(err)
		}
		return d.OnOutcomes(g.stat) // a surrogate is always finite, so never NaN
	}
}

// GroupTest runs the spectral surrogate test of a group statistic: its
// observed value (groups.Data.Observed, so that every scheme of a
// comparison reports the same number) against its values on p.Draws
// surrogates of o with the grouping of gs held fixed. p.Alternative is used
// as given (the comparison tests H and F in their upper tail only).
func GroupTest(o *surrogate.Outcome, gs *GroupStatistic, observed float64, p shuffle.SurrogatePlan) (shuffle.Result, error) {
	if len(gs.labels) != o.Len() {
		return shuffle.Result{}, fmt.Errorf("compare: %d labels for %d areas", len(gs.labels), o.Len())
	}
	return shuffle.RunSurrogates(p, observed, o.NewDraw, gs.Factory(), o.Len())
}
