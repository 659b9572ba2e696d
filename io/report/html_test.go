package report

import (
	"bytes"
	"image"
	"image/color"
	"image/png"
	"io"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/weights"
)

// Hostile text as an area id or a column name would bring it.
const (
	hostileID     = `<img src=x onerror=alert(1)>`
	hostileColumn = `</script><script>alert(2)</script>`
)

// inlineSVG passes the drawing elements and refuses anything that could
// run, load or hide something; text stays escaped text.
func TestInlineSVG(t *testing.T) {
	const head = `<?xml version="1.0"?><!-- made here --><svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" width="10" height="10">`
	cases := []struct {
		name, body string
		want       []string // in the output
		refused    string   // in the error; "" for a picture that passes
	}{
		{"shapes", `<defs><pattern id="hatch"><rect width="2" height="2"/></pattern></defs><path d="M0 0h5v5z" fill="url(#hatch)"/>`,
			[]string{`<svg role="img" aria-label="a picture" width="10"`, `<pattern id="x-hatch">`, `fill="url(#x-hatch)"`, `<rect width="2" height="2"/>`}, ""},
		{"escaped tooltip", `<path d="M0 0"><title>&lt;img src=x onerror=alert(1)&gt;: high-high</title></path>`,
			[]string{`<title>&lt;img src=x onerror=alert(1)&gt;: high-high</title>`}, ""},
		{"escaped text with quotes", `<text x="1" y="2">&lt;/script&gt;&lt;script&gt;alert(2)&lt;/script&gt; &amp; &#39;q&#39;</text>`,
			[]string{`&lt;/script&gt;&lt;script&gt;alert(2)&lt;/script&gt; &amp; &#39;q&#39;`}, ""},
		{"own reference", `<use xlink:href="#a"/>`, []string{`<use href="#x-a"/>`}, ""},
		{"embedded image", `<image href="data:image/png;base64,iVBORw0KGgo="/>`, []string{`data:image/png;base64,iVBORw0KGgo=`}, ""},
		{"script", `<script>alert(1)</script>`, nil, "<script> is not allowed"},
		{"handler", `<rect onload="alert(1)"/>`, nil, `"onload"`},
		{"handler in capitals", `<rect ONCLICK="alert(1)"/>`, nil, `"ONCLICK"`},
		{"foreign object", `<foreignObject><div xmlns="http://www.w3.org/1999/xhtml">x</div></foreignObject>`, nil, "<foreignObject>"},
		{"style sheet", `<style>@import url(http://example.org/a.css);</style>`, nil, "<style>"},
		{"link out", `<a href="http://example.org">x</a>`, nil, "<a>"},
		{"image from the web", `<image href="https://example.org/x.png"/>`, nil, "refers to"},
		{"fill from the web", `<rect fill="url(http://example.org/p.svg#a)"/>`, nil, "refers outside"},
		{"style from the web", `<rect style="fill:URL(//example.org/p.svg#a)"/>`, nil, "refers outside"},
		{"code in a value", `<rect style="x:javascript:alert(1)"/>`, nil, "holds code"},
		{"element out of SVG", `<x:b xmlns:x="urn:x"/>`, nil, "namespace"},
		{"unknown entity", `<text>&nbsp;</text>`, nil, "well-formed"},
		{"declaration", `<!DOCTYPE svg>`, nil, "declaration"},
		{"second root", `</svg><svg xmlns="http://www.w3.org/2000/svg">`, nil, "top level"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			got, err := inlineSVG([]byte(head+c.body+"</svg>"), "x-", "a picture")
			switch {
			case c.refused != "" && err == nil:
				t.Fatalf("passed: %s", got)
			case c.refused != "" && !strings.Contains(err.Error(), c.refused):
				t.Fatalf("error %q, want it to say %q", err, c.refused)
			case c.refused != "":
				return
			case err != nil:
				t.Fatal(err)
			}
			for _, w := range c.want {
				if !strings.Contains(string(got), w) {
					t.Errorf("output lacks %s:\n%s", w, got)
				}
			}
			for _, bad := range []string{"<?xml", "<!--", "xmlns", "http:"} {
				if strings.Contains(string(got), bad) {
					t.Errorf("output holds %s:\n%s", bad, got)
				}
			}
		})
	}
}

// hostileCompare is a comparison whose names and ids are hostile.
func hostileCompare() *compare.Result {
	return &compare.Result{Version: "test", Seed: 7,
		Input:     compare.InputInfo{File: hostileID + ".geojson", Areas: 3, Tested: 2, Outcome: hostileColumn, Group: hostileColumn},
		Weights:   weights.Summary{Kind: "queen contiguity", Scaling: "row-standardised", Areas: 2, Islands: 1, IslandIDs: []string{hostileID}},
		Groups:    []compare.GroupResult{{Level: hostileID}, {Level: "b"}},
		Statistic: compare.StatisticInfo{Label: "difference in medians", Observed: 1.5, Contrast: []string{hostileID, "b"}, InOutcomeUnits: true},
		Excluded:  []compare.Exclusion{{Reason: "missing " + hostileColumn, Areas: 1, IDs: []string{hostileID}}},
		Warnings:  []string{"area " + hostileID + " has no neighbour"}, Cautions: compare.Cautions,
		Recommended: compare.Recommendation{Scheme: "free", PValue: 0.25, Reason: "because " + hostileColumn},
	}
}

// A hostile id and column name land in the page as text wherever they
// are shown (headings, cells, captions, attributes, inside an SVG).
func TestHTMLEscapesNames(t *testing.T) {
	drawn := func(w io.Writer, f figure.Format) error {
		geoms := []orb.MultiPolygon{{{{{0, 0}, {1, 0}, {1, 1}, {0, 0}}}}, {{{{1, 0}, {2, 0}, {2, 1}, {1, 0}}}}}
		return figure.CategoryMap(w, f, geoms, []int{0, 1}, figure.LocalCategories(),
			figure.MapOptions{Title: hostileColumn, IDs: []string{hostileID, "b"}, Note: hostileID})
	}
	pic, err := DrawPicture(hostileColumn, hostileID, drawn)
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	doc := HTMLDoc{Result: hostileCompare(), Inputs: []InputFile{{Role: "layer", Name: hostileID, SHA256: "ab"}}, Pictures: []Picture{pic}}
	if err := HTML(&b, doc); err != nil {
		t.Fatal(err)
	}
	page := b.String()
	for _, raw := range []string{"<img", "<script", "</script>"} {
		if strings.Contains(page, raw) {
			t.Errorf("page holds %q unescaped", raw)
		}
	}
	for _, shown := range []string{"&lt;img src=x onerror=alert(1)&gt;", "&lt;/script&gt;&lt;script&gt;alert(2)&lt;/script&gt;"} {
		if n := strings.Count(page, shown); n < 5 {
			t.Errorf("%s shown %d times, want it in the title, tables, warnings and the picture", shown, n)
		}
	}
}

// Each kind of result gives its page; an unknown one is an error.
func TestHTMLPages(t *testing.T) {
	cases := []struct {
		name   string
		result any
		want   []string
	}{
		{"compare", hostileCompare(), []string{"What to read", "Groups", "Areas left out", "Keep in mind", "seed 7"}},
		{"weights", &WeightsDocument{Version: "test", Input: "w.geojson", Weights: weights.Summary{Kind: "queen contiguity", Scaling: "binary",
			Areas: 3, Links: 4, Pairs: 2, MeanNeighbours: 1.33, MinNeighbours: 1, MaxNeighbours: 2, Histogram: []int{0, 2, 1}, Components: 1}},
			[]string{"Neighbours in w.geojson", `<span style="width: 100%">`, `<span style="width: 50%">`, "connected"}},
		{"unknown", 42, nil},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			var b bytes.Buffer
			err := HTML(&b, HTMLDoc{Result: c.result})
			if c.want == nil {
				if err == nil {
					t.Fatal("no error")
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			for _, w := range c.want {
				if !strings.Contains(b.String(), w) {
					t.Errorf("page lacks %q", w)
				}
			}
		})
	}
}

// A picture heavier than MaxInlineSVG as SVG is drawn as PNG instead,
// and lands in the page as a data: URL.
func TestDrawPictureFallsBackToPNG(t *testing.T) {
	heavy := func(w io.Writer, f figure.Format) error {
		if f == figure.SVG {
			_, err := w.Write(make([]byte, MaxInlineSVG+1))
			return err
		}
		img := image.NewRGBA(image.Rect(0, 0, 4, 4))
		img.Set(1, 1, color.Black)
		return png.Encode(w, img)
	}
	pic, err := DrawPicture("big map", "many areas", heavy)
	if err != nil || pic.SVG != nil || pic.PNG == nil {
		t.Fatalf("svg %d bytes, png %d bytes, %v", len(pic.SVG), len(pic.PNG), err)
	}
	var b bytes.Buffer
	if err := HTML(&b, HTMLDoc{Result: hostileCompare(), Pictures: []Picture{pic}}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), `<img src="data:image/png;base64,iVBORw0KGgo`) {
		t.Error("no PNG data: URL in the page")
	}
}
