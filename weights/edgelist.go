package weights

import (
	"bufio"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// The edge list is areatest's own plain exchange format for a neighbour
// graph: a CSV file with the header from,to,weight and one row per directed
// link, areas named by their ids. Any spreadsheet or script can write one.

// WriteEdgeList writes g as an edge list, ids naming the areas. Links are
// written in row order, so the same graph always gives the same file.
func WriteEdgeList(w io.Writer, g *Graph, ids []string) error {
	cw := csv.NewWriter(w)
	if err := cw.Write([]string{"from", "to", "weight"}); err != nil {
		return err
	}
	for i := 0; i < g.Len(); i++ {
		nb, wt := g.Row(i)
		for k, j := range nb {
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
// Unknown ids, self-links, repeated links, and weights that are missing,
// non-numeric, negative or not finite are errors naming the file and line.
func ReadEdgeList(r io.Reader, source string, ids []string) (*Graph, error) {
	cr := csv.NewReader(bufio.NewReader(r))
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	cols, err := readEdgeHeader(cr, source)
	if err != nil {
		return nil, err
	}
	cols.index = make(map[string]int32, len(ids))
	for i, id := range ids {
		cols.index[id] = int32(i)
	}
	var links []Link
	seen := map[[2]int32]int{}
	binary := true
	for {
		rec, err := cr.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		line, _ := cr.FieldPos(0)
		if err != nil {
			return nil, fmt.Errorf("%s: %w", source, err)
		}
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		l, err := cols.link(rec)
		if err != nil {
			return nil, fmt.Errorf("%s: line %d: %w", source, line, err)
		}
		if first, dup := seen[[2]int32{l.From, l.To}]; dup {
			return nil, fmt.Errorf("%s: line %d: the link %s→%s was already given on line %d", source, line, ids[l.From], ids[l.To], first)
		}
		seen[[2]int32{l.From, l.To}] = line
		binary = binary && (l.Weight == 1 || l.Weight == 0)
		links = append(links, l)
	}
	scaling := "as given"
	if binary {
		scaling = string(Binary)
	}
	return FromEntries(len(ids), links, "edge list "+source, scaling)
}

// edgeColumns says where the columns of an edge list are, and which area
// each id names.
type edgeColumns struct {
	from, to, weight int
	index            map[string]int32
}

// readEdgeHeader reads the header line, which must name the columns from,
// to and weight (in any order and case, a byte-order mark allowed).
func readEdgeHeader(cr *csv.Reader, source string) (edgeColumns, error) {
	header, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return edgeColumns{}, fmt.Errorf("%s: the file is empty; an edge list starts with the header from,to,weight", source)
	}
	if err != nil {
		return edgeColumns{}, fmt.Errorf("%s: %w", source, err)
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
		return edgeColumns{}, fmt.Errorf("%s: line 1: the header must name the columns from, to and weight (found %q)", source, strings.Join(header, ","))
	}
	return edgeColumns{from: from, to: to, weight: wc}, nil
}

// link reads one row as a link; its errors are about the row alone.
func (c *edgeColumns) link(rec []string) (Link, error) {
	if len(rec) <= max(c.from, c.to, c.weight) {
		return Link{}, fmt.Errorf("expected the columns from, to and weight, found %d value(s)", len(rec))
	}
	a, b := strings.TrimSpace(rec[c.from]), strings.TrimSpace(rec[c.to])
	i, ok := c.index[a]
	if !ok {
		return Link{}, fmt.Errorf("area %q is not an id of the layer", a)
	}
	j, ok := c.index[b]
	if !ok {
		return Link{}, fmt.Errorf("area %q is not an id of the layer", b)
	}
	if i == j {
		return Link{}, fmt.Errorf("area %q is linked to itself; an area cannot be its own neighbour", a)
	}
	ws := strings.TrimSpace(rec[c.weight])
	v, err := strconv.ParseFloat(ws, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return Link{}, fmt.Errorf("weight %q of %s→%s is not a number", ws, a, b)
	}
	if v < 0 {
		return Link{}, fmt.Errorf("weight %v of %s→%s is negative; weights must be zero or more", v, a, b)
	}
	return Link{From: i, To: j, Weight: v}, nil
}
