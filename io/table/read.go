package table

import (
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"
	"unicode/utf8"

	"github.com/areatest/areatest/io/layer"
)

// Table is a delimited text file read into columns: the header's names and
// one column per name, each built by layer.Builder, so that its values
// follow the missing-value and number rules of every layer reader.
type Table struct {
	// Source names the file in messages (its path).
	Source string
	// Header holds the column names, trimmed, in file order, all different.
	Header []string
	// Columns holds one column per header name, in the same order, each
	// with Rows values.
	Columns []*layer.Column
	// Rows counts the data rows (blank rows are not counted).
	Rows int
	// Lines holds, per row, the 1-based line of the file where the row
	// starts, as an editor numbers lines, for messages.
	Lines []int
	// Delimiter is the field delimiter found in the header: ',', ';' or '\t'.
	Delimiter rune
}

// Column returns the index of the named column, -1 when there is none.
func (t *Table) Column(name string) int {
	for j, h := range t.Header {
		if h == name {
			return j
		}
	}
	return -1
}

// ReadFile reads the table at path. Standard input ("-") is not accepted:
// there it holds the layer the table is joined onto.
func ReadFile(path string) (*Table, []string, error) {
	if path == "-" {
		return nil, nil, errorf("stdin", 0, "", "a table cannot be read from standard input, which holds the layer; give the table as a file")
	}
	data, err := os.ReadFile(path)
	if err != nil {
		reason := err // the path is the message's source already
		if inner := errors.Unwrap(err); inner != nil {
			reason = inner
		}
		return nil, nil, &Error{Source: path, Msg: "cannot be read: " + reason.Error(), Err: err}
	}
	return parse(data, path)
}

// Read reads a delimited text table from r; source names it in the table
// and in messages. On success it returns the table and any warnings, each
// one line starting with the source. On failure the error is an *Error and
// the table is nil.
func Read(r io.Reader, source string) (*Table, []string, error) {
	if source == "" {
		source = "input"
	}
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, nil, &Error{Source: source, Msg: "cannot be read: " + err.Error(), Err: err}
	}
	return parse(data, source)
}

// parse reads the table held in data.
func parse(data []byte, source string) (*Table, []string, error) {
	data, err := checkText(data, source)
	if err != nil {
		return nil, nil, err
	}
	delim, err := sniff(data, source)
	if err != nil {
		return nil, nil, err
	}
	p := &parser{source: source, cr: newCSV(data, delim)}
	t, err := p.run(delim)
	if err != nil {
		return nil, p.warnings, err
	}
	return t, p.warnings, nil
}

// checkText drops a UTF-8 byte-order mark and refuses input that is empty,
// or not UTF-8, naming the line of the first byte that is not.
func checkText(data []byte, source string) ([]byte, error) {
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	if bytes.HasPrefix(data, []byte("\xff\xfe")) || bytes.HasPrefix(data, []byte("\xfe\xff")) {
		return nil, errorf(source, 0, "", "is UTF-16 text; save the file as UTF-8")
	}
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, errorf(source, 0, "", "is empty; a table needs a header line and rows")
	}
	if utf8.Valid(data) {
		return data, nil
	}
	at := 0
	for at < len(data) {
		c, size := utf8.DecodeRune(data[at:])
		if c == utf8.RuneError && size == 1 {
			break
		}
		at += size
	}
	line := 1 + bytes.Count(data[:at], []byte("\n"))
	col := at - (bytes.LastIndexByte(data[:at], '\n') + 1) + 1
	return nil, errorf(source, line, "", "is not UTF-8 text (byte 0x%02X at byte %d of the line); save the file as UTF-8", data[at], col)
}

func newCSV(data []byte, delim rune) *csv.Reader {
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = delim
	cr.FieldsPerRecord = -1 // counts are checked here, for a better message
	cr.ReuseRecord = true
	return cr
}

// delimiters are the candidates, in the order that breaks a tie.
var delimiters = []rune{',', ';', '\t'}

// sniffRows is how many data rows must agree with the header on a
// delimiter.
const sniffRows = 5

// sniff picks the delimiter: of comma, semicolon and tab, the most
// frequent outside quotes in the header line that splits the header and
// the first data rows into the same number of fields (at least 2). When
// none does, the most frequent is taken and the row that disagrees is
// reported by the parse.
func sniff(data []byte, source string) (rune, error) {
	counts := headerCounts(data)
	var order []rune
	for _, d := range delimiters {
		if counts[d] > 0 {
			order = append(order, d)
		}
	}
	if len(order) == 0 {
		return 0, errorf(source, 0, "", "has one column (no comma, semicolon or tab in its header line %s); a table needs a key column and at least one more", quoteValue(firstLine(data)))
	}
	// Most frequent first; the sort is stable, so ties keep the order above.
	for i := 1; i < len(order); i++ {
		for j := i; j > 0 && counts[order[j]] > counts[order[j-1]]; j-- {
			order[j], order[j-1] = order[j-1], order[j]
		}
	}
	for _, d := range order {
		if agrees(data, d) {
			return d, nil
		}
	}
	return order[0], nil
}

// headerCounts counts the candidate delimiters in the first line, outside
// double quotes.
func headerCounts(data []byte) map[rune]int {
	counts := make(map[rune]int, len(delimiters))
	quoted := false
	for _, c := range skipBlankLines(data) {
		switch {
		case c == '"':
			quoted = !quoted
		case quoted:
		case c == '\n' || c == '\r':
			return counts
		case c == ',' || c == ';' || c == '\t':
			counts[rune(c)]++
		}
	}
	return counts
}

// skipBlankLines drops the lines of white space before the header, which
// the CSV reader passes over too.
func skipBlankLines(data []byte) []byte {
	start := 0
	for i, c := range data {
		switch c {
		case '\n':
			start = i + 1
		case ' ', '\t', '\r':
		default:
			return data[start:]
		}
	}
	return data[start:]
}

func firstLine(data []byte) string {
	data = skipBlankLines(data)
	if i := bytes.IndexAny(data, "\r\n"); i >= 0 {
		data = data[:i]
	}
	return string(data)
}

// agrees reports whether delimiter d splits the header into at least two
// fields and the first data rows into as many.
func agrees(data []byte, d rune) bool {
	cr := newCSV(data, d)
	want := -1
	for range sniffRows + 1 {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return false
		}
		if blank(rec) {
			continue
		}
		if want < 0 {
			want = len(rec)
		} else if len(rec) != want {
			return false
		}
	}
	return want >= 2
}

// blank reports a record of empty or white fields, as spreadsheets write
// after the last row of data.
func blank(rec []string) bool {
	for _, f := range rec {
		if strings.TrimSpace(f) != "" {
			return false
		}
	}
	return true
}

// parser holds the state of one Read after the delimiter is known.
type parser struct {
	source   string
	cr       *csv.Reader
	warnings []string
}

// run reads the header and the rows and builds the columns.
func (p *parser) run(delim rune) (*Table, error) {
	header, err := p.header()
	if err != nil {
		return nil, err
	}
	builders := make([]*layer.Builder, len(header))
	commas := make([]decimalComma, len(header))
	for j, h := range header {
		builders[j] = layer.NewBuilder(h, 0)
	}
	var lines []int
	skipped := 0
	for {
		rec, err := p.cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, p.syntax(err)
		}
		line, _ := p.cr.FieldPos(0)
		if blank(rec) {
			skipped++
			continue
		}
		if len(rec) != len(header) {
			return nil, errorf(p.source, line, "", "has %d field(s); the header has %d (%s)", len(rec), len(header), fieldHint(delim))
		}
		for j, v := range rec {
			builders[j].AddText(v)
			commas[j].add(v, line)
		}
		lines = append(lines, line)
	}
	if len(lines) == 0 {
		return nil, errorf(p.source, 0, "", "has a header line but no rows")
	}
	for j := range commas {
		if err := commas[j].check(p.source, header[j]); err != nil {
			return nil, err
		}
	}
	if skipped > 0 {
		p.warnings = append(p.warnings, fmt.Sprintf("%s: %d row(s) of empty fields were skipped", p.source, skipped))
	}
	cols := make([]*layer.Column, len(header))
	for j, b := range builders {
		cols[j] = b.Column()
	}
	return &Table{Source: p.source, Header: header, Columns: cols, Rows: len(lines), Lines: lines, Delimiter: delim}, nil
}

// header reads the first record: at least two names, none empty, none
// repeated.
func (p *parser) header() ([]string, error) {
	rec, err := p.cr.Read()
	for err == nil && blank(rec) {
		rec, err = p.cr.Read()
	}
	if err != nil {
		return nil, p.syntax(err)
	}
	line, _ := p.cr.FieldPos(0)
	if len(rec) < 2 {
		return nil, errorf(p.source, line, "", "the header %s has one column; a table needs a key column and at least one more", quoteValue(rec[0]))
	}
	header := make([]string, len(rec))
	seen := make(map[string]int, len(rec))
	for j, f := range rec {
		name := strings.TrimSpace(f)
		if name == "" {
			return nil, errorf(p.source, line, "", "column %d of the header has no name; every column needs one", j+1)
		}
		if prev, dup := seen[name]; dup {
			return nil, errorf(p.source, line, "", "the header names %q twice (columns %d and %d); names must be unique", name, prev+1, j+1)
		}
		seen[name] = j
		header[j] = name
	}
	return header, nil
}

// fieldHint names the delimiter in a field-count message.
func fieldHint(d rune) string {
	switch d {
	case ';':
		return "fields are separated by semicolons"
	case '\t':
		return "fields are separated by tabs"
	}
	return "fields are separated by commas; a value holding a comma must be quoted"
}

// syntax turns an error of the CSV reader into an *Error on its line.
func (p *parser) syntax(err error) *Error {
	var pe *csv.ParseError
	if !errors.As(err, &pe) {
		return &Error{Source: p.source, Msg: "cannot be read: " + err.Error(), Err: err}
	}
	var msg string
	switch {
	case errors.Is(pe.Err, csv.ErrBareQuote):
		msg = `has a double quote inside a field that does not start with one; quote the whole field and double the quotes inside it ("5"" tall")`
	case errors.Is(pe.Err, csv.ErrQuote) && pe.StartLine != pe.Line:
		msg = fmt.Sprintf("a quoted field of the row that starts on line %d is not closed, or its closing quote is followed by more text; a quote inside a quoted field must be doubled", pe.StartLine)
	case errors.Is(pe.Err, csv.ErrQuote):
		msg = "a quoted field is not closed, or its closing quote is followed by more text; a quote inside a quoted field must be doubled"
	default:
		msg = pe.Err.Error()
	}
	return &Error{Source: p.source, Line: pe.Line, Msg: msg, Err: err}
}
