package regress

import (
	"errors"
	"fmt"
	"sort"
	"strings"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Column is one column of a layer for Analyse, one entry per area in
// layer order: numbers in Values, or, for a text covariate, Labels (Values
// nil). Missing marks the areas without a value.
type Column struct {
	Name    string
	Values  []float64
	Labels  []string
	Missing []bool
}

// Input is a layer's columns for one run of Analyse.
type Input struct {
	// File names the layer in messages and in the result.
	File string
	IDs  []string
	// Outcome must hold numbers; a covariate may be text, which becomes
	// indicator columns (Indicator).
	Outcome    Column
	Covariates []Column
	// Graph is the neighbour graph of all areas of the layer, before any
	// scaling; Analyse cuts it down to the areas with data and applies
	// Scaling (empty: row-standardised). Areas without a neighbour among
	// them are left out of the fit as well as the tests, so that the
	// residuals tested are those of the model fitted, unless KeepIslands,
	// which keeps them with a zero spatial lag.
	Graph       *weights.Graph
	Scaling     weights.Scaling
	KeepIslands bool
	// Alternative is the direction of the residual Moran's p-values;
	// Alpha the level of the reading of the LM tests.
	Alternative shuffle.Alternative
	Alpha       float64
}

// Analyse fits the outcome on the covariates over the areas that have
// every value and a neighbour among each other (see Input.Graph), and tests
// the residuals on the graph among them: Moran's I with its exact moments,
// and the LM tests with their reading at Alpha. Errors name the file; the
// fit's typed errors (*TooFewAreasError, *CollinearError, *ValueError) are
// wrapped.
func Analyse(in Input) (*Result, error) {
	keep, excluded := present(in)
	if len(keep) == 0 {
		return nil, fmt.Errorf("%s: no area has a value of every column of the model (%s)", in.File, strings.Join(columnNames(in), ", "))
	}
	r, err := weights.Restrict(in.Graph, keep, in.IDs, in.Scaling, in.KeepIslands)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", in.File, err)
	}
	res := &Result{Input: Inputs{File: in.File, Areas: len(in.IDs), Used: len(r.Areas), Outcome: in.Outcome.Name},
		Indicators: []Indicator{}, Excluded: excluded, Weights: r.Summary, Alpha: in.Alpha,
		Warnings: append([]string{}, r.Summary.Warnings...), Cautions: Cautions, Rows: r.Areas}
	res.islands(in, keep, r)
	if r.Summary.Areas == r.Summary.Islands {
		return nil, fmt.Errorf("%s: none of the %d areas with data has a neighbour among the others, so nothing is left to test", in.File, len(keep))
	}
	y := r.Pick(in.Outcome.Values)
	x, names, err := res.design(in, r)
	if err != nil {
		return nil, err
	}
	if res.Fit, err = OLS(y, x, names); err != nil {
		return nil, located(in.File, res.explain(err))
	}
	res.Warnings = append(res.Warnings, res.Fit.Warnings...)
	if err := res.test(r.Graph, in.Alternative); err != nil {
		return nil, located(in.File, err)
	}
	return res, nil
}

// present returns the areas that have every column of the model, and the
// others counted by the first column they lack.
func present(in Input) ([]int, []Exclusion) {
	cols := append([]Column{in.Outcome}, in.Covariates...)
	var keep []int
	excluded := []Exclusion{}
	slot := map[string]int{}
	for i, id := range in.IDs {
		why := ""
		for _, c := range cols {
			if c.Missing[i] {
				why = "missing " + c.Name
				break
			}
		}
		if why == "" {
			keep = append(keep, i)
			continue
		}
		k, ok := slot[why]
		if !ok {
			k = len(excluded)
			slot[why] = k
			excluded = append(excluded, Exclusion{Reason: why})
		}
		excluded[k].Areas++
		excluded[k].IDs = append(excluded[k].IDs, id)
	}
	return keep, excluded
}

func columnNames(in Input) []string {
	names := []string{in.Outcome.Name}
	for _, c := range in.Covariates {
		names = append(names, c.Name)
	}
	return names
}

// islands records the areas with data that have no neighbour among them:
// left out (an exclusion of their own) or kept.
func (res *Result) islands(in Input, keep []int, r *weights.Restricted) {
	if in.KeepIslands {
		if res.IslandsKept = r.Summary.Islands; res.IslandsKept > 0 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("%d area(s) have no neighbour among the areas with data and are kept with a zero spatial lag: they count in the fit and in the spread of the residuals, but add nothing to the spatial tests' cross-products.", res.IslandsKept))
		}
		return
	}
	used := make(map[int]bool, len(r.Areas))
	for _, i := range r.Areas {
		used[i] = true
	}
	e := Exclusion{Reason: "no neighbour among the areas with data"}
	for _, i := range keep {
		if !used[i] {
			e.Areas++
			e.IDs = append(e.IDs, in.IDs[i])
		}
	}
	if e.Areas > 0 {
		res.IslandsLeftOut = e.Areas
		res.Excluded = append(res.Excluded, e)
	}
}

// design returns the covariate columns of the fit on the areas used, each
// text covariate replaced by its indicators, with their names.
func (res *Result) design(in Input, r *weights.Restricted) (x [][]float64, names []string, err error) {
	for _, c := range in.Covariates {
		res.Input.Covariates = append(res.Input.Covariates, c.Name)
		if c.Labels == nil {
			x, names = append(x, r.Pick(c.Values)), append(names, c.Name)
			continue
		}
		ind, cols, err := indicators(c, r.Areas)
		if err != nil {
			return nil, nil, located(in.File, err)
		}
		res.Indicators = append(res.Indicators, ind)
		x, names = append(x, cols...), append(names, ind.Terms...)
	}
	return x, names, nil
}

// indicators codes a text covariate on the areas rows as one 0/1 column
// per level but the first (LevelOrder).
func indicators(c Column, rows []int) (Indicator, [][]float64, error) {
	seen := map[string]bool{}
	for _, i := range rows {
		seen[c.Labels[i]] = true
	}
	levels := make([]string, 0, len(seen))
	for l := range seen {
		levels = append(levels, l)
	}
	sort.Strings(levels)
	if len(levels) < 2 {
		return Indicator{}, nil, &ValueError{Column: c.Name, Index: -1,
			Problem: fmt.Sprintf("the text covariate takes one value (%q) on every area used, so it explains nothing; leave it out", levels[0])}
	}
	ind := Indicator{Column: c.Name, Baseline: levels[0], Levels: levels[1:]}
	cols := make([][]float64, len(ind.Levels))
	for k, l := range ind.Levels {
		ind.Terms = append(ind.Terms, c.Name+"="+l)
		cols[k] = make([]float64, len(rows))
		for j, i := range rows {
			if c.Labels[i] == l {
				cols[k][j] = 1
			}
		}
	}
	return ind, cols, nil
}

// explain adds to a fit without enough areas how many columns the text
// covariates added, which a user may not have counted.
func (res *Result) explain(err error) error {
	var tf *TooFewAreasError
	if !errors.As(err, &tf) || len(res.Indicators) == 0 {
		return err
	}
	var parts []string
	for _, ind := range res.Indicators {
		parts = append(parts, fmt.Sprintf("%s adds %d", ind.Column, len(ind.Terms)))
	}
	return &locatedError{fmt.Sprintf("%v (each text covariate adds one column per level but its first: %s)", err, strings.Join(parts, ", ")), err}
}

// locatedError is an error of this package for a reader: the file first,
// without the package's prefix, which names code rather than data.
type locatedError struct {
	msg string
	err error
}

func (e *locatedError) Error() string { return e.msg }
func (e *locatedError) Unwrap() error { return e.err }

// located words err for the layer file.
func located(file string, err error) error {
	return &locatedError{file + ": " + strings.TrimPrefix(err.Error(), "regress: "), err}
}

// test runs the residual Moran's I and the LM tests on g and reads them.
func (res *Result) test(g *weights.Graph, alt shuffle.Alternative) (err error) {
	if res.Moran, err = res.Fit.Moran(g, alt); err != nil {
		return err
	}
	lm, err := res.Fit.LagrangeMultipliers(g)
	switch {
	case errors.Is(err, ErrNoLagSignal):
		res.LMNotComputed = strings.TrimPrefix(err.Error(), "regress: ")
		res.Reading = "The Lagrange multiplier tests are not computed: " + res.LMNotComputed + ". " + Caution
		return nil
	case err != nil:
		return err
	}
	res.LM = &lm
	res.Suggestion = Suggest(lm, res.Alpha).String()
	res.Reading = Reading(lm, res.Alpha)
	return nil
}
