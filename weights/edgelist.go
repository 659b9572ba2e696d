package weights

import (
	"bufio"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strconv"
	"strings"
)

// The edge list is areatest's own plain exchange format for a neighbour
// graph: a CSV file with the header from,to,weight and one row per directed
// link, areas named by their ids. Any spreadsheet or script can write one.
//
// Ids round-trip exactly: WriteEdgeList quotes a field where CSV needs it
// (commas, quotes, line breaks, leading spaces), and ReadEdgeList matches a
// field against the layer's ids as written first. Only when no id is
// written exactly so does it match the field with its surrounding spaces
// trimmed, which lets a hand-written "A01, A02, 1" work; a trimmed field
// that fits several ids is an error rather than a guess.
//
// Weights are decimal numbers (digits, a decimal point, an exponent: "1",
// "0.25", "2.5e-3"), 0 or from MinEdgeWeight to MaxEdgeWeight. Hexadecimal
// and named values ("0x1p0", "Inf", "NaN") are refused. The range keeps
// every sum the statistics form — row sums, sums of squared weights, the
// moments of Moran's I over up to 2³¹ areas — finite and away from
// underflow; a link of weight 0 is no link.

// Bounds of a positive edge-list weight; see the comment at the top of the
// file.
const (
	MinEdgeWeight = 1e-100
	MaxEdgeWeight = 1e100
)

// EdgeListError is a problem with an edge list, with the facts to find it:
// the file, the line and the link the line gives.
type EdgeListError struct {
	// File names the edge list as the caller gave it.
	File string
	// Line is the 1-based line of the file, 0 for the file as a whole.
	Line int
	// From and To are the ids as written on the line ("" when the line
	// gives no link, or for the writer's problems with a single id).
	From, To string
	Err      error
}

func (e *EdgeListError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ": line %d", e.Line)
	}
	if e.From != "" || e.To != "" {
		fmt.Fprintf(&b, ": link %q→%q", e.From, e.To)
	}
	fmt.Fprintf(&b, ": %v", e.Err)
	return b.String()
}

func (e *EdgeListError) Unwrap() error { return e.Err }

// WriteEdgeList writes g as an edge list, ids naming the areas. Links are
// written in row order, so the same graph always gives the same file. An id
// holding a carriage return (CSV readers turn a quoted line break into a
// bare one) and a weight outside the range ReadEdgeList accepts are
// errors, so that every file written reads back as the same graph; source
// names the file in them.
func WriteEdgeList(w io.Writer, g *Graph, ids []string, source string) error {
	for i, id := range ids[:g.Len()] {
		if strings.ContainsRune(id, '\r') {
			return &EdgeListError{File: source, Err: fmt.Errorf("the id %q (area %d of the layer) holds a carriage return, which an edge list cannot keep", id, i+1)}
		}
	}
	cw := csv.NewWriter(w)
	if err := cw.Write([]string{"from", "to", "weight"}); err != nil {
		return err
	}
	for i := 0; i < g.Len(); i++ {
		nb, wt := g.Row(i)
		for k, j := range nb {
			if err := checkWeight(wt[k]); err != nil {
				return &EdgeListError{File: source, From: ids[i], To: ids[j], Err: err}
			}
			if err := cw.Write([]string{ids[i], ids[j], strconv.FormatFloat(wt[k], 'g', -1, 64)}); err != nil {
				return err
			}
		}
	}
	cw.Flush()
	return cw.Error()
}

// ReadEdgeList reads an edge list for the areas named by ids (the layer's
// ids, in layer order). Areas the file does not mention have no neighbours.
// Every problem is an *EdgeListError naming the file (source), the line
// and the ids it gives: CSV syntax, a missing column, unknown ids,
// self-links, repeated links, weights that are missing, not decimal
// numbers, negative or out of range, and a file with no link of positive
// weight (only a header, or every weight 0).
func ReadEdgeList(r io.Reader, source string, ids []string) (*Graph, error) {
	cr := csv.NewReader(bufio.NewReader(r))
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	cols, err := readEdgeHeader(cr, source)
	if err != nil {
		return nil, err
	}
	cols.index = newIDIndex(ids)
	var links []Link
	seen := map[[2]int32]int{}
	binary, rows := true, 0
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, csvError(source, err)
		}
		line, _ := cr.FieldPos(0)
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		rows++
		l, bad := cols.link(rec)
		if bad != nil {
			bad.File, bad.Line = source, line
			return nil, bad
		}
		if first, dup := seen[[2]int32{l.From, l.To}]; dup {
			return nil, &EdgeListError{File: source, Line: line, From: rec[cols.from], To: rec[cols.to],
				Err: fmt.Errorf("this link was already given on line %d", first)}
		}
		seen[[2]int32{l.From, l.To}] = line
		binary = binary && (l.Weight == 1 || l.Weight == 0)
		links = append(links, l)
	}
	if err := noLinks(source, rows, links); err != nil {
		return nil, err
	}
	scaling := "as given"
	if binary {
		scaling = string(Binary)
	}
	g, err := FromEntries(len(ids), links, "edge list "+source, scaling)
	if err != nil { // cannot happen: every link was checked above
		return nil, &EdgeListError{File: source, Err: err}
	}
	return g, nil
}

// noLinks says what is wrong with an edge list that links no areas: rows
// is the number of its lines after the header that are not blank.
func noLinks(source string, rows int, links []Link) error {
	for _, l := range links {
		if l.Weight > 0 {
			return nil
		}
	}
	if rows == 0 {
		return &EdgeListError{File: source, Err: errors.New("the edge list has a header but no links; give one line from,to,weight per link")}
	}
	return &EdgeListError{File: source, Err: fmt.Errorf("all %d links have weight 0, so no area has a neighbour (a link of weight 0 is no link)", rows)}
}

// csvError turns an error of the CSV reader into an EdgeListError at the
// line its record starts on (a quoted field may run over several lines),
// with advice on quoting for the quote errors.
func csvError(source string, err error) error {
	var pe *csv.ParseError
	if !errors.As(err, &pe) {
		return &EdgeListError{File: source, Err: err}
	}
	where := fmt.Sprintf("column %d", pe.Column)
	if pe.Line != pe.StartLine {
		where = fmt.Sprintf("at line %d, column %d of the record that starts here", pe.Line, pe.Column)
	}
	inner := fmt.Errorf("%s: %w", where, pe.Err)
	if errors.Is(pe.Err, csv.ErrBareQuote) || errors.Is(pe.Err, csv.ErrQuote) {
		inner = fmt.Errorf(`%s: %w; a field holding a quote is written in quotes with the quote doubled, as in "A""01"`, where, pe.Err)
	}
	return &EdgeListError{File: source, Line: pe.StartLine, Err: inner}
}

// idIndex finds the area an edge-list field names: exactly as written, or
// else with surrounding spaces trimmed when that fits exactly one id.
type idIndex struct {
	exact map[string]int32
	// trimmed maps each id with its surrounding spaces trimmed to its
	// area, or to -1 when several ids trim to the same text.
	trimmed map[string]int32
}

func newIDIndex(ids []string) idIndex {
	x := idIndex{exact: make(map[string]int32, len(ids)), trimmed: make(map[string]int32, len(ids))}
	for i, id := range ids {
		x.exact[id] = int32(i)
		t := strings.TrimSpace(id)
		if _, dup := x.trimmed[t]; dup {
			x.trimmed[t] = -1
		} else {
			x.trimmed[t] = int32(i)
		}
	}
	return x
}

// area returns the area field names.
func (x idIndex) area(field string) (int32, error) {
	if i, ok := x.exact[field]; ok {
		return i, nil
	}
	i, ok := x.trimmed[strings.TrimSpace(field)]
	switch {
	case !ok:
		return 0, fmt.Errorf("area %q is not an id of the layer", field)
	case i < 0:
		return 0, fmt.Errorf("area %q is not an id of the layer, and without its surrounding spaces it fits several; write the id exactly, in quotes", field)
	}
	return i, nil
}

// edgeColumns says where the columns of an edge list are, and which area
// each id names.
type edgeColumns struct {
	from, to, weight int
	index            idIndex
}

// readEdgeHeader reads the header line, which must name the columns from,
// to and weight (in any order and case, a byte-order mark allowed).
func readEdgeHeader(cr *csv.Reader, source string) (edgeColumns, error) {
	header, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return edgeColumns{}, &EdgeListError{File: source, Err: errors.New("the file is empty; an edge list starts with the header from,to,weight")}
	}
	if err != nil {
		return edgeColumns{}, csvError(source, err)
	}
	if len(header) > 0 {
		header[0] = strings.TrimPrefix(header[0], "\ufeff")
	}
	col := map[string]int{}
	for k, h := range header {
		col[strings.ToLower(strings.TrimSpace(h))] = k
	}
	from, okF := col["from"]
	to, okT := col["to"]
	wc, okW := col["weight"]
	if !okF || !okT || !okW {
		return edgeColumns{}, &EdgeListError{File: source, Line: 1, Err: fmt.Errorf("the header must name the columns from, to and weight (found %q)", strings.Join(header, ","))}
	}
	return edgeColumns{from: from, to: to, weight: wc}, nil
}

// link reads one row as a link; the error it returns names the ids, and
// the caller adds the file and line.
func (c *edgeColumns) link(rec []string) (Link, *EdgeListError) {
	if len(rec) <= max(c.from, c.to, c.weight) {
		return Link{}, &EdgeListError{Err: fmt.Errorf("expected the columns from, to and weight, found %d value(s): %q", len(rec), strings.Join(rec, ","))}
	}
	a, b := rec[c.from], rec[c.to]
	fail := func(err error) (Link, *EdgeListError) { return Link{}, &EdgeListError{From: a, To: b, Err: err} }
	i, err := c.index.area(a)
	if err != nil {
		return fail(err)
	}
	j, err := c.index.area(b)
	if err != nil {
		return fail(err)
	}
	if i == j {
		return fail(errors.New("an area cannot be its own neighbour"))
	}
	v, err := parseWeight(strings.TrimSpace(rec[c.weight]))
	if err != nil {
		return fail(err)
	}
	return Link{From: i, To: j, Weight: v}, nil
}

// parseWeight reads an edge-list weight: a decimal number, 0 or from
// MinEdgeWeight to MaxEdgeWeight.
func parseWeight(s string) (float64, error) {
	if s == "" {
		return 0, errors.New("the weight is missing")
	}
	if strings.Trim(s, "0123456789.eE+-") != "" {
		return 0, fmt.Errorf("weight %q is not a decimal number", s)
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil && !errors.Is(err, strconv.ErrRange) {
		return 0, fmt.Errorf("weight %q is not a decimal number", s)
	}
	if v == 0 && strings.Trim(mantissa(s), "0.+-") != "" {
		v = MinEdgeWeight / 2 // a positive weight below what float64 holds
	}
	if err != nil || checkWeight(v) != nil {
		return 0, fmt.Errorf("weight %s is %w", s, weightRange(v))
	}
	return v, nil
}

// mantissa returns the part of a decimal number before its exponent.
func mantissa(s string) string {
	if k := strings.IndexAny(s, "eE"); k >= 0 {
		return s[:k]
	}
	return s
}

// errWeightRange is the reason common to every weight out of range.
var errWeightRange = fmt.Errorf("weights must be 0 or from %g to %g", MinEdgeWeight, MaxEdgeWeight)

// weightRange says how v is out of range.
func weightRange(v float64) error {
	switch {
	case v < 0:
		return fmt.Errorf("negative; %w", errWeightRange)
	case v > MaxEdgeWeight:
		return fmt.Errorf("too large; %w, so that sums of weights and of their squares stay finite", errWeightRange)
	}
	return fmt.Errorf("too small; %w, so that squares of weights do not vanish", errWeightRange)
}

// checkWeight rejects a weight an edge list cannot hold.
func checkWeight(v float64) error {
	if v == 0 || (v >= MinEdgeWeight && v <= MaxEdgeWeight) {
		return nil
	}
	if v != v {
		return fmt.Errorf("weight %v is not a number", v)
	}
	return fmt.Errorf("weight %v is %w", v, weightRange(v))
}
