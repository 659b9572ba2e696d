package figure

import (
	"fmt"
	"image/color"
	"math"
)

// Category is one entry of a category map's legend. Color is painted
// opaque: its alpha is ignored, so overlapping outlines cannot change a
// category's look.
type Category struct {
	Name  string
	Color color.RGBA
}

// Indices of the categories LocalCategories returns, in legend order.
const (
	HighHigh = iota
	LowLow
	HighLow
	LowHigh
	NotSignificant
)

// LocalCategories returns the legend for maps of local association: areas
// high among high neighbours, low among low, and the two kinds of outlier,
// plus areas without a significant pattern. The colours are this project's
// own: two hues that stay apart under the common forms of colour-blindness
// (orange for a high value, purple for a low one), dark for an area that
// resembles its neighbours and light for one that stands out from them,
// and a warm pale grey that recedes behind them.
func LocalCategories() []Category {
	return []Category{
		HighHigh:       {"high-high: high, neighbours high", rgb(0xb8, 0x4a, 0x06)},
		LowLow:         {"low-low: low, neighbours low", rgb(0x4b, 0x2c, 0x80)},
		HighLow:        {"high-low: high, neighbours low", rgb(0xf2, 0xa3, 0x5e)},
		LowHigh:        {"low-high: low, neighbours high", rgb(0xae, 0x9b, 0xd4)},
		NotSignificant: {"no significant pattern", rgb(0xe4, 0xe1, 0xdb)},
	}
}

func rgb(r, g, b uint8) color.RGBA { return color.RGBA{r, g, b, 0xff} }

// Missing data are hatched: diagonal lines of hatchInk on hatchPaper, which
// no palette colour resembles, so "unknown" never reads as "low".
var (
	hatchPaper = rgb(0xfa, 0xfa, 0xf8)
	hatchInk   = rgb(0x8a, 0x8a, 0x8a)
)

// Sequential returns k colours (2 ≤ k ≤ MaxClasses) for ordered classes,
// lightest for the lowest. They run from a pale cream through sea green to
// a deep indigo, evenly spaced in lightness in the OKLab colour space
// (Ottosson 2020), so each step looks about as large as the next and the
// order survives colour-blindness and greyscale printing.
func Sequential(k int) ([]color.RGBA, error) {
	if k < 2 || k > MaxClasses {
		return nil, fmt.Errorf("plot: a sequential palette has 2 to %d colours, got %d", MaxClasses, k)
	}
	out := make([]color.RGBA, k)
	for i := range out {
		out[i] = rampColor(float64(i) / float64(k-1))
	}
	return out, nil
}

// The ramp's anchors in OKLCh (lightness, chroma, hue in degrees); the
// lightness runs linearly from the first to the last, chroma and hue are
// interpolated piecewise through the middle anchor.
var rampAnchors = [3][3]float64{
	{0.965, 0.055, 100},
	{0.700, 0.120, 165},
	{0.310, 0.110, 282},
}

func rampColor(t float64) color.RGBA {
	a, b := rampAnchors[0], rampAnchors[1]
	u := t * 2
	if t > 0.5 {
		a, b = rampAnchors[1], rampAnchors[2]
		u = t*2 - 1
	}
	l := rampAnchors[0][0] + t*(rampAnchors[2][0]-rampAnchors[0][0])
	c := a[1] + u*(b[1]-a[1])
	h := (a[2] + u*(b[2]-a[2])) * math.Pi / 180
	// Out-of-gamut colours lose chroma until they fit, keeping lightness
	// and hue, which carry the order.
	for ; c > 0; c -= 0.002 {
		if col, ok := oklabToSRGB(l, c*math.Cos(h), c*math.Sin(h)); ok {
			return col
		}
	}
	col, _ := oklabToSRGB(l, 0, 0)
	return col
}

// oklabToSRGB converts OKLab to 8-bit sRGB; ok is false outside the gamut.
func oklabToSRGB(l, a, b float64) (color.RGBA, bool) {
	l_ := l + 0.3963377774*a + 0.2158037573*b
	m_ := l - 0.1055613458*a - 0.0638541728*b
	s_ := l - 0.0894841775*a - 1.2914855480*b
	l3, m3, s3 := l_*l_*l_, m_*m_*m_, s_*s_*s_
	lin := [3]float64{
		+4.0767416621*l3 - 3.3077115913*m3 + 0.2309699292*s3,
		-1.2684380046*l3 + 2.6097574011*m3 - 0.3413193965*s3,
		-0.0041960863*l3 - 0.7034186147*m3 + 1.7076147010*s3,
	}
	var out [3]uint8
	for i, v := range lin {
		if v < -1e-4 || v > 1+1e-4 {
			return color.RGBA{}, false
		}
		v = min(max(v, 0), 1)
		if v <= 0.0031308 {
			v *= 12.92
		} else {
			v = 1.055*math.Pow(v, 1/2.4) - 0.055
		}
		out[i] = uint8(math.Round(v * 255))
	}
	return rgb(out[0], out[1], out[2]), true
}

func hex(c color.RGBA) string { return fmt.Sprintf("#%02x%02x%02x", c.R, c.G, c.B) }

// MaxGroups is the number of colours of the Groups palette: the most
// groups a map of groups tells apart.
const MaxGroups = 8

// groupColours are this project's qualitative palette, in the order groups
// take them: blue, orange, green, wine, yellow, pale sky, olive brown and
// violet. They were chosen (by a search over sRGB, started from hand-picked
// hues) so that every pair stays at least 0.13 apart in OKLab, and 0.10
// from the grey and white of the missing-data hatching, both for normal
// vision and for protanopia, deuteranopia and tritanopia as simulated by
// Machado, Oliveira & Fernandes (2009, IEEE TVCG 15:1291–1298); see
// TestGroupColoursApart. The first two, the usual two-group case, differ
// in hue and in lightness.
var groupColours = [MaxGroups]color.RGBA{
	rgb(0x2d, 0x5b, 0xa8),
	rgb(0xfe, 0x83, 0x0e),
	rgb(0x2e, 0xc6, 0x9b),
	rgb(0x82, 0x22, 0x56),
	rgb(0xfb, 0xda, 0x5b),
	rgb(0xb0, 0xdc, 0xfe),
	rgb(0x81, 0x6b, 0x33),
	rgb(0xc8, 0x80, 0xf7),
}

// Groups returns k colours (1 ≤ k ≤ MaxGroups) for unordered groups, such
// as the levels of a grouping column: none looks "more" than another.
func Groups(k int) ([]color.RGBA, error) {
	if k < 1 || k > MaxGroups {
		return nil, fmt.Errorf("plot: a map of groups tells 1 to %d groups apart, got %d", MaxGroups, k)
	}
	return append([]color.RGBA(nil), groupColours[:k]...), nil
}
