package report

import (
	"bytes"
	"encoding/xml"
	"errors"
	"fmt"
	"html"
	"html/template"
	"io"
	"regexp"
	"strings"
)

// The page takes pictures as inline SVG, inserted as template.HTML: the
// one place where html/template does not escape. So an SVG goes in only
// after inlineSVG has read it as XML and written it out again, element by
// element, from what it allows: the drawing elements io/figure and
// gonum/plot write, presentation attributes (none named on…), references
// only to its own definitions (url(#…), href="#…") or to an embedded PNG
// or JPEG, and all text re-escaped here. Anything else — a script, a
// foreign object, a comment, a link out of the page — makes it refuse the
// picture rather than pass it through. Text from the data (an area id in a
// tooltip, a column name in a title) is escaped by io/figure when drawn,
// decoded by the XML reader here and escaped again on the way out, so it
// stays text whatever it holds.

const (
	svgNS   = "http://www.w3.org/2000/svg"
	xlinkNS = "http://www.w3.org/1999/xlink"
)

// svgElements are the elements a picture may hold.
var svgElements = map[string]bool{
	"svg": true, "g": true, "defs": true, "pattern": true, "clipPath": true, "mask": true, "symbol": true, "use": true,
	"path": true, "rect": true, "circle": true, "ellipse": true, "line": true, "polyline": true, "polygon": true,
	"text": true, "tspan": true, "title": true, "desc": true, "image": true,
	"linearGradient": true, "radialGradient": true, "stop": true,
}

var (
	attrName = regexp.MustCompile(`^[A-Za-z][A-Za-z0-9-]*$`)
	urlRef   = regexp.MustCompile(`url\(\s*#([A-Za-z0-9_.-]+)\s*\)`)
	embedded = regexp.MustCompile(`^data:image/(png|jpeg);base64,[A-Za-z0-9+/=\s]*$`)
)

// svgInliner writes one checked picture; prefix makes its ids unique on
// the page, where several pictures define the same pattern.
type svgInliner struct {
	out     bytes.Buffer
	prefix  string
	label   string
	depth   int
	pending bool // a start tag is open, waiting for "/>" or ">"
	root    bool // the root element has been seen
}

// inlineSVG checks that svg is a drawing of the kind io/figure makes and
// returns it rewritten for a place inside an HTML page: without the XML
// prolog, comments and namespace declarations, its ids prefixed with
// prefix, and the root marked as an image labelled label for screen
// readers.
func inlineSVG(svg []byte, prefix, label string) (template.HTML, error) {
	d := xml.NewDecoder(bytes.NewReader(svg))
	d.Strict = true
	s := &svgInliner{prefix: prefix, label: label}
	for {
		tok, err := d.Token()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return "", fmt.Errorf("picture %q is not well-formed SVG: %w", truncate(label, 60), err)
		}
		if err := s.token(tok); err != nil {
			return "", fmt.Errorf("picture %q: %w", truncate(label, 60), err)
		}
	}
	if !s.root || s.depth != 0 {
		return "", fmt.Errorf("picture %q holds no complete <svg> element", truncate(label, 60))
	}
	return template.HTML(s.out.String()), nil
}

func (s *svgInliner) token(tok xml.Token) error {
	switch t := tok.(type) {
	case xml.StartElement:
		return s.start(t)
	case xml.EndElement:
		s.depth--
		if s.pending {
			s.pending = false
			s.out.WriteString("/>")
			return nil
		}
		s.out.WriteString("</" + t.Name.Local + ">")
	case xml.CharData:
		if s.depth == 0 {
			if len(bytes.TrimSpace(t)) > 0 {
				return errors.New("text outside the <svg> element")
			}
			return nil
		}
		s.closePending()
		s.out.WriteString(html.EscapeString(string(t)))
	case xml.Comment:
		// Dropped: a comment could hide nothing from the browser, but
		// there is no reason to pass one on.
	case xml.ProcInst:
		if s.root {
			return fmt.Errorf("processing instruction <?%s?> inside the picture", t.Target)
		}
	case xml.Directive:
		return errors.New("a <!…> declaration is not allowed in a picture")
	}
	return nil
}

// start writes a start tag from its allowed attributes.
func (s *svgInliner) start(t xml.StartElement) error {
	name := t.Name.Local
	switch {
	case t.Name.Space != svgNS:
		return fmt.Errorf("element <%s> is not in the SVG namespace", name)
	case !svgElements[name]:
		return fmt.Errorf("element <%s> is not allowed in a picture", name)
	case s.depth == 0 && (s.root || name != "svg"):
		return fmt.Errorf("element <%s> at the top level: want one <svg>", name)
	}
	s.closePending()
	s.out.WriteString("<" + name)
	if s.depth == 0 {
		s.root = true
		s.out.WriteString(` role="img" aria-label="` + html.EscapeString(s.label) + `"`)
	}
	for _, a := range t.Attr {
		if err := s.attr(name, a); err != nil {
			return err
		}
	}
	s.depth++
	s.pending = true
	return nil
}

// attr writes one attribute, or leaves out a namespace declaration; any
// attribute it cannot vouch for is an error.
func (s *svgInliner) attr(elem string, a xml.Attr) error {
	local := a.Name.Local
	switch {
	case a.Name.Space == "xmlns" || (a.Name.Space == "" && local == "xmlns"):
		return nil // the HTML parser puts inline SVG in its namespace itself
	case a.Name.Space == xlinkNS && local == "href":
	case a.Name.Space != "":
		return fmt.Errorf("attribute %s:%s on <%s> is not allowed", a.Name.Space, local, elem)
	case !attrName.MatchString(local) || strings.HasPrefix(strings.ToLower(local), "on"):
		return fmt.Errorf("attribute %q on <%s> is not allowed", local, elem)
	case elem == "svg" && (local == "role" || local == "aria-label"):
		return nil // set by start
	}
	value, err := s.value(elem, local, a.Value)
	if err != nil {
		return err
	}
	s.out.WriteString(" " + local + `="` + html.EscapeString(value) + `"`)
	return nil
}

// value checks an attribute's value and gives its ids the prefix.
func (s *svgInliner) value(elem, name, v string) (string, error) {
	low := strings.ToLower(v)
	switch {
	case name == "id":
		return s.prefix + v, nil
	case name == "href" && strings.HasPrefix(v, "#"):
		return "#" + s.prefix + v[1:], nil
	case name == "href" && elem == "image" && embedded.MatchString(v):
		return v, nil
	case name == "href":
		return "", fmt.Errorf("<%s> refers to %q: a picture may refer only to itself or to an embedded image", elem, truncate(v, 40))
	case strings.Contains(low, "javascript:") || strings.Contains(low, "expression("):
		return "", fmt.Errorf("attribute %q on <%s> holds code", name, elem)
	}
	if !strings.Contains(low, "url(") {
		return v, nil
	}
	if strings.Count(low, "url(") != len(urlRef.FindAllStringIndex(v, -1)) {
		return "", fmt.Errorf("attribute %q on <%s> refers outside the picture", name, elem)
	}
	return urlRef.ReplaceAllString(v, "url(#"+s.prefix+"$1)"), nil
}

// closePending ends an open start tag that has content.
func (s *svgInliner) closePending() {
	if s.pending {
		s.out.WriteByte('>')
		s.pending = false
	}
}
