package report

import (
	"bytes"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/clustering"
	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/weights"
)

func region(t *testing.T) (*layer.Layer, *weights.Graph) {
	t.Helper()
	lay, _, err := geojson.ReadFile("../../samples/region.geojson", geojson.Options{})
	if err != nil {
		t.Fatal(err)
	}
	g, _, err := weights.Spec{Rule: weights.Queen}.Build(lay.Geoms, lay.IDs)
	if err != nil {
		t.Fatal(err)
	}
	return lay, g
}

// autocorrOn runs Autocorr on the region's numeric columns named, with
// the given number of workers, and returns its pictures.
func autocorrOn(t *testing.T, lay *layer.Layer, g *weights.Graph, workers, lags int, names ...string) AutocorrPictures {
	t.Helper()
	in := clustering.Input{File: "region.geojson", IDs: lay.IDs, Graph: g, Scaling: weights.RowStandardised, Lags: lags}
	for _, n := range names {
		col, err := lay.NumericColumn(n, "a variable")
		if err != nil {
			t.Fatal(err)
		}
		in.Numeric = append(in.Numeric, clustering.Column{Name: n, Values: col.Num, Missing: col.Missing})
	}
	opt := clustering.Options{Permutations: 999, Seed: 7, Workers: workers}
	res, err := clustering.Autocorr(in, opt)
	if err != nil {
		t.Fatal(err)
	}
	res.Version = "test"
	return AutocorrPictures{Input: in, Options: opt, Result: res}
}

// The histogram's draws are the very draws of the reported test: they
// tally to its counts and moments, for any number of workers.
func TestMoranDrawsAreTheTestsDraws(t *testing.T) {
	lay, g := region(t)
	var first [][]float64
	for _, workers := range []int{1, 3} {
		p := autocorrOn(t, lay, g, workers, 0, "income", "rate")
		for c, v := range p.Result.Variables {
			draws, err := p.MoranDraws(c)
			if err != nil {
				t.Fatal(err)
			}
			perm := v.MoransI.Permutation
			if len(draws) != perm.Permutations {
				t.Fatalf("%s: %d draws, the test made %d", v.Name, len(draws), perm.Permutations)
			}
			tol := 1e-9 * math.Max(math.Abs(perm.Observed), 1)
			atLeast, atMost, sum := 0, 0, 0.0
			for _, d := range draws {
				if d >= perm.Observed-tol {
					atLeast++
				}
				if d <= perm.Observed+tol {
					atMost++
				}
				sum += d
			}
			if atLeast != perm.AtLeast || atMost != perm.AtMost {
				t.Errorf("%s: draws give %d ≥ and %d ≤ the observed, the test %d and %d", v.Name, atLeast, atMost, perm.AtLeast, perm.AtMost)
			}
			if mean := sum / float64(len(draws)); math.Abs(mean-perm.NullMean) > 1e-12 {
				t.Errorf("%s: draws' mean %g, the test's %g", v.Name, mean, perm.NullMean)
			}
			if workers == 1 {
				first = append(first, draws)
			} else if !slices.Equal(draws, first[c]) {
				t.Errorf("%s: the draws differ with 3 workers", v.Name)
			}
		}
	}
}

// With row-standardised weights the scatter's slope is the reported
// Moran's I, and its lag the mean of the neighbours.
func TestScatterSlopeIsMoransI(t *testing.T) {
	lay, g := region(t)
	p := autocorrOn(t, lay, g, 2, 0, "income")
	x, r, err := p.sample(0)
	if err != nil {
		t.Fatal(err)
	}
	z, lag, slope := scatterAxes(x, r.Binary.RowStandardised())
	if want := p.Result.Variables[0].MoransI.Value; math.Abs(slope-want) > 1e-12 {
		t.Errorf("slope %g, Moran's I %g", slope, want)
	}
	nb, _ := r.Binary.Row(0)
	mean := 0.0
	for _, j := range nb {
		mean += z[j] / float64(len(nb))
	}
	if math.Abs(lag[0]-mean) > 1e-12 {
		t.Errorf("lag of area 0 %g, mean of its neighbours %g", lag[0], mean)
	}
}

var svgTitle = regexp.MustCompile(`<text[^>]*>([^<]*)</text>`)

func texts(svg string) []string {
	var out []string
	for _, m := range svgTitle.FindAllStringSubmatch(svg, -1) {
		out = append(out, m[1])
	}
	return out
}

// One panel per variable, titled with its name, in each picture; the
// correlogram's axis names the neighbour orders.
func TestAutocorrPictures(t *testing.T) {
	lay, g := region(t)
	p := autocorrOn(t, lay, g, 2, 3, "income", "rate", "population")
	for name, draw := range map[string]func(w *bytes.Buffer) error{
		"scatter":     func(w *bytes.Buffer) error { return p.Scatter(w, figure.SVG) },
		"histogram":   func(w *bytes.Buffer) error { return p.Histogram(w, figure.SVG) },
		"correlogram": func(w *bytes.Buffer) error { return p.Correlogram(w, figure.SVG) },
	} {
		var buf bytes.Buffer
		if err := draw(&buf); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		all := strings.Join(texts(buf.String()), "\n")
		for _, v := range p.Result.Variables {
			if c := strings.Count(all, "\n"+v.Name); c != 1 {
				t.Errorf("%s: %d panel titles for %s", name, c, v.Name)
			}
		}
		if !strings.Contains(all, "Clusters are patterns across areas, not causes.") {
			t.Errorf("%s: no caution in %q", name, all)
		}
		if name == "correlogram" && !strings.Contains(all, "neighbour order") {
			t.Errorf("correlogram: axis not named: %q", all)
		}
	}
}

func TestLagLabels(t *testing.T) {
	for _, c := range []struct {
		names  []string
		labels string
		axis   string
	}{
		{[]string{"order 1", "order 2"}, "1|2", "neighbour order"},
		{[]string{"distance class 0–20 km", "distance class 20–40 km"}, "0–20|20–40", "distance class (km)"},
		{[]string{"distance class 0–20 km", "distance class 20–40 m"}, "0–20 km|20–40 m", "distance class"},
		{[]string{"near", "far"}, "near|far", "lag"},
	} {
		l, axis := lagLabels(c.names)
		if strings.Join(l, "|") != c.labels || axis != c.axis {
			t.Errorf("%q: %q on %q, want %q on %q", c.names, l, axis, c.labels, c.axis)
		}
	}
}

// The band of a lag is its null mean ± 1.96 sd and holds the expected
// value when the null is centred on it.
func TestLagPoint(t *testing.T) {
	var l autocorr.Lag
	l.MoransI, l.Expected = 0.4, -0.01
	l.Permutation.NullMean, l.Permutation.NullSD = -0.012, 0.05
	pt := lagPoint("1", l)
	if math.Abs(pt.Low-(-0.012-0.098)) > 1e-12 || math.Abs(pt.High-(-0.012+0.098)) > 1e-12 || pt.Low > pt.Expected || pt.High < pt.Expected {
		t.Errorf("%+v", pt)
	}
}

// The compare map: each area once in each map, the areas left out (the
// region's one area without a policy) hatched in both, the legend
// counting the groups' sizes.
func TestCompareMap(t *testing.T) {
	lay, g := region(t)
	rate, _ := lay.NumericColumn("rate", "the outcome")
	policy, _ := lay.Column("policy")
	in := compare.Input{IDs: lay.IDs, OutcomeName: "rate", Outcome: rate.Num, OutcomeMissing: rate.Missing,
		GroupName: "policy", Group: policy.Labels(), GroupMissing: policy.Missing, Graph: g}
	res, err := compare.Run(in, compare.Options{Permutations: 99, Seed: 3, Workers: 2, Alpha: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	res.Version, res.Input.File = "test", "region.geojson"
	var buf bytes.Buffer
	if err := (ComparePictures{Layer: lay, Result: res}).Map(&buf, figure.SVG); err != nil {
		t.Fatal(err)
	}
	svg := buf.String()
	excluded := 0
	for _, e := range res.Excluded {
		excluded += e.Areas
	}
	if excluded == 0 {
		t.Fatal("the test needs areas left out")
	}
	if h := strings.Count(svg, `<g fill-rule="evenodd" fill="url(#areatest-no-data)"`); h != 2 {
		t.Errorf("%d hatched groups, want one per map", h)
	}
	if n := strings.Count(svg, "<title>"); n != 2*lay.Len() {
		t.Errorf("%d areas drawn (tooltips), want %d in each map", n, lay.Len())
	}
	if n := strings.Count(svg, ": left out</title>"); n != 2*excluded {
		t.Errorf("%d areas left out in the maps, want %d in each", n, excluded)
	}
	all := strings.Join(texts(svg), "\n") + "\n"
	for _, gr := range res.Groups {
		if !strings.Contains(all, "\n"+gr.Level+"\n") || !strings.Contains(all, "\n"+strconv.Itoa(gr.Areas)+"\n") {
			t.Errorf("legend lacks group %q with %d areas", gr.Level, gr.Areas)
		}
	}
	if !strings.Contains(all, "An association between areas is not evidence that one causes the other.") {
		t.Errorf("no caution in %q", all)
	}
}
