package tests

import (
	"math"
	"testing"

	"github.com/areatest/areatest/samples/region"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// effZonesConnected reports the first zone that is not connected through
// links inside it, or −1.
func effZonesConnected(g *weights.Graph, zones []int32) int32 {
	sizes := weights.ZoneSizes(zones)
	seen := make([]bool, g.Len())
	for i := range zones {
		if seen[i] {
			continue
		}
		queue := []int{i}
		seen[i] = true
		for h := 0; h < len(queue); h++ {
			nb, _ := g.Row(queue[h])
			for _, v := range nb {
				if !seen[v] && zones[v] == zones[i] {
					seen[v] = true
					queue = append(queue, int(v))
				}
			}
		}
		if len(queue) != sizes[zones[i]] {
			return zones[i]
		}
	}
	return -1
}

// Automatic zones on a real layer: the US states (queen contiguity) in
// zones of about 7. The 49 linked states (48 contiguous and DC) get
// round(49/7) = 7 seeds; a zone that ends up enclosed below half the target
// is merged into a neighbour, so 6 or 7 connected zones of 4 to 14 states
// remain. Alaska, Hawaii, Puerto Rico and the four island areas have no
// neighbour and are zones of their own (common knowledge, no source: none
// of them borders a state).
func TestZonesOnStates(t *testing.T) {
	l := loadStates(t)
	g, err := weights.ContiguityGraph(l.Geoms, weights.Queen)
	if err != nil {
		t.Fatal(err)
	}
	zones, err := weights.Zones(g, 7)
	if err != nil {
		t.Fatal(err)
	}
	if z := effZonesConnected(g, zones); z >= 0 {
		t.Fatalf("zone %d is not connected", z)
	}
	sizes := weights.ZoneSizes(zones)
	var mainland, alone int
	for _, s := range sizes {
		switch {
		case s == 1:
			alone++
		case s < 4 || s > 14:
			t.Fatalf("a zone of %d states", s)
		default:
			mainland++
		}
	}
	if mainland < 6 || mainland > 7 || alone != 7 {
		t.Fatalf("%d zones of linked states and %d alone, want 6 or 7 and 7 (sizes %v)", mainland, alone, sizes)
	}
	byID := map[string]int32{}
	for i, id := range l.IDs {
		byID[id] = zones[i]
	}
	for _, id := range []string{"02", "15", "72"} { // Alaska, Hawaii, Puerto Rico
		if sizes[byID[id]] != 1 {
			t.Fatalf("%s shares a zone", id)
		}
	}
	t.Logf("zone sizes %v", sizes)
}

// The pieces together, as the compare command will use them: Freedman–Lane
// residual permutation within automatic zones of the demo region (3,000
// areas). Every arrangement the shuffle machinery hands the evaluator moves
// each area's residual only within its zone, and the test runs to a
// p-value.
func TestFreedmanLaneWithinZones(t *testing.T) {
	cfg := region.DefaultConfig()
	cfg.Areas = 3000
	r, err := region.Build(cfg)
	if err != nil {
		t.Fatal(err)
	}
	g, err := weights.ContiguityGraph(r.Geoms, weights.Queen)
	if err != nil {
		t.Fatal(err)
	}
	var keep []int
	for i := range r.IDs {
		if !math.IsNaN(r.Rate[i]) && r.Policy[i] != "" {
			keep = append(keep, i)
		}
	}
	sub := g.Subset(keep)
	zones, err := weights.Zones(sub, 0)
	if err != nil {
		t.Fatal(err)
	}
	y := make([]float64, len(keep))
	income := make([]float64, len(keep))
	lab := make([]int32, len(keep))
	for k, i := range keep {
		y[k] = r.Rate[i]
		income[k] = r.Income[i]
		if r.Policy[i] != "yes" {
			lab[k] = 1
		}
	}
	fl, err := shuffle.NewFreedmanLane(y, [][]float64{income}, lab, 2)
	if err != nil {
		t.Fatal(err)
	}
	tf, err := fl.TFactory()
	if err != nil {
		t.Fatal(err)
	}
	checked := func() shuffle.Evaluator {
		eval := tf()
		return func(perm []int32) float64 {
			for i, u := range perm {
				if zones[u] != zones[i] {
					t.Errorf("area %d got the residual of area %d from another zone", i, u)
				}
			}
			return eval(perm)
		}
	}
	res, err := shuffle.Run(shuffle.Plan{Scheme: "within automatic zones", Labels: fl.Labels(), Strata: zones,
		Permutations: 999, Seed: 3, Workers: 2, Alternative: shuffle.TwoSided, Scale: 1}, checked)
	if err != nil {
		t.Fatal(err)
	}
	free, err := shuffle.Run(shuffle.Plan{Scheme: "free", Labels: fl.Labels(), Permutations: 999, Seed: 3,
		Alternative: shuffle.TwoSided, Scale: 1}, tf)
	if err != nil {
		t.Fatal(err)
	}
	_, classical, _ := fl.ClassicalT(shuffle.TwoSided)
	t.Logf("%d areas in %d zones: t of policy given income %.3f; p within zones %.4f, free %.4f, classical %.4f",
		len(keep), len(weights.ZoneSizes(zones)), res.Observed, res.PValue, free.PValue, classical)
	if res.PValue <= 0 || res.PValue > 1 || res.Permutations != 999 {
		t.Fatalf("within zones: %+v", res)
	}
}
