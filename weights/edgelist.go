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
	index := make(map[string]int32, len(ids))
	for i, id := range ids {
		index[id] = int32(i)
	}
	cr := csv.NewReader(bufio.NewReader(r))
	cr.FieldsPerRecord = -1
	cr.TrimLeadingSpace = true
	header, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return nil, fmt.Errorf("%s: the file is empty; an edge list starts with the header from,to,weight", source)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %v", source, err)
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
		return nil, fmt.Errorf("%s: line 1: the header must name the columns from, to and weight (found %q)", source, strings.Join(header, ","))
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
			return nil, fmt.Errorf("%s: %v", source, err)
		}
		if len(rec) == 1 && strings.TrimSpace(rec[0]) == "" {
			continue
		}
		if len(rec) <= max(from, to, wc) {
			return nil, fmt.Errorf("%s: line %d: expected the columns from, to and weight, found %d value(s)", source, line, len(rec))
		}
		a, b := strings.TrimSpace(rec[from]), strings.TrimSpace(rec[to])
		i, ok := index[a]
		if !ok {
			return nil, fmt.Errorf("%s: line %d: area %q is not an id of the layer", source, line, a)
		}
		j, ok := index[b]
		if !ok {
			return nil, fmt.Errorf("%s: line %d: area %q is not an id of the layer", source, line, b)
		}
		if i == j {
			return nil, fmt.Errorf("%s: line %d: area %q is linked to itself; an area cannot be its own neighbour", source, line, a)
		}
		ws := strings.TrimSpace(rec[wc])
		v, err := strconv.ParseFloat(ws, 64)
		if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%s: line %d: weight %q of %s→%s is not a number", source, line, ws, a, b)
		}
		if v < 0 {
			return nil, fmt.Errorf("%s: line %d: weight %v of %s→%s is negative; weights must be zero or more", source, line, v, a, b)
		}
		if first, dup := seen[[2]int32{i, j}]; dup {
			return nil, fmt.Errorf("%s: line %d: the link %s→%s was already given on line %d", source, line, a, b, first)
		}
		seen[[2]int32{i, j}] = line
		if v != 1 && v != 0 {
			binary = false
		}
		links = append(links, Link{From: i, To: j, Weight: v})
	}
	transform := "as given"
	if binary {
		transform = string(Binary)
	}
	return FromEntries(len(ids), links, "edge list "+source, transform)
}
