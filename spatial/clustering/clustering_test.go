package clustering

import (
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// lattice is rook contiguity on an r×c grid, with ids "a0", "a1", ….
func lattice(r, c int) (*weights.Graph, []string) {
	g := weights.Lattice(r, c, weights.Rook)
	ids := make([]string, r*c)
	for i := range ids {
		ids[i] = "a" + string(rune('0'+i/100)) + string(rune('0'+i/10%10)) + string(rune('0'+i%10))
	}
	return g, ids
}

func column(name string, n int, f func(i int) float64) Column {
	c := Column{Name: name, Values: make([]float64, n), Missing: make([]bool, n)}
	for i := range c.Values {
		c.Values[i] = f(i)
	}
	return c
}

var quick = Options{Permutations: 499, Seed: 3, Workers: 2}

// Missing values shrink the layer the statistics see: Moran's I then equals
// the one computed directly on the areas with values and the graph among
// them (row-standardised after cutting, as documented).
func TestAutocorrWithMissingValues(t *testing.T) {
	g, ids := lattice(8, 8)
	x := column("x", 64, func(i int) float64 { return 1 + float64(i/8) + 0.3*math.Sin(float64(i)*3) })
	x.Missing[9], x.Missing[40] = true, true
	res, err := Autocorr(Input{IDs: ids, Graph: g, Numeric: []Column{x}}, quick)
	if err != nil {
		t.Fatal(err)
	}
	v := res.Variables[0]
	if v.Areas != 62 || v.Missing != 2 || v.Weights == nil {
		t.Fatalf("areas %d missing %d", v.Areas, v.Missing)
	}
	var keep []int
	var vals []float64
	for i := 0; i < 64; i++ {
		if !x.Missing[i] {
			keep = append(keep, i)
			vals = append(vals, x.Values[i])
		}
	}
	want, _ := autocorr.MoransI(vals, g.Subset(keep).RowStandardised())
	if math.Abs(v.MoransI.Value-want) > 1e-12 {
		t.Fatalf("I %v, want %v", v.MoransI.Value, want)
	}
	wantC, _ := autocorr.GearysC(vals, g.Subset(keep).RowStandardised())
	if math.Abs(v.GearysC.Value-wantC) > 1e-12 || v.GearysC.Value >= 1 {
		t.Fatalf("C %v, want %v", v.GearysC.Value, wantC)
	}
	if v.MoransI.Value < v.Bounds.Min || v.MoransI.Value > v.Bounds.Max {
		t.Fatalf("I %v outside its range %+v", v.MoransI.Value, v.Bounds)
	}
	if v.GeneralG == nil || v.GeneralGSkipped != "" {
		t.Fatalf("General G skipped: %s", v.GeneralGSkipped)
	}
}

func TestGeneralGSkippedForNegativeValues(t *testing.T) {
	g, ids := lattice(5, 5)
	x := column("x", 25, func(i int) float64 { return float64(i%5) - 2 })
	res, err := Autocorr(Input{IDs: ids, Graph: g, Numeric: []Column{x}}, quick)
	if err != nil {
		t.Fatal(err)
	}
	if v := res.Variables[0]; v.GeneralG != nil || !strings.Contains(v.GeneralGSkipped, `10 negative value(s), the first in area "a000"`) {
		t.Fatalf("General G on negative values: %+v %q", v.GeneralG, v.GeneralGSkipped)
	}
}

func TestRateChecksNameAreas(t *testing.T) {
	g, ids := lattice(4, 4)
	ev := column("cases", 16, func(i int) float64 { return float64(i) })
	pop := column("pop", 16, func(i int) float64 { return 1000 })
	pop.Values[5] = 0
	_, err := Autocorr(Input{IDs: ids, Graph: g, Events: &ev, Population: &pop}, quick)
	if err == nil || !strings.Contains(err.Error(), `"a005"`) || !strings.Contains(err.Error(), "pop") {
		t.Fatalf("zero population: %v", err)
	}
}

func TestScreen(t *testing.T) {
	g, ids := lattice(10, 10)
	n := 100
	cols := []Column{
		column("gradient", n, func(i int) float64 { return float64(i / 10) }),
		column("noise", n, func(i int) float64 { return math.Sin(float64(i) * 12.9898) }),
		column("constant", n, func(i int) float64 { return 7 }),
		column("tract_id", n, func(i int) float64 { return float64(1000 + i) }),
		column("gid", n, func(i int) float64 { return float64(i) }),
		column("dropme", n, func(i int) float64 { return float64(i % 3) }),
		column("patchy", n, func(i int) float64 { return float64(i%10) + float64(i/10) }),
	}
	cols[6].Missing[3] = true
	in := ScreenInput{Input: Input{IDs: ids, Graph: g, Numeric: cols}, IDColumn: "gid", Text: []string{"name"}, Excluded: []string{"dropme"}}
	opt := quick
	opt.Adjust = shuffle.BenjaminiHochberg
	res, err := Screen(in, opt)
	if err != nil {
		t.Fatal(err)
	}
	if len(res.Rows) != 3 {
		t.Fatalf("%d rows: %+v", len(res.Rows), res.Rows)
	}
	if res.Rows[0].Name != "gradient" || res.Rows[2].Name != "noise" || res.Rows[0].Rank != 1 {
		t.Fatalf("ranking %v %v %v", res.Rows[0].Name, res.Rows[1].Name, res.Rows[2].Name)
	}
	reasons := map[string]string{}
	for _, s := range res.Skipped {
		reasons[s.Name] = s.Reason
	}
	for name, want := range map[string]string{"constant": "constant", "tract_id": "identifier", "gid": "ids", "dropme": "excluded", "name": "not numeric"} {
		if !strings.Contains(reasons[name], want) {
			t.Errorf("%s skipped for %q, want %q", name, reasons[name], want)
		}
	}
	// The screen's values are the ordinary statistics, and its adjusted
	// p-values are Benjamini–Hochberg of its raw ones.
	var raw []float64
	for _, r := range res.Rows {
		raw = append(raw, r.MoranP)
		if r.Name == "gradient" {
			want, _ := autocorr.MoransI(cols[0].Values, g.RowStandardised())
			if math.Abs(r.MoransI-want) > 1e-12 {
				t.Errorf("gradient I %v, want %v", r.MoransI, want)
			}
		}
		if r.Name == "patchy" && (r.Areas != 99 || r.Missing != 1) {
			t.Errorf("patchy: %d areas, %d missing", r.Areas, r.Missing)
		}
	}
	adj := shuffle.Adjust(raw, shuffle.BenjaminiHochberg)
	for k, r := range res.Rows {
		if r.MoranPAdjusted != adj[k] {
			t.Errorf("%s: adjusted %v, want %v", r.Name, r.MoranPAdjusted, adj[k])
		}
	}
}

// A correlogram over distance classes uses the class graphs cut to the areas
// with values: on a lattice with unit spacing, the class (0, 1] is rook
// contiguity, so its Moran's I equals order 1's.
func TestDistanceClassCorrelogram(t *testing.T) {
	g, ids := lattice(6, 6)
	var pts []orb.Point
	for i := 0; i < 36; i++ {
		pts = append(pts, orb.Point{float64(i % 6), float64(i / 6)})
	}
	classes, err := weights.DistanceClasses(pts, 1, 3, weights.Planar)
	if err != nil {
		t.Fatal(err)
	}
	x := column("x", 36, func(i int) float64 { return float64(i%6) + 0.5*float64(i/6) })
	x.Missing[14] = true
	byOrder, err := Autocorr(Input{IDs: ids, Graph: g, Numeric: []Column{x}, Lags: 1}, quick)
	if err != nil {
		t.Fatal(err)
	}
	byDistance, err := Autocorr(Input{IDs: ids, Graph: g, Numeric: []Column{x}, DistanceClasses: classes}, quick)
	if err != nil {
		t.Fatal(err)
	}
	o, d := byOrder.Variables[0], byDistance.Variables[0]
	if len(d.Correlogram) != 3 || d.CorrelogramClasses[0] != "distance class 0–1 layer units" {
		t.Fatalf("classes %v", d.CorrelogramClasses)
	}
	if math.Abs(o.Correlogram[0].MoransI-d.Correlogram[0].MoransI) > 1e-12 {
		t.Fatalf("class (0,1] I %v, order 1 I %v", d.Correlogram[0].MoransI, o.Correlogram[0].MoransI)
	}
}
