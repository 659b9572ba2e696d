package weights

import (
	"slices"
	"testing"
)

// Present keeps the areas no mask marks; Restrict then drops the kept
// areas without a kept neighbour, and Pick and Areas follow it back to the
// layer's rows.
func TestPresentRestrictPick(t *testing.T) {
	// A row of five squares, rook: 0–1–2–3–4. Area 2 has no value, so 0–1
	// and 3–4 stay linked; with area 4 missing as well, 3 is an island.
	g := Lattice(1, 5, Rook)
	missing := []bool{false, false, true, false, true}
	keep := Present(5, missing, nil)
	if !slices.Equal(keep, []int{0, 1, 3}) {
		t.Fatalf("Present: %v", keep)
	}
	if got := Present(3); !slices.Equal(got, []int{0, 1, 2}) {
		t.Fatalf("Present without masks: %v", got)
	}
	ids := []string{"a", "b", "c", "d", "e"}
	r, err := Restrict(g, keep, ids, RowStandardised, false)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(r.Used, []int{0, 1}) || !slices.Equal(r.Areas, []int{0, 1}) {
		t.Fatalf("used %v, areas %v", r.Used, r.Areas)
	}
	values := []float64{10, 11, 12, 13, 14}
	if got := r.Pick(values); !slices.Equal(got, []float64{10, 11}) {
		t.Fatalf("Pick: %v", got)
	}
	if r.Pick(nil) != nil {
		t.Fatal("Pick(nil) is not nil")
	}
	r, err = Restrict(g, keep, ids, RowStandardised, true) // islands kept
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(r.Areas, []int{0, 1, 3}) || !slices.Equal(r.Pick(values), []float64{10, 11, 13}) {
		t.Fatalf("with islands: areas %v, pick %v", r.Areas, r.Pick(values))
	}
}
