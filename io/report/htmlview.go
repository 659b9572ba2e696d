package report

import (
	"html/template"
	"strings"
)

// The page is built in two steps: the *Page functions turn a result into
// a page — facts, sections of paragraphs, tables and lists, all plain
// strings — and html/page.tmpl lays it out, escaping every string. So the
// templates hold no wording and the wording is shared with the text
// reports (the …Sentence functions).

// page is one report page.
type page struct {
	Title, Command, Version string
	// Facts are the inputs and settings, label and value.
	Facts []fact
	// Read is the recommendation, "" when the result makes none.
	Read     string
	Sections []*section
	Pictures []pictureView
	Warnings []string
	Cautions []string
	Written  []string
	// Footer is the seed and the version, as the text report ends.
	Footer string
	CSS    template.CSS
}

// fact is one line of the page's facts; Code sets the value in a fixed
// font (a digest).
type fact struct {
	Label, Value string
	Code         bool
}

// section is a heading and what follows it.
type section struct {
	Heading string
	Blocks  []block
}

// block is a paragraph (Note: a footnote), a table or a list.
type block struct {
	Text  string
	Note  bool
	Table *tableView
	List  []string
}

// tableView is a table whose first column heads its rows.
type tableView struct {
	Caption string
	Head    []string
	// Num marks the columns of numbers, set right-aligned.
	Num  []bool
	Rows []*rowView
	// Bars adds a column drawing each row's Bar.
	Bars bool
}

// rowView is one row; Notes are shown under it, across the table.
type rowView struct {
	Cells []string
	// Bar is the length of the row's bar in percent of the longest.
	Bar  float64
	Warn bool
	// Notes run across the table under the row; Warn marks them as
	// warnings.
	Notes []string
}

// pictureView is a picture ready for the page: a checked SVG or a PNG as
// a data: URL.
type pictureView struct {
	ID, Title, Caption string
	SVG                template.HTML
	PNG                template.URL
}

// newTable starts a table; a head starting with "#" is a column of
// numbers (the "#" is not shown).
func newTable(caption string, head ...string) *tableView {
	t := &tableView{Caption: caption}
	for _, h := range head {
		num := strings.HasPrefix(h, "#")
		t.Head = append(t.Head, strings.TrimPrefix(h, "#"))
		t.Num = append(t.Num, num)
	}
	return t
}

// add appends a row of cells.
func (t *tableView) add(cells ...string) *rowView {
	r := &rowView{Cells: cells}
	t.Rows = append(t.Rows, r)
	return r
}

// text, note, table and list make blocks.
func text(s string) block         { return block{Text: s} }
func note(s string) block         { return block{Text: s, Note: true} }
func table(t *tableView) block    { return block{Table: t} }
func list(items ...string) block  { return block{List: items} }
func (s *section) add(b ...block) { s.Blocks = append(s.Blocks, b...) }

// section starts a new section of the page.
func (pg *page) section(h string) *section {
	s := &section{Heading: h}
	pg.Sections = append(pg.Sections, s)
	return s
}
