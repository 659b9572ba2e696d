package figure

import (
	"bytes"
	"encoding/xml"
	"image/color"
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// isletCase is a made-up layer in the shape of a county layer that once
// made a map panic: a grid of areas, some without a value, where areas of
// several parts — with a value and without — have small separate parts a
// pixel or two across out at sea.
type isletCase struct {
	name    string
	geoms   []orb.MultiPolygon
	missing []bool
	// width and height of the picture: chosen so that both kinds of map
	// draw the layer at about the same scale.
	width, height int
	// markers is the number of tiny isolated parts (a hand count from the
	// layout below), hatched the number of those in areas without a value.
	markers, hatched int
}

// addPart appends a square part to area i.
func addPart(g []orb.MultiPolygon, i int, x, y, side float64) {
	g[i] = append(g[i], square(x, y, side)[0])
}

// gridLayer is n×n squares of the given side; area i is at column i%n,
// row i/n. missingAt picks the areas without a value.
func gridLayer(n int, side float64, missingAt func(i int) bool) ([]orb.MultiPolygon, []bool) {
	g := make([]orb.MultiPolygon, 0, n*n)
	miss := make([]bool, 0, n*n)
	for i := range n * n {
		g = append(g, square(float64(i%n)*side, float64(i/n)*side, side))
		miss = append(miss, missingAt(i))
	}
	return g, miss
}

func isletCases() []isletCase {
	// Nine large areas, 10 units a side, drawn about 12 pixels a unit:
	// areas are outlined and only tiny isolated parts are looked at.
	big, bigMiss := gridLayer(3, 10, func(i int) bool { return i == 2 || i == 4 || i == 7 })
	addPart(big, 2, 35, 5, 0.2)     // islet of an area without a value
	addPart(big, 2, 35, 1, 0.2)     // a second one
	addPart(big, 7, 15, 36, 0.2)    // another area without a value
	addPart(big, 7, 30.05, 25, 0.2) // beside area 8: not isolated, no marker
	addPart(big, 0, 38, 38, 0.2)    // islet of an area with a value
	big = append(big, square(38, 20, 0.2), square(33, 33, 3))
	bigMiss = append(bigMiss, true, true) // a lone islet; an island and …
	addPart(big, 10, 36.5, 34, 0.2)       // … its islet, near only its own island

	// 6,400 small areas, about 4 pixels across (the legend goes under the
	// map in a 400×600 picture): outlined in their own colour, so every isolated part is looked at and islands get a rim.
	small, smallMiss := gridLayer(80, 1, func(i int) bool { return i%7 == 3 })
	addPart(small, 3, 85, 2, 0.3)  // areas 3, 10 and 17 have no value
	addPart(small, 3, 85, 10, 0.3) //
	addPart(small, 10, 88, 20, 0.3)
	addPart(small, 17, 80.1, 5, 0.3) // beside area 479: no marker
	addPart(small, 0, 85, 40, 0.3)   // area 0 has a value
	addPart(small, 10, 84, 70, 4)    // an island, not tiny: rimmed, no marker
	small = append(small, square(88, 60, 0.3))
	smallMiss = append(smallMiss, true)
	none := make([]bool, len(big))
	for i := range none {
		none[i] = true
	}
	return []isletCase{
		{"outlined areas", big, bigMiss, 800, 0, 6, 5},
		{"no area with a value", big, none, 800, 0, 6, 6},
		{"areas in their own colour", small, smallMiss, 400, 600, 5, 4},
	}
}

// svgCircle is a marker read back from an SVG.
type svgCircle struct {
	CX   float64 `xml:"cx,attr"`
	CY   float64 `xml:"cy,attr"`
	Fill string  `xml:"fill,attr"`
}

func readCircles(t *testing.T, data []byte) []svgCircle {
	t.Helper()
	var doc struct {
		Circles []svgCircle `xml:"circle"`
	}
	if err := xml.Unmarshal(data, &doc); err != nil {
		t.Fatal(err)
	}
	return doc.Circles
}

// Islets of areas with and without a value, in areas of several parts,
// are marked in both kinds of map and both formats: the SVG has one disc
// per tiny isolated part, hatched for areas without a value, and the PNG
// shows each disc's fill at its centre.
func TestIsletsOfAreasWithoutValue(t *testing.T) {
	legend := LocalCategories()
	for _, c := range isletCases() {
		cats, values := make([]int, len(c.geoms)), make([]float64, len(c.geoms))
		for i := range c.geoms {
			cats[i], values[i] = i%len(legend), float64(i%13)
			if c.missing[i] {
				cats[i] = -1
			}
		}
		draws := map[string]func(f Format) ([]byte, error){
			"category map": func(f Format) ([]byte, error) {
				var buf bytes.Buffer
				err := CategoryMap(&buf, f, c.geoms, cats, legend, MapOptions{Width: c.width, Height: c.height})
				return buf.Bytes(), err
			},
			"choropleth": func(f Format) ([]byte, error) {
				var buf bytes.Buffer
				err := Choropleth(&buf, f, c.geoms, values, c.missing, Quantile, 5, "v", MapOptions{Width: c.width, Height: c.height})
				return buf.Bytes(), err
			},
		}
		for kind, draw := range draws {
			name := c.name + ", " + kind
			svg, err := draw(SVG)
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			png, err := draw(PNG)
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			circles := readCircles(t, svg)
			hatched := 0
			for _, ci := range circles {
				if ci.Fill == "url(#"+hatchID+")" {
					hatched++
				}
			}
			if len(circles) != c.markers || hatched != c.hatched {
				t.Errorf("%s: %d markers, %d hatched; want %d and %d", name, len(circles), hatched, c.markers, c.hatched)
			}
			checkMarkerPixels(t, name, png, circles)
		}
	}
}

// checkMarkerPixels checks that the pixel under each marker's centre has
// the marker's fill: its colour, or the hatching at that pixel.
func checkMarkerPixels(t *testing.T, name string, png []byte, circles []svgCircle) {
	t.Helper()
	img := decodePNG(t, png)
	for _, ci := range circles {
		x, y := int(math.Floor(ci.CX)), int(math.Floor(ci.CY))
		got := color.RGBAModel.Convert(img.At(x, y)).(color.RGBA)
		want := hex(hatchAt(x, y))
		if ci.Fill != "url(#"+hatchID+")" {
			want = ci.Fill
		}
		if hex(got) != want {
			t.Errorf("%s: pixel (%d, %d) under a marker is %s, want %s", name, x, y, hex(got), want)
		}
	}
}
