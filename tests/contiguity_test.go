package tests

import (
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/weights"
)

// contigStatesGraphs builds queen and rook contiguity of geoms with the default
// snap distance, failing on any error or warning.
func contigStatesGraphs(t *testing.T, geoms []orb.MultiPolygon, ids []string) (queen, rook *weights.Graph) {
	t.Helper()
	for _, rule := range []weights.Contiguity{weights.Queen, weights.Rook} {
		g, warns, err := weights.BuildContiguity(geoms, weights.ContiguityOptions{Rule: rule, IDs: ids})
		if err != nil {
			t.Fatal(err)
		}
		if len(warns) != 0 {
			t.Fatalf("%v: warnings %q", rule, warns)
		}
		if rule == weights.Queen {
			queen = g
		} else {
			rook = g
		}
	}
	return queen, rook
}

// contigStateFacts holds the robust contiguity of the states to facts of
// common knowledge, no source: Arizona–Colorado and Utah–New Mexico meet
// only at the Four Corners (queen, not rook neighbours); Missouri and
// Tennessee each border eight states; Maine borders one, New Hampshire;
// Alaska and Hawaii border none. Michigan has three neighbours in this file
// (Indiana, Ohio, Wisconsin; its water borders with Illinois and Minnesota
// do not touch), a property of the file noted by whoever prepared it, not
// common knowledge.
func contigStateFacts(t *testing.T, what string, queen, rook *weights.Graph, ids []string) {
	t.Helper()
	const az, co, ut, nm, mo, tn, me, nh, ak, hi, mi = "04", "08", "49", "35", "29", "47", "23", "33", "02", "15", "26"
	for _, pair := range [][2]string{{az, co}, {ut, nm}} {
		if !neighbourSet(queen, ids, pair[0])[pair[1]] {
			t.Errorf("%s: %s–%s should be queen neighbours", what, pair[0], pair[1])
		}
		if neighbourSet(rook, ids, pair[0])[pair[1]] {
			t.Errorf("%s: %s–%s should not be rook neighbours", what, pair[0], pair[1])
		}
	}
	for _, g := range []*weights.Graph{queen, rook} {
		for _, c := range []struct {
			id   string
			want int
		}{{mo, 8}, {tn, 8}, {me, 1}, {ak, 0}, {hi, 0}, {mi, 3}} {
			if got := len(neighbourSet(g, ids, c.id)); got != c.want {
				t.Errorf("%s, %s: %s has %d neighbours, want %d", what, g.Kind, c.id, got, c.want)
			}
		}
		if !neighbourSet(g, ids, me)[nh] {
			t.Errorf("%s, %s: Maine's neighbour should be New Hampshire", what, g.Kind)
		}
		for _, id := range []string{"18", "39", "55"} {
			if !neighbourSet(g, ids, mi)[id] {
				t.Errorf("%s, %s: Michigan should border %s", what, g.Kind, id)
			}
		}
	}
	if d := queen.Links()/2 - rook.Links()/2; d != 2 {
		t.Errorf("%s: queen has %d more pairs than rook, want 2 (the Four Corners)", what, d)
	}
}

func contigSameLinks(a, b *weights.Graph) bool {
	return slices.Equal(a.Offsets, b.Offsets) && slices.Equal(a.Neighbours, b.Neighbours)
}

// The robust method on a real boundary file: the facts hold as the file
// is; and they still hold — the graphs do not change at all — when every
// state is digitised again on its own, each vertex moved by up to 0.3 of
// the snap distance so that no shared vertex coincides any more, or when
// every other state gets an extra vertex in the middle of each side, so
// that its neighbours' corners no longer meet its corners (T-junctions).
func TestStatesRobustContiguity(t *testing.T) {
	l := loadStates(t)
	queen, rook := contigStatesGraphs(t, l.Geoms, l.IDs)
	contigStateFacts(t, "as read", queen, rook, l.IDs)

	snap := weights.DefaultSnap(l.Geoms)
	if snap < 1e-7 || snap > 1e-6 {
		t.Errorf("default snap %g degrees, expected 1e-7 to 1e-6", snap)
	}
	rng := rand.New(rand.NewPCG(3, 4))
	amp := 0.3 * snap
	jittered := make([]orb.MultiPolygon, len(l.Geoms))
	split := make([]orb.MultiPolygon, len(l.Geoms))
	for a, mp := range l.Geoms {
		for _, poly := range mp {
			var jp, sp orb.Polygon
			for _, ring := range poly {
				jr := make(orb.Ring, len(ring))
				for v := range ring[:len(ring)-1] {
					jr[v] = orb.Point{ring[v][0] + amp*(2*rng.Float64()-1), ring[v][1] + amp*(2*rng.Float64()-1)}
				}
				jr[len(ring)-1] = jr[0]
				jp = append(jp, jr)
				if a%2 == 1 {
					sp = append(sp, ring)
					continue
				}
				sr := orb.Ring{ring[0]}
				for v := 1; v < len(ring); v++ {
					p, q := ring[v-1], ring[v]
					sr = append(sr, orb.Point{(p[0] + q[0]) / 2, (p[1] + q[1]) / 2}, q)
				}
				sp = append(sp, sr)
			}
			jittered[a] = append(jittered[a], jp)
			split[a] = append(split[a], sp)
		}
	}
	for name, geoms := range map[string][]orb.MultiPolygon{"jittered": jittered, "T-junctions": split} {
		q, r := contigStatesGraphs(t, geoms, l.IDs)
		if !contigSameLinks(q, queen) || !contigSameLinks(r, rook) {
			t.Errorf("%s: graphs differ from the file as read (queen %d vs %d links, rook %d vs %d)",
				name, q.Links(), queen.Links(), r.Links(), rook.Links())
		}
		contigStateFacts(t, name, q, r, l.IDs)
	}
	// The thin wrapper gives the same graphs.
	if g, err := weights.ContiguityGraph(l.Geoms, weights.Rook); err != nil || !contigSameLinks(g, rook) {
		t.Errorf("ContiguityGraph differs from BuildContiguity: %v", err)
	}
}
