package geojson

import (
	"fmt"
	"math"
	"strconv"

	"github.com/paulmach/orb"
)

// geomParser turns the "coordinates" of a Polygon or MultiPolygon into an
// orb.MultiPolygon. It parses the bytes itself rather than through
// reflection so that a feature costs three allocations (points, rings,
// parts) however many positions it has, and so that each error can say
// which ring and which coordinate is at fault. Its scratch slices are
// reused from feature to feature.
type geomParser struct {
	b     []byte
	i     int
	multi bool

	pts      []orb.Point
	ringEnds []int // end of each ring in pts
	partEnds []int // end of each part in ringEnds

	unclosed bool

	// outside is the first position of the geometry being parsed that lies
	// outside longitude/latitude range, as written; "" while none does.
	outside string
	// unswappable is set, for the whole file, by the first position that
	// could not be [latitude, longitude] either (|x| > 90 or |y| > 180).
	unswappable bool
}

// geomError is a coordinates problem.
type geomError struct {
	msg string
}

func (p *geomParser) parse(raw []byte, multi bool) (orb.MultiPolygon, bool, *geomError) {
	p.b, p.i, p.multi = raw, 0, multi
	p.pts, p.ringEnds, p.partEnds = p.pts[:0], p.ringEnds[:0], p.partEnds[:0]
	p.unclosed, p.outside = false, ""

	var err *geomError
	if multi {
		err = p.list(func(k int) *geomError { return p.polygon(k) })
	} else {
		err = p.polygon(0)
	}
	if err == nil {
		if p.i = skipSpace(p.b, p.i); p.i != len(p.b) {
			err = p.nesting()
		}
	}
	p.b = nil
	if err != nil {
		return nil, false, err
	}

	// Copy out of the scratch slices; full slice expressions cap each ring
	// and part so an append by a later stage cannot run into its neighbour.
	pts := make([]orb.Point, len(p.pts))
	copy(pts, p.pts)
	rings := make([]orb.Ring, len(p.ringEnds))
	start := 0
	for k, end := range p.ringEnds {
		rings[k] = orb.Ring(pts[start:end:end])
		start = end
	}
	mp := make(orb.MultiPolygon, len(p.partEnds))
	start = 0
	for k, end := range p.partEnds {
		mp[k] = orb.Polygon(rings[start:end:end])
		start = end
	}
	return mp, p.unclosed, nil
}

// list parses a JSON array whose elements are parsed by elem(k), k from 1.
func (p *geomParser) list(elem func(k int) *geomError) *geomError {
	if err := p.open(); err != nil {
		return err
	}
	if p.peek() == ']' {
		p.i++
		return nil
	}
	for k := 1; ; k++ {
		if err := elem(k); err != nil {
			return err
		}
		switch p.peek() {
		case ',':
			p.i++
		case ']':
			p.i++
			return nil
		default:
			return p.nesting()
		}
	}
}

// polygon parses one polygon; part is its 1-based number in a MultiPolygon
// (0 for a Polygon). A part with no rings is dropped.
func (p *geomParser) polygon(part int) *geomError {
	before := len(p.ringEnds)
	err := p.list(func(k int) *geomError { return p.ring(part, k) })
	if err != nil {
		return err
	}
	if len(p.ringEnds) > before {
		p.partEnds = append(p.partEnds, len(p.ringEnds))
	}
	return nil
}

func (p *geomParser) ring(part, k int) *geomError {
	start := len(p.pts)
	if err := p.list(func(int) *geomError { return p.position() }); err != nil {
		return err
	}
	n := len(p.pts) - start
	if n > 0 && p.pts[start] != p.pts[len(p.pts)-1] {
		p.pts = append(p.pts, p.pts[start])
		p.unclosed = true
		n++
	}
	if n < 4 {
		return &geomError{msg: fmt.Sprintf("%s has %d positions; a ring needs at least 4, the last repeating the first", ringName(part, k), n)}
	}
	p.ringEnds = append(p.ringEnds, len(p.pts))
	return nil
}

func ringName(part, k int) string {
	if part == 0 {
		return fmt.Sprintf("ring %d", k)
	}
	return fmt.Sprintf("ring %d of part %d", k, part)
}

// position parses [lon, lat] or [lon, lat, more...], keeping two values.
func (p *geomParser) position() *geomError {
	if err := p.open(); err != nil {
		return err
	}
	var xy [2]float64
	var lit [2][]byte
	n := 0
	for {
		c := p.peek()
		if c == ']' && n == 0 {
			break
		}
		if c == '[' {
			return p.nesting()
		}
		if c != '-' && (c < '0' || c > '9') {
			return &geomError{msg: fmt.Sprintf("a position holds %s where a number belongs", jsonKind(p.b[p.i:]))}
		}
		s := p.i
		for p.i < len(p.b) && isNumberByte(p.b[p.i]) {
			p.i++
		}
		if n < 2 {
			v, err := strconv.ParseFloat(string(p.b[s:p.i]), 64)
			if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
				return &geomError{msg: fmt.Sprintf("coordinate %s is not a finite number", p.b[s:p.i])}
			}
			xy[n], lit[n] = v, p.b[s:p.i]
		}
		n++
		c = p.peek()
		if c == ',' {
			p.i++
			continue
		}
		if c == ']' {
			break
		}
		return p.nesting()
	}
	p.i++ // the closing bracket
	if n < 2 {
		return &geomError{msg: fmt.Sprintf("a position has %d number(s); it needs [longitude, latitude]", n)}
	}
	// Whether the coordinates are degrees is decided at the end, when the
	// "crs" member, which may follow the features, is known.
	if p.outside == "" && !(math.Abs(xy[0]) <= 180 && math.Abs(xy[1]) <= 90) {
		p.outside = fmt.Sprintf("[%s, %s]", lit[0], lit[1])
	}
	if math.Abs(xy[0]) > 90 || math.Abs(xy[1]) > 180 {
		p.unswappable = true
	}
	p.pts = append(p.pts, orb.Point(xy))
	return nil
}

func isNumberByte(c byte) bool {
	return c >= '0' && c <= '9' || c == '-' || c == '+' || c == '.' || c == 'e' || c == 'E'
}

// open consumes the '[' that starts an array, or explains what is there.
func (p *geomParser) open() *geomError {
	if p.peek() != '[' {
		return p.nesting()
	}
	p.i++
	return nil
}

func (p *geomParser) peek() byte {
	p.i = skipSpace(p.b, p.i)
	if p.i >= len(p.b) {
		return 0
	}
	return p.b[p.i]
}

// nesting explains coordinates that are not arrays nested as the type
// needs, guessing the other polygon type when the depth fits it.
func (p *geomParser) nesting() *geomError {
	want, shape, other := "Polygon", "[[[lon, lat], ...], ...]", "MultiPolygon"
	wantDepth, otherDepth := 3, 4
	if p.multi {
		want, shape, other = "MultiPolygon", "[[[[lon, lat], ...], ...], ...]", "Polygon"
		wantDepth, otherDepth = 4, 3
	}
	msg := fmt.Sprintf("coordinates are not nested as a %s needs (%s)", want, shape)
	if d := numberDepth(p.b); d == otherDepth {
		msg += fmt.Sprintf("; they look like a %s's", other)
	} else if d > 0 && d != wantDepth {
		msg += fmt.Sprintf("; the first number is %d arrays deep", d)
	}
	return &geomError{msg: msg}
}

// numberDepth counts the arrays open at the first number, 0 if none.
func numberDepth(b []byte) int {
	d := 0
	for _, c := range b {
		switch {
		case c == '[':
			d++
		case c == ']':
			d--
		case c == '-' || c >= '0' && c <= '9':
			return d
		}
	}
	return 0
}
