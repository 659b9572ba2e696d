// Package crs reads what the inputs say about their coordinate system — a
// well-known-text definition (a shapefile's .prj, a GeoPackage's
// gpkg_spatial_ref_sys), or a name or EPSG code (a GeoJSON legacy "crs"
// member) — into a layer.CRS: geographic or projected, and the linear unit
// of a projected system. It never reprojects; areatest measures distances
// on the sphere for geographic layers and in the plane, in the layer's
// unit, for projected ones.
//
// Sources: OGC 01-009 (Coordinate Transformation Services, 2001) for the
// first well-known-text form (PROJCS, GEOGCS, UNIT, AUTHORITY), as GDAL and
// ESRI write it in .prj files; OGC 18-010r7 (WKT-CRS 2.0, 2019) for the
// second (PROJCRS, GEOGCRS, LENGTHUNIT, ID); the EPSG Geodetic Parameter
// Dataset for the codes of Lookup and the unit factors (metre 9001, foot
// 9002 = 0.3048 m, US survey foot 9003 = 1200/3937 m).
package crs

import (
	"fmt"
	"strconv"
	"strings"
	"unicode"

	"github.com/areatest/areatest/io/layer"
)

// FromWKT reads a well-known-text definition of either edition. A
// definition that is not well-known text, or describes a system with no
// horizontal plane or sphere (geocentric, vertical only), is an error.
func FromWKT(def string) (layer.CRS, error) {
	root, err := parse(def)
	if err != nil {
		return layer.CRS{}, err
	}
	return fromNode(root)
}

func fromNode(n *node) (layer.CRS, error) {
	switch strings.ToUpper(n.key) {
	case "PROJCS", "PROJCRS", "PROJECTEDCRS":
		c := layer.CRS{Projected: true, Name: n.text(0), EPSG: n.code()}
		c.Unit, c.MetresPerUnit = n.linearUnit()
		return c, nil
	case "GEOGCS", "GEOGCRS", "GEOGRAPHICCRS", "GEODCRS", "GEODETICCRS":
		if cs := n.child("CS"); cs != nil && strings.EqualFold(cs.text(0), "Cartesian") {
			return layer.CRS{}, fmt.Errorf("the coordinate system %q is geocentric (x, y, z from the Earth's centre), not a map", n.text(0))
		}
		return layer.CRS{Name: n.text(0), EPSG: n.code()}, nil
	case "COMPD_CS", "COMPOUNDCRS":
		for _, k := range n.kids {
			if c, err := fromNode(k); err == nil {
				return c, nil
			}
		}
	case "BOUNDCRS":
		if src := n.child("SOURCECRS"); src != nil && len(src.kids) > 0 {
			return fromNode(src.kids[0])
		}
	case "LOCAL_CS", "ENGCRS", "ENGINEERINGCRS":
		c := layer.CRS{Projected: true, Name: n.text(0)}
		c.Unit, c.MetresPerUnit = n.linearUnit()
		return c, nil
	case "GEOCCS":
		return layer.CRS{}, fmt.Errorf("the coordinate system %q is geocentric (x, y, z from the Earth's centre), not a map", n.text(0))
	}
	return layer.CRS{}, fmt.Errorf("the coordinate system definition starts with %s, which names no map coordinate system", n.key)
}

// node is one keyword of well-known text with its arguments: quoted texts
// and bare words or numbers in args (in order), nested keywords in kids.
type node struct {
	key  string
	args []string
	kids []*node
}

// text returns the i-th argument, "" when there is none.
func (n *node) text(i int) string {
	if i < len(n.args) {
		return n.args[i]
	}
	return ""
}

// child returns the first nested keyword named key (any case), or nil.
func (n *node) child(key string) *node {
	for _, k := range n.kids {
		if strings.EqualFold(k.key, key) {
			return k
		}
	}
	return nil
}

// code returns the EPSG code of AUTHORITY["EPSG","5070"] or ID["EPSG",5070]
// directly under n, 0 when there is none.
func (n *node) code() int {
	for _, k := range n.kids {
		if (strings.EqualFold(k.key, "AUTHORITY") || strings.EqualFold(k.key, "ID")) && strings.EqualFold(k.text(0), "EPSG") {
			if v, err := strconv.Atoi(k.text(1)); err == nil {
				return v
			}
		}
	}
	return 0
}

// linearUnit finds the unit of a projected system: UNIT or LENGTHUNIT
// directly under it, else under its first AXIS (the second edition puts it
// there). The name is normalised for the usual spellings ("Meter",
// "metre", "Foot_US").
func (n *node) linearUnit() (string, float64) {
	find := func(m *node) *node {
		for _, k := range m.kids {
			switch strings.ToUpper(k.key) {
			case "UNIT", "LENGTHUNIT":
				return k
			}
		}
		return nil
	}
	u := find(n)
	if u == nil {
		for _, k := range n.kids {
			if strings.EqualFold(k.key, "AXIS") {
				if u = find(k); u != nil {
					break
				}
			}
		}
	}
	if u == nil {
		return "", 0
	}
	factor, err := strconv.ParseFloat(u.text(1), 64)
	if err != nil || !(factor > 0) {
		factor = 0
	}
	return unitName(u.text(0), factor)
}

// unitName gives the known units their one spelling and exact factor.
func unitName(name string, factor float64) (string, float64) {
	key := strings.ToLower(strings.NewReplacer("_", " ", "-", " ").Replace(name))
	switch {
	case key == "metre" || key == "meter" || key == "m" || (factor == 1 && key == ""):
		return "metre", 1
	case key == "kilometre" || key == "kilometer" || key == "km":
		return "kilometre", 1000
	case key == "us survey foot" || key == "foot us" || key == "us foot" || key == "ftus" || near(factor, 1200.0/3937):
		return "US survey foot", 1200.0 / 3937
	case key == "foot" || key == "international foot" || key == "ft" || near(factor, 0.3048):
		return "foot", 0.3048
	}
	return name, factor
}

func near(a, b float64) bool { return a > 0 && (a-b)/b < 1e-9 && (b-a)/b < 1e-9 }

// parse reads well-known text into its tree. Either bracket pair, [] or
// (), is accepted, as both editions allow.
func parse(def string) (*node, error) {
	p := &wktParser{s: strings.TrimSpace(strings.TrimPrefix(def, "\ufeff"))}
	if p.s == "" {
		return nil, fmt.Errorf("the coordinate system definition is empty")
	}
	n, err := p.keyword(0)
	if err != nil {
		return nil, err
	}
	p.space()
	if p.i != len(p.s) {
		return nil, p.errorf("text after the end of the definition")
	}
	return n, nil
}

type wktParser struct {
	s string
	i int
}

func (p *wktParser) errorf(format string, args ...any) error {
	return fmt.Errorf("the coordinate system definition is not well-known text: %s at character %d", fmt.Sprintf(format, args...), p.i+1)
}

func (p *wktParser) space() {
	for p.i < len(p.s) && unicode.IsSpace(rune(p.s[p.i])) {
		p.i++
	}
}

// maxDepth bounds the nesting a definition may have (real ones have fewer
// than 10 levels), so that a hostile file cannot exhaust the stack.
const maxDepth = 64

func (p *wktParser) keyword(depth int) (*node, error) {
	if depth > maxDepth {
		return nil, p.errorf("nested too deeply")
	}
	p.space()
	start := p.i
	for p.i < len(p.s) && (p.s[p.i] == '_' || unicode.IsLetter(rune(p.s[p.i])) || unicode.IsDigit(rune(p.s[p.i]))) {
		p.i++
	}
	if p.i == start {
		return nil, p.errorf("a keyword was expected")
	}
	n := &node{key: p.s[start:p.i]}
	p.space()
	if p.i == len(p.s) || (p.s[p.i] != '[' && p.s[p.i] != '(') {
		return nil, p.errorf("%s is not followed by a bracket", n.key)
	}
	closing := byte(']')
	if p.s[p.i] == '(' {
		closing = ')'
	}
	p.i++
	for {
		p.space()
		if p.i == len(p.s) {
			return nil, p.errorf("%s is not closed", n.key)
		}
		switch c := p.s[p.i]; {
		case c == '"':
			s, err := p.quoted()
			if err != nil {
				return nil, err
			}
			n.args = append(n.args, s)
		case unicode.IsLetter(rune(c)):
			save := p.i
			word := p.word()
			p.space()
			if p.i < len(p.s) && (p.s[p.i] == '[' || p.s[p.i] == '(') {
				p.i = save
				k, err := p.keyword(depth + 1)
				if err != nil {
					return nil, err
				}
				n.kids = append(n.kids, k)
			} else {
				n.args = append(n.args, word)
			}
		default:
			w := p.word()
			if w == "" {
				return nil, p.errorf("unexpected %q", c)
			}
			n.args = append(n.args, w)
		}
		p.space()
		if p.i == len(p.s) {
			return nil, p.errorf("%s is not closed", n.key)
		}
		switch p.s[p.i] {
		case ',':
			p.i++
		case closing:
			p.i++
			return n, nil
		default:
			return nil, p.errorf("unexpected %q in %s", p.s[p.i], n.key)
		}
	}
}

// word reads a bare word or number up to a delimiter.
func (p *wktParser) word() string {
	start := p.i
	for p.i < len(p.s) && !strings.ContainsRune(",[]()\"", rune(p.s[p.i])) && !unicode.IsSpace(rune(p.s[p.i])) {
		p.i++
	}
	return p.s[start:p.i]
}

// quoted reads a quoted text; a doubled quote stands for one.
func (p *wktParser) quoted() (string, error) {
	var b strings.Builder
	p.i++
	for p.i < len(p.s) {
		c := p.s[p.i]
		p.i++
		if c != '"' {
			b.WriteByte(c)
			continue
		}
		if p.i < len(p.s) && p.s[p.i] == '"' {
			b.WriteByte('"')
			p.i++
			continue
		}
		return b.String(), nil
	}
	return "", p.errorf("a quoted text is not closed")
}
