package weights

import (
	"math"
	"strings"
	"testing"
)

func TestTransforms(t *testing.T) {
	g, _ := ContiguityGraph(lattice(4), Queen)
	b, err := g.Scaled(Binary)
	if err != nil || b.Weights[0] != 1 {
		t.Fatal(err)
	}
	v, err := g.Scaled(VarianceStabilising)
	if err != nil {
		t.Fatal(err)
	}
	// S-coding (Tiefelsdorf, Griffith & Boots 1999): equal sum of squared
	// weights in every row, and all weights summing to n.
	var total, first float64
	for i := 0; i < v.Len(); i++ {
		_, w := v.Row(i)
		var q float64
		for _, x := range w {
			q += x * x
			total += x
		}
		if i == 0 {
			first = q
		} else if math.Abs(q-first) > 1e-12 {
			t.Fatalf("row %d: Σw² = %v, row 0: %v", i, q, first)
		}
	}
	if math.Abs(total-16) > 1e-12 {
		t.Fatalf("S-coded weights sum to %v, want n = 16", total)
	}
	if _, err := ParseTransform("cube"); err == nil {
		t.Fatal("unknown transform accepted")
	}
}

func TestSymmetrisedAndAsymmetry(t *testing.T) {
	// 0→1 (weight 2) and 1→0 (weight 4); 1→2 only (weight 1).
	g, err := FromEntries(3, []Link{{0, 1, 2}, {1, 0, 4}, {1, 2, 1}}, "test", "weighted")
	if err != nil {
		t.Fatal(err)
	}
	if g.Asymmetric() != 1 {
		t.Fatalf("asymmetric links %d, want 1", g.Asymmetric())
	}
	s := g.Symmetrised()
	if s.Asymmetric() != 0 || weightOf(s, 0, 1) != 3 || weightOf(s, 1, 0) != 3 || weightOf(s, 2, 1) != 0.5 {
		t.Fatalf("symmetrised weights %v", s.Weights)
	}
	if _, err := FromEntries(2, []Link{{0, 1, 1}, {0, 1, 2}}, "x", "x"); err == nil {
		t.Fatal("a repeated link was accepted")
	}
	if _, err := FromEntries(2, []Link{{0, 1, -1}}, "x", "x"); err == nil {
		t.Fatal("a negative weight was accepted")
	}
}

// On a rook lattice the neighbours of order k of an interior cell are the
// cells at Manhattan distance exactly k (4k of them when they all fit), and
// the cumulative graph up to k holds 2k(k+1) (lattice geometry).
func TestHigherOrder(t *testing.T) {
	m := 9
	g, _ := ContiguityGraph(lattice(m), Rook)
	centre := 4*m + 4
	for k := 1; k <= 3; k++ {
		h, err := g.HigherOrder(k, false)
		if err != nil {
			t.Fatal(err)
		}
		if got := h.Degree(centre); got != 4*k {
			t.Errorf("order %d: %d neighbours, want %d", k, got, 4*k)
		}
		nb, _ := h.Row(centre)
		for _, j := range nb {
			r, c := int(j)/m, int(j)%m
			if d := abs(r-4) + abs(c-4); d != k {
				t.Errorf("order %d lists a cell at distance %d", k, d)
			}
		}
		c, _ := g.HigherOrder(k, true)
		if got := c.Degree(centre); got != 2*k*(k+1) {
			t.Errorf("orders 1..%d: %d neighbours, want %d", k, got, 2*k*(k+1))
		}
		if c.Asymmetric() != 0 || h.Asymmetric() != 0 {
			t.Error("higher-order graph is not symmetric")
		}
	}
	if _, err := g.HigherOrder(0, false); err == nil {
		t.Fatal("order 0 accepted")
	}
}

func abs(x int) int {
	if x < 0 {
		return -x
	}
	return x
}

func TestSummary(t *testing.T) {
	// A 3×3 queen lattice (a..i), a separate linked pair (j, k) and an
	// island (l).
	g, _ := ContiguityGraph(lattice(3), Queen)
	ids := []string{"a", "b", "c", "d", "e", "f", "g", "h", "i", "j", "k", "l"}
	var pairs [][2]int32
	for i := 0; i < g.Len(); i++ {
		nb, _ := g.Row(i)
		for _, j := range nb {
			if int(j) > i {
				pairs = append(pairs, [2]int32{int32(i), j})
			}
		}
	}
	pairs = append(pairs, [2]int32{9, 10})
	h, _ := FromLinks(12, pairs, "queen contiguity")
	s := Summarise(h, ids)
	if s.Areas != 12 || s.Pairs != 20+1 || s.Links != 42 || s.Islands != 1 || s.IslandIDs[0] != "l" {
		t.Fatalf("summary %+v", s)
	}
	if s.MaxNeighbours != 8 || s.MostIDs[0] != "e" || s.MinNeighbours != 0 || s.Histogram[3] != 4 {
		t.Fatalf("neighbour counts %+v", s)
	}
	if s.Components != 3 || s.ComponentSizes[0] != 9 || s.ComponentSizes[1] != 2 {
		t.Fatalf("components %d %v", s.Components, s.ComponentSizes)
	}
	joined := strings.Join(s.Warnings, " ")
	if !strings.Contains(joined, "2 separate groups") {
		t.Fatalf("warnings %q", s.Warnings)
	}
	empty, _ := FromLinks(3, nil, "distance band 1 km")
	if w := Summarise(empty, ids[:3]).Warnings; len(w) == 0 || !strings.Contains(w[0], "every area is an island") {
		t.Fatalf("all-islands warning missing: %q", w)
	}
}

// "As built" leaves a weighted graph's weights alone, where Binary sets
// them to one: the difference between --scaling none and the former
// --transform binary on kernel weights. On a contiguity graph, whose
// weights are ones, the two agree.
func TestAsBuilt(t *testing.T) {
	g, err := FromEntries(3, []Link{{0, 1, 0.5}, {1, 0, 0.5}, {1, 2, 2}, {2, 1, 2}}, "test", "weighted")
	if err != nil {
		t.Fatal(err)
	}
	kept, err := g.Scaled(AsBuilt)
	if err != nil {
		t.Fatal(err)
	}
	ones, _ := g.Scaled(Binary)
	for k := range g.Weights {
		if kept.Weights[k] != g.Weights[k] || ones.Weights[k] != 1 {
			t.Fatalf("link %d: as built %v, binary %v (built %v)", k, kept.Weights[k], ones.Weights[k], g.Weights[k])
		}
	}
	if kept.Scaling != "weighted" || &kept.Weights[0] == &g.Weights[0] {
		t.Errorf("as built: label %q, or the weights are not a copy", kept.Scaling)
	}
	lat := Lattice(3, 3, Rook)
	a, _ := lat.Scaled(AsBuilt)
	b, _ := lat.Scaled(Binary)
	if a.Scaling != b.Scaling || len(a.Weights) != len(b.Weights) {
		t.Fatalf("contiguity: as built %q, binary %q", a.Scaling, b.Scaling)
	}
	for k := range a.Weights {
		if a.Weights[k] != b.Weights[k] {
			t.Fatalf("contiguity link %d: %v and %v", k, a.Weights[k], b.Weights[k])
		}
	}
}
