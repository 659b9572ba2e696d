package figure

import (
	"bytes"
	"image/png"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// chartPath is one path of a chart's SVG (gonum's vgsvg): its style and
// its points, in points with y growing upwards.
type chartPath struct {
	style string
	pts   [][2]float64
	arc   bool // drawn with arcs: a dot
}

var (
	pathTag   = regexp.MustCompile(`<path d="([^"]*)" style="([^"]*)"`)
	pathPoint = regexp.MustCompile(`[ML](-?[\d.e+-]+),(-?[\d.e+-]+)`)
	textTag   = regexp.MustCompile(`<text[^>]*>([^<]*)</text>`)
)

func chartPaths(svg string) []chartPath {
	var out []chartPath
	for _, m := range pathTag.FindAllStringSubmatch(svg, -1) {
		p := chartPath{style: m[2], arc: strings.Contains(m[1], "A")}
		for _, q := range pathPoint.FindAllStringSubmatch(m[1], -1) {
			x, _ := strconv.ParseFloat(q[1], 64)
			y, _ := strconv.ParseFloat(q[2], 64)
			p.pts = append(p.pts, [2]float64{x, y})
		}
		out = append(out, p)
	}
	return out
}

func chartTexts(svg string) []string {
	var out []string
	for _, m := range textTag.FindAllStringSubmatch(svg, -1) {
		out = append(out, m[1])
	}
	return out
}

func upperHex(c [3]uint8) string {
	return strings.ToUpper(hex(rgb(c[0], c[1], c[2])))
}

// The correlogram puts its points where their values are on one linear
// axis, a step apart; the band holds the expected value at every lag; one
// panel per variable.
func TestCorrelogramPositions(t *testing.T) {
	panels := []CorrelogramPanel{
		{Title: "rate", Lags: []LagPoint{
			{"1", 0.52, -0.12, 0.08, -0.02}, {"2", 0.31, -0.10, 0.06, -0.02}, {"3", 0.05, -0.09, 0.05, -0.02}, {"4", -0.11, -0.08, 0.04, -0.02}}},
		{Title: "income", Lags: []LagPoint{{"0–25", 0.2, -0.1, 0.1, -0.01}, {"25–50", -0.05, -0.1, 0.1, -0.01}}},
		{Title: "third", Lags: []LagPoint{{"1", 0.4, -0.2, 0.15, -0.03}}},
	}
	var buf bytes.Buffer
	if err := Correlogram(&buf, SVG, panels, ChartOptions{Title: "correlogram", XLabel: "neighbour order"}); err != nil {
		t.Fatal(err)
	}
	svg := buf.String()
	obs := upperHex([3]uint8{observedInk.R, observedInk.G, observedInk.B})
	band := upperHex([3]uint8{bandFill.R, bandFill.G, bandFill.B})
	guide := upperHex([3]uint8{guideInk.R, guideInk.G, guideInk.B})
	var dots [][2]float64
	var bands, refs []chartPath
	for _, p := range chartPaths(svg) {
		switch {
		case p.arc && strings.HasPrefix(p.style, "fill:"+obs):
			// The path starts at the right end of the circle, one radius
			// from its centre: the same offset for every dot.
			dots = append(dots, p.pts[0])
		case strings.HasPrefix(p.style, "fill:"+band) && len(p.pts) > 4:
			bands = append(bands, p)
		case strings.Contains(p.style, "stroke:"+guide) && strings.Contains(p.style, "dasharray"):
			refs = append(refs, p)
		}
	}
	// The key's dot is the lowest of all (y up); the rest are the lags'.
	low := 0
	for k := range dots {
		if dots[k][1] < dots[low][1] {
			low = k
		}
	}
	dots = append(dots[:low], dots[low+1:]...)
	if len(dots) != 7 {
		t.Fatalf("%d dots, want 7 (4 + 2 + 1 lags)", len(dots))
	}
	if len(refs) != 3 {
		t.Fatalf("%d reference lines, want one per panel", len(refs))
	}
	// Panel 1: x a step apart, y linear in the value, the reference line
	// and the band on the same axis.
	first := panels[0].Lags
	d := dots[:4]
	step := d[1][0] - d[0][0]
	scale := (d[0][1] - d[3][1]) / (first[0].Value - first[3].Value)
	at := func(v float64) float64 { return d[0][1] + (v-first[0].Value)*scale }
	for k, l := range first {
		if math.Abs(d[k][0]-d[0][0]-float64(k)*step) > 0.02 {
			t.Errorf("lag %d at x %.2f, want %.2f", k+1, d[k][0], d[0][0]+float64(k)*step)
		}
		if math.Abs(d[k][1]-at(l.Value)) > 0.02 {
			t.Errorf("lag %d at y %.2f, want %.2f for I = %g", k+1, d[k][1], at(l.Value), l.Value)
		}
		if y := refs[0].pts[k+1][1]; math.Abs(y-at(l.Expected)) > 0.02 {
			t.Errorf("reference line at lag %d: y %.2f, want %.2f", k+1, y, at(l.Expected))
		}
	}
	// Bands of more than four points: panel 1's only (panel 2's has four,
	// as the key's bar has; the single lag of panel 3 has a bar).
	if len(bands) != 1 || len(bands[0].pts) != 2*len(first) {
		t.Fatalf("%d bands of more than four points, want panel 1's of %d", len(bands), 2*len(first))
	}
	b := bands[0].pts
	for k, l := range first {
		hi, lo := b[k][1], b[len(first)*2-1-k][1]
		if math.Abs(hi-at(l.High)) > 0.02 || math.Abs(lo-at(l.Low)) > 0.02 {
			t.Errorf("band at lag %d: %.2f to %.2f, want %.2f to %.2f", k+1, lo, hi, at(l.Low), at(l.High))
		}
		if e := at(l.Expected); e < lo || e > hi {
			t.Errorf("band at lag %d (%.2f to %.2f) leaves out the expected value at %.2f", k+1, lo, hi, e)
		}
	}
	texts := chartTexts(svg)
	for _, s := range []string{"rate", "income", "third", "0–25", "25–50", "neighbour order"} {
		if strings.Count(strings.Join(texts, "\n")+"\n", s+"\n") < 1 {
			t.Errorf("no text %q in %q", s, texts)
		}
	}
}

// Scatter and histogram grids: one titled panel per variable, in the
// order given, row by row.
func TestPanelGrids(t *testing.T) {
	z := []float64{-1.2, -0.4, 0.1, 0.6, 0.9}
	lag := []float64{-0.8, -0.1, 0.2, 0.3, 0.4}
	draws := []float64{-0.2, -0.1, -0.1, 0, 0, 0, 0.05, 0.1, 0.15}
	for _, n := range []int{1, 2, 3, 5} {
		var sp []ScatterPanel
		var hp []HistogramPanel
		for k := range n {
			name := "variable " + strconv.Itoa(k+1)
			sp = append(sp, ScatterPanel{Title: name, Z: z, Lag: lag, Slope: 0.5})
			hp = append(hp, HistogramPanel{Title: name, Draws: draws, Observed: 0.3})
		}
		var s, h bytes.Buffer
		if err := MoranScatterPanels(&s, SVG, sp, ChartOptions{Title: "scatter"}); err != nil {
			t.Fatal(err)
		}
		if err := HistogramPanels(&h, SVG, hp, ChartOptions{Title: "histogram"}); err != nil {
			t.Fatal(err)
		}
		for _, svg := range []string{s.String(), h.String()} {
			texts := strings.Join(chartTexts(svg), "\n")
			for k := range n {
				if c := strings.Count(texts+"\n", "variable "+strconv.Itoa(k+1)+"\n"); c != 1 {
					t.Errorf("%d panels: title %d found %d times", n, k+1, c)
				}
			}
		}
		// Grey dots: one per area in each panel, plus the key's.
		// (Translucent dots come out a shade darker in vgsvg's rounding.)
		grey := upperHex([3]uint8{pointGrey.R, pointGrey.G, pointGrey.B})
		dim := upperHex([3]uint8{pointGrey.R - 1, pointGrey.G - 1, pointGrey.B - 1})
		dots := 0
		for _, p := range chartPaths(s.String()) {
			if p.arc && (strings.HasPrefix(p.style, "fill:"+grey) || strings.HasPrefix(p.style, "fill:"+dim)) {
				dots++
			}
		}
		if dots != n*len(z)+1 {
			t.Errorf("%d panels: %d dots, want %d", n, dots, n*len(z)+1)
		}
	}
	var out bytes.Buffer
	if err := HistogramPanels(&out, PNG, []HistogramPanel{{Title: "a", Draws: draws, Observed: 0.3}, {Title: "b", Draws: draws, Observed: -0.3}}, ChartOptions{}); err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(&out)
	if err != nil {
		t.Fatal(err)
	}
	if w := img.Bounds().Dx(); w != int(2*margin)+2*panelW+int(panelGapPx) {
		t.Errorf("two panels: width %d", w)
	}
	if err := HistogramPanels(&out, SVG, nil, ChartOptions{}); err == nil || !strings.Contains(err.Error(), "1 to 12 panels") {
		t.Errorf("no panels: %v", err)
	}
}
