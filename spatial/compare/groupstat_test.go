package compare

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
)

// The evaluator keeps the definitions of spatial/groups: on any outcome it
// returns what groups.Prepare followed by Data.Observed returns, for every
// statistic, with ties (integer values) and without, with odd and even
// group sizes — bit for bit, since it performs the same operations in the
// same order.
func TestGroupStatisticEqualsGroups(t *testing.T) {
	rng := shuffle.NewStream(3, 3, 0)
	for trial := 0; trial < 40; trial++ {
		n := 7 + rng.IntN(60)
		y := make([]float64, n)
		for i := range y {
			if trial%2 == 0 {
				y[i] = float64(rng.IntN(6)) // many ties
			} else {
				y[i] = math.Exp(2 * rng.Float64())
			}
		}
		for _, k := range []int{2, 3} {
			lab := make([]int32, n)
			for i := range lab {
				lab[i] = int32(i % k)
			}
			for i := n - 1; i > 0; i-- {
				j := rng.IntN(i + 1)
				lab[i], lab[j] = lab[j], lab[i]
			}
			d, err := groups.Prepare(y, lab, k)
			if err != nil {
				t.Fatal(err)
			}
			for s := groups.DiffMedians; s <= groups.OneWayF; s++ {
				if s.TwoGroupsOnly() != (k == 2) {
					continue
				}
				gs, err := NewGroupStatistic(s, lab, k)
				if err != nil {
					t.Fatal(err)
				}
				want := d.Observed(s)
				got := gs.Value(y)
				if got != want && !(math.IsInf(got, 1) && math.IsInf(want, 1)) {
					t.Fatalf("trial %d, %s, k=%d: %v, groups %v", trial, s, k, got, want)
				}
			}
		}
	}
}

// One evaluation allocates nothing, whatever the statistic.
func TestGroupEvaluatorAllocatesNothing(t *testing.T) {
	y := []float64{1, 5, 2, 8, 3, 3, 9, 4, 7, 6}
	for s := groups.DiffMedians; s <= groups.OneWayF; s++ {
		k := 3
		lab := []int32{0, 1, 0, 1, 2, 2, 0, 1, 2, 0}
		if s.TwoGroupsOnly() {
			k, lab = 2, []int32{0, 1, 0, 1, 1, 1, 0, 1, 0, 0}
		}
		gs, err := NewGroupStatistic(s, lab, k)
		if err != nil {
			t.Fatal(err)
		}
		eval := gs.Factory()()
		if a := testing.AllocsPerRun(100, func() { eval(y) }); a != 0 {
			t.Errorf("%s allocates %v times", s, a)
		}
	}
	if _, err := NewGroupStatistic(groups.DiffMeans, []int32{0, 1, 2, 0, 1, 2}, 3); err == nil {
		t.Error("a two-group statistic accepted three groups")
	}
	if _, err := NewGroupStatistic(groups.KruskalWallis, []int32{0, 1, 1, 1}, 2); err == nil {
		t.Error("a group of one accepted")
	}
}
