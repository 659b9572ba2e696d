package figure

import (
	"fmt"
	"strconv"
)

// partCanvas is a canvas that can name parts of a drawing. The SVG backend
// wraps a part in <g class="…" data-…="…">, so that a test — or a page
// that inlines the picture — can find the observed line or a panel's bars
// and read what they stand for; the raster backend has no elements to
// name and draws the same picture unnamed.
type partCanvas interface {
	// openPart starts a part of the given class; data holds pairs of
	// attribute names (written with a "data-" prefix) and values.
	openPart(class string, data ...string)
	closePart()
}

// openPart names what cv draws next, when cv can.
func openPart(cv canvas, class string, data ...string) {
	if p, ok := cv.(partCanvas); ok {
		p.openPart(class, data...)
	}
}

// closePart ends the part openPart began.
func closePart(cv canvas) {
	if p, ok := cv.(partCanvas); ok {
		p.closePart()
	}
}

func (c *svgCanvas) openPart(class string, data ...string) {
	fmt.Fprintf(c.w, `<g class="%s"`, xmlEscape(class, true))
	for k := 0; k+1 < len(data); k += 2 {
		fmt.Fprintf(c.w, ` data-%s="%s"`, xmlEscape(data[k], true), xmlEscape(data[k+1], true))
	}
	c.w.WriteString(">\n")
}

func (c *svgCanvas) closePart() { c.w.WriteString("</g>\n") }

// dataNum writes a value for a data attribute: the shortest decimal that
// reads back as the same float64.
func dataNum(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
