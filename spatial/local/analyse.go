package local

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// NoData is the category of areas without a value of the variable (or of
// the second variable of the cross local Moran).
const NoData = "no data"

// Cautions are printed with every local result.
var Cautions = []string{
	"A cluster on the map is a pattern across areas; it does not say what causes it.",
	"Results for areas do not carry over to the individuals living in them (the ecological fallacy).",
	"Rates from areas with small populations are unstable and often show up as outliers; smooth or standardise rates first.",
	"This tool supports, and does not replace, the judgement of trained epidemiologists and local rules of practice.",
}

// Input is a layer's columns for one local analysis. The slices have one
// entry per area of the layer, in layer order.
type Input struct {
	// File names the layer in messages and in the result.
	File string
	IDs  []string
	// Variable is the column analysed: Values, with Missing marking the
	// areas without a value.
	Variable string
	Values   []float64
	Missing  []bool
	// Against is the second variable of CrossMoran, whose values are drawn
	// into the neighbour slots; empty (and its slices nil) for the other
	// kinds.
	Against        string
	AgainstValues  []float64
	AgainstMissing []bool
	// Graph is the neighbour graph of all areas of the layer, before any
	// scaling; Analyse cuts it down to the areas with values and applies
	// Scaling (empty: row-standardised). KeepIslands keeps areas without
	// a neighbour among them, with a zero spatial lag.
	Graph       *weights.Graph
	Scaling     weights.Scaling
	KeepIslands bool
	// NullOf, when set, is the id of an analysed area whose null
	// distribution the result keeps (Area.Null), to draw it.
	NullOf string
}

// Area is one area of a local analysis, named by id. Areas left out (no
// value, or no neighbour) carry only their id, value and category.
type Area struct {
	ID string `json:"id"`
	// Value is the area's value, null when it has none (JSON has no NaN);
	// it shadows the embedded result's value.
	Value *float64 `json:"value"`
	AreaResult
	Analysed bool `json:"analysed"`
}

// Result is one local analysis of a layer: every area of the layer in
// layer order, with the run's summary. The reports render it as it is.
type Result struct {
	// Version is the caller's release, written into the outputs.
	Version  string          `json:"version"`
	Input    string          `json:"input"`
	Variable string          `json:"variable"`
	Against  string          `json:"against,omitempty"`
	Weights  weights.Summary `json:"weights"`
	// Summary counts the categories over the whole layer, so the areas
	// left out show too.
	Summary Summary `json:"summary"`
	// RawSignificant and AdjustedSignificant count the areas with a p-value
	// at most alpha before and after the multiple-testing adjustment.
	RawSignificant      int      `json:"significant_before_adjustment"`
	AdjustedSignificant int      `json:"significant_after_adjustment"`
	Areas               []Area   `json:"areas"`
	Warnings            []string `json:"warnings"`
	Cautions            []string `json:"cautions"`
	// Written lists the files the caller wrote from the result.
	Written []string `json:"written,omitempty"`
	// Kind is the statistic computed.
	Kind Kind `json:"-"`
	// nullArea is the layer row of the area Input.NullOf named, or -1.
	nullArea int
}

// NotAnalysedError is returned when Input.NullOf names an area that is not
// analysed: an unknown id, an area without a value, or one without a
// neighbour among the areas with values.
type NotAnalysedError struct {
	File, ID, Variable string
}

func (e *NotAnalysedError) Error() string {
	return fmt.Sprintf("%s: area %q is not an analysed area (unknown id, no value of %s, or no neighbour)", e.File, e.ID, e.Variable)
}

// Analyse runs kind on a layer: it restricts the graph to the areas with
// values, tests every one of them by conditional permutation (Run), and
// places the results among all areas of the layer, with categories for the
// areas left out (NoData, NoNeighbours). opt.KeepNull is set from
// in.NullOf.
func Analyse(kind Kind, in Input, opt Options) (*Result, error) {
	opt = opt.withDefaults()
	keep := weights.Present(len(in.IDs), in.Missing, in.AgainstMissing)
	r, err := weights.Restrict(in.Graph, keep, in.IDs, in.Scaling, in.KeepIslands)
	if err != nil {
		return nil, err
	}
	// r.Used holds the kept islands too; the count that matters here is
	// of the areas with a neighbour.
	if linked := r.Summary.Areas - r.Summary.Islands; len(r.Used) < 3 || linked == 0 {
		return nil, fmt.Errorf("%s: only %d of the %d areas with a value of %s have a neighbour among themselves; a local analysis needs at least three areas to analyse and a pair of neighbours among them", in.File, linked, r.Summary.Areas, in.Variable)
	}
	x, y := r.Pick(in.Values), r.Pick(in.AgainstValues)
	for _, v := range []struct {
		name string
		x    []float64
	}{{in.Variable, x}, {in.Against, y}} {
		var tl *autocorr.TooLargeError
		if err := autocorr.CheckMagnitude(v.x); errors.As(err, &tl) {
			tl.Column, tl.ID = v.name, in.IDs[r.Areas[tl.Index]]
			return nil, fmt.Errorf("%s: %w", in.File, err)
		}
	}
	opt.KeepNull = nil
	nullArea := -1
	if in.NullOf != "" {
		k := -1
		for j, i := range r.Areas {
			if in.IDs[i] == in.NullOf {
				k = j
			}
		}
		if k < 0 {
			return nil, &NotAnalysedError{File: in.File, ID: in.NullOf, Variable: in.Variable}
		}
		opt.KeepNull, nullArea = []int{k}, r.Areas[k]
	}
	results, err := Run(kind, x, y, r.Graph, opt)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", in.File, err)
	}
	res := &Result{Input: in.File, Variable: in.Variable, Against: in.Against, Weights: r.Summary,
		Summary: Summarise(kind, results, opt), Warnings: append([]string{}, r.Summary.Warnings...),
		Cautions: Cautions, Kind: kind, nullArea: nullArea}
	for _, a := range results {
		if a.P <= opt.Alpha {
			res.RawSignificant++
		}
		if a.AdjustedP <= opt.Alpha {
			res.AdjustedSignificant++
		}
	}
	res.place(in, keep, r.Areas, results)
	res.countCategories()
	res.warn(len(in.IDs)-len(keep), len(keep)-len(r.Used), opt)
	if w := reachWarning(res, results, opt); w != "" {
		res.Warnings = append(res.Warnings, w)
	}
	return res, nil
}

// place puts every area of the layer into res.Areas: the analysed ones
// with their results (Index mapped back to the layer row), the others with
// the category that says why they were left out.
func (res *Result) place(in Input, keep, areas []int, results []AreaResult) {
	res.Areas = make([]Area, len(in.IDs))
	for i := range res.Areas {
		res.Areas[i] = Area{ID: in.IDs[i], AreaResult: AreaResult{Index: i, Category: NoData}}
		if !in.Missing[i] {
			res.Areas[i].Value = &in.Values[i]
		}
	}
	for _, k := range keep {
		res.Areas[k].Category = NoNeighbours
	}
	for k, a := range results {
		i := areas[k]
		a.Index = i
		res.Areas[i] = Area{ID: in.IDs[i], Value: &in.Values[i], AreaResult: a, Analysed: true}
	}
}

// countCategories counts the categories over the whole layer, NoData last
// and only when some area has it.
func (res *Result) countCategories() {
	count := map[string]int{}
	for _, a := range res.Areas {
		count[a.Category]++
	}
	res.Summary.Categories = res.Summary.Categories[:0]
	for _, name := range append(Categories(res.Kind), NoData) {
		if name != NoData || count[NoData] > 0 {
			res.Summary.Categories = append(res.Summary.Categories, CategoryCount{Category: name, Areas: count[name]})
		}
	}
}

func (res *Result) warn(missing, islands int, opt Options) {
	if missing > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d area(s) have no value and are drawn as \"%s\".", missing, NoData))
	}
	if islands > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d area(s) have no neighbour among the areas with values and are left out (category \"%s\").", islands, NoNeighbours))
	}
	if opt.Alternative == shuffle.Folded {
		res.Warnings = append(res.Warnings, fmt.Sprintf("Folded p-values are one-sided in the direction each area departs: on a map without any spatial pattern about %g%% of areas pass at %g before adjustment.", 200*opt.Alpha, opt.Alpha))
	}
}

// Analysed returns the analysed areas in layer order.
func (res *Result) Analysed() []Area {
	var out []Area
	for _, a := range res.Areas {
		if a.Analysed {
			out = append(out, a)
		}
	}
	return out
}

// Strongest returns up to top analysed areas with a significant category,
// by |z|, largest first (ties in layer order).
func (res *Result) Strongest(top int) []Area {
	var out []Area
	for _, a := range res.Analysed() {
		if a.Category != NotSignificant && a.Category != NoNeighbours {
			out = append(out, a)
		}
	}
	sort.SliceStable(out, func(i, j int) bool { return math.Abs(out[i].Z) > math.Abs(out[j].Z) })
	if len(out) > max(top, 0) {
		out = out[:max(top, 0)]
	}
	return out
}

// NullArea returns the area Input.NullOf named, with its null
// distribution in Null, or nil when none was asked for.
func (res *Result) NullArea() *Area {
	if res.nullArea < 0 {
		return nil
	}
	return &res.Areas[res.nullArea]
}

// CategoryIndex is the position of category in Categories(kind), or -1
// (NoData).
func CategoryIndex(kind Kind, category string) int {
	for k, c := range Categories(kind) {
		if c == category {
			return k
		}
	}
	return -1
}
