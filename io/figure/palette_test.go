package figure

import (
	"image/color"
	"math"
	"testing"
)

// Colour-vision deficiencies at full severity as linear-sRGB matrices
// (Machado, Oliveira & Fernandes 2009, IEEE TVCG 15:1291–1298).
var visions = []struct {
	name string
	m    [3][3]float64
}{
	{"normal vision", [3][3]float64{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}},
	{"protanopia", [3][3]float64{{0.152286, 1.052583, -0.204868}, {0.114503, 0.786281, 0.099216}, {-0.003882, -0.048116, 1.051998}}},
	{"deuteranopia", [3][3]float64{{0.367322, 0.860646, -0.227968}, {0.280085, 0.672501, 0.047413}, {-0.011820, 0.042940, 0.968881}}},
	{"tritanopia", [3][3]float64{{1.255528, -0.076749, -0.178779}, {-0.078411, 0.930809, 0.147602}, {0.004733, 0.691367, 0.303900}}},
}

// seen is colour c as OKLab, as someone with vision m sees it.
func seen(c color.RGBA, m [3][3]float64) [3]float64 {
	lin := func(v uint8) float64 {
		f := float64(v) / 255
		if f <= 0.04045 {
			return f / 12.92
		}
		return math.Pow((f+0.055)/1.055, 2.4)
	}
	in := [3]float64{lin(c.R), lin(c.G), lin(c.B)}
	var rgb [3]float64
	for i := range 3 {
		for j := range 3 {
			rgb[i] += m[i][j] * in[j]
		}
		rgb[i] = min(max(rgb[i], 0), 1)
	}
	l := math.Cbrt(0.4122214708*rgb[0] + 0.5363325363*rgb[1] + 0.0514459929*rgb[2])
	mm := math.Cbrt(0.2119034982*rgb[0] + 0.6806995451*rgb[1] + 0.1073969566*rgb[2])
	s := math.Cbrt(0.0883024619*rgb[0] + 0.2817188376*rgb[1] + 0.6299787005*rgb[2])
	return [3]float64{0.2104542553*l + 0.7936177850*mm - 0.0040720468*s,
		1.9779984951*l - 2.4285922050*mm + 0.4505937099*s,
		0.0259040371*l + 0.7827717662*mm - 0.8086757660*s}
}

// The group colours stay at least 0.13 apart from each other, and 0.10
// from the hatching's grey and white (which also differ by their
// pattern), for normal vision and the three dichromacies.
func TestGroupColoursApart(t *testing.T) {
	pal, err := Groups(MaxGroups)
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range visions {
		for a := range pal {
			others := append([]color.RGBA{hatchInk, hatchPaper}, pal[a+1:]...)
			for k, other := range others {
				want := 0.13
				if k < 2 {
					want = 0.10
				}
				x, y := seen(pal[a], v.m), seen(other, v.m)
				d := math.Sqrt((x[0]-y[0])*(x[0]-y[0]) + (x[1]-y[1])*(x[1]-y[1]) + (x[2]-y[2])*(x[2]-y[2]))
				if d < want {
					t.Errorf("%s: %s and %s are %.3f apart in OKLab, want ≥ %g", v.name, hex(pal[a]), hex(other), d, want)
				}
			}
		}
	}
	if _, err := Groups(MaxGroups + 1); err == nil {
		t.Error("Groups(MaxGroups+1) gave no error")
	}
}
