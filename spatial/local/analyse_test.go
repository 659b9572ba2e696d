package local

import (
	"errors"
	"testing"

	"github.com/areatest/areatest/weights"
)

// Analyse places the results among all areas of the layer: areas without
// a value are "no data", an area whose only neighbour lacks a value has
// "no neighbours", and the categories are counted over the whole layer.
func TestAnalyseLayer(t *testing.T) {
	var pairs [][2]int32
	for i := int32(0); i < 9; i++ {
		pairs = append(pairs, [2]int32{i, i + 1})
	}
	g, err := weights.FromLinks(10, pairs, "path")
	if err != nil {
		t.Fatal(err)
	}
	ids := []string{"a", "b", "c", "d", "e", "f", "g", "h", "i", "j"}
	in := Input{File: "layer", IDs: ids, Variable: "v", Graph: g,
		Values:  []float64{1, 0, 2, 1, 3, 8, 9, 8, 9, 7},
		Missing: []bool{false, true, false, false, false, false, false, false, false, false},
		NullOf:  "f"}
	res, err := Analyse(Moran, in, Options{Permutations: 99, Seed: 3})
	if err != nil {
		t.Fatal(err)
	}
	if res.Areas[1].Category != NoData || res.Areas[1].Value != nil || res.Areas[0].Category != NoNeighbours || res.Areas[0].Analysed {
		t.Fatalf("left-out areas: %+v, %+v", res.Areas[0], res.Areas[1])
	}
	if got := len(res.Analysed()); got != 8 || res.Summary.Areas != 8 {
		t.Fatalf("%d analysed areas, summary %d; want 8", got, res.Summary.Areas)
	}
	total := 0
	for _, c := range res.Summary.Categories {
		total += c.Areas
	}
	if last := res.Summary.Categories[len(res.Summary.Categories)-1]; total != 10 || last.Category != NoData || last.Areas != 1 {
		t.Fatalf("categories %+v", res.Summary.Categories)
	}
	if a := res.NullArea(); a == nil || a.ID != "f" || len(a.Null) != a.Permutations {
		t.Fatalf("null area %+v", a)
	}
	if n := len(res.Weights.Warnings); len(res.Warnings) != n+2 {
		t.Errorf("warnings %q, want the weights' and then the missing value and the island", res.Warnings)
	}
	in.NullOf = "a"
	var na *NotAnalysedError
	if _, err := Analyse(Moran, in, Options{Permutations: 99}); !errors.As(err, &na) || na.ID != "a" {
		t.Fatalf("NullOf an island: %v", err)
	}
}

// The legend lines and the category order are one list per statistic.
func TestCategoryIndexAndLegend(t *testing.T) {
	for _, kind := range []Kind{Moran, CrossMoran, Geary, Gi, GiStar} {
		for k, c := range Categories(kind) {
			if CategoryIndex(kind, c) != k || Legend(c) == "" {
				t.Errorf("%s: %q at %d", kind, c, CategoryIndex(kind, c))
			}
		}
		if CategoryIndex(kind, NoData) != -1 {
			t.Errorf("%s: no data has an index", kind)
		}
	}
}
