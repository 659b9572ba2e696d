package regress

import (
	"errors"
	"fmt"
	"math"
	"reflect"
	"strings"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// layerInput is a rows×cols rook lattice as a layer: an outcome y from two
// covariates and noise, the numeric covariate x and the text covariate g
// (levels "b", "a", "c" in turn), with the outcome missing on missingY and
// x on missingX.
func layerInput(rows, cols int, missingY, missingX []int) Input {
	n := rows * cols
	x := design(rows, cols, 2, 5)
	u := make([]float64, n)
	rng := shuffle.NewStream(9, 2, 0)
	rng.Normals(u)
	in := Input{File: "grid", IDs: make([]string, n), Graph: weights.Lattice(rows, cols, weights.Rook), Alpha: 0.05,
		Outcome:    Column{Name: "y", Values: outcome(x, u), Missing: make([]bool, n)},
		Covariates: []Column{{Name: "x", Values: x[0], Missing: make([]bool, n)}, {Name: "g", Labels: make([]string, n), Missing: make([]bool, n)}}}
	for i := range in.IDs {
		in.IDs[i] = fmt.Sprintf("A%02d", i)
		in.Covariates[1].Labels[i] = []string{"b", "a", "c"}[i%3]
	}
	for _, i := range missingY {
		in.Outcome.Missing[i] = true
	}
	for _, i := range missingX {
		in.Covariates[0].Missing[i] = true
	}
	return in
}

// Analyse leaves out the areas missing a value (by the first column they
// lack) and, unless kept, those left without a neighbour; codes the text
// covariate against its first level; and reports exactly what OLS, Moran
// and LagrangeMultipliers give on the areas used and the graph among them.
func TestAnalyseSelectsCodesAndFits(t *testing.T) {
	cases := []struct {
		name               string
		missingY, missingX []int
		keepIslands        bool
		used               int
		excluded           []Exclusion
		islandsLeft, kept  int
	}{
		{"missing values", []int{3}, []int{7, 8, 3}, false, 27,
			[]Exclusion{{"missing y", 1, []string{"A03"}}, {"missing x", 2, []string{"A07", "A08"}}}, 0, 0},
		// Area 14 of a 5×6 lattice loses all four neighbours (8, 13, 15, 20).
		{"an island left out", []int{8, 13, 15}, []int{20}, false, 25,
			[]Exclusion{{"missing y", 3, []string{"A08", "A13", "A15"}}, {"missing x", 1, []string{"A20"}},
				{"no neighbour among the areas with data", 1, []string{"A14"}}}, 1, 0},
		{"an island kept", []int{8, 13, 15}, []int{20}, true, 26,
			[]Exclusion{{"missing y", 3, []string{"A08", "A13", "A15"}}, {"missing x", 1, []string{"A20"}}}, 0, 1},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in := layerInput(5, 6, c.missingY, c.missingX)
			in.KeepIslands = c.keepIslands
			res, err := Analyse(in)
			if err != nil {
				t.Fatal(err)
			}
			if res.Input.Used != c.used || len(res.Rows) != c.used || !reflect.DeepEqual(res.Excluded, c.excluded) ||
				res.IslandsLeftOut != c.islandsLeft || res.IslandsKept != c.kept {
				t.Fatalf("used %d, left out %v, islands %d/%d; want %d, %v, %d/%d",
					res.Input.Used, res.Excluded, res.IslandsLeftOut, res.IslandsKept, c.used, c.excluded, c.islandsLeft, c.kept)
			}
			want := Indicator{Column: "g", Baseline: "a", Levels: []string{"b", "c"}, Terms: []string{"g=b", "g=c"}}
			if len(res.Indicators) != 1 || !reflect.DeepEqual(res.Indicators[0], want) {
				t.Errorf("indicators %+v, want %+v", res.Indicators, want)
			}
			checkAgainstLibrary(t, in, res)
		})
	}
}

// checkAgainstLibrary fits the same model by hand on res.Rows (the dummies
// of g written out) and compares every figure of res with it.
func checkAgainstLibrary(t *testing.T, in Input, res *Result) {
	t.Helper()
	pick := func(v []float64) []float64 {
		out := make([]float64, len(res.Rows))
		for k, i := range res.Rows {
			out[k] = v[i]
		}
		return out
	}
	b, c := make([]float64, len(res.Rows)), make([]float64, len(res.Rows))
	for k, i := range res.Rows {
		b[k] = map[bool]float64{true: 1}[in.Covariates[1].Labels[i] == "b"]
		c[k] = map[bool]float64{true: 1}[in.Covariates[1].Labels[i] == "c"]
	}
	fit, err := OLS(pick(in.Outcome.Values), [][]float64{pick(in.Covariates[0].Values), b, c}, []string{"x", "g=b", "g=c"})
	if err != nil {
		t.Fatal(err)
	}
	g, err := in.Graph.Subset(res.Rows).Scaled(weights.RowStandardised)
	if err != nil {
		t.Fatal(err)
	}
	moran, err := fit.Moran(g, shuffle.TwoSided)
	if err != nil {
		t.Fatal(err)
	}
	lm, err := fit.LagrangeMultipliers(g)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(res.Fit.Coefficients, fit.Coefficients) || !reflect.DeepEqual(res.Fit.Residuals, fit.Residuals) {
		t.Errorf("coefficients %+v, by hand %+v", res.Fit.Coefficients, fit.Coefficients)
	}
	if res.Moran != moran || *res.LM != lm || res.Reading != Reading(lm, 0.05) || res.Suggestion != Suggest(lm, 0.05).String() {
		t.Errorf("Moran %+v LM %+v, by hand %+v %+v", res.Moran, *res.LM, moran, lm)
	}
}

// Models without a unique fit or without enough areas are typed errors
// that name the file and the column, and say what text covariates add.
func TestAnalyseErrors(t *testing.T) {
	cases := []struct {
		name  string
		edit  func(in *Input)
		check func(err error) bool
		words []string
	}{
		{"one level", func(in *Input) {
			for i := range in.Covariates[1].Labels {
				in.Covariates[1].Labels[i] = "same"
			}
		}, func(err error) bool { var e *ValueError; return errors.As(err, &e) && e.Column == "g" }, []string{"grid: g:", `one value ("same")`}},
		{"a copy", func(in *Input) {
			twice := make([]float64, len(in.IDs))
			for i, v := range in.Covariates[0].Values {
				twice[i] = 2 * v
			}
			in.Covariates = append(in.Covariates, Column{Name: "x2", Values: twice, Missing: make([]bool, len(twice))})
		}, func(err error) bool { var e *CollinearError; return errors.As(err, &e) && e.Covariate == "x2" }, []string{"grid: covariate \"x2\""}},
		{"too few areas", func(in *Input) {
			for i := 4; i < len(in.IDs); i++ {
				in.Outcome.Missing[i] = true
			}
		}, func(err error) bool { var e *TooFewAreasError; return errors.As(err, &e) }, []string{"grid: 4 areas", "g adds 2"}},
		{"no data", func(in *Input) {
			for i := range in.IDs {
				in.Outcome.Missing[i] = true
			}
		}, func(err error) bool { return err != nil }, []string{"grid: no area has a value", "(y, x, g)"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			in := layerInput(3, 4, nil, nil)
			c.edit(&in)
			_, err := Analyse(in)
			if err == nil || !c.check(err) {
				t.Fatalf("error %v", err)
			}
			for _, w := range c.words {
				if !strings.Contains(err.Error(), w) || strings.Contains(err.Error(), "regress:") {
					t.Errorf("error %q lacks %q or names the package", err, w)
				}
			}
		})
	}
}

// On a graph of two complete groups (5 and 7 areas), row-standardised,
// the lag of the group indicator is the indicator itself, so with it as
// the covariate the lag and error alternatives cannot be told apart: the
// fit and the residual Moran's I are reported, the LM tests are not, and
// the reading says why.
func TestAnalyseWithoutLMTests(t *testing.T) {
	in := layerInput(3, 4, nil, nil)
	var pairs [][2]int32
	block := make([]float64, 12)
	for i := range int32(12) {
		block[i] = map[bool]float64{true: 1}[i >= 5]
		for j := i + 1; j < 12; j++ {
			if (i >= 5) == (j >= 5) {
				pairs = append(pairs, [2]int32{i, j})
			}
		}
	}
	g, err := weights.FromLinks(12, pairs, "two groups")
	if err != nil {
		t.Fatal(err)
	}
	in.Graph = g
	in.Covariates = []Column{{Name: "block", Values: block, Missing: make([]bool, 12)}}
	res, err := Analyse(in)
	if err != nil {
		t.Fatal(err)
	}
	if res.LM != nil || res.Suggestion != "" || !strings.Contains(res.LMNotComputed, "cannot be told apart") ||
		!strings.HasPrefix(res.Reading, "The Lagrange multiplier tests are not computed") || !strings.HasSuffix(res.Reading, Caution) {
		t.Errorf("LM %+v, not computed %q, reading %q", res.LM, res.LMNotComputed, res.Reading)
	}
	if res.Fit == nil || math.IsNaN(res.Moran.I) || !res.Moran.Exact {
		t.Errorf("fit %v, Moran %+v", res.Fit != nil, res.Moran)
	}
}
