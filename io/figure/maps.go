package figure

import (
	"cmp"
	"fmt"
	"image/color"
	"io"
	"math"
	"sort"
	"strconv"

	"github.com/paulmach/orb"
)

// MapOptions set the frame of a map. The zero value draws a map 1000 pixels
// wide with no title.
type MapOptions struct {
	// Title and Subtitle are printed above the map; long ones wrap.
	Title, Subtitle string
	// Width and Height are the size of the picture in pixels. The map is
	// never stretched: it keeps the aspect of the layer and is fitted into
	// the room the text and the legend leave. When Height is 0 it is
	// chosen so that the map just fits at the given width (and the other
	// way round); when both are 0 the width is 1000.
	Width, Height int
	// LonLat says the layer is in longitude/latitude degrees, to be drawn
	// in an equal-area projection (Lambert cylindrical equal-area, standard
	// parallel at the middle latitude of the layer); otherwise coordinates
	// are drawn as they are, x to the east and y to the north.
	LonLat bool
	// Note is printed small at the foot of the picture (seed, version,
	// cautions); long notes wrap and "\n" starts a new line.
	Note string
	// LegendTitle heads the legend; a choropleth uses its variable name
	// when this is empty.
	LegendTitle string
	// IDs, when given (one per area), label the areas in SVG output: each
	// area's path gets a tooltip with its id and its value or category.
	IDs []string
}

// Largest picture accepted, so that a slip in a size does not ask for
// gigabytes of pixels.
const maxSide = 20000

// checkSize checks the size asked for a picture; 0 leaves a side to the
// drawing.
func checkSize(w, h int) error {
	if w < 0 || h < 0 || w > maxSide || h > maxSide {
		return fmt.Errorf("plot: picture size %d×%d out of range (0 to %d pixels a side; 0 picks one)", w, h, maxSide)
	}
	return nil
}

const (
	defaultWidth = 1000
	margin       = 24.0
	legendGap    = 28.0
	titleSize    = 22.0
	subSize      = 15.0
	noteSize     = 12.0
	headSize     = 14.0
	labelSize    = 13.0
	swatchW      = 26.0
	swatchH      = 15.0
	rowH         = 22.0
	maxLabelW    = 340.0
)

var (
	inkTitle  = rgb(0x1f, 0x1f, 0x1f)
	inkText   = rgb(0x33, 0x33, 0x33)
	inkMuted  = rgb(0x66, 0x66, 0x66)
	swatchRim = rgb(0x88, 0x88, 0x88)
	markerRim = rgb(0x2b, 0x2b, 0x2b)
	white     = rgb(0xff, 0xff, 0xff)
)

// Choropleth draws values as a map of classes: each area is filled with the
// colour of its class (Sequential palette, lightest for the lowest), cut by
// rule classes into at most k classes (see Breaks). Areas where missing is
// true, or whose value is NaN, are hatched and counted in the legend as
// "no data"; missing may be nil. The legend shows each class as the range
// of the values actually in it, with the number of areas. variable names
// the values in the legend heading.
func Choropleth(w io.Writer, f Format, geoms []orb.MultiPolygon, values []float64, missing []bool, classes Classes, k int, variable string, opt MapOptions) error {
	if missing != nil && len(missing) != len(geoms) {
		return fmt.Errorf("plot: %d missing flags for %d areas", len(missing), len(geoms))
	}
	isMissing := func(i int) bool { return missing != nil && missing[i] }
	spec, err := choroplethSpec(geoms, values, isMissing, classes, k, variable, opt)
	if err != nil {
		return err
	}
	return drawMap(w, f, spec, opt)
}

// choroplethSpec classifies values for a choropleth; areas where
// isMissing is true, or whose value is NaN, go in no class.
func choroplethSpec(geoms []orb.MultiPolygon, values []float64, isMissing func(i int) bool, classes Classes, k int, variable string, opt MapOptions) (mapSpec, error) {
	if len(values) != len(geoms) {
		return mapSpec{}, fmt.Errorf("plot: %d values for %d areas", len(values), len(geoms))
	}
	given := isMissing
	isMissing = func(i int) bool { return given(i) || math.IsNaN(values[i]) }
	known := make([]float64, 0, len(values))
	for i, v := range values {
		if isMissing(i) {
			continue
		}
		if math.IsInf(v, 0) {
			return mapSpec{}, fmt.Errorf("plot: area %d has an infinite value", i+1)
		}
		known = append(known, v)
	}
	var breaks []float64
	if len(known) > 0 {
		var err error
		if breaks, err = Breaks(known, classes, k); err != nil {
			return mapSpec{}, err
		}
	} else if k < 2 || k > MaxClasses {
		return mapSpec{}, fmt.Errorf("plot: number of classes must be between 2 and %d, got %d", MaxClasses, k)
	}
	spec := classify(values, isMissing, breaks)
	spec.geoms = geoms
	spec.heading = cmp.Or(opt.LegendTitle, variable)
	switch nc := len(breaks); nc {
	case 0:
		spec.subheading = "no values"
	case 1:
		spec.subheading = "one value only"
	default:
		spec.subheading = fmt.Sprintf("%d classes, %s", nc, classes)
	}
	if opt.IDs != nil {
		spec.tip = func(i int) string {
			if spec.class[i] < 0 {
				return opt.IDs[i] // areaPainter adds the missingName
			}
			return opt.IDs[i] + ": " + strconv.FormatFloat(values[i], 'g', -1, 64)
		}
	}
	return spec, nil
}

// classify puts each value in its class of breaks, or in none (−1) where
// it is missing, and gives each class its colour and its legend entry:
// the range of the values in it and their number.
func classify(values []float64, isMissing func(i int) bool, breaks []float64) mapSpec {
	nc := len(breaks)
	spec := mapSpec{class: make([]int, len(values))}
	lo := make([]float64, nc)
	hi := make([]float64, nc)
	count := make([]int, nc)
	for j := range lo {
		lo[j], hi[j] = math.Inf(1), math.Inf(-1)
	}
	for i, v := range values {
		if isMissing(i) {
			spec.class[i] = -1
			spec.missing++
			continue
		}
		j := classOf(breaks, v)
		spec.class[i] = j
		count[j]++
		lo[j], hi[j] = math.Min(lo[j], v), math.Max(hi[j], v)
	}
	switch {
	case nc >= 2:
		spec.fills, _ = Sequential(nc)
	case nc == 1:
		// One distinct value: a middle tone, neither "low" nor "high".
		spec.fills = []color.RGBA{rampColor(0.5)}
	}
	labels := rangeLabels(lo, hi)
	for j := range nc {
		spec.entries = append(spec.entries, legendEntry{label: labels[j], count: count[j], st: style{fill: spec.fills[j]}})
	}
	return spec
}

// CategoryMap draws each area in the colour of its category: cats[i] is an
// index into legend, or −1 for an area without one (hatched, counted in the
// legend as "no data"). Every legend entry is listed with its number of
// areas, in the order given, so maps drawn with one legend compare at a
// glance. LocalCategories is the legend for local association.
func CategoryMap(w io.Writer, f Format, geoms []orb.MultiPolygon, cats []int, legend []Category, opt MapOptions) error {
	spec, err := categorySpec(geoms, cats, legend, opt)
	if err != nil {
		return err
	}
	return drawMap(w, f, spec, opt)
}

// categorySpec gives each area the colour of its category and counts the
// areas of each for the legend.
func categorySpec(geoms []orb.MultiPolygon, cats []int, legend []Category, opt MapOptions) (mapSpec, error) {
	if len(cats) != len(geoms) {
		return mapSpec{}, fmt.Errorf("plot: %d categories for %d areas", len(cats), len(geoms))
	}
	if len(legend) == 0 {
		return mapSpec{}, fmt.Errorf("plot: a category map needs a legend with at least one category")
	}
	spec := mapSpec{geoms: geoms, class: cats, heading: opt.LegendTitle}
	count := make([]int, len(legend))
	for i, c := range cats {
		switch {
		case c == -1:
			spec.missing++
		case c < -1 || c >= len(legend):
			return mapSpec{}, fmt.Errorf("plot: area %d has category %d; the legend has %d (0 to %d, or −1 for none)", i+1, c, len(legend), len(legend)-1)
		default:
			count[c]++
		}
	}
	for j, c := range legend {
		c.Color.A = 0xff // areas are painted opaque; see Category
		spec.fills = append(spec.fills, c.Color)
		spec.entries = append(spec.entries, legendEntry{label: c.Name, count: count[j], st: style{fill: c.Color}})
	}
	if opt.IDs != nil {
		spec.tip = func(i int) string {
			if cats[i] < 0 {
				return opt.IDs[i] // areaPainter adds the missingName
			}
			return opt.IDs[i] + ": " + legend[cats[i]].Name
		}
	}
	return spec, nil
}

// mapSpec is what both kinds of map hand to drawMap.
type mapSpec struct {
	geoms   []orb.MultiPolygon
	class   []int        // per area; −1 is missing
	fills   []color.RGBA // per class
	entries []legendEntry
	missing int
	// missingLabel names the areas without a class in the legend and the
	// tooltips; empty is "no data".
	missingLabel        string
	heading, subheading string
	// tip, when set, is the tooltip of area i; for an area without a class
	// only its id, to which drawing adds missingName.
	tip func(i int) string
}

// missingName is what the legend and the tooltips call an area without a
// class.
func (s *mapSpec) missingName() string { return cmp.Or(s.missingLabel, "no data") }

type legendEntry struct {
	label string
	count int
	st    style
}

// rangeLabels writes "lo – hi" for each class, all with the same number of
// decimals: enough to give the range of the data three significant digits,
// more if neighbouring ends would otherwise print alike, none when every
// end is a whole number.
func rangeLabels(lo, hi []float64) []string {
	var ends []float64
	for j := range lo {
		if !math.IsInf(lo[j], 0) {
			ends = append(ends, lo[j], hi[j])
		}
	}
	d := decimalsFor(ends)
	out := make([]string, len(lo))
	for j := range lo {
		switch {
		case math.IsInf(lo[j], 0):
			out[j] = "none"
		case lo[j] == hi[j]:
			out[j] = formatNum(lo[j], d)
		default:
			out[j] = formatNum(lo[j], d) + " – " + formatNum(hi[j], d)
		}
	}
	return out
}

func decimalsFor(ends []float64) int {
	if len(ends) == 0 {
		return 0
	}
	s := append([]float64(nil), ends...)
	sort.Float64s(s)
	whole := true
	for _, v := range s {
		if v != math.Trunc(v) || math.Abs(v) > 1e15 {
			whole = false
			break
		}
	}
	if whole {
		return 0
	}
	span := s[len(s)-1] - s[0]
	if span == 0 {
		span = math.Abs(s[0])
	}
	d := 0
	if span > 0 {
		d = max(0, 2-int(math.Floor(math.Log10(span))))
	}
	for ; d < 12; d++ {
		distinct := true
		for i := 1; i < len(s); i++ {
			if s[i] != s[i-1] && formatNum(s[i], d) == formatNum(s[i-1], d) {
				distinct = false
				break
			}
		}
		if distinct {
			break
		}
	}
	return min(d, 12)
}

// formatNum writes v with d decimals, a true minus sign, and commas between
// thousands from 10,000 up, so that values such as years stay as written.
func formatNum(v float64, d int) string {
	s := strconv.FormatFloat(v, 'f', d, 64)
	neg := s[0] == '-'
	if neg {
		s = s[1:]
		if z, _ := strconv.ParseFloat(s, 64); z == 0 {
			neg = false
		}
	}
	s = groupDigits(s, 5)
	if neg {
		return "−" + s
	}
	return s
}

// groupDigits puts commas between the thousands of the whole part of the
// unsigned decimal s when that part has at least from digits.
//
// It is not numtext.Count, which groups every count from 1,000 up: axis and
// legend values are measurements, where a four-digit value such as a year
// reads wrong with a comma, and s is already formatted with its decimals
// (its whole part may be longer than any integer type holds).
func groupDigits(s string, from int) string {
	intPart, frac := s, ""
	for i := range s {
		if s[i] == '.' {
			intPart, frac = s[:i], s[i:]
			break
		}
	}
	if len(intPart) < from {
		return s
	}
	var b []byte
	for i := range intPart {
		if i > 0 && (len(intPart)-i)%3 == 0 {
			b = append(b, ',')
		}
		b = append(b, intPart[i])
	}
	return string(b) + frac
}
