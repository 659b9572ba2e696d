package report

import (
	"bytes"
	"embed"
	"encoding/base64"
	"errors"
	"fmt"
	"html/template"
	"io"
	"slices"

	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/spatial/clustering"
	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/spatial/regress"
)

// The page is html/template's work from templates embedded in the binary
// (html/*.tmpl) and one stylesheet (html/page.css), so that every id,
// column name and value from the data is escaped for where it lands, and
// the file written needs nothing but itself: no script, no font, no
// request of any kind when it is opened.
//
//go:embed html/*.tmpl html/page.css
var htmlFiles embed.FS

var pageTemplate = template.Must(template.New("page.tmpl").ParseFS(htmlFiles, "html/*.tmpl"))

// HTMLDoc is what one page shows: one result, the files it was computed
// from, and the pictures.
type HTMLDoc struct {
	// Result is a *compare.Result, *clustering.Result (autocorr),
	// *clustering.ScreenResult, *local.Result or *WeightsDocument.
	Result any
	// Inputs are the files read, each with its SHA-256.
	Inputs []InputFile
	// Top is how many of the strongest areas a local result lists.
	Top int
	// Pictures are shown in order, after the tables.
	Pictures []Picture
}

// InputFile is a file the result was computed from.
type InputFile struct {
	// Role says what the file is to the run: "layer", "table", "weights".
	Role string
	// Name is the path as given, or "standard input".
	Name string
	// SHA256 is the hex digest of the bytes read, "" when unknown.
	SHA256 string
}

// Picture is one picture of the page, as io/figure drew it: SVG, or PNG
// where the SVG would be too heavy for the page (SVG is then nil).
type Picture struct {
	Title, Caption string
	SVG, PNG       []byte
}

// MaxInlineSVG is the largest SVG a page inlines; a heavier picture (a
// map of tens of thousands of areas) is embedded as a PNG instead.
const MaxInlineSVG = 1 << 20

// errHeavy stops an SVG that has grown past MaxInlineSVG.
var errHeavy = errors.New("picture heavier than MaxInlineSVG")

// capped passes writes on until more than max bytes have come.
type capped struct {
	buf bytes.Buffer
	max int
}

func (c *capped) Write(p []byte) (int, error) {
	if c.buf.Len()+len(p) > c.max {
		return 0, errHeavy
	}
	return c.buf.Write(p)
}

// DrawPicture draws a picture for the page with draw (one of
// LocalPictures' methods, say): as SVG, or as PNG when the SVG would be
// over MaxInlineSVG bytes.
func DrawPicture(title, caption string, draw func(io.Writer, figure.Format) error) (Picture, error) {
	p := Picture{Title: title, Caption: caption}
	svg := &capped{max: MaxInlineSVG}
	err := draw(svg, figure.SVG)
	if err == nil {
		p.SVG = svg.buf.Bytes()
		return p, nil
	}
	if !errors.Is(err, errHeavy) {
		return p, fmt.Errorf("%s: %w", title, err)
	}
	var png bytes.Buffer
	if err := draw(&png, figure.PNG); err != nil {
		return p, fmt.Errorf("%s: %w", title, err)
	}
	p.PNG = png.Bytes()
	return p, nil
}

// HTML writes the page of doc: one self-contained HTML file.
func HTML(w io.Writer, doc HTMLDoc) error {
	pg, err := buildPage(doc)
	if err != nil {
		return err
	}
	if pg.Pictures, err = pictureViews(doc.Pictures); err != nil {
		return err
	}
	css, err := htmlFiles.ReadFile("html/page.css")
	if err != nil {
		return err
	}
	pg.CSS = template.CSS(css)
	var b bytes.Buffer
	if err := pageTemplate.Execute(&b, pg); err != nil {
		return fmt.Errorf("report page: %w", err)
	}
	_, err = w.Write(b.Bytes())
	return err
}

// buildPage lays out the result of doc.
func buildPage(doc HTMLDoc) (*page, error) {
	var pg *page
	switch r := doc.Result.(type) {
	case *compare.Result:
		pg = comparePage(r)
	case *clustering.Result:
		pg = autocorrPage(r)
	case *clustering.ScreenResult:
		pg = screenPage(r)
	case *local.Result:
		pg = localPage(r, doc.Top)
	case *WeightsDocument:
		pg = weightsPage(r)
	case *regress.Result:
		pg = residualsPage(r)
	default:
		return nil, fmt.Errorf("report page: no page for a %T", doc.Result)
	}
	if len(doc.Inputs) > 0 {
		// The files read, with their digests, name the input instead.
		pg.Facts = slices.DeleteFunc(pg.Facts, func(f fact) bool { return f.Label == "input" })
	}
	pg.Facts = append(inputFacts(doc.Inputs), pg.Facts...)
	return pg, nil
}

// inputFacts name the files read, each with its digest.
func inputFacts(inputs []InputFile) []fact {
	var out []fact
	for _, in := range inputs {
		out = append(out, fact{Label: in.Role + " file", Value: in.Name})
		digest := in.SHA256
		if digest == "" {
			digest = "not available"
		}
		out = append(out, fact{Label: "SHA-256", Value: digest, Code: in.SHA256 != ""})
	}
	return out
}

// pictureViews checks each picture and readies it for the page.
func pictureViews(pics []Picture) ([]pictureView, error) {
	var out []pictureView
	for i, p := range pics {
		v := pictureView{ID: fmt.Sprintf("picture-%d", i+1), Title: p.Title, Caption: p.Caption}
		switch {
		case p.SVG != nil:
			svg, err := inlineSVG(p.SVG, fmt.Sprintf("p%d-", i+1), p.Title+". "+p.Caption)
			if err != nil {
				return nil, err
			}
			v.SVG = svg
		case p.PNG != nil:
			if !bytes.HasPrefix(p.PNG, []byte("\x89PNG\r\n\x1a\n")) {
				return nil, fmt.Errorf("picture %q: not a PNG", p.Title)
			}
			v.PNG = template.URL("data:image/png;base64," + base64.StdEncoding.EncodeToString(p.PNG))
		default:
			return nil, fmt.Errorf("picture %q: nothing drawn", p.Title)
		}
		out = append(out, v)
	}
	return out, nil
}
