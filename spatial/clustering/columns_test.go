package clustering

import (
	"errors"
	"strings"
	"testing"

	"github.com/areatest/areatest/spatial/autocorr"
)

// TestJoinCountsNeedCategories: join counts refuse a text column more than
// half of whose categories (among the analysed areas) have a single area,
// and run on one with a few rare categories (hand counts of the labels
// below).
func TestJoinCountsNeedCategories(t *testing.T) {
	g, ids := lattice(4, 4) // 16 areas
	labels := func(f func(i int) string) Categories {
		c := Categories{Name: "c", Labels: make([]string, 16), Missing: make([]bool, 16)}
		for i := range c.Labels {
			c.Labels[i] = f(i)
		}
		return c
	}
	for _, c := range []struct {
		name   string
		cat    Categories
		refuse string // "" when join counts run
	}{
		{"names", labels(func(i int) string { return ids[i] }), "16 categories among 16 areas, 16 of them with a single area"},
		// 7 categories: a, b and 5 singletons (areas 0..4): 5 of 7 single.
		{"mostly singletons", labels(func(i int) string {
			if i < 5 {
				return ids[i]
			}
			return string(rune('a' + i%2))
		}), "7 categories among 16 areas, 5 of them with a single area"},
		// 4 categories: a, b, and 2 singletons: half, not more than half.
		{"half singletons", labels(func(i int) string {
			if i < 2 {
				return ids[i]
			}
			return string(rune('a' + i%2))
		}), ""},
		{"two categories", labels(func(i int) string { return string(rune('a' + (i/4+i%4)%2)) }), ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := Autocorr(Input{IDs: ids, Graph: g, Categorical: []Categories{c.cat}}, quick)
			switch {
			case c.refuse == "" && err != nil:
				t.Errorf("refused: %v", err)
			case c.refuse != "" && (!errors.Is(err, ErrNotCategories) || !strings.Contains(err.Error(), c.refuse) || !strings.HasPrefix(err.Error(), `column "c": `)):
				t.Errorf("got %v, want a NotCategoriesError saying %q", err, c.refuse)
			}
		})
	}
}

// TestTooLargeValuesNamed: values too large to square are an error naming
// the column and the area (autocorr.TooLargeError) in Autocorr, for the
// variable, the --against column and a rate; the screen skips such a
// column with that reason and screens the others.
func TestTooLargeValuesNamed(t *testing.T) {
	g, ids := lattice(5, 5)
	ok := column("ok", 25, func(i int) float64 { return float64(i%5) + 0.5*float64(i/5) })
	big := column("big", 25, func(i int) float64 { return 1e300 * float64(1+i%3) })
	big.Missing[0] = true // so the analysed areas are not the layer's: area 2 is a002
	wantArea := `area "a002"`
	for name, in := range map[string]Input{
		"variable": {IDs: ids, Graph: g, Numeric: []Column{ok, big}},
		"against":  {IDs: ids, Graph: g, Numeric: []Column{ok}, Against: &big},
		"rate":     {IDs: ids, Graph: g, Events: &big, Population: &Column{Name: "pop", Values: ones(25), Missing: make([]bool, 25)}},
	} {
		t.Run(name, func(t *testing.T) {
			_, err := Autocorr(in, quick)
			if !errors.Is(err, autocorr.ErrTooLarge) || !strings.Contains(err.Error(), `column "big`) || !strings.Contains(err.Error(), wantArea) {
				t.Errorf("got %v, want the column and %s", err, wantArea)
			}
		})
	}
	// Nearly constant large values: constant to the relative test of
	// autocorr.Centre, though not all equal; skipped, not a failure.
	nearly := column("nearly", 25, func(i int) float64 { return 1e20 + float64(i%2)*1e4 })
	res, err := Screen(ScreenInput{Input: Input{IDs: ids, Graph: g, Numeric: []Column{big, ok, nearly}},
		Text: []string{"t", "u"}, TextReasons: map[string]string{"t": "not numeric: it holds numbers except for 1 of its 25 values"}}, quick)
	if err != nil {
		t.Fatal(err)
	}
	reasons := map[string]string{}
	for _, s := range res.Skipped {
		reasons[s.Name] = s.Reason
	}
	if len(res.Rows) != 1 || res.Rows[0].Name != "ok" || !strings.Contains(reasons["big"], "too large to square") ||
		!strings.Contains(reasons["big"], wantArea) || reasons["nearly"] != "constant on the areas with a value" ||
		reasons["t"] != "not numeric: it holds numbers except for 1 of its 25 values" || reasons["u"] != "not numeric" {
		t.Errorf("rows %+v, skipped %q", res.Rows, reasons)
	}
}

func ones(n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = 1
	}
	return x
}
