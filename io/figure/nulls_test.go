package figure

import (
	"bytes"
	"encoding/xml"
	"image/color"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// svgNode is an element of a parsed SVG, with its attributes, children
// and text.
type svgNode struct {
	name     string
	attr     map[string]string
	children []*svgNode
	text     string
}

// parseSVGTree reads an SVG into a tree of elements.
func parseSVGTree(t *testing.T, data []byte) *svgNode {
	t.Helper()
	root := &svgNode{name: "#document"}
	stack := []*svgNode{root}
	dec := xml.NewDecoder(bytes.NewReader(data))
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			return root
		}
		if err != nil {
			t.Fatalf("SVG not well-formed: %v", err)
		}
		switch e := tok.(type) {
		case xml.StartElement:
			n := &svgNode{name: e.Name.Local, attr: map[string]string{}}
			for _, a := range e.Attr {
				n.attr[a.Name.Local] = a.Value
			}
			top := stack[len(stack)-1]
			top.children = append(top.children, n)
			stack = append(stack, n)
		case xml.EndElement:
			stack = stack[:len(stack)-1]
		case xml.CharData:
			stack[len(stack)-1].text += string(e)
		}
	}
}

// find lists the descendants of n with the element name (any when "") and
// class (any when "").
func (n *svgNode) find(name, class string) []*svgNode {
	var out []*svgNode
	for _, c := range n.children {
		if (name == "" || c.name == name) && (class == "" || c.attr["class"] == class) {
			out = append(out, c)
		}
		out = append(out, c.find(name, class)...)
	}
	return out
}

func (n *svgNode) num(t *testing.T, key string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(n.attr[key], 64)
	if err != nil {
		t.Fatalf("<%s> %s=%q: %v", n.name, key, n.attr[key], err)
	}
	return v
}

// axisMap reads a horizontal axis from its labelled ticks (text centred on
// each tick, e.g. "−50" or "10%") and returns the mapping from a value to
// its x in pixels, fitted through the outermost two.
func axisMap(t *testing.T, axis *svgNode) func(float64) float64 {
	t.Helper()
	var xs, vs []float64
	for _, tx := range axis.find("text", "") {
		s := strings.NewReplacer("−", "-", ",", "", "%", "").Replace(tx.text)
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatalf("tick label %q: %v", tx.text, err)
		}
		xs, vs = append(xs, tx.num(t, "x")), append(vs, v)
	}
	if len(xs) < 2 {
		t.Fatalf("%d labelled ticks on the axis", len(xs))
	}
	a, b := 0, len(xs)-1
	return func(v float64) float64 { return xs[a] + (v-vs[a])/(vs[b]-vs[a])*(xs[b]-xs[a]) }
}

func normalNull(seed uint64, n int, sd float64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 1))
	out := make([]float64, n)
	for i := range out {
		out[i] = rng.NormFloat64() * sd
	}
	return out
}

// The drawn SVG says what the statistics say: one panel per null
// distribution, each panel's bars counting every one of its finite draws
// with heights in proportion to their counts, the observed line where the
// shared axis puts the observed value, and one row per rate in the check
// with the level's line where the rate axis puts α.
func TestNullPanelsDrawWhatTheyShow(t *testing.T) {
	withNaN := normalNull(4, 500, 3)
	withNaN[7], withNaN[99] = math.NaN(), math.NaN()
	exact := []float64{0, 1, 1, 2, 2, 2, 3, 3, 4} // an enumeration's few values
	rates := []RateRow{
		{Name: "free", Detail: "27% (23–31%)", Rate: 0.27, Interval: [2]float64{0.23, 0.31}, Unsound: true},
		{Name: "spectral surrogates", Detail: "0% (0–9%)", Rate: 0, Interval: [2]float64{0, 0.088}},
	}
	cases := []struct {
		name     string
		panels   []NullPanel
		observed float64
		rates    []RateRow
		alpha    float64
	}{
		{"one panel, no check", []NullPanel{{Name: "free", Null: normalNull(1, 999, 10)}}, 4.5, nil, 0},
		{"narrow and wide with the check", []NullPanel{{Name: "free", Detail: "p = 0.0004", Null: normalNull(2, 9999, 5)},
			{Name: "within <province>", Null: normalNull(3, 9999, 8)}, {Name: "spectral surrogates", Null: normalNull(5, 999, 40)}}, -70.8, rates, 0},
		{"observed far outside, NaN draws, α 10%", []NullPanel{{Name: "free", Null: withNaN}}, 250, rates[:1], 0.1},
		{"exact enumeration", []NullPanel{{Name: "free", Detail: "exact, 9 arrangements", Null: exact}}, 3, nil, 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var buf bytes.Buffer
			opt := NullOptions{ChartOptions: ChartOptions{Title: "t", XLabel: "difference", Note: "n"}, Alpha: c.alpha}
			if err := NullPanels(&buf, SVG, c.panels, c.observed, c.rates, opt); err != nil {
				t.Fatal(err)
			}
			doc := parseSVGTree(t, buf.Bytes())
			panels := doc.find("g", "panel")
			if len(panels) != len(c.panels) {
				t.Fatalf("%d panels drawn for %d null distributions", len(panels), len(c.panels))
			}
			for p, pg := range panels {
				checkPanel(t, pg, c.panels[p])
			}
			x := axisMap(t, doc.find("g", "x-axis")[0])
			obs := doc.find("g", "observed")
			if len(obs) != 1 {
				t.Fatalf("%d observed lines", len(obs))
			}
			line := obs[0].find("line", "")[0]
			if x1, x2 := line.num(t, "x1"), line.num(t, "x2"); math.Abs(x1-x(c.observed)) > 0.02 || x1 != x2 {
				t.Errorf("observed line at x %v–%v, the axis puts %v at %v", x1, x2, c.observed, x(c.observed))
			}
			top := panels[0].find("rect", "")
			if y1, y2 := line.num(t, "y1"), line.num(t, "y2"); y1 > bottomOf(t, panels[0]) || y2 < bottomOf(t, panels[len(panels)-1]) || len(top) == 0 {
				t.Errorf("observed line from y %v to %v does not cross every panel", y1, y2)
			}
			checkRates(t, doc, c.rates, cmpOr(c.alpha, 0.05))
		})
	}
}

func cmpOr(a, b float64) float64 {
	if a == 0 {
		return b
	}
	return a
}

// checkPanel checks that a panel's bars count its finite draws, each bar as
// high as its count in the panel's pixels per draw.
func checkPanel(t *testing.T, pg *svgNode, pn NullPanel) {
	t.Helper()
	finite := 0
	for _, v := range pn.Null {
		if !math.IsNaN(v) {
			finite++
		}
	}
	if pg.attr["data-scheme"] != pn.Name || pg.attr["data-draws"] != strconv.Itoa(finite) {
		t.Errorf("panel %q says %s draws, want %q with %d", pg.attr["data-scheme"], pg.attr["data-draws"], pn.Name, finite)
	}
	perDraw := pg.find("g", "bars")[0].num(t, "data-per-draw")
	sum := 0
	for _, bar := range pg.find("g", "bar") {
		c := int(bar.num(t, "data-count"))
		sum += c
		h := bar.find("rect", "")[0].num(t, "height")
		if math.Abs(h-float64(c)*perDraw) > 0.006 {
			t.Errorf("panel %q: a bar of %d draws is %v px high, want %v", pn.Name, c, h, float64(c)*perDraw)
		}
	}
	if sum != finite {
		t.Errorf("panel %q: bars hold %d draws, want %d", pn.Name, sum, finite)
	}
}

// bottomOf is the y of a panel's base line: the bottom of its bars.
func bottomOf(t *testing.T, pg *svgNode) float64 {
	lines := pg.find("line", "")
	return lines[len(lines)-1].num(t, "y1")
}

// checkRates checks one row per rate, unsound ones in the warning colour,
// each point where the rate axis puts its rate, and the level's line.
func checkRates(t *testing.T, doc *svgNode, rates []RateRow, alpha float64) {
	t.Helper()
	rows := doc.find("g", "rate")
	if len(rows) != len(rates) {
		t.Fatalf("%d rate rows for %d rates", len(rows), len(rates))
	}
	if len(rates) == 0 {
		return
	}
	x := axisMap(t, doc.find("g", "rate-axis")[0])
	for k, row := range rows {
		dot := row.find("circle", "")[0]
		want := hex(rateInk)
		if rates[k].Unsound {
			want = hex(warnInk)
		}
		if dot.attr["fill"] != want || row.attr["data-unsound"] != strconv.FormatBool(rates[k].Unsound) {
			t.Errorf("row %q: fill %s, unsound %s", rates[k].Name, dot.attr["fill"], row.attr["data-unsound"])
		}
		if cx := dot.num(t, "cx"); math.Abs(cx-x(100*rates[k].Rate)) > 0.02 {
			t.Errorf("row %q: point at %v, the axis puts %v%% at %v", rates[k].Name, cx, 100*rates[k].Rate, x(100*rates[k].Rate))
		}
	}
	al := doc.find("g", "alpha")[0].find("line", "")[0]
	if ax := al.num(t, "x1"); math.Abs(ax-x(100*alpha)) > 0.02 {
		t.Errorf("level line at %v, the axis puts %v%% at %v", ax, 100*alpha, x(100*alpha))
	}
}

// Every panel shares one set of bins, covering all draws and the observed
// value; the counts add up to the draws.
func TestNullBinsShared(t *testing.T) {
	panels := []NullPanel{{Null: normalNull(1, 2000, 1)}, {Null: normalNull(2, 300, 30)}, {Null: []float64{5, 5, 5}}}
	b, err := binNulls(panels, 200)
	if err != nil {
		t.Fatal(err)
	}
	if b.k < minNullBins || b.k > maxNullBins || b.edge(b.k) < 200-1e-9 || b.lo > -30 {
		t.Fatalf("%d bins from %v to %v", b.k, b.lo, b.edge(b.k))
	}
	for p, counts := range b.counts {
		sum := 0
		for _, c := range counts {
			sum += c
		}
		if sum != len(panels[p].Null) || b.drawn[p] != sum {
			t.Errorf("panel %d: %d counted, %d drawn of %d", p, sum, b.drawn[p], len(panels[p].Null))
		}
	}
	one, err := binNulls([]NullPanel{{Null: []float64{2, 2}}}, 2)
	if err != nil || one.k != minNullBins || one.lo >= 2 || one.edge(one.k) <= 2 {
		t.Fatalf("a single value: %+v, %v", one, err)
	}
}

// The PNG is the same picture: its size is the layout's, and the observed
// line is painted in its colour where the SVG puts it.
func TestNullPanelsPNG(t *testing.T) {
	panels := []NullPanel{{Name: "free", Null: normalNull(1, 999, 10)}, {Name: "spectral surrogates", Null: normalNull(2, 999, 30)}}
	var buf bytes.Buffer
	if err := NullPanels(&buf, PNG, panels, 12, nil, NullOptions{ChartOptions: ChartOptions{Width: 700}}); err != nil {
		t.Fatal(err)
	}
	img := decodePNG(t, buf.Bytes())
	ff, _ := loadFonts()
	bins, _ := binNulls(panels, 12)
	L, _ := layoutNulls(ff, NullOptions{ChartOptions: ChartOptions{Width: 700}}, bins, nil)
	if b := img.Bounds(); b.Dx() != 700 || float64(b.Dy()) != L.h {
		t.Fatalf("PNG %v, layout %v×%v", b, L.w, L.h)
	}
	got := color.RGBAModel.Convert(img.At(int(L.x(12)), int(L.tops[1]+L.panelH/2))).(color.RGBA)
	if got != observedInk {
		t.Errorf("pixel on the observed line is %v, want %v", got, observedInk)
	}
}

func TestNullPanelsRefuse(t *testing.T) {
	ok := []NullPanel{{Name: "free", Null: []float64{1, 2, 3}}}
	cases := []struct {
		name     string
		panels   []NullPanel
		observed float64
		rates    []RateRow
		opt      NullOptions
	}{
		{"no panel", nil, 0, nil, NullOptions{}},
		{"observed NaN", ok, math.NaN(), nil, NullOptions{}},
		{"infinite draw", []NullPanel{{Null: []float64{1, math.Inf(1)}}}, 0, nil, NullOptions{}},
		{"rate outside its interval", ok, 0, []RateRow{{Rate: 0.5, Interval: [2]float64{0.1, 0.2}}}, NullOptions{}},
		{"level 1", ok, 0, nil, NullOptions{Alpha: 1}},
		{"too small", ok, 0, nil, NullOptions{ChartOptions: ChartOptions{Width: 200, Height: 150}}},
	}
	for _, c := range cases {
		if err := NullPanels(io.Discard, SVG, c.panels, c.observed, c.rates, c.opt); err == nil {
			t.Errorf("%s: accepted", c.name)
		}
	}
}
