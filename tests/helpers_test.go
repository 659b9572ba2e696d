package tests

import (
	"testing"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// loadStates reads the US states, DC and territories from the Census
// Bureau's cartographic boundaries (us-atlas 3.0.1, converted by
// testdata/us-states.js); feature ids are FIPS codes.
func loadStates(t *testing.T) *layer.Layer {
	t.Helper()
	l, _, err := geojson.ReadFile(testkit.Testdata(t, "us-states.geojson"), geojson.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return l
}

// linkedStates returns the queen graph of the whole layer and, in file
// order, the areas with a neighbour: the 48 contiguous states and DC.
func linkedStates(t *testing.T, l *layer.Layer) (queen *weights.Graph, keep []int) {
	t.Helper()
	queen, err := weights.ContiguityGraph(l.Geoms, weights.Queen)
	if err != nil {
		t.Fatal(err)
	}
	for i := range l.IDs {
		if queen.Degree(i) > 0 {
			keep = append(keep, i)
		}
	}
	return queen, keep
}

// statesQueen returns the queen graph of the 49 states with a neighbour (48
// contiguous and DC), in file order, checking that it links exactly the
// pairs the reference script found by shared vertices on its own.
func statesQueen(t *testing.T, r *autocorrRefs) *weights.Graph {
	t.Helper()
	l := loadStates(t)
	queen, keep := linkedStates(t, l)
	if len(keep) != len(r.IDs) {
		t.Fatalf("%d linked states, reference %d", len(keep), len(r.IDs))
	}
	for k, i := range keep {
		if l.IDs[i] != r.IDs[k] {
			t.Fatalf("area %d is %s, reference %s", k, l.IDs[i], r.IDs[k])
		}
	}
	ours := map[[2]string]bool{}
	for i := range l.IDs {
		nb, _ := queen.Row(i)
		for _, j := range nb {
			if int(j) > i {
				ours[[2]string{l.IDs[i], l.IDs[j]}] = true
			}
		}
	}
	if len(ours) != len(r.QueenPairs) {
		t.Fatalf("%d queen pairs, reference %d", len(ours), len(r.QueenPairs))
	}
	for _, p := range r.QueenPairs {
		if !ours[p] {
			t.Fatalf("reference pair %v missing", p)
		}
	}
	return queen.Subset(keep)
}

// neighbourSet returns the ids of the neighbours of the area with the given
// id in g, nil when no area has it.
func neighbourSet(g *weights.Graph, ids []string, id string) map[string]bool {
	for i, v := range ids {
		if v == id {
			nb, _ := g.Row(i)
			out := map[string]bool{}
			for _, j := range nb {
				out[ids[j]] = true
			}
			return out
		}
	}
	return nil
}
