package clustering

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/areatest/areatest/weights"
)

// Past AutoRangeAreas the range of Moran's I is computed only when asked
// for; the note on a skipped range counts the areas, names the limit and
// ends with the caller's advice. Variables on the same areas share one
// computation; a variable with missing values gets the range of its own
// graph.
func TestMoranRangeRule(t *testing.T) {
	const m = 101 // 10,201 areas, just past the limit
	g := weights.Lattice(m, m, weights.Queen)
	ids := make([]string, m*m)
	for i := range ids {
		ids[i] = "c" + strconv.Itoa(i)
	}
	smooth := column("smooth", m*m, func(i int) float64 { return math.Sin(float64(i%m)/9) + math.Cos(float64(i/m)/7) })
	wiggly := column("wiggly", m*m, func(i int) float64 { return math.Sin(float64(i) * 12.9898) })
	gappy := column("gappy", m*m, func(i int) float64 { return float64(i % 7) })
	for i := 0; i < m*m; i += 3 {
		gappy.Missing[i] = true
	}
	in := Input{IDs: ids, Graph: g, Scaling: weights.RowStandardised, Numeric: []Column{smooth, wiggly, gappy}}
	fast := Options{Permutations: 9, Seed: 1, Workers: 2, RangeAdvice: "ask for it with the switch"}
	for _, c := range []struct {
		name  string
		asked bool
	}{{"unasked", false}, {"asked", true}} {
		opt := fast
		opt.MoranRange = c.asked
		res, err := Autocorr(in, opt)
		if err != nil {
			t.Fatal(err)
		}
		for _, v := range res.Variables {
			// gappy has 6,800 areas, below the limit: computed unasked.
			computed := c.asked || v.Areas <= AutoRangeAreas
			switch {
			case computed && (v.Bounds == nil || v.RangeSkipped != "" || !v.Bounds.Converged ||
				v.MoransI.Value < v.Bounds.Min || v.MoransI.Value > v.Bounds.Max):
				t.Errorf("%s %s: range %+v, note %q, I %v", c.name, v.Name, v.Bounds, v.RangeSkipped, v.MoransI.Value)
			case !computed && (v.Bounds != nil || !strings.HasPrefix(v.RangeSkipped, "10,201 areas") ||
				!strings.HasSuffix(v.RangeSkipped, "; ask for it with the switch")):
				t.Errorf("%s %s: range %+v, note %q", c.name, v.Name, v.Bounds, v.RangeSkipped)
			}
		}
		if c.asked {
			a, b, gap := res.Variables[0].Bounds, res.Variables[1].Bounds, res.Variables[2].Bounds
			if *a != *b || a == b || *a == *gap {
				t.Errorf("same areas %+v %+v (shared copies expected), fewer areas %+v", a, b, gap)
			}
			// The range draws its start vector from a fixed stream of its
			// own: neither the seed nor the workers change it.
			opt.Workers, opt.Seed = 1, 77
			one, err := Autocorr(in, opt)
			if err != nil {
				t.Fatal(err)
			}
			if *one.Variables[0].Bounds != *a {
				t.Errorf("one worker, seed 77: %+v; two workers, seed 1: %+v", one.Variables[0].Bounds, a)
			}
		}
	}
}

// The note on a skipped range, word for word.
func TestMoranRangeNote(t *testing.T) {
	g := weights.Lattice(101, 100, weights.Rook)
	ids := make([]string, g.Len())
	for i := range ids {
		ids[i] = strconv.Itoa(i)
	}
	x := column("x", g.Len(), func(i int) float64 { return float64(i % 13) })
	res, err := Autocorr(Input{IDs: ids, Graph: g, Numeric: []Column{x}}, Options{Permutations: 9, Seed: 1, RangeAdvice: "ask for it with --x"})
	if err != nil {
		t.Fatal(err)
	}
	want := "10,100 areas, more than the 10,000 up to which it is computed unasked; ask for it with --x"
	if got := res.Variables[0].RangeSkipped; got != want {
		t.Errorf("note %q, want %q", got, want)
	}
}
