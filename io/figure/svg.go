package figure

import (
	"bufio"
	"fmt"
	"image/color"
	"io"
	"math"
	"strconv"
	"unicode/utf8"
)

// hatchID names the missing-data pattern; the prefix keeps it from
// clashing with other ids when the SVG is inlined in a page.
const hatchID = "areatest-no-data"

// hatchStep is the spacing of the hatching lines in pixels, shared by both
// backends so the two formats look alike.
const (
	hatchStep  = 6.0
	hatchWidth = 1.3
)

// svgCanvas writes SVG straight to a buffered writer: a map of 85,000
// areas is never held in memory as elements. Coordinates are written in
// tenths of a pixel — finer than any screen shows, and neighbouring areas,
// whose shared vertices round alike, still meet without cracks.
type svgCanvas struct {
	w   *bufio.Writer
	buf []byte
}

func newSVGCanvas(out io.Writer, width, height int) *svgCanvas {
	c := &svgCanvas{w: bufio.NewWriterSize(out, 1<<16)}
	fmt.Fprintf(c.w, `<?xml version="1.0" encoding="UTF-8"?>
<svg xmlns="http://www.w3.org/2000/svg" width="%d" height="%d" viewBox="0 0 %d %d" font-family="%s">
<defs><pattern id="%s" patternUnits="userSpaceOnUse" width="%g" height="%g"><rect width="%g" height="%g" fill="%s"/><path d="M-1 1l2-2M0 %g l%g-%gM%g %gl2-2" stroke="%s" stroke-width="%g"/></pattern></defs>
`, width, height, width, height, xmlEscape(fontFamily, true),
		hatchID, hatchStep, hatchStep, hatchStep, hatchStep, hex(hatchPaper),
		hatchStep, hatchStep, hatchStep, hatchStep-1, hatchStep+1, hex(hatchInk), hatchWidth)
	return c
}

// xmlEscape escapes s for an attribute value (attr) or for character data,
// dropping the control characters XML 1.0 does not allow at all. '&' and
// '<' are escaped in both; both quotes in attributes, whichever quote
// delimits them, and '>' in text, where titles keep their quotes as typed.
func xmlEscape(s string, attr bool) string {
	var b []byte
	for _, r := range s {
		if !xmlAllowed(r) {
			continue
		}
		switch {
		case r == '&':
			b = append(b, "&amp;"...)
		case r == '<':
			b = append(b, "&lt;"...)
		case r == '"' && attr:
			b = append(b, "&quot;"...)
		case r == '\'' && attr:
			b = append(b, "&apos;"...)
		case r == '>' && !attr:
			b = append(b, "&gt;"...)
		default:
			b = utf8.AppendRune(b, r)
		}
	}
	return string(b)
}

func xmlAllowed(r rune) bool {
	return r == '\t' || r == '\n' || r == '\r' || (r >= 0x20 && r != 0xfffe && r != 0xffff)
}

// num formats a coordinate or length compactly: at most two decimals.
func num(v float64) string {
	return strconv.FormatFloat(math.Round(v*100)/100, 'f', -1, 64)
}

func (s style) svgAttrs() string {
	var fill string
	switch {
	case s.noFill:
		fill = "none"
	case s.hatch:
		fill = "url(#" + hatchID + ")"
	default:
		fill = hex(s.fill)
	}
	a := `fill="` + fill + `"`
	if s.strokeW > 0 {
		a += ` stroke="` + hex(s.stroke) + `" stroke-width="` + num(s.strokeW) + `" stroke-linejoin="round" stroke-linecap="round"`
	}
	return a
}

func (c *svgCanvas) rect(x, y, w, h float64, st style) {
	fmt.Fprintf(c.w, "<rect x=\"%s\" y=\"%s\" width=\"%s\" height=\"%s\" %s/>\n", num(x), num(y), num(w), num(h), st.svgAttrs())
}

func (c *svgCanvas) group(st style) {
	fmt.Fprintf(c.w, "<g fill-rule=\"evenodd\" %s>\n", st.svgAttrs())
}

func (c *svgCanvas) endGroup() { c.w.WriteString("</g>\n") }

func (c *svgCanvas) area(pts []pt, ends []int, _ []bool, tip string) {
	b := append(c.buf[:0], `<path d="`...)
	start := 0
	for _, end := range ends {
		ring := pts[start:end]
		start = end
		if len(ring) == 0 {
			continue
		}
		// Deltas between rounded absolute positions, so rounding errors do
		// not add up along a ring.
		px, py := tenths(ring[0].x), tenths(ring[0].y)
		b = append(b, 'M')
		b = appendTenths(b, px, false)
		b = appendTenths(b, py, true)
		b = append(b, 'l')
		// "z" closes the ring; a closing copy of the first point is not written.
		if n := len(ring); n > 1 && tenths(ring[n-1].x) == px && tenths(ring[n-1].y) == py {
			ring = ring[:n-1]
		}
		first := true
		for _, q := range ring[1:] {
			x, y := tenths(q.x), tenths(q.y)
			if x == px && y == py {
				continue
			}
			b = appendTenths(b, x-px, !first)
			b = appendTenths(b, y-py, true)
			first = false
			px, py = x, y
		}
		if first {
			// The whole ring fell within a tenth of a pixel: keep it as a
			// dot so the area is still there; round caps draw its outline
			// as a speck.
			b = append(b, "0 0"...)
		}
		b = append(b, 'z')
	}
	b = append(b, '"')
	if tip != "" {
		b = append(b, "><title>"...)
		b = append(b, xmlEscape(tip, false)...)
		b = append(b, "</title></path>\n"...)
	} else {
		b = append(b, "/>\n"...)
	}
	c.buf = b
	c.w.Write(b)
}

func tenths(v float64) int64 { return int64(math.Round(v * 10)) }

// appendTenths writes v/10 with at most one decimal and no leading zero;
// sep says whether a number precedes it, in which case a space separates
// them unless the minus sign does.
func appendTenths(b []byte, v int64, sep bool) []byte {
	if v < 0 {
		b = append(b, '-')
		v = -v
	} else if sep {
		b = append(b, ' ')
	}
	whole, frac := v/10, v%10
	if whole != 0 || frac == 0 {
		b = strconv.AppendInt(b, whole, 10)
	}
	if frac != 0 {
		b = append(b, '.', byte('0'+frac))
	}
	return b
}

func (c *svgCanvas) circle(cx, cy, r float64, st style) {
	fmt.Fprintf(c.w, "<circle cx=\"%s\" cy=\"%s\" r=\"%s\" %s/>\n", num(cx), num(cy), num(r), st.svgAttrs())
}

func (c *svgCanvas) line(x1, y1, x2, y2, w float64, col color.RGBA) {
	fmt.Fprintf(c.w, "<line x1=\"%s\" y1=\"%s\" x2=\"%s\" y2=\"%s\" stroke=\"%s\" stroke-width=\"%s\"/>\n",
		num(x1), num(y1), num(x2), num(y2), hex(col), num(w))
}

func (c *svgCanvas) text(x, y float64, s string, size float64, bold bool, col color.RGBA, a anchor) {
	attrs := ""
	switch a {
	case anchorMiddle:
		attrs = ` text-anchor="middle"`
	case anchorEnd:
		attrs = ` text-anchor="end"`
	}
	if bold {
		attrs += ` font-weight="bold"`
	}
	fmt.Fprintf(c.w, "<text x=\"%s\" y=\"%s\" font-size=\"%s\" fill=\"%s\"%s>%s</text>\n",
		num(x), num(y), num(size), hex(col), attrs, xmlEscape(s, false))
}

func (c *svgCanvas) finish() error {
	c.w.WriteString("</svg>\n")
	return c.w.Flush()
}
