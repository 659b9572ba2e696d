package figure

import "image/color"

// Maps are drawn once, through canvas, onto one of two backends: svgCanvas
// writes the drawing as SVG elements as it goes, rasterCanvas paints it
// into an image. Everything about layout — where the map, the legend and
// each label go — is decided before either is touched, in pixels with y
// pointing down, so the SVG and the PNG of a map match.
type canvas interface {
	// rect fills (and optionally outlines) an axis-aligned rectangle.
	rect(x, y, w, h float64, st style)
	// group sets the style of the areas that follow, until endGroup.
	group(st style)
	endGroup()
	// area draws one area of the current group: rings[k] runs from
	// ends[k−1] to ends[k] in pts, exteriors and holes in any orientation,
	// filled by the even-odd rule; hole[k] says which rings are holes, for
	// backends that fill by winding. tip, when not empty, is a tooltip.
	area(pts []pt, ends []int, hole []bool, tip string)
	circle(cx, cy, r float64, st style)
	line(x1, y1, x2, y2, w float64, c color.RGBA)
	// text draws s with its baseline at y; anchor says whether x is the
	// start, the middle or the end of the text.
	text(x, y float64, s string, size float64, bold bool, c color.RGBA, anchor anchor)
	// finish completes the output and writes what is left of it.
	finish() error
}

type pt struct{ x, y float64 }

type anchor int

const (
	anchorStart anchor = iota
	anchorMiddle
	anchorEnd
)

// style says how a shape is painted. A zero stroke width draws no outline.
type style struct {
	fill    color.RGBA
	hatch   bool // fill with the missing-data hatching instead of fill
	noFill  bool
	stroke  color.RGBA
	strokeW float64
}
