package rates

import (
	"math"
	"testing"

	_ "github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

func TestRatesErrorsAndWarnings(t *testing.T) {
	for _, c := range []struct{ e, p []float64 }{
		{[]float64{1, 2}, []float64{10, 0}},
		{[]float64{1, 2}, []float64{10, -5}},
		{[]float64{-1, 2}, []float64{10, 5}},
		{[]float64{1, math.NaN()}, []float64{10, 5}},
		{[]float64{1, 2, 3}, []float64{10, 5}},
	} {
		if _, err := EBStandardise(c.e, c.p); err == nil {
			t.Errorf("events %v population %v accepted", c.e, c.p)
		}
	}
	if _, err := EBStandardise([]float64{0, 0, 0}, []float64{1, 2, 3}); err == nil {
		t.Error("no events accepted")
	}
	s, err := EBStandardise([]float64{12, 2, 3}, []float64{10, 20, 30})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.AboveOne) != 1 || s.AboveOne[0] != 0 {
		t.Errorf("above one: %v", s.AboveOne)
	}
}

// A worked example in exact fractions (Python's fractions module, from the
// formulas of GlobalEB and SpatialEB): events 1, 10, 2, 30 over 100, 200,
// 100, 300 people, neighbours in a path 1–2–3–4. b = 43/700, s² =
// 159/122500, a = 29/30625 > 0; the smoothed rates are 257/8500,
// 6489/122900, 2777/76500 and 15769/169300. With the neighbourhoods
// {1,2}, {1,2,3}, {2,3,4}, {3,4}: 131/4300, 289/7600, 31/675 and 19/200
// (area 4: b = 32/400, a = 1/1250, shrinkage 3/4 of the way from b to its
// raw rate 1/10).
func TestSmoothedWorkedExample(t *testing.T) {
	e := []float64{1, 10, 2, 30}
	p := []float64{100, 200, 100, 300}
	global, err := GlobalEB(e, p)
	if err != nil {
		t.Fatal(err)
	}
	for i, want := range []float64{257.0 / 8500, 6489.0 / 122900, 2777.0 / 76500, 15769.0 / 169300} {
		if math.Abs(global[i]-want) > 1e-15 {
			t.Errorf("global[%d] = %v, want %v", i, global[i], want)
		}
	}
	g, err := weights.FromLinks(4, [][2]int32{{0, 1}, {1, 2}, {2, 3}}, "path")
	if err != nil {
		t.Fatal(err)
	}
	spatial, alone, err := SpatialEB(e, p, g)
	if err != nil || len(alone) != 0 {
		t.Fatal(err, alone)
	}
	for i, want := range []float64{131.0 / 4300, 289.0 / 7600, 31.0 / 675, 19.0 / 200} {
		if math.Abs(spatial[i]-want) > 1e-15 {
			t.Errorf("spatial[%d] = %v, want %v", i, spatial[i], want)
		}
	}
	// An area without neighbours keeps its raw rate.
	lone, _ := weights.FromLinks(4, [][2]int32{{0, 1}, {1, 2}}, "path")
	s, alone, _ := SpatialEB(e, p, lone)
	if len(alone) != 1 || alone[0] != 3 || s[3] != 0.1 {
		t.Errorf("alone %v, rate %v", alone, s[3])
	}
}

func TestPoolCheckUnstable(t *testing.T) {
	pooled, err := Pool([]float64{1, 2, 3, 4}, []float64{10, 20, 30, 40}, []int32{0, 1, 0, 1}, 2)
	if err != nil || pooled[0].Events != 4 || pooled[0].Population != 40 || pooled[1].Rate != 0.1 || pooled[0].Areas != 2 {
		t.Errorf("Pool: %+v %v", pooled, err)
	}
	if r := Ratio(pooled[0], pooled[1]); r != 1 {
		t.Errorf("ratio %v", r)
	}
	if _, err := Pool([]float64{1}, []float64{1}, []int32{2}, 2); err == nil {
		t.Error("a label out of range was accepted")
	}
	ps := Check([]float64{1, -1, 5, 3, math.NaN()}, []float64{10, 10, 4, 0, 1}, false)
	if len(ps) != 4 || ps[0].Index != 1 || ps[1].Index != 2 || ps[2].Index != 3 || ps[3].Index != 4 {
		t.Errorf("Check: %+v", ps)
	}
	if ps := Check([]float64{5}, []float64{4}, true); len(ps) != 0 {
		t.Errorf("repeat events allowed: %+v", ps)
	}
	if err := Validate([]float64{1, 5}, []float64{10, 4}, false, []string{"a", "b"}); err == nil || err.Error() != `area "b": there are more events (5) than people (4)` {
		t.Errorf("Validate: %v", err)
	}
	if u := Unstable([]float64{19, 20, 3}, DefaultUnstable); len(u) != 2 || u[0] != 0 || u[1] != 2 {
		t.Errorf("Unstable: %v", u)
	}
}
