package figure

import (
	"bytes"
	"encoding/xml"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
)

func demoLayer(t *testing.T) *layer.Layer {
	t.Helper()
	lay, _, err := geojson.ReadFile("../../samples/region.geojson", geojson.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return lay
}

// svgDoc is what the tests read back from an SVG: the paths drawn as
// areas (inside a group, not in the pattern definitions), the texts, the
// circles, and the size; areas and placed give the area paths with their
// group's fill and first point, and the texts with their anchors.
type svgDoc struct {
	width, height string
	areaPaths     int
	tips          int
	circles       int
	texts         []string
	areas         []svgArea
	placed        []svgText
}

// readSVG decodes the whole document with encoding/xml, failing the test
// on anything that is not well-formed.
func readSVG(t *testing.T, data []byte) svgDoc {
	t.Helper()
	var doc svgDoc
	dec := xml.NewDecoder(bytes.NewReader(data))
	var stack, fills []string // the open elements, and the fill of each open group
	var inText bool
	var text strings.Builder
	var at svgText
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("SVG not well-formed: %v", err)
		}
		switch e := tok.(type) {
		case xml.StartElement:
			switch e.Name.Local {
			case "svg":
				for _, a := range e.Attr {
					switch a.Name.Local {
					case "width":
						doc.width = a.Value
					case "height":
						doc.height = a.Value
					}
				}
			case "path":
				if len(stack) > 0 && stack[len(stack)-1] == "g" {
					doc.areaPaths++
					doc.areas = append(doc.areas, areaOf(e, fills[len(fills)-1]))
				}
			case "title":
				doc.tips++
			case "circle":
				doc.circles++
			case "text":
				inText = true
				text.Reset()
				at = svgText{x: attrNum(e, "x"), y: attrNum(e, "y")}
			}
			stack = append(stack, e.Name.Local)
			fills = append(fills, attr(e, "fill"))
		case xml.EndElement:
			stack, fills = stack[:len(stack)-1], fills[:len(fills)-1]
			if e.Name.Local == "text" {
				doc.texts = append(doc.texts, text.String())
				at.s = text.String()
				doc.placed = append(doc.placed, at)
				inText = false
			}
		case xml.CharData:
			if inText {
				text.Write(e)
			}
		}
	}
	if len(stack) != 0 {
		t.Fatalf("SVG ends inside %v", stack)
	}
	return doc
}

func hasText(doc svgDoc, s string) bool {
	for _, t := range doc.texts {
		if t == s {
			return true
		}
	}
	return false
}

func TestChoroplethSVG(t *testing.T) {
	lay := demoLayer(t)
	rate, _ := lay.Column("rate")
	var buf bytes.Buffer
	err := Choropleth(&buf, SVG, lay.Geoms, rate.Num, rate.Missing, NaturalBreaks, 5, "rate & <risk>", MapOptions{
		Title: "Rate", Subtitle: "by district", LonLat: true, Note: "invented data", IDs: lay.IDs,
	})
	if err != nil {
		t.Fatal(err)
	}
	doc := readSVG(t, buf.Bytes())
	if doc.areaPaths != lay.Len() {
		t.Errorf("%d area paths for %d areas", doc.areaPaths, lay.Len())
	}
	if doc.tips != lay.Len() {
		t.Errorf("%d tooltips for %d areas", doc.tips, lay.Len())
	}
	if doc.width != "1000" {
		t.Errorf("width %q, want the default 1000", doc.width)
	}
	breaks, _ := Breaks(rate.Num, NaturalBreaks, 5)
	if len(breaks) != 5 {
		t.Fatalf("breaks %v", breaks)
	}
	// One legend entry per class, its label the range of the class's
	// values, then "no data" with the count of missing rates (2).
	lo, hi := make([]float64, 5), make([]float64, 5)
	for j := range lo {
		lo[j], hi[j] = math.Inf(1), math.Inf(-1)
	}
	for i, v := range rate.Num {
		if !rate.Missing[i] {
			j := classOf(breaks, v)
			lo[j], hi[j] = math.Min(lo[j], v), math.Max(hi[j], v)
		}
	}
	for _, l := range rangeLabels(lo, hi) {
		if !hasText(doc, l) {
			t.Errorf("no legend entry %q in %q", l, doc.texts)
		}
	}
	for _, s := range []string{"no data", "2", "rate & <risk>", "5 classes, natural breaks", "Rate", "by district", "invented data", "areas"} {
		if !hasText(doc, s) {
			t.Errorf("no text %q in %q", s, doc.texts)
		}
	}
	if !strings.Contains(buf.String(), `fill="url(#areatest-no-data)"`) {
		t.Error("missing areas are not hatched")
	}
	if c := strings.Count(buf.String(), `fill-rule="evenodd"`); c < 5 {
		t.Errorf("%d groups fill by the even-odd rule", c)
	}
}

func TestCategoryMapSVG(t *testing.T) {
	lay := demoLayer(t)
	cats := make([]int, lay.Len())
	for i := range cats {
		cats[i] = i % 5
	}
	cats[7] = -1
	var buf bytes.Buffer
	if err := CategoryMap(&buf, SVG, lay.Geoms, cats, LocalCategories(), MapOptions{LonLat: true, LegendTitle: "pattern"}); err != nil {
		t.Fatal(err)
	}
	doc := readSVG(t, buf.Bytes())
	if doc.areaPaths != lay.Len() {
		t.Errorf("%d area paths for %d areas", doc.areaPaths, lay.Len())
	}
	for _, c := range LocalCategories() {
		if !hasText(doc, c.Name) {
			t.Errorf("no legend entry %q", c.Name)
		}
	}
	if !hasText(doc, "no data") || !hasText(doc, "pattern") || !hasText(doc, "40") {
		t.Errorf("legend texts %q", doc.texts)
	}
}

func TestCategoryMapErrors(t *testing.T) {
	g := []orb.MultiPolygon{square(0, 0, 1)}
	for _, c := range []struct {
		cats   []int
		legend []Category
		msg    string
	}{
		{[]int{5}, LocalCategories(), "category 5"},
		{[]int{-2}, LocalCategories(), "category -2"},
		{[]int{0, 0}, LocalCategories(), "2 categories for 1 areas"},
		{[]int{0}, nil, "needs a legend"},
	} {
		err := CategoryMap(io.Discard, SVG, g, c.cats, c.legend, MapOptions{})
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("cats %v: %v; want %q", c.cats, err, c.msg)
		}
	}
	if err := CategoryMap(io.Discard, Format(7), g, []int{0}, LocalCategories(), MapOptions{}); err == nil {
		t.Error("unknown format accepted")
	}
	if err := CategoryMap(io.Discard, SVG, g, []int{0}, LocalCategories(), MapOptions{Width: 120, Height: 90}); err == nil {
		t.Error("a picture too small for its legend was drawn")
	}
	bad := []orb.MultiPolygon{{{{{0, 0}, {math.NaN(), 0}, {1, 1}, {0, 0}}}}}
	if err := CategoryMap(io.Discard, PNG, bad, []int{0}, LocalCategories(), MapOptions{}); err == nil || !strings.Contains(err.Error(), "area 1") {
		t.Errorf("NaN coordinate: %v", err)
	}
	if err := CategoryMap(io.Discard, PNG, []orb.MultiPolygon{square(0, 0, 400)}, []int{0}, LocalCategories(), MapOptions{LonLat: true}); err == nil || !strings.Contains(err.Error(), "not longitude/latitude") {
		t.Errorf("projected layer drawn as lon/lat: %v", err)
	}
}

func square(x, y, s float64) orb.MultiPolygon {
	return orb.MultiPolygon{{{{x, y}, {x + s, y}, {x + s, y + s}, {x, y + s}, {x, y}}}}
}

func decodePNG(t *testing.T, data []byte) image.Image {
	t.Helper()
	img, err := png.Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatalf("PNG does not decode: %v", err)
	}
	return img
}

func TestPNGSizes(t *testing.T) {
	lay := demoLayer(t)
	rate, _ := lay.Column("rate")
	for _, c := range []struct{ w, h int }{{640, 480}, {1200, 0}, {0, 500}, {0, 0}} {
		var buf bytes.Buffer
		if err := Choropleth(&buf, PNG, lay.Geoms, rate.Num, rate.Missing, Quantile, 4, "rate", MapOptions{Width: c.w, Height: c.h, LonLat: true, Title: "Rate"}); err != nil {
			t.Fatal(err)
		}
		b := decodePNG(t, buf.Bytes()).Bounds()
		if (c.w > 0 && b.Dx() != c.w) || (c.h > 0 && b.Dy() != c.h) || b.Dx() < 300 || b.Dy() < 200 {
			t.Errorf("asked %d×%d, got %d×%d", c.w, c.h, b.Dx(), b.Dy())
		}
		if c.w == 0 && c.h == 0 && b.Dx() != defaultWidth {
			t.Errorf("default width %d", b.Dx())
		}
	}
}

// colourBox returns the box of the largest patch of pixels of exactly
// colour c that contains the longest horizontal run of them — the map's
// shape, not its legend swatch.
func colourBox(img image.Image, c color.RGBA) image.Rectangle {
	b := img.Bounds()
	is := func(x, y int) bool {
		return image.Pt(x, y).In(b) && color.RGBAModel.Convert(img.At(x, y)).(color.RGBA) == c
	}
	var seed image.Point
	best := 0
	for y := b.Min.Y; y < b.Max.Y; y++ {
		run := 0
		for x := b.Min.X; x < b.Max.X; x++ {
			if is(x, y) {
				run++
				if run > best {
					best, seed = run, image.Pt(x, y)
				}
			} else {
				run = 0
			}
		}
	}
	if best == 0 {
		return image.Rectangle{}
	}
	seen := map[image.Point]bool{seed: true}
	queue := []image.Point{seed}
	r := image.Rectangle{Min: seed, Max: seed.Add(image.Pt(1, 1))}
	for len(queue) > 0 {
		p := queue[0]
		queue = queue[1:]
		r = r.Union(image.Rectangle{Min: p, Max: p.Add(image.Pt(1, 1))})
		for _, d := range []image.Point{{1, 0}, {-1, 0}, {0, 1}, {0, -1}} {
			q := p.Add(d)
			if !seen[q] && is(q.X, q.Y) {
				seen[q] = true
				queue = append(queue, q)
			}
		}
	}
	return r
}

// A square of 1° × 1° centred on 60°N is half as wide as it is tall on the
// ground (cos 60° = 0.5, common knowledge, no source), and so on the map.
func TestProjectionAt60North(t *testing.T) {
	g := []orb.MultiPolygon{square(10, 59.5, 1)}
	p, err := newProjector(g, true)
	if err != nil {
		t.Fatal(err)
	}
	x0, y0 := p.xy(orb.Point{10, 59.5})
	x1, y1 := p.xy(orb.Point{11, 60.5})
	if r := (x1 - x0) / (y1 - y0); math.Abs(r-0.5) > 1e-3 {
		t.Errorf("projected width/height %v, want 0.5", r)
	}
	// Equal area: a 1° square at 60°N has half the area of one at the
	// equator, in any single projection.
	p2, _ := newProjector([]orb.MultiPolygon{square(10, -0.5, 1), square(10, 59.5, 1)}, true)
	area := func(lat float64) float64 {
		ax, ay := p2.xy(orb.Point{10, lat})
		bx, by := p2.xy(orb.Point{11, lat + 1})
		return (bx - ax) * (by - ay)
	}
	want := (math.Sin(60.5*math.Pi/180) - math.Sin(59.5*math.Pi/180)) / (2 * math.Sin(0.5*math.Pi/180))
	if r := area(59.5) / area(-0.5); math.Abs(r-want) > 1e-9 || math.Abs(r-0.5) > 1e-3 {
		t.Errorf("area ratio %v, want %v ≈ 0.5", r, want)
	}
	// On the drawn map.
	var buf bytes.Buffer
	if err := Choropleth(&buf, PNG, g, []float64{1}, nil, Quantile, 5, "v", MapOptions{LonLat: true, Width: 800, Height: 700}); err != nil {
		t.Fatal(err)
	}
	box := colourBox(decodePNG(t, buf.Bytes()), rampColor(0.5))
	if r := float64(box.Dx()) / float64(box.Dy()); math.Abs(r-0.5) > 0.02 {
		t.Errorf("drawn square %v: width/height %v, want 0.5", box, r)
	}
	// Without LonLat the coordinates are planar and the square stays square.
	buf.Reset()
	if err := Choropleth(&buf, PNG, g, []float64{1}, nil, Quantile, 5, "v", MapOptions{Width: 800, Height: 700}); err != nil {
		t.Fatal(err)
	}
	box = colourBox(decodePNG(t, buf.Bytes()), rampColor(0.5))
	if r := float64(box.Dx()) / float64(box.Dy()); math.Abs(r-1) > 0.02 {
		t.Errorf("planar square %v: width/height %v, want 1", box, r)
	}
}

func TestProjectionAcrossTheAntimeridian(t *testing.T) {
	g := []orb.MultiPolygon{
		{{{{179, -0.5}, {180, -0.5}, {180, 0.5}, {179, 0.5}, {179, -0.5}}}},
		{{{{-180, -0.5}, {-179, -0.5}, {-179, 0.5}, {-180, 0.5}, {-180, -0.5}}}},
	}
	p, _ := newProjector(g, true)
	xa, _ := p.xy(orb.Point{179, 0})
	xb, _ := p.xy(orb.Point{-179, 0})
	if d := (xb - xa) * 180 / math.Pi; math.Abs(d-2) > 1e-9 {
		t.Errorf("179°E to 179°W is %v degrees wide on the map, want 2", d)
	}
}

// Holes show: the middle of a square with a square hole is background,
// whichever way the hole's ring runs; the frame around it is filled.
func TestHolesInPNG(t *testing.T) {
	outer := orb.Ring{{0, 0}, {10, 0}, {10, 10}, {0, 10}, {0, 0}}
	for _, hole := range []orb.Ring{
		{{3, 3}, {3, 7}, {7, 7}, {7, 3}, {3, 3}}, // clockwise, as RFC 7946 asks
		{{3, 3}, {7, 3}, {7, 7}, {3, 7}, {3, 3}}, // the same way as the exterior
	} {
		g := []orb.MultiPolygon{{{outer, hole}}}
		var buf bytes.Buffer
		if err := Choropleth(&buf, PNG, g, []float64{1}, nil, Quantile, 5, "v", MapOptions{Width: 600, Height: 500}); err != nil {
			t.Fatal(err)
		}
		img := decodePNG(t, buf.Bytes())
		fill := rampColor(0.5)
		box := colourBox(img, fill)
		cx, cy := (box.Min.X+box.Max.X)/2, (box.Min.Y+box.Max.Y)/2
		if got := color.RGBAModel.Convert(img.At(cx, cy)).(color.RGBA); got != white {
			t.Errorf("middle of the hole is %v, want the white page", got)
		}
		if got := color.RGBAModel.Convert(img.At(box.Min.X+box.Dx()/8, cy)).(color.RGBA); got != fill {
			t.Errorf("frame around the hole is %v, want %v", got, fill)
		}
	}
}

// An islet a fraction of a pixel across, far from everything, gets a
// marker; the same islet inside a tiling of neighbours does not need one.
func TestTinyIsletsGetAMarker(t *testing.T) {
	g := []orb.MultiPolygon{square(0, 0, 100), square(150, 50, 0.05)}
	var buf bytes.Buffer
	if err := CategoryMap(&buf, SVG, g, []int{0, 1}, LocalCategories(), MapOptions{Width: 800}); err != nil {
		t.Fatal(err)
	}
	if doc := readSVG(t, buf.Bytes()); doc.circles != 1 || doc.areaPaths != 2 {
		t.Errorf("%d markers and %d area paths, want 1 and 2", doc.circles, doc.areaPaths)
	}
	buf.Reset()
	if err := CategoryMap(&buf, PNG, g, []int{0, LowLow}, LocalCategories(), MapOptions{Width: 800}); err != nil {
		t.Fatal(err)
	}
	img := decodePNG(t, buf.Bytes())
	if box := colourBox(img, LocalCategories()[LowLow].Color); box.Dx() < 3 || box.Dy() < 3 {
		t.Errorf("the islet's colour covers only %v", box)
	}
	// A tiny area beside a big one is not isolated.
	g[1] = square(100, 50, 0.05)
	buf.Reset()
	if err := CategoryMap(&buf, SVG, g, []int{0, 1}, LocalCategories(), MapOptions{Width: 800}); err != nil {
		t.Fatal(err)
	}
	if doc := readSVG(t, buf.Bytes()); doc.circles != 0 {
		t.Errorf("%d markers for an area with a neighbour", doc.circles)
	}
	// An isolated islet without data gets a hatched marker.
	g[1] = square(150, 50, 0.05)
	buf.Reset()
	if err := CategoryMap(&buf, SVG, g, []int{0, -1}, LocalCategories(), MapOptions{Width: 800}); err != nil {
		t.Fatal(err)
	}
	if doc := readSVG(t, buf.Bytes()); doc.circles != 1 || !bytes.Contains(buf.Bytes(), []byte(`<circle cx="`)) || !bytes.Contains(buf.Bytes(), []byte(`fill="url(#`+hatchID+`)" stroke="#2b2b2b"`)) {
		t.Errorf("%d markers for an islet without data, want 1, hatched", doc.circles)
	}
}

func TestChoroplethEdgeCases(t *testing.T) {
	g := []orb.MultiPolygon{square(0, 0, 1), square(1, 0, 1), square(2, 0, 1)}
	// All missing: only "no data" in the legend.
	var buf bytes.Buffer
	if err := Choropleth(&buf, SVG, g, []float64{math.NaN(), 1, 2}, []bool{false, true, true}, NaturalBreaks, 5, "v", MapOptions{}); err != nil {
		t.Fatal(err)
	}
	if doc := readSVG(t, buf.Bytes()); !hasText(doc, "no data") || !hasText(doc, "3") || !hasText(doc, "no values") {
		t.Errorf("texts %q", doc.texts)
	}
	for _, c := range []struct {
		vals []float64
		miss []bool
		k    int
		msg  string
	}{
		{[]float64{1, 2}, nil, 5, "2 values for 3 areas"},
		{[]float64{1, 2, 3}, []bool{false}, 5, "1 missing flags"},
		{[]float64{1, math.Inf(-1), 3}, nil, 5, "area 2 has an infinite value"},
		{[]float64{1, 2, 3}, nil, 12, "between 2 and 9"},
	} {
		err := Choropleth(io.Discard, SVG, g, c.vals, c.miss, Quantile, c.k, "v", MapOptions{})
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%v: %v; want %q", c.vals, err, c.msg)
		}
	}
	if err := Choropleth(io.Discard, SVG, g, []float64{1, 2, 3}, nil, Quantile, 3, "v", MapOptions{IDs: []string{"a"}}); err == nil {
		t.Error("ids of the wrong length accepted")
	}
	if err := Choropleth(io.Discard, SVG, []orb.MultiPolygon{{}}, []float64{1}, nil, Quantile, 3, "v", MapOptions{}); err == nil {
		t.Error("an area without polygons was drawn")
	}
}

// Nothing is cut off: every text of the demo maps starts and ends inside
// the picture, at the default size and at a cramped one.
func TestTextStaysInside(t *testing.T) {
	lay := demoLayer(t)
	rate, _ := lay.Column("rate")
	ff, err := loadFonts()
	if err != nil {
		t.Fatal(err)
	}
	long := "A rather long title that will have to wrap onto a second line at the smaller size of picture"
	for _, w := range []int{0, 560} {
		var buf bytes.Buffer
		err := Choropleth(&buf, SVG, lay.Geoms, rate.Num, rate.Missing, NaturalBreaks, 7, "rate per 100,000 inhabitants a year", MapOptions{
			Width: w, Title: long, Subtitle: long, Note: long + ". " + long, LonLat: true,
		})
		if err != nil {
			t.Fatal(err)
		}
		checkTextInside(t, buf.Bytes(), ff)
	}
}

func checkTextInside(t *testing.T, data []byte, ff *fontFaces) {
	t.Helper()
	type textEl struct {
		X      float64 `xml:"x,attr"`
		Y      float64 `xml:"y,attr"`
		Size   float64 `xml:"font-size,attr"`
		Anchor string  `xml:"text-anchor,attr"`
		Weight string  `xml:"font-weight,attr"`
		Body   string  `xml:",chardata"`
	}
	var doc struct {
		W     float64  `xml:"width,attr"`
		H     float64  `xml:"height,attr"`
		Texts []textEl `xml:"text"`
	}
	if err := xml.Unmarshal(data, &doc); err != nil {
		t.Fatal(err)
	}
	for _, e := range doc.Texts {
		w := ff.width(e.Weight == "bold", e.Size, e.Body)
		x0 := e.X
		switch e.Anchor {
		case "middle":
			x0 -= w / 2
		case "end":
			x0 -= w
		}
		if x0 < 0 || x0+w > doc.W || e.Y-e.Size < 0 || e.Y > doc.H {
			t.Errorf("text %q at (%v, %v), %v wide, leaves the %v×%v picture", e.Body, e.X, e.Y, w, doc.W, doc.H)
		}
	}
}
