package table

import (
	"fmt"
	"math"
	"strings"

	"github.com/areatest/areatest/io/layer"
)

// JoinOptions name the keys a join matches.
type JoinOptions struct {
	// LayerKey names the layer column that holds the key; "" (or the name
	// of the column the ids came from, Layer.IDColumn) means the areas' ids.
	LayerKey string
	// TableKey names the table column that holds the key; "" means the
	// column named as LayerKey, or the table's first column when LayerKey
	// is "" too.
	TableKey string
}

// maxListed is how many keys a report or message names one by one.
const maxListed = 5

// JoinReport says how a join went, for the command's report.
type JoinReport struct {
	// Table is the table's source.
	Table string `json:"table"`
	// LayerKey is the layer column joined on, "" for the areas' ids;
	// TableKey the table's key column.
	LayerKey string `json:"layer_key,omitempty"`
	TableKey string `json:"table_key"`
	// Areas and Rows count the two sides.
	Areas int `json:"areas"`
	Rows  int `json:"rows"`
	// Matched counts the areas that got a row; Padded those of them whose
	// key matched only once padded with leading zeros to PadWidth digits.
	Matched  int `json:"areas_matched"`
	Padded   int `json:"matched_after_zero_padding"`
	PadWidth int `json:"padding_width,omitempty"`
	// Unmatched counts the areas without a row, whose joined values are
	// missing; UnmatchedFirst names the first of them (at most 5).
	Unmatched      int      `json:"areas_without_row"`
	UnmatchedFirst []string `json:"first_areas_without_row,omitempty"`
	// Unused counts the rows no area matched; UnusedFirst gives the keys of
	// the first of them (at most 5).
	Unused      int      `json:"rows_without_area"`
	UnusedFirst []string `json:"first_rows_without_area,omitempty"`
	// Columns names the table columns added to the layer; Replaced those of
	// them that replaced a layer column of the same name.
	Columns  []string `json:"columns_added"`
	Replaced []string `json:"columns_replaced,omitempty"`
}

// Join adds the columns of t to a copy of l, matching each area's key to
// the row with the same key (see the package documentation for the rules).
// The layer returned shares l's ids, geometry and untouched columns; l is
// not changed. Warnings are one line each, starting with the table's
// source.
func Join(l *layer.Layer, t *Table, opt JoinOptions) (*layer.Layer, *JoinReport, []string, error) {
	layerKeys, layerKeyName, err := keysOfLayer(l, opt.LayerKey)
	if err != nil {
		return nil, nil, nil, err
	}
	keyCol, err := tableKeyColumn(t, opt, layerKeyName)
	if err != nil {
		return nil, nil, nil, err
	}
	idx, err := indexRows(t, keyCol, commonWidth(layerKeys))
	if err != nil {
		return nil, nil, nil, err
	}
	rep := &JoinReport{Table: t.Source, LayerKey: layerKeyName, TableKey: t.Header[keyCol], Areas: l.Len(), Rows: t.Rows}
	rows := idx.match(layerKeys, rep)
	if rep.Matched == 0 {
		return nil, nil, nil, errorf(t.Source, 0, rep.TableKey, "no key matches %s (layer keys: %s; table keys: %s)",
			describeKey(layerKeyName), listFirst(distinct(layerKeys), 3), listFirst(distinct(idx.keys), 3))
	}
	var warns []string
	warn := func(format string, args ...any) {
		warns = append(warns, t.Source+": "+fmt.Sprintf(format, args...))
	}
	out := *l
	out.Columns = append([]*layer.Column(nil), l.Columns...)
	for j, name := range t.Header {
		switch {
		case j == keyCol:
			continue // its values are the layer's key on every matched area
		case layerKeyName != "" && name == layerKeyName:
			warn("column %q is left out: the layer's column of that name is the key", name)
			continue
		}
		col := pick(t.Columns[j], rows)
		rep.Columns = append(rep.Columns, name)
		if k := columnIndex(out.Columns, name); k >= 0 {
			out.Columns[k] = col
			rep.Replaced = append(rep.Replaced, name)
		} else {
			out.Columns = append(out.Columns, col)
		}
	}
	idx.report(rep, layerKeys, rows)
	warns = append(warns, joinWarnings(rep, idx.example)...)
	return &out, rep, warns, nil
}

// joinWarnings says, one line each, what a user should know of a join that
// worked: padded keys, replaced columns, areas without a row and rows
// without an area.
func joinWarnings(rep *JoinReport, example string) []string {
	var w []string
	add := func(format string, args ...any) {
		w = append(w, rep.Table+": "+fmt.Sprintf(format, args...))
	}
	if rep.Padded > 0 {
		add("%d key(s) matched only once padded with leading zeros to %d digits (%s); the codes were probably saved as numbers", rep.Padded, rep.PadWidth, example)
	}
	if len(rep.Replaced) > 0 {
		add("the table's column(s) %s replace the layer's of the same name", strings.Join(quoteAll(rep.Replaced), ", "))
	}
	if rep.Unmatched > 0 {
		add("%d of %d areas have no row (%s); their joined values are missing", rep.Unmatched, rep.Areas, listFirst(quoteAll(rep.UnmatchedFirst), maxListed))
	}
	if rep.Unused > 0 {
		add("%d of %d rows match no area (keys %s)", rep.Unused, rep.Rows, listFirst(quoteAll(rep.UnusedFirst), maxListed))
	}
	return w
}

func quoteAll(s []string) []string {
	out := make([]string, len(s))
	for i, v := range s {
		out[i] = fmt.Sprintf("%q", v)
	}
	return out
}

func describeKey(layerKey string) string {
	if layerKey == "" {
		return "an area's id"
	}
	return fmt.Sprintf("the layer's %q", layerKey)
}

// keysOfLayer returns each area's key, trimmed ("" for a missing value),
// and the name of the column they came from ("" for the ids).
func keysOfLayer(l *layer.Layer, name string) ([]string, string, error) {
	if name == "" || name == l.IDColumn {
		keys := make([]string, l.Len())
		for i, id := range l.IDs {
			keys[i] = strings.TrimSpace(id)
		}
		return keys, "", nil
	}
	k := columnIndex(l.Columns, name)
	if k < 0 {
		names := make([]string, len(l.Columns))
		for i, c := range l.Columns {
			names[i] = c.Name
		}
		return nil, "", errorf(l.Source, 0, "", "has no column %q to join on (its columns: %s)", name, listFirst(names, 10))
	}
	keys := l.Columns[k].Labels()
	for i := range keys {
		keys[i] = strings.TrimSpace(keys[i])
	}
	return keys, name, nil
}

// tableKeyColumn finds the table's key column.
func tableKeyColumn(t *Table, opt JoinOptions, layerKey string) (int, error) {
	name := opt.TableKey
	if name == "" {
		name = layerKey
	}
	if name == "" {
		return 0, nil
	}
	if j := t.Column(name); j >= 0 {
		return j, nil
	}
	return -1, errorf(t.Source, 0, "", "has no column %q to join on (its columns: %s)", name, listFirst(t.Header, 10))
}

func columnIndex(cols []*layer.Column, name string) int {
	for k, c := range cols {
		if c.Name == name {
			return k
		}
	}
	return -1
}

// commonWidth returns the length all the all-digit keys share, 0 when
// there are none or their lengths differ.
func commonWidth(keys []string) int {
	w := 0
	for _, k := range keys {
		if !digits(k) {
			continue
		}
		if w == 0 {
			w = len(k)
		} else if len(k) != w {
			return 0
		}
	}
	return w
}

// rowIndex finds the table row of a key.
type rowIndex struct {
	rows     map[string]entry
	keys     []string // each row's key as written, trimmed
	width    int      // the table's common digit width (commonWidth)
	layerPad int      // the layer's, to which short table keys were padded
	example  string   // the first padding that matched, for the warning
}

type entry struct {
	row    int
	padded bool // reached by a key padded with zeros
}

// indexRows maps each row's key to its row; duplicates and missing keys
// are errors. layerWidth is the common width of the layer's all-digit
// keys: a shorter all-digit table key is entered padded to it as well,
// unless another row has the padded key itself.
func indexRows(t *Table, keyCol, layerWidth int) (*rowIndex, error) {
	col := t.Columns[keyCol]
	name := t.Header[keyCol]
	idx := &rowIndex{rows: make(map[string]entry, t.Rows), keys: make([]string, t.Rows), layerPad: layerWidth}
	for r := range t.Rows {
		k := strings.TrimSpace(col.Label(r))
		if k == "" {
			return nil, errorf(t.Source, t.Lines[r], name, "the key is missing; every row needs one")
		}
		if prev, dup := idx.rows[k]; dup {
			return nil, errorf(t.Source, t.Lines[r], name, "the key %q is also on line %d; each key may appear once", k, t.Lines[prev.row])
		}
		idx.rows[k] = entry{row: r}
		idx.keys[r] = k
	}
	idx.width = commonWidth(idx.keys)
	if layerWidth == 0 {
		return idx, nil
	}
	for r, k := range idx.keys {
		if digits(k) && len(k) < layerWidth {
			p := strings.Repeat("0", layerWidth-len(k)) + k
			if _, taken := idx.rows[p]; !taken {
				idx.rows[p] = entry{row: r, padded: true}
			}
		}
	}
	return idx, nil
}

// match finds each area's row, -1 for none, and counts the matches in rep.
// A layer key of digits shorter than the table keys' common width is
// looked up padded to it.
func (idx *rowIndex) match(keys []string, rep *JoinReport) []int {
	rows := make([]int, len(keys))
	for i, k := range keys {
		rows[i] = -1
		if k == "" {
			continue
		}
		e, ok := idx.rows[k]
		width := idx.layerPad
		if !ok && idx.width > 0 && digits(k) && len(k) < idx.width {
			e, ok = idx.rows[strings.Repeat("0", idx.width-len(k))+k]
			e.padded, width = ok, idx.width
		}
		if !ok {
			continue
		}
		rows[i] = e.row
		rep.Matched++
		if e.padded {
			rep.Padded++
			rep.PadWidth = width
			if idx.example == "" {
				idx.example = fmt.Sprintf("table %q ↔ layer %q", idx.keys[e.row], k)
			}
		}
	}
	return rows
}

// report fills in the areas without a row and the rows without an area.
func (idx *rowIndex) report(rep *JoinReport, keys []string, rows []int) {
	used := make([]bool, len(idx.keys))
	for i, r := range rows {
		if r >= 0 {
			used[r] = true
			continue
		}
		rep.Unmatched++
		if len(rep.UnmatchedFirst) < maxListed {
			rep.UnmatchedFirst = append(rep.UnmatchedFirst, keys[i])
		}
	}
	for r, u := range used {
		if !u {
			rep.Unused++
			if len(rep.UnusedFirst) < maxListed {
				rep.UnusedFirst = append(rep.UnusedFirst, idx.keys[r])
			}
		}
	}
}

// distinct returns the different non-empty keys in their first order.
func distinct(keys []string) []string {
	var out []string
	seen := make(map[string]bool)
	for _, k := range keys {
		if k != "" && !seen[k] {
			seen[k] = true
			out = append(out, k)
		}
	}
	return out
}

// pick builds the joined column: row rows[i] of c for area i, missing
// where rows[i] is -1. It keeps the kind the column has in the whole
// table, so that a column reads the same whichever rows match.
func pick(c *layer.Column, rows []int) *layer.Column {
	n := len(rows)
	out := &layer.Column{Name: c.Name, Kind: c.Kind, Missing: make([]bool, n)}
	if c.Kind == layer.Number {
		out.Num = make([]float64, n)
	} else {
		out.Str = make([]string, n)
		if c.NotNumber != nil {
			out.NotNumber = make([]bool, n)
		}
	}
	for i, r := range rows {
		if r < 0 {
			out.Missing[i] = true
			if out.Num != nil {
				out.Num[i] = math.NaN()
			}
			continue
		}
		out.Missing[i] = c.Missing[r]
		if out.Num != nil {
			out.Num[i] = c.Num[r]
		} else {
			out.Str[i] = c.Str[r]
			if out.NotNumber != nil {
				out.NotNumber[i] = c.NotNumber[r]
			}
		}
	}
	return out
}
