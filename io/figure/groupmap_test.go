package figure

import (
	"bytes"
	"encoding/xml"
	"image/png"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// svgArea is one area path of an SVG map: its group's fill and the first
// point of its outline, in pixels.
type svgArea struct {
	fill string
	x, y float64
}

// svgText is one text element with its anchor point.
type svgText struct {
	s    string
	x, y float64
}

var firstPoint = regexp.MustCompile(`^M([\d.]+) ([\d.]+)`)

func attr(e xml.StartElement, name string) string {
	for _, a := range e.Attr {
		if a.Name.Local == name {
			return a.Value
		}
	}
	return ""
}

func attrNum(e xml.StartElement, name string) float64 {
	v, _ := strconv.ParseFloat(attr(e, name), 64)
	return v
}

// areaOf reads the first point of an area's path, drawn with fill; a
// path not written as maps write theirs (a chart's) is at NaN.
func areaOf(e xml.StartElement, fill string) svgArea {
	m := firstPoint.FindStringSubmatch(attr(e, "d"))
	if m == nil {
		return svgArea{fill: fill, x: math.NaN(), y: math.NaN()}
	}
	x, _ := strconv.ParseFloat(m[1], 64)
	y, _ := strconv.ParseFloat(m[2], 64)
	return svgArea{fill: fill, x: x, y: y}
}

// degreeGrid is cols×rows squares of one degree from (10°E, 50°N), area
// i at column i%cols, row i/cols.
func degreeGrid(cols, rows int) []orb.MultiPolygon {
	var g []orb.MultiPolygon
	for i := range cols * rows {
		g = append(g, square(10+float64(i%cols), 50+float64(i/cols), 1))
	}
	return g
}

func TestGroupOutcomeMap(t *testing.T) {
	geoms := degreeGrid(5, 4)
	n := len(geoms)
	d := GroupsAndOutcome{Geoms: geoms, Group: make([]int, n), Levels: []string{"yes", "no", "maybe <x>"},
		GroupName: "policy", OutcomeName: "rate", Outcome: make([]float64, n), Classes: Quantile, K: 5}
	leftOut := map[int]bool{4: true, 9: true, 13: true}
	size := make([]int, 3)
	for i := range n {
		d.Outcome[i] = float64(i * i)
		if leftOut[i] {
			d.Group[i] = -1
			continue
		}
		d.Group[i] = i % 3
		size[i%3]++
	}
	var buf bytes.Buffer
	if err := GroupOutcomeMap(&buf, SVG, d, MapOptions{Title: "rate by policy", LonLat: true, Note: "note"}); err != nil {
		t.Fatal(err)
	}
	doc := readSVG(t, buf.Bytes())
	areas, texts := doc.areas, doc.placed
	width := 1400.0
	pal, _ := Groups(3)
	seq, _ := Sequential(5)
	type count struct{ left, right map[string]int }
	c := count{map[string]int{}, map[string]int{}}
	for _, a := range areas {
		if a.x < width/2 {
			c.left[a.fill]++
		} else {
			c.right[a.fill]++
		}
	}
	hatch := "url(#" + hatchID + ")"
	for _, side := range []map[string]int{c.left, c.right} {
		total := 0
		for _, v := range side {
			total += v
		}
		if total != n {
			t.Errorf("%d area paths in a map of %d areas: %v", total, n, side)
		}
		if side[hatch] != len(leftOut) {
			t.Errorf("%d hatched areas, want the %d left out", side[hatch], len(leftOut))
		}
	}
	for g, col := range pal {
		if c.left[hex(col)] != size[g] {
			t.Errorf("group %d: %d areas drawn in %s, want %d", g, c.left[hex(col)], hex(col), size[g])
		}
	}
	right := 0
	for _, col := range seq {
		right += c.right[hex(col)]
	}
	if right != n-len(leftOut) {
		t.Errorf("%d areas in the outcome's classes, want %d", right, n-len(leftOut))
	}
	// Each legend, under its own map, counts its entries; both count the
	// areas left out.
	has := func(s string, left bool) bool {
		for _, tx := range texts {
			if tx.s == s && (tx.x < width/2) == left {
				return true
			}
		}
		return false
	}
	for g, l := range d.Levels {
		if !has(l, true) || !has(strconv.Itoa(size[g]), true) {
			t.Errorf("the groups' legend lacks %q with its count %d", l, size[g])
		}
	}
	for _, left := range []bool{true, false} {
		if !has("left out", left) || !has("3", left) {
			t.Errorf("legend (left %v) lacks \"left out\" with 3 areas", left)
		}
	}
	if !has("policy", true) || !has("rate", false) || !has("5 classes, quantiles", false) {
		t.Errorf("legend headings missing: %v", texts)
	}
	// Same frame: the two maps' first areas are one panel width apart,
	// at the same height.
	var firstL, firstR *svgArea
	for k := range areas {
		if areas[k].x < width/2 && firstL == nil && areas[k].fill == hex(pal[0]) {
			firstL = &areas[k]
		}
	}
	if firstL == nil {
		t.Fatal("no area of the first group")
	}
	for k := range areas {
		if areas[k].x >= width/2 && areas[k].y == firstL.y && firstR == nil {
			firstR = &areas[k]
		}
	}
	if firstR == nil {
		t.Error("no area of the outcome map at the height of the groups' first")
	}
}

func TestGroupOutcomeMapPNG(t *testing.T) {
	geoms := degreeGrid(3, 2)
	d := GroupsAndOutcome{Geoms: geoms, Group: []int{0, 1, 0, -1, 1, 0}, Levels: []string{"a", "b"},
		GroupName: "g", OutcomeName: "y", Outcome: []float64{1, 2, 3, 4, 5, 6}, Classes: Quantile, K: 5}
	var buf bytes.Buffer
	if err := GroupOutcomeMap(&buf, PNG, d, MapOptions{Width: 900}); err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if w := img.Bounds().Dx(); w != 900 {
		t.Fatalf("width %d", w)
	}
	pal, _ := Groups(2)
	found := map[string]bool{}
	for y := 0; y < img.Bounds().Dy(); y += 3 {
		for x := 0; x < 450; x += 3 {
			r, g, b, _ := img.At(x, y).RGBA()
			for _, c := range pal {
				if uint8(r>>8) == c.R && uint8(g>>8) == c.G && uint8(b>>8) == c.B {
					found[hex(c)] = true
				}
			}
		}
	}
	if len(found) != 2 {
		t.Errorf("the left half shows %d of the 2 group colours", len(found))
	}
}

func TestGroupOutcomeMapErrors(t *testing.T) {
	geoms := degreeGrid(3, 3)
	many := make([]string, MaxGroups+1)
	for i := range many {
		many[i] = strconv.Itoa(i)
	}
	nine := []int{0, 1, 2, 3, 4, 5, 6, 7, 8}
	for _, c := range []struct {
		name string
		d    GroupsAndOutcome
		msg  string
	}{
		{"too many groups", GroupsAndOutcome{Geoms: geoms, Group: nine, Levels: many, Outcome: make([]float64, 9), K: 5}, "1 to 8 groups"},
		{"no outcome", GroupsAndOutcome{Geoms: geoms, Group: make([]int, 9), Levels: []string{"a"}, Outcome: []float64{math.NaN(), 1, 2, 3, 4, 5, 6, 7, 8}, K: 5}, "needs an outcome"},
		{"bad group", GroupsAndOutcome{Geoms: geoms, Group: nine, Levels: []string{"a"}, Outcome: make([]float64, 9), K: 5}, "category 1"},
	} {
		err := GroupOutcomeMap(io.Discard, SVG, c.d, MapOptions{})
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%s: error %v, want one with %q", c.name, err, c.msg)
		}
	}
}
