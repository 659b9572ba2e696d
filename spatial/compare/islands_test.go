package compare

import (
	"strings"
	"testing"

	"github.com/areatest/areatest/weights"
)

// On a layer where no tested area has a neighbour the spatial check cannot
// run: the result says so (Autocorrelation.Skipped), and the recommendation
// does not claim that nothing clusters; where the check runs it does.
func TestSkippedSpatialCheckIsNotNoClustering(t *testing.T) {
	y := []float64{1, 5, 2, 8, 3, 9, 4, 7, 6, 10}
	g := []string{"a", "b", "a", "b", "a", "b", "a", "b", "a", "b"}
	cases := []struct {
		name    string
		graph   *weights.Graph
		skipped bool
	}{
		{"all islands", mustLinks(t, 10, nil), true},
		{"one pair", mustLinks(t, 10, [][2]int32{{0, 1}}), true},
		{"a chain", path(10), false},
	}
	for _, c := range cases {
		in := input(y, g)
		in.Graph = c.graph
		res, err := Run(in, opts())
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		reason := res.Recommended.Reason
		if got := res.Autocorrelation.Skipped != ""; got != c.skipped {
			t.Errorf("%s: skipped %q", c.name, res.Autocorrelation.Skipped)
		}
		if c.skipped && (strings.Contains(reason, "do not both cluster") || !strings.Contains(reason, "could not run")) {
			t.Errorf("%s: recommendation %q", c.name, reason)
		}
		if !c.skipped && !strings.Contains(reason, "do not both cluster") {
			t.Errorf("%s: recommendation %q", c.name, reason)
		}
	}
}

func mustLinks(t *testing.T, n int, pairs [][2]int32) *weights.Graph {
	t.Helper()
	g, err := weights.FromLinks(n, pairs, "links")
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// The "and N more" of an id list counts from the total, not from the ids
// given, which weights.Summary cuts to the first few.
func TestListIDsCountsFromTheTotal(t *testing.T) {
	ten := []string{"A01", "A02", "A03", "A04", "A05", "A06", "A07", "A08", "A09", "A10"}
	cases := []struct {
		ids   []string
		total int
		want  string
	}{
		{ten, 25, "A01, A02, A03, A04, A05 and 20 more"},
		{ten[:3], 3, "A01, A02, A03"},
		{ten[:5], 5, "A01, A02, A03, A04, A05"},
		{ten[:6], 6, "A01, A02, A03, A04, A05 and 1 more"},
	}
	for _, c := range cases {
		if got := listIDs(c.ids, c.total, 5); got != c.want {
			t.Errorf("%d of %d: %q, want %q", len(c.ids), c.total, got, c.want)
		}
	}
}
