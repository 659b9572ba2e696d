package clustering

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"sort"
	"strings"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// ScreenRow is one screened column.
type ScreenRow struct {
	Rank    int    `json:"rank"`
	Name    string `json:"column"`
	Areas   int    `json:"areas"`
	Missing int    `json:"missing"`
	// Moran's I with its z under randomisation, permutation p-value and
	// that p-value adjusted across the screened columns.
	MoransI        float64    `json:"morans_i"`
	MoranZ         float64    `json:"morans_i_z"`
	MoranP         float64    `json:"morans_i_p"`
	MoranPAdjusted float64    `json:"morans_i_p_adjusted"`
	GearysC        float64    `json:"gearys_c"`
	GearyP         float64    `json:"gearys_c_p"`
	GearyPAdjusted float64    `json:"gearys_c_p_adjusted"`
	Exact          bool       `json:"exact"`
	MoranInterval  [2]float64 `json:"morans_i_p_interval"`
}

// Skipped is a column the screen left out, and why.
type Skipped struct {
	Name   string `json:"column"`
	Reason string `json:"reason"`
}

// ScreenResult is the document `areatest screen` writes.
type ScreenResult struct {
	Version      string          `json:"version"`
	Seed         uint64          `json:"seed"`
	Input        string          `json:"input"`
	Areas        int             `json:"areas"`
	Permutations int             `json:"permutations"`
	Adjustment   string          `json:"adjustment"`
	Alternative  string          `json:"alternative"`
	Weights      weights.Summary `json:"weights"`
	Rows         []ScreenRow     `json:"columns"`
	Skipped      []Skipped       `json:"skipped"`
	Warnings     []string        `json:"warnings"`
	Cautions     []string        `json:"cautions"`
}

// ScreenInput is a layer's columns for screening. IDColumn names the column
// the ids came from, which is never screened.
type ScreenInput struct {
	Input
	IDColumn string
	// Text lists the names of the text columns, which are reported as
	// skipped, "not numeric" or with the reason TextReasons gives.
	Text []string
	// TextReasons says, for a text column that is mostly numbers, why it is
	// not numeric (the values that are not numbers), where the caller can
	// say more than "not numeric".
	TextReasons map[string]string
	// Excluded lists columns the user asked to leave out.
	Excluded []string
}

// idLike matches column names that usually hold codes, not measurements.
var idLike = regexp.MustCompile(`(?i)(^|[_\s-])(id|fid|gid|oid|objectid|fips|geoid|code|key)$|^(id|fid|gid|oid|objectid|fips|geoid|code|key)([_\s-]|$)`)

// Screen computes Moran's I and Geary's C with permutation p-values for
// every numeric column, adjusts the p-values across columns, and ranks the
// columns by Moran's I. Columns with the same missing areas share their
// shuffles (autocorr.MoranGearyMany), so a wide layer costs little more
// than a narrow one.
func Screen(in ScreenInput, opt Options) (*ScreenResult, error) {
	n := len(in.IDs)
	res := &ScreenResult{Seed: opt.Seed, Input: in.File, Areas: n, Permutations: opt.Permutations,
		Adjustment: opt.Adjust.String(), Alternative: opt.Alternative.String(),
		Rows: []ScreenRow{}, Skipped: []Skipped{}, Warnings: []string{}, Cautions: Cautions}
	all, err := weights.Restrict(in.Graph, weights.Present(n), in.IDs, in.Scaling, in.KeepIslands)
	if err != nil {
		return nil, err
	}
	res.Weights = all.Summary
	res.Warnings = append(res.Warnings, all.Summary.Warnings...)
	excluded := map[string]bool{}
	for _, e := range in.Excluded {
		excluded[e] = true
	}
	for _, t := range in.Text {
		switch {
		case t == in.IDColumn:
			res.Skipped = append(res.Skipped, Skipped{t, "holds the area ids"})
		case excluded[t]:
			res.Skipped = append(res.Skipped, Skipped{t, "excluded on request"})
		case in.TextReasons[t] != "":
			res.Skipped = append(res.Skipped, Skipped{t, in.TextReasons[t]})
		default:
			res.Skipped = append(res.Skipped, Skipped{t, "not numeric"})
		}
	}
	for gi, g := range res.groups(in, excluded) {
		if err := res.screenGroup(&in.Input, g, opt, uint64(1000+gi)); err != nil {
			return nil, err
		}
	}
	if len(res.Rows) == 0 {
		return nil, fmt.Errorf("%s: no numeric column could be screened; %s", in.File, skippedText(res.Skipped))
	}
	res.adjustAndRank(opt.Adjust)
	return res, nil
}

// columnGroup is the columns that lack values in the same areas: they
// share one graph and one run of shuffles.
type columnGroup struct {
	keep []int
	cols []Column
}

// groups sorts the numeric columns to screen into groups by their missing
// areas, in the order the groups first appear; the others are skipped.
func (res *ScreenResult) groups(in ScreenInput, excluded map[string]bool) []*columnGroup {
	var order []*columnGroup
	byPattern := map[string]*columnGroup{}
	for _, col := range in.Numeric {
		if reason := skipReason(col, in.IDColumn, excluded); reason != "" {
			res.Skipped = append(res.Skipped, Skipped{col.Name, reason})
			continue
		}
		key := patternKey(col.Missing)
		g, ok := byPattern[key]
		if !ok {
			g = &columnGroup{keep: weights.Present(len(in.IDs), col.Missing)}
			byPattern[key] = g
			order = append(order, g)
		}
		g.cols = append(g.cols, col)
	}
	return order
}

// screenGroup screens the columns of one group, purpose marking its
// shuffle streams.
func (res *ScreenResult) screenGroup(in *Input, g *columnGroup, opt Options, purpose uint64) error {
	r, err := in.restrict(g.keep)
	if err != nil {
		for _, c := range g.cols {
			res.Skipped = append(res.Skipped, Skipped{c.Name, err.Error()})
		}
		return nil
	}
	// A column constant on the used areas, or too large for the sums of
	// the statistics, cannot be screened; find those first (by the checks
	// of autocorr.Centre) so the rest share one run.
	var xs [][]float64
	var cols []Column
	for _, c := range g.cols {
		x := r.Pick(c.Values)
		if err := checkMagnitude(x, in.IDs, r); err != nil {
			res.Skipped = append(res.Skipped, Skipped{c.Name, err.Error()})
			continue
		}
		if _, _, err := autocorr.Centre(x); errors.Is(err, autocorr.ErrConstant) {
			res.Skipped = append(res.Skipped, Skipped{c.Name, "constant on the areas with a value"})
			continue
		}
		xs, cols = append(xs, x), append(cols, c)
	}
	if len(xs) == 0 {
		return nil
	}
	labels, stats, f, err := autocorr.MoranGearyMany(xs, r.Graph, opt.Alternative)
	if err != nil {
		return err
	}
	p := planFor(opt, fmt.Sprintf("screening %d column(s)", len(xs)), purpose, opt.Alternative)
	p.Labels = labels
	out, err := shuffle.RunMany(p, stats, f)
	if err != nil {
		return err
	}
	for c, col := range cols {
		m, err := autocorr.MoranMoments(xs[c], r.Graph)
		if err != nil {
			return named(err, col.Name)
		}
		mi, gc := out[2*c], out[2*c+1]
		res.Rows = append(res.Rows, ScreenRow{Name: col.Name, Areas: len(xs[c]), Missing: len(in.IDs) - len(g.keep),
			MoransI: mi.Observed, MoranZ: (mi.Observed - m.Expected) / math.Sqrt(m.VarianceRandomisation),
			MoranP: mi.PValue, GearysC: gc.Observed, GearyP: gc.PValue, Exact: mi.Exact, MoranInterval: mi.Interval})
	}
	return nil
}

// adjustAndRank adjusts the p-values across the screened columns and ranks
// the columns by Moran's I, largest first.
func (res *ScreenResult) adjustAndRank(method shuffle.Adjustment) {
	mp := make([]float64, len(res.Rows))
	gp := make([]float64, len(res.Rows))
	for k, r := range res.Rows {
		mp[k], gp[k] = r.MoranP, r.GearyP
	}
	ma, ga := shuffle.Adjust(mp, method), shuffle.Adjust(gp, method)
	for k := range res.Rows {
		res.Rows[k].MoranPAdjusted, res.Rows[k].GearyPAdjusted = ma[k], ga[k]
	}
	sort.SliceStable(res.Rows, func(a, b int) bool { return res.Rows[a].MoransI > res.Rows[b].MoransI })
	for k := range res.Rows {
		res.Rows[k].Rank = k + 1
	}
}

// skipReason says why a numeric column is not screened, or "".
func skipReason(col Column, idColumn string, excluded map[string]bool) string {
	switch {
	case col.Name == idColumn:
		return "holds the area ids"
	case excluded[col.Name]:
		return "excluded on request"
	}
	var vals []float64
	for i, v := range col.Values {
		if !col.Missing[i] {
			vals = append(vals, v)
		}
	}
	if len(vals) < 4 {
		return fmt.Sprintf("only %d area(s) have a value", len(vals))
	}
	if isConstant(vals) {
		return "constant"
	}
	if idLike.MatchString(strings.TrimSpace(col.Name)) && distinctWholeNumbers(vals) {
		return "looks like an identifier (every value a different whole number, and the name says so); use it with autocorr if it is a measurement"
	}
	return ""
}

func isConstant(v []float64) bool {
	for _, x := range v[1:] {
		if x != v[0] {
			return false
		}
	}
	return true
}

func distinctWholeNumbers(v []float64) bool {
	seen := make(map[float64]bool, len(v))
	for _, x := range v {
		if x != math.Trunc(x) || seen[x] {
			return false
		}
		seen[x] = true
	}
	return true
}

func patternKey(missing []bool) string {
	var b strings.Builder
	for i, m := range missing {
		if m {
			fmt.Fprintf(&b, "%d,", i)
		}
	}
	return b.String()
}

// skippedText names the skipped columns and why, for the error of a screen
// with nothing left to screen: the reader needs to know which column to
// fix (a number column with a few bad values) or that there is none.
func skippedText(skipped []Skipped) string {
	if len(skipped) == 0 {
		return "the layer has no column besides the geometry"
	}
	const most = 12 // a wide table would bury the message
	parts := make([]string, 0, min(len(skipped), most)+1)
	for k, s := range skipped {
		if k == most {
			parts = append(parts, fmt.Sprintf("and %d more", len(skipped)-most))
			break
		}
		parts = append(parts, fmt.Sprintf("%q (%s)", s.Name, s.Reason))
	}
	return fmt.Sprintf("%d skipped: %s", len(skipped), strings.Join(parts, ", "))
}
