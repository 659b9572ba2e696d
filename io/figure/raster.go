package figure

import (
	"image"
	"image/color"
	"image/png"
	"io"
	"math"

	"golang.org/x/image/font"
	"golang.org/x/image/math/fixed"
	"golang.org/x/image/vector"
)

// rasterCanvas paints the drawing into an RGBA image with anti-aliasing and
// encodes it as PNG at the end.
//
// golang.org/x/image/vector fills by accumulated signed coverage, |sum|
// clamped to 1, not by the even-odd rule. That is even-odd for valid
// polygons once every exterior runs one way and every hole the other,
// which area() ensures; and it makes the union of an outline's segment
// quads, all turning the same way as the exteriors, come out right in the
// same pass. Each shape is rasterised in a buffer the size of its own
// bounding box, so a map of many small areas costs about one pass over the
// image, not one per area.
type rasterCanvas struct {
	out   io.Writer
	img   *image.RGBA
	z     vector.Rasterizer
	mask  *image.Alpha
	grp   style
	fonts *fontFaces
	ring  []pt
}

func newRasterCanvas(out io.Writer, width, height int, fonts *fontFaces) *rasterCanvas {
	img := image.NewRGBA(image.Rect(0, 0, width, height))
	return &rasterCanvas{out: out, img: img, fonts: fonts}
}

// shapeSign is the orientation (sign of the shoelace sum, in pixel
// coordinates) of the stroke quads; exteriors are drawn the same way.
const shapeSign = -1

// job collects the path of one shape before it is painted.
type job struct {
	c      *rasterCanvas
	x0, y0 int // pixel origin of the shape's buffer
	w, h   int
}

// begin sizes the rasteriser to the pixel box around pts, grown by pad.
// ok is false when the box misses the image.
func (c *rasterCanvas) begin(pts []pt, pad float64) (j job, ok bool) {
	if len(pts) == 0 {
		return j, false
	}
	minX, minY, maxX, maxY := pts[0].x, pts[0].y, pts[0].x, pts[0].y
	for _, q := range pts[1:] {
		minX, maxX = math.Min(minX, q.x), math.Max(maxX, q.x)
		minY, maxY = math.Min(minY, q.y), math.Max(maxY, q.y)
	}
	b := c.img.Bounds()
	x0 := max(int(math.Floor(minX-pad)), b.Min.X)
	y0 := max(int(math.Floor(minY-pad)), b.Min.Y)
	x1 := min(int(math.Ceil(maxX+pad)), b.Max.X)
	y1 := min(int(math.Ceil(maxY+pad)), b.Max.Y)
	if x1 <= x0 || y1 <= y0 {
		return j, false
	}
	j = job{c: c, x0: x0, y0: y0, w: x1 - x0, h: y1 - y0}
	c.z.Reset(j.w, j.h)
	return j, true
}

// ring adds a closed ring, turned to run with sign sgn.
func (j job) ring(r []pt, sgn int) {
	if len(r) > 1 && r[0] == r[len(r)-1] {
		r = r[:len(r)-1]
	}
	if len(r) < 3 {
		return
	}
	var a float64
	for i := range r {
		p, q := r[i], r[(i+1)%len(r)]
		a += p.x*q.y - q.x*p.y
	}
	if a == 0 {
		return
	}
	ox, oy := float64(j.x0), float64(j.y0)
	z := &j.c.z
	if (a > 0) == (sgn > 0) {
		z.MoveTo(float32(r[0].x-ox), float32(r[0].y-oy))
		for _, q := range r[1:] {
			z.LineTo(float32(q.x-ox), float32(q.y-oy))
		}
	} else {
		z.MoveTo(float32(r[len(r)-1].x-ox), float32(r[len(r)-1].y-oy))
		for k := len(r) - 2; k >= 0; k-- {
			z.LineTo(float32(r[k].x-ox), float32(r[k].y-oy))
		}
	}
	z.ClosePath()
}

// outline adds the segments of ring r as quads of width w, each lengthened
// by w/2 at both ends so that corners are covered.
func (j job) outline(r []pt, w float64) {
	hw := w / 2
	ox, oy := float64(j.x0), float64(j.y0)
	z := &j.c.z
	n := len(r)
	closed := n > 1 && r[0] == r[n-1]
	segs := n - 1
	if !closed && n > 2 {
		segs = n
	}
	for i := range segs {
		a, b := r[i], r[(i+1)%n]
		dx, dy := b.x-a.x, b.y-a.y
		l := math.Hypot(dx, dy)
		if l == 0 {
			continue
		}
		ux, uy := dx/l*hw, dy/l*hw
		// (−uy, ux) is the normal; this order gives the quad shapeSign.
		ax, ay := a.x-ux-ox, a.y-uy-oy
		bx, by := b.x+ux-ox, b.y+uy-oy
		z.MoveTo(float32(ax-uy), float32(ay+ux))
		z.LineTo(float32(bx-uy), float32(by+ux))
		z.LineTo(float32(bx+uy), float32(by-ux))
		z.LineTo(float32(ax+uy), float32(ay-ux))
		z.ClosePath()
	}
}

// paint composites the accumulated path in colour col, or in the hatching.
func (j job) paint(col color.RGBA, hatch bool) {
	c := j.c
	r := image.Rect(j.x0, j.y0, j.x0+j.w, j.y0+j.h)
	if !hatch {
		c.z.Draw(c.img, r, image.NewUniform(col), image.Point{})
		return
	}
	if c.mask == nil || c.mask.Rect.Dx() < j.w || c.mask.Rect.Dy() < j.h {
		c.mask = image.NewAlpha(image.Rect(0, 0, max(j.w, 64), max(j.h, 64)))
	}
	m := c.mask
	for y := range j.h {
		clear(m.Pix[y*m.Stride : y*m.Stride+j.w])
	}
	c.z.Draw(m, image.Rect(0, 0, j.w, j.h), image.Opaque, image.Point{})
	for y := range j.h {
		for x := range j.w {
			a := m.Pix[y*m.Stride+x]
			if a == 0 {
				continue
			}
			blend(c.img, j.x0+x, j.y0+y, hatchAt(j.x0+x, j.y0+y), a)
		}
	}
}

// hatchAt is the colour of the missing-data hatching at pixel (x, y): lines
// along x + y = k·hatchStep, as in the SVG pattern, anti-aliased by their
// distance from the pixel centre.
func hatchAt(x, y int) color.RGBA {
	u := math.Mod(float64(x+y)+1, hatchStep)
	d := math.Min(u, hatchStep-u) / math.Sqrt2
	return mix(hatchPaper, hatchInk, math.Min(math.Max(hatchWidth/2+0.5-d, 0), 1))
}

func mix(a, b color.RGBA, t float64) color.RGBA {
	f := func(p, q uint8) uint8 { return uint8(math.Round(float64(p) + t*(float64(q)-float64(p)))) }
	return color.RGBA{f(a.R, b.R), f(a.G, b.G), f(a.B, b.B), 0xff}
}

// blend paints opaque colour col over pixel (x, y) with coverage a.
func blend(img *image.RGBA, x, y int, col color.RGBA, a uint8) {
	i := img.PixOffset(x, y)
	p := img.Pix[i : i+4 : i+4]
	ca := uint32(a)
	p[0] = uint8((uint32(p[0])*(255-ca) + uint32(col.R)*ca) / 255)
	p[1] = uint8((uint32(p[1])*(255-ca) + uint32(col.G)*ca) / 255)
	p[2] = uint8((uint32(p[2])*(255-ca) + uint32(col.B)*ca) / 255)
	p[3] = uint8((uint32(p[3])*(255-ca) + 255*ca) / 255)
}

// fillShape paints rings (ends as in canvas.area; hole[k] marks holes) in
// style st.
func (c *rasterCanvas) fillShape(pts []pt, ends []int, hole []bool, st style) {
	pad := st.strokeW/2 + 1
	// An outline in the fill colour is there to close the hair-thin seams
	// anti-aliasing leaves between neighbours; it joins the fill in one pass.
	merged := !st.hatch && !st.noFill && st.strokeW > 0 && st.stroke == st.fill
	if !st.noFill {
		j, ok := c.begin(pts, pad)
		if !ok {
			return
		}
		start := 0
		for k, end := range ends {
			sgn := shapeSign
			if hole != nil && hole[k] {
				sgn = -shapeSign
			}
			j.ring(pts[start:end], sgn)
			if merged {
				j.outline(pts[start:end], st.strokeW)
			}
			start = end
		}
		j.paint(st.fill, st.hatch)
	}
	if st.strokeW > 0 && !merged {
		j, ok := c.begin(pts, pad)
		if !ok {
			return
		}
		start := 0
		for _, end := range ends {
			j.outline(pts[start:end], st.strokeW)
			start = end
		}
		j.paint(st.stroke, false)
	}
}

func (c *rasterCanvas) rect(x, y, w, h float64, st style) {
	pts := []pt{{x, y}, {x + w, y}, {x + w, y + h}, {x, y + h}, {x, y}}
	c.fillShape(pts, []int{len(pts)}, nil, st)
}

func (c *rasterCanvas) group(st style) { c.grp = st }
func (c *rasterCanvas) endGroup()      { c.grp = style{} }

func (c *rasterCanvas) area(pts []pt, ends []int, hole []bool, _ string) {
	c.fillShape(pts, ends, hole, c.grp)
}

func (c *rasterCanvas) circle(cx, cy, r float64, st style) {
	const n = 28
	pts := c.ring[:0]
	for k := range n + 1 {
		t := 2 * math.Pi * float64(k%n) / n
		pts = append(pts, pt{cx + r*math.Cos(t), cy + r*math.Sin(t)})
	}
	c.ring = pts
	c.fillShape(pts, []int{len(pts)}, nil, st)
}

func (c *rasterCanvas) line(x1, y1, x2, y2, w float64, col color.RGBA) {
	pts := []pt{{x1, y1}, {x2, y2}}
	j, ok := c.begin(pts, w/2+1)
	if !ok {
		return
	}
	j.outline(pts, w)
	j.paint(col, false)
}

func (c *rasterCanvas) text(x, y float64, s string, size float64, bold bool, col color.RGBA, a anchor) {
	face := c.fonts.face(bold, size)
	switch a {
	case anchorMiddle:
		x -= c.fonts.width(bold, size, s) / 2
	case anchorEnd:
		x -= c.fonts.width(bold, size, s)
	}
	d := font.Drawer{
		Dst:  c.img,
		Src:  image.NewUniform(col),
		Face: face,
		Dot:  fixed.Point26_6{X: fixed.Int26_6(math.Round(x * 64)), Y: fixed.Int26_6(math.Round(y * 64))},
	}
	d.DrawString(s)
}

func (c *rasterCanvas) finish() error {
	return (&png.Encoder{CompressionLevel: png.DefaultCompression}).Encode(c.out, c.img)
}
