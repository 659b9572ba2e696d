// Package compare runs the tool's main job: does an outcome differ between
// groups of areas beyond chance? It takes plain columns and a neighbour
// graph, runs the group statistic under every shuffle scheme asked for, and
// checks whether the outcome and the grouping cluster in space, which is
// when an ordinary shuffle overstates significance.
package compare

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/effective"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/weights"
)

// Input is what one comparison needs. All slices have one entry per area of
// the layer, in layer order.
type Input struct {
	IDs []string
	// Outcome values, with OutcomeMissing marking areas without one.
	OutcomeName    string
	Outcome        []float64
	OutcomeMissing []bool
	// Group labels as text, with GroupMissing marking areas without one.
	GroupName    string
	Group        []string
	GroupMissing []bool
	// Strata labels, optional (nil when no strata were asked for).
	StrataName    string
	Strata        []string
	StrataMissing []bool
	// Graph is the neighbour graph of all areas of the layer, before any
	// transform.
	Graph *weights.Graph
	// Transform is applied to the graph among the tested areas before the
	// spatial check; empty means row-standardised.
	Transform weights.Transform
	// KeepIslands keeps areas without neighbours in the spatial check, with
	// a spatial lag of zero, instead of leaving them out.
	KeepIslands bool
	// Covariates, when given, make every scheme test the group effect
	// adjusted for them (Freedman & Lane 1983).
	Covariates []Covariate
}

// Covariate is a numeric column to adjust for.
type Covariate struct {
	Name    string
	Values  []float64
	Missing []bool
}

// Options tune the comparison.
type Options struct {
	// Statistic, when nil, is chosen from the number of groups: difference
	// in medians for two, Kruskal–Wallis H for more.
	Statistic *groups.Statistic
	// Contrast names the two levels A and B of a two-group contrast, A − B.
	// With more than two levels in the data it restricts the test to them.
	Contrast    []string
	Alternative shuffle.Alternative
	// Permutations is the number of Monte Carlo shuffles B per scheme.
	Permutations int
	// ExactLimit as in shuffle.Plan.
	ExactLimit int
	Seed       uint64
	Workers    int
	// Alpha is the level at which the spatial check calls clustering
	// significant.
	Alpha float64
	// Zones adds a shuffle within automatic contiguous zones when no strata
	// are given and at least ZoneMinAreas areas are tested.
	Zones bool
	// Surrogates is the number of spectral surrogates of the outcome for
	// the spatially constrained scheme (0: not run).
	Surrogates int
	// FalsePositives is the number of surrogates on which the free
	// shuffle's false-positive rate is measured (0: not measured), with
	// FalsePositiveShuffles shuffles each (0: 199).
	FalsePositives, FalsePositiveShuffles int
	// Basis tunes the eigenbasis of the surrogates.
	Basis surrogate.Options
	// Progress, when set, gives the progress callback for a named stage of
	// the work (see shuffle.Plan.Progress).
	Progress func(stage string) func(done, total int)
}

func (o Options) progress(stage string) func(done, total int) {
	if o.Progress == nil {
		return nil
	}
	return o.Progress(stage)
}

// Result is everything a report shows. The text report, the JSON document
// and any later view render this one struct.
type Result struct {
	Version string    `json:"version"`
	Seed    uint64    `json:"seed"`
	Input   InputInfo `json:"input"`
	// Weights summarises the neighbour graph among the tested areas.
	Weights weights.Summary `json:"weights"`
	Groups  []GroupResult   `json:"groups"`
	// Statistic describes the group statistic and its observed value.
	Statistic StatisticInfo `json:"statistic"`
	// Tests holds one entry per shuffle scheme, the free shuffle first.
	Tests           []shuffle.Result `json:"tests"`
	Autocorrelation Autocorrelation  `json:"autocorrelation"`
	Excluded        []Exclusion      `json:"excluded"`
	Warnings        []string         `json:"warnings"`
	Cautions        []string         `json:"cautions"`
	// Adjusted describes the covariate adjustment, when asked for.
	Adjusted *CovariateInfo `json:"adjusted,omitempty"`
	// Zones describes the automatic zones of the within-zone shuffle.
	Zones *ZonesInfo `json:"zones,omitempty"`
	// EffectiveSampleSize is the modified t-test of outcome against
	// grouping: how many independent areas the data are worth.
	EffectiveSampleSize *EffectiveInfo `json:"effective_sample_size,omitempty"`
	// Spectral describes the eigenbasis behind the spectral surrogates.
	Spectral *SpectralInfo `json:"spectral_basis,omitempty"`
	// FalsePositiveRate is the measured share of true nulls the free
	// shuffle rejects on surrogates with the outcome's spatial pattern.
	FalsePositiveRate *surrogate.FalsePositiveRate `json:"false_positive_rate,omitempty"`
	// Recommended names the p-value to read and why.
	Recommended Recommendation `json:"recommended"`
}

// SpectralInfo describes the eigenbasis of the spectral surrogates and how
// faithfully surrogates keep the outcome's Moran's I.
type SpectralInfo struct {
	surrogate.Info
	// ResidualShare is the share of the outcome's variance outside the
	// stored eigenvectors (0 for a complete basis), MoranTolerance the
	// guaranteed bound on how far a surrogate's Moran's I can move.
	ResidualShare  float64 `json:"residual_share"`
	MoranTolerance float64 `json:"morans_i_tolerance"`
}

// Recommendation is the p-value the tool advises reading.
type Recommendation struct {
	Scheme string  `json:"scheme"`
	PValue float64 `json:"p_value"`
	Reason string  `json:"reason"`
}

// CovariateInfo describes the Freedman–Lane adjustment.
type CovariateInfo struct {
	Covariates []string `json:"covariates"`
	Method     string   `json:"method"`
	Statistic  string   `json:"statistic"`
	Observed   float64  `json:"observed"`
	// ClassicalP is the p-value of the same statistic from its t or F
	// distribution, exact for independent normal errors.
	ClassicalP float64 `json:"classical_p_value"`
}

// ZonesInfo describes automatic contiguous zones.
type ZonesInfo struct {
	Zones int   `json:"zones"`
	Sizes []int `json:"sizes"`
}

// EffectiveInfo is the modified t-test of the outcome against a group
// indicator (group Level against the rest).
type EffectiveInfo struct {
	effective.Result
	Level   string             `json:"level"`
	Note    string             `json:"note,omitempty"`
	ByGroup []EffectiveByGroup `json:"by_group,omitempty"`
}

// EffectiveByGroup is the modified t-test of one group against the others.
type EffectiveByGroup struct {
	Level string `json:"level"`
	effective.Result
}

// InputInfo says what was read and which columns were used.
type InputInfo struct {
	File    string `json:"file"`
	Areas   int    `json:"areas"`
	Tested  int    `json:"tested"`
	Outcome string `json:"outcome"`
	Group   string `json:"group"`
	Strata  string `json:"strata,omitempty"`
}

// GroupResult is one group's size and outcome summary.
type GroupResult struct {
	Level string `json:"level"`
	groups.Summary
}

// StatisticInfo names the group statistic and gives its observed value.
type StatisticInfo struct {
	Name     string  `json:"name"`
	Label    string  `json:"label"`
	Observed float64 `json:"observed"`
	// Contrast is [A, B] for a two-group statistic, read as A − B.
	Contrast []string `json:"contrast,omitempty"`
	// Units says whether Observed is in the outcome's units.
	InOutcomeUnits bool `json:"in_outcome_units"`
}

// Autocorrelation is the spatial check: Moran's I of the outcome and of each
// group indicator, with permutation p-values.
type Autocorrelation struct {
	Outcome VariableMoran   `json:"outcome"`
	Group   []VariableMoran `json:"group"`
	// Clustered is true when both the outcome and some group indicator show
	// significant positive autocorrelation at Alpha.
	Clustered bool    `json:"clustered"`
	Alpha     float64 `json:"alpha"`
}

// VariableMoran is Moran's I of one variable.
type VariableMoran struct {
	Variable     string  `json:"variable"`
	MoransI      float64 `json:"morans_i"`
	Expected     float64 `json:"expected"`
	PValue       float64 `json:"p_value"`
	Permutations int     `json:"permutations"`
	Exact        bool    `json:"exact"`
}

// Exclusion counts the areas left out for one reason.
type Exclusion struct {
	Reason string   `json:"reason"`
	Areas  int      `json:"areas"`
	IDs    []string `json:"ids"`
}

// Cautions are printed with every result.
var Cautions = []string{
	"An association between areas is not evidence that one thing causes the other.",
	"Results for areas do not carry over to the individuals living in them (the ecological fallacy).",
	"Rates from areas with small populations are unstable and can dominate a comparison.",
	"This tool supports, and does not replace, the judgement of trained epidemiologists and local rules of practice.",
}

// Error is a problem with the data that the user must fix; it names the
// column concerned.
type Error struct{ Msg string }

func (e *Error) Error() string { return e.Msg }

func dataErr(format string, a ...any) error { return &Error{Msg: fmt.Sprintf(format, a...)} }

// Run carries out the comparison.
func Run(in Input, opt Options) (*Result, error) {
	n := len(in.IDs)
	if len(in.Outcome) != n || len(in.Group) != n || in.Graph == nil || in.Graph.Len() != n {
		return nil, errors.New("compare: input columns and graph disagree in length")
	}
	res := &Result{Seed: opt.Seed, Cautions: Cautions, Warnings: []string{}, Excluded: []Exclusion{}}
	res.Input = InputInfo{Areas: n, Outcome: in.OutcomeName, Group: in.GroupName, Strata: in.StrataName}

	// Decide which areas take part, recording why the others do not.
	keep := make([]int, 0, n)
	reasons := map[string]*Exclusion{}
	var order []string
	exclude := func(i int, why string) {
		e, ok := reasons[why]
		if !ok {
			e = &Exclusion{Reason: why}
			reasons[why] = e
			order = append(order, why)
		}
		e.Areas++
		e.IDs = append(e.IDs, in.IDs[i])
	}
	var contrast map[string]bool
	if len(opt.Contrast) > 0 {
		if len(opt.Contrast) != 2 || opt.Contrast[0] == opt.Contrast[1] {
			return nil, dataErr("--contrast needs two different levels of %s, as A,B", in.GroupName)
		}
		contrast = map[string]bool{opt.Contrast[0]: true, opt.Contrast[1]: true}
	}
	for i := 0; i < n; i++ {
		switch {
		case in.OutcomeMissing[i]:
			exclude(i, "missing "+in.OutcomeName)
		case in.GroupMissing[i]:
			exclude(i, "missing "+in.GroupName)
		case in.Strata != nil && in.StrataMissing[i]:
			exclude(i, "missing "+in.StrataName)
		case contrast != nil && !contrast[in.Group[i]]:
			exclude(i, fmt.Sprintf("%s not in the contrast", in.GroupName))
		case missingCovariate(in.Covariates, i) != "":
			exclude(i, "missing "+missingCovariate(in.Covariates, i))
		default:
			keep = append(keep, i)
		}
	}
	for _, r := range order {
		res.Excluded = append(res.Excluded, *reasons[r])
	}

	// Levels, in the order of the contrast when one is given.
	present := map[string]int{}
	for _, i := range keep {
		present[in.Group[i]]++
	}
	levels, err := orderLevels(present, opt.Contrast, in.GroupName)
	if err != nil {
		return nil, err
	}
	if len(levels) < 2 {
		return nil, dataErr("%s has only one level (%q) among the %d areas with data; a comparison needs at least two groups", in.GroupName, levels[0], len(keep))
	}
	for _, l := range levels {
		if present[l] < 2 {
			return nil, dataErr("group %s=%q has %d area with data; every group needs at least 2", in.GroupName, l, present[l])
		}
	}
	code := map[string]int32{}
	for k, l := range levels {
		code[l] = int32(k)
	}
	y := make([]float64, len(keep))
	lab := make([]int32, len(keep))
	for k, i := range keep {
		y[k] = in.Outcome[i]
		lab[k] = code[in.Group[i]]
	}
	res.Input.Tested = len(keep)

	stat := groups.KruskalWallis
	if len(levels) == 2 {
		stat = groups.DiffMedians
	}
	if opt.Statistic != nil {
		stat = *opt.Statistic
		if stat.TwoGroupsOnly() && len(levels) != 2 {
			return nil, dataErr("the %s compares two groups, but %s has %d levels (%s); use kruskal-wallis or anova-f, or pick two with --contrast",
				stat, in.GroupName, len(levels), strings.Join(quoteAll(levels), ", "))
		}
	}
	data, err := groups.Prepare(y, lab, len(levels))
	if err != nil {
		return nil, err
	}
	for g, s := range data.Summaries() {
		res.Groups = append(res.Groups, GroupResult{Level: levels[g], Summary: s})
	}
	res.Statistic = StatisticInfo{Name: stat.Flag(), Label: stat.String(), Observed: data.Observed(stat),
		InOutcomeUnits: stat.InOutcomeUnits()}
	if stat.TwoGroupsOnly() {
		res.Statistic.Contrast = []string{levels[0], levels[1]}
	}
	if math.IsNaN(res.Statistic.Observed) || math.IsInf(res.Statistic.Observed, 0) {
		return nil, dataErr("the %s of %s is undefined for these data (is %s constant within each group?)", stat, in.OutcomeName, in.OutcomeName)
	}
	alt := opt.Alternative
	if !stat.Directional() && alt != shuffle.Greater {
		// H and F grow with any separation of the groups; only their upper
		// tail is evidence.
		alt = shuffle.Greater
	}
	t := &tester{opt: opt, data: data, stat: stat, alt: alt}
	if len(in.Covariates) > 0 {
		if err := t.adjustFor(in, keep, y, lab, len(levels), res); err != nil {
			return nil, err
		}
	}
	free, err := t.run("free", nil, 1, "free shuffle")
	if err != nil {
		return nil, err
	}
	res.Tests = append(res.Tests, free)

	if in.Strata != nil {
		strata, count := codes(keep, in.Strata)
		if count < 2 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("%s has a single level among the tested areas, so the within-%s shuffle is the free shuffle.", in.StrataName, in.StrataName))
		}
		within, err := t.run("within "+in.StrataName, strata, 2, "shuffle within "+in.StrataName)
		if err != nil {
			return nil, err
		}
		res.Tests = append(res.Tests, within)
		if mixedStrata(strata, lab) == 0 {
			res.Warnings = append(res.Warnings, fmt.Sprintf("No level of %s holds areas of more than one group, so shuffling within %s cannot move a label: its p-value is 1 by construction.", in.StrataName, in.StrataName))
		}
	} else if opt.Zones && len(keep) >= ZoneMinAreas {
		zones, err := weights.Zones(in.Graph.Subset(keep), 0)
		if err != nil {
			return nil, err
		}
		count := len(weights.ZoneSizes(zones))
		name := fmt.Sprintf("within %d automatic zones", count)
		within, err := t.run(name, zones, 3, "shuffle within zones")
		if err != nil {
			return nil, err
		}
		res.Tests = append(res.Tests, within)
		res.Zones = &ZonesInfo{Zones: count, Sizes: weights.ZoneSizes(zones)}
		if mixedStrata(zones, lab) == 0 {
			res.Warnings = append(res.Warnings, "No automatic zone holds areas of more than one group, so the within-zone shuffle cannot move a label: its p-value is 1 by construction.")
		}
	}

	if opt.Surrogates > 0 || opt.FalsePositives > 0 {
		if t.fl != nil {
			res.Warnings = append(res.Warnings, "Spectral surrogates and the false-positive check are not run with --covariates: the adjusted statistic would need surrogates of the residuals, which this version does not make.")
		} else if err := spectral(in, opt, keep, y, lab, len(levels), stat, alt, res); err != nil {
			return nil, err
		}
	}
	if err := effectiveSize(in, keep, y, lab, len(levels), levels, opt, res); err != nil {
		return nil, err
	}
	if err := spatialCheck(in, opt, keep, levels, y, lab, res); err != nil {
		return nil, err
	}
	recommend(res, opt)
	return res, nil
}

// spectral adds the spatially constrained scheme (Moran spectral
// randomisation of the outcome, Wagner & Dray 2015) and measures the free
// shuffle's false-positive rate on surrogates with the outcome's spatial
// structure and no link to the grouping.
func spectral(in Input, opt Options, keep []int, y []float64, lab []int32, k int,
	stat groups.Statistic, alt shuffle.Alternative, res *Result) error {
	// Every tested area enters; the basis sets islands apart (their values
	// are permuted among themselves) unless they are kept.
	r, err := weights.Restrict(in.Graph, keep, in.IDs, in.Transform, true)
	if err != nil {
		return err
	}
	bo := opt.Basis
	bo.Seed, bo.KeepIslands = opt.Seed, in.KeepIslands
	basis, err := surrogate.NewBasis(r.Graph, bo)
	if err != nil {
		res.Warnings = append(res.Warnings, fmt.Sprintf("Spectral surrogates were skipped: %v.", err))
		return nil
	}
	info := basis.Info()
	o, err := basis.Prepare(y)
	if err != nil {
		return err
	}
	res.Spectral = &SpectralInfo{Info: info, ResidualShare: o.ResidualShare(), MoranTolerance: o.MoranTolerance()}
	scale := 1.0
	if stat.InOutcomeUnits() {
		scale = slices.Max(y) - slices.Min(y)
	}
	if opt.Surrogates > 0 {
		gs, err := surrogate.NewGroupStatistic(stat, lab, k)
		if err != nil {
			return err
		}
		sp, err := surrogate.GroupTest(o, gs, res.Statistic.Observed, shuffle.SurrogatePlan{
			Scheme: SpectralScheme, Draws: opt.Surrogates, Seed: opt.Seed, Purpose: 4,
			Workers: opt.Workers, Alternative: alt, Scale: scale, Progress: opt.progress("spectral surrogates")})
		if err != nil {
			return err
		}
		res.Tests = append(res.Tests, sp)
	}
	if opt.FalsePositives > 0 {
		fpr, err := surrogate.FalsePositives(o, stat, lab, k, surrogate.FPROptions{
			Surrogates: opt.FalsePositives, Permutations: opt.FalsePositiveShuffles, Alpha: opt.Alpha,
			Alternative: alt, Seed: opt.Seed, Purpose: 5, Workers: opt.Workers,
			Progress: opt.progress("false-positive check")})
		if err != nil {
			return err
		}
		res.FalsePositiveRate = &fpr
	}
	return nil
}

// SpectralScheme names the spatially constrained scheme in results.
const SpectralScheme = "spectral surrogates"

// recommend says which p-value to read, and why, and writes the warning
// with its numbers when the free shuffle cannot be trusted.
func recommend(res *Result, opt Options) {
	find := func(prefix string) *shuffle.Result {
		for k := range res.Tests {
			if strings.HasPrefix(res.Tests[k].Scheme, prefix) {
				return &res.Tests[k]
			}
		}
		return nil
	}
	fpr := res.FalsePositiveRate
	inflated := fpr != nil && fpr.Interval[0] > fpr.Alpha
	suspect := res.Autocorrelation.Clustered || inflated
	if !suspect {
		res.Recommended = Recommendation{Scheme: res.Tests[0].Scheme, PValue: res.Tests[0].PValue,
			Reason: "The outcome and the grouping do not both cluster in space, so neighbouring areas can be treated as separate evidence: the free shuffle's p-value is fine."}
		if fpr != nil {
			res.Recommended.Reason += fmt.Sprintf(" On %d surrogates with the outcome's spatial pattern it rejected %.1f%% of true nulls at the %g level.", fpr.Surrogates, 100*fpr.Rate, fpr.Alpha)
		}
		return
	}
	// The free shuffle is suspect: say so with numbers.
	var b strings.Builder
	out := res.Autocorrelation.Outcome
	if len(res.Autocorrelation.Group) > 0 && res.Autocorrelation.Clustered {
		g := res.Autocorrelation.Group[0]
		for _, m := range res.Autocorrelation.Group {
			if m.MoransI > g.MoransI {
				g = m
			}
		}
		fmt.Fprintf(&b, "Both the outcome %s (Moran's I %.2f) and the grouping %s (Moran's I %.2f) cluster in space. ", out.Variable, out.MoransI, g.Variable, g.MoransI)
	} else {
		b.WriteString("The outcome's spatial pattern makes the free shuffle unreliable here. ")
	}
	if e := res.EffectiveSampleSize; e != nil && !e.Capped {
		fmt.Fprintf(&b, "The %s areas carry about %s areas' worth of independent information. ", numtext.Count(e.Areas), numtext.Count(int(math.Round(e.EffectiveSampleSize))))
	}
	if fpr != nil {
		fmt.Fprintf(&b, "On %d outcomes with the same spatial pattern and no link to the grouping, the free shuffle called %.0f%% significant at the %g level (95%% interval %.0f–%.0f%%), where a sound test calls %g%%. ",
			fpr.Surrogates, 100*fpr.Rate, fpr.Alpha, 100*fpr.Interval[0], 100*fpr.Interval[1], 100*fpr.Alpha)
	} else {
		b.WriteString("The free shuffle treats every area as independent evidence, so its p-value is likely too small. ")
	}
	if sp := find(SpectralScheme); sp != nil {
		res.Recommended = Recommendation{Scheme: sp.Scheme, PValue: sp.PValue,
			Reason: "Spectral surrogates keep the outcome's spatial pattern and break only its link to the grouping, so their p-value does not count neighbouring areas as separate evidence."}
		b.WriteString("Prefer the spatially constrained p-value (spectral surrogates).")
	} else if e := res.EffectiveSampleSize; e != nil {
		res.Recommended = Recommendation{Scheme: "modified t-test", PValue: e.PValue,
			Reason: "The modified t-test counts the areas by their effective number, not their raw number; it tests the difference in means."}
		b.WriteString("Prefer the modified t-test's p-value, which uses the effective number of areas.")
	} else {
		res.Recommended = Recommendation{Scheme: res.Tests[len(res.Tests)-1].Scheme, PValue: res.Tests[len(res.Tests)-1].PValue,
			Reason: "No spatially constrained test was run; the free shuffle's p-value is likely too small."}
		b.WriteString("Treat the free shuffle's p-value as a lower bound, not as the strength of the evidence.")
	}
	res.Warnings = append(res.Warnings, b.String())
}

func missingCovariate(cs []Covariate, i int) string {
	for _, c := range cs {
		if c.Missing[i] {
			return c.Name
		}
	}
	return ""
}

// ZoneMinAreas is the number of tested areas from which compare adds a
// shuffle within automatic contiguous zones when no strata are given.
const ZoneMinAreas = 300

// tester runs the group statistic under one shuffle scheme after another:
// on the once-sorted outcome, or, with covariates, by Freedman–Lane on the
// residuals of the covariates-only model.
type tester struct {
	opt  Options
	data *groups.Data
	stat groups.Statistic
	alt  shuffle.Alternative
	// fl is set when the test adjusts for covariates.
	fl      *shuffle.FreedmanLane
	flEval  shuffle.Factory
	flAlt   shuffle.Alternative
	covName string
}

// run tests the statistic with labels exchanged only within strata (given
// per tested area in layer order; nil for the free shuffle).
func (t *tester) run(scheme string, strata []int32, purpose uint64, stage string) (shuffle.Result, error) {
	plan := shuffle.Plan{Scheme: scheme, Permutations: t.opt.Permutations, ExactLimit: t.opt.ExactLimit,
		Seed: t.opt.Seed, Purpose: purpose, Workers: t.opt.Workers, Progress: t.opt.progress(stage)}
	if t.fl != nil {
		plan.Labels, plan.Strata, plan.Alternative, plan.Scale = t.fl.Labels(), strata, t.flAlt, 1
		plan.Scheme = scheme + ", adjusted for " + t.covName
		return shuffle.Run(plan, t.flEval)
	}
	plan.Labels, plan.Alternative = t.data.Labels, t.alt
	plan.Scale = 1
	if t.stat.InOutcomeUnits() {
		plan.Scale = t.data.Y[len(t.data.Y)-1] - t.data.Y[0]
	}
	if strata != nil {
		// The group statistics see areas in sorted order of the outcome.
		sorted := make([]int32, len(strata))
		for pos, o := range t.data.Order {
			sorted[pos] = strata[o]
		}
		plan.Strata = sorted
	}
	return shuffle.Run(plan, t.data.Factory(t.stat))
}

// adjustFor switches the tester to the Freedman–Lane test of the group
// effect adjusted for the covariates: the t of the group coefficient for
// two groups, the partial F for more.
func (t *tester) adjustFor(in Input, keep []int, y []float64, lab []int32, k int, res *Result) error {
	var cols [][]float64
	var names []string
	for _, c := range in.Covariates {
		col := make([]float64, len(keep))
		for j, i := range keep {
			col[j] = c.Values[i]
		}
		cols = append(cols, col)
		names = append(names, c.Name)
	}
	fl, err := shuffle.NewFreedmanLane(y, cols, lab, k)
	if err != nil {
		return dataErr("adjusting for %s: %v", strings.Join(names, ", "), err)
	}
	t.fl, t.covName = fl, strings.Join(names, ", ")
	info := &CovariateInfo{Covariates: names}
	if k == 2 {
		if t.flEval, err = fl.TFactory(); err != nil {
			return err
		}
		t.flAlt = t.opt.Alternative
		info.Statistic = "t of the group effect"
		info.Observed, info.ClassicalP, _ = fl.ClassicalT(t.flAlt)
	} else {
		t.flEval, t.flAlt = fl.Factory(), shuffle.Greater
		info.Statistic = "partial F of the group effect"
		info.Observed, info.ClassicalP = fl.PartialF()
	}
	info.Method = "Freedman–Lane: residuals of the model with the covariates alone are shuffled"
	res.Adjusted = info
	return nil
}

// codes numbers the text labels of the tested areas in order of first
// appearance, returning the codes (in keep order) and how many there are.
func codes(keep []int, labels []string) ([]int32, int) {
	code := map[string]int32{}
	out := make([]int32, len(keep))
	for k, i := range keep {
		c, ok := code[labels[i]]
		if !ok {
			c = int32(len(code))
			code[labels[i]] = c
		}
		out[k] = c
	}
	return out, len(code)
}

// effectiveSize runs the modified t-test (Dutilleul 1993) of the outcome
// against the group indicators on the binary graph among the tested areas,
// islands included as independent areas.
func effectiveSize(in Input, keep []int, y []float64, lab []int32, k int, levels []string, opt Options, res *Result) error {
	r, err := weights.Restrict(in.Graph, keep, in.IDs, weights.Binary, true)
	if err != nil {
		return err
	}
	if r.Graph.Links() == 0 {
		return nil
	}
	lags, err := effective.NewLags(r.Binary, 0)
	if err != nil {
		return err
	}
	alt := opt.Alternative
	out, err := lags.Groups(y, lab, k, alt)
	if errors.Is(err, effective.ErrTooFew) || errors.Is(err, effective.ErrConstant) {
		res.Warnings = append(res.Warnings, fmt.Sprintf("The effective sample size could not be estimated: %v.", err))
		return nil
	}
	if err != nil {
		return err
	}
	if k > 2 {
		p := make([]float64, len(out))
		for g := range out {
			p[g] = out[g].PValue
		}
		adj := shuffle.Adjust(p, shuffle.Holm)
		for g := range out {
			out[g].PValue = adj[g]
		}
	}
	best := 0
	for g := range out {
		if out[g].EffectiveSampleSize < out[best].EffectiveSampleSize {
			best = g
		}
	}
	e := &EffectiveInfo{Result: out[best], Level: levels[best]}
	if k > 2 {
		e.Note = "each group against the others; the smallest effective sample size is shown, p-values Holm-adjusted across groups"
		for g := range out {
			e.ByGroup = append(e.ByGroup, EffectiveByGroup{Level: levels[g], Result: out[g]})
		}
	}
	res.EffectiveSampleSize = e
	return nil
}

// mixedStrata counts strata that hold more than one group.
func mixedStrata(strata, labels []int32) int {
	first := map[int32]int32{}
	mixed := map[int32]bool{}
	for i, s := range strata {
		if l, ok := first[s]; !ok {
			first[s] = labels[i]
		} else if l != labels[i] {
			mixed[s] = true
		}
	}
	return len(mixed)
}

// spatialCheck computes Moran's I of the outcome and of each group
// indicator on the graph among the tested areas, with the transform asked
// for. Areas with no neighbour there are left out (their spatial lag is
// undefined) unless the input keeps them, with a zero lag.
func spatialCheck(in Input, opt Options, keep []int, levels []string, y []float64, lab []int32, res *Result) error {
	r, err := weights.Restrict(in.Graph, keep, in.IDs, in.Transform, in.KeepIslands)
	if err != nil {
		return err
	}
	res.Weights = r.Summary
	res.Warnings = append(res.Warnings, res.Weights.Warnings...)
	res.Autocorrelation.Alpha = opt.Alpha
	if linkedAreas := r.Summary.Areas - r.Summary.Islands; linkedAreas < 3 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("Only %d tested areas have a neighbour among the tested areas, too few for Moran's I; the spatial check was skipped.", linkedAreas))
		return nil
	}
	g, linked := r.Graph, r.Used
	plan := shuffle.Plan{Scheme: "free", Permutations: opt.Permutations, ExactLimit: opt.ExactLimit,
		Seed: opt.Seed, Workers: opt.Workers, Alternative: shuffle.TwoSided}
	ys := make([]float64, len(linked))
	for k, i := range linked {
		ys[k] = y[i]
	}
	plan.Purpose = 10
	plan.Progress = opt.progress("Moran's I of " + in.OutcomeName)
	outcome, err := moranOf(in.OutcomeName, ys, g, plan)
	if err != nil {
		return dataErr("Moran's I of %s: %v", in.OutcomeName, err)
	}
	res.Autocorrelation.Outcome = outcome
	// With two groups one indicator carries all the information (the other
	// is its complement, with the same I).
	indicators := levels
	if len(levels) == 2 {
		indicators = levels[:1]
	}
	for k, level := range indicators {
		x := make([]float64, len(linked))
		for t, i := range linked {
			if lab[i] == int32(k) {
				x[t] = 1
			}
		}
		plan.Purpose = 11 + uint64(k)
		name := in.GroupName + "=" + level
		plan.Progress = opt.progress("Moran's I of " + name)
		m, err := moranOf(name, x, g, plan)
		if errors.Is(err, autocorr.ErrConstant) {
			res.Warnings = append(res.Warnings, fmt.Sprintf("Every area with a neighbour has the same value of %s, so its clustering cannot be measured.", name))
			continue
		}
		if err != nil {
			return dataErr("Moran's I of %s: %v", name, err)
		}
		res.Autocorrelation.Group = append(res.Autocorrelation.Group, m)
	}
	switch w := res.Weights; {
	case w.Islands > 0 && in.KeepIslands:
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d tested area(s) have no neighbour (%s); they are kept in the spatial check with a spatial lag of zero.",
			w.Islands, listIDs(w.IslandIDs, 5)))
	case w.Islands > 0:
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d tested area(s) have no neighbour (%s) and are left out of the spatial check; they still count in the group test.",
			w.Islands, listIDs(w.IslandIDs, 5)))
	}
	significant := func(m VariableMoran) bool { return m.MoransI > m.Expected && m.PValue <= opt.Alpha }
	if significant(res.Autocorrelation.Outcome) {
		for _, m := range res.Autocorrelation.Group {
			if significant(m) {
				res.Autocorrelation.Clustered = true
				break
			}
		}
	}
	return nil
}

func moranOf(name string, x []float64, g *weights.Graph, plan shuffle.Plan) (VariableMoran, error) {
	t, err := autocorr.RunTest(x, g, plan)
	if err != nil {
		return VariableMoran{}, err
	}
	return VariableMoran{Variable: name, MoransI: t.MoransI, Expected: t.Expected, PValue: t.Permutation.PValue,
		Permutations: t.Permutation.Permutations, Exact: t.Permutation.Exact}, nil
}

func listIDs(ids []string, max int) string {
	if len(ids) <= max {
		return strings.Join(ids, ", ")
	}
	return strings.Join(ids[:max], ", ") + fmt.Sprintf(" and %d more", len(ids)-max)
}

func quoteAll(s []string) []string {
	out := make([]string, len(s))
	for i, v := range s {
		out[i] = strconv.Quote(v)
	}
	return out
}

// positive lists level names that usually mean "has it"; with two such
// levels, that one becomes group A so that the contrast reads
// "with − without" by default.
var positive = map[string]bool{"1": true, "yes": true, "true": true, "y": true, "t": true}

// orderLevels puts the group levels in report order. With a contrast, its
// order; with two levels one of which reads as "yes", that one first;
// otherwise natural order (numbers by value, then text).
func orderLevels(present map[string]int, contrast []string, column string) ([]string, error) {
	if len(contrast) == 2 {
		for _, c := range contrast {
			if present[c] == 0 {
				var have []string
				for l := range present {
					have = append(have, l)
				}
				sort.Strings(have)
				return nil, dataErr("--contrast level %q is not a level of %s among the areas with data (levels: %s)", c, column, strings.Join(quoteAll(have), ", "))
			}
		}
		return []string{contrast[0], contrast[1]}, nil
	}
	levels := make([]string, 0, len(present))
	for l := range present {
		levels = append(levels, l)
	}
	sort.Slice(levels, func(a, b int) bool { return naturalLess(levels[a], levels[b]) })
	if len(levels) == 2 {
		p0, p1 := positive[strings.ToLower(levels[0])], positive[strings.ToLower(levels[1])]
		if p1 && !p0 {
			levels[0], levels[1] = levels[1], levels[0]
		}
	}
	return levels, nil
}

func naturalLess(a, b string) bool {
	x, errA := strconv.ParseFloat(a, 64)
	y, errB := strconv.ParseFloat(b, 64)
	switch {
	case errA == nil && errB == nil:
		return x < y
	case errA == nil:
		return true
	case errB == nil:
		return false
	}
	return a < b
}
