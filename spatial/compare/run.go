package compare

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/rates"
	"github.com/areatest/areatest/spatial/shuffle"
)

// Random streams: every stage of a comparison draws from its own purpose
// (shuffle.Stream's second seed word), so that adding or dropping one stage
// leaves the numbers of the others as they were. The values are part of
// the definition of a seeded result.
const (
	streamFree           uint64 = 1 // the free shuffle
	streamStrata         uint64 = 2 // the shuffle within strata
	streamZones          uint64 = 3 // the shuffle within automatic zones
	streamSurrogates     uint64 = 4 // the spectral surrogates
	streamFalsePositives uint64 = 5 // the false-positive check
	streamSARCheck       uint64 = 6 // the SAR check of the spectral surrogates
	streamMoranOutcome   uint64 = 10
	streamMoranGroup     uint64 = 11 // plus the index of the group indicator
)

// comparison is one comparison prepared by Run: the tested areas with
// their outcome and group codes, the levels, the statistic and the
// settings, which every later stage reads.
type comparison struct {
	in  Input
	opt Options
	// keep holds the layer index of each tested area; y and lab its
	// outcome and group code (an index into levels), in the same order.
	keep   []int
	y      []float64
	lab    []int32
	levels []string
	stat   groups.Statistic
	// alt is the alternative of the group statistic: the one asked for,
	// or the upper tail for H and F.
	alt  shuffle.Alternative
	data *groups.Data
	// checks are the label-shuffle schemes run, whose false-positive rates
	// the check measures, and checkRows their rows in Result.Tests.
	checks    []CheckScheme
	checkRows []int
	// rateStat is the statistic of pooled rates of a comparison of rates
	// (0 otherwise, or when a statistic of the area rates was asked for);
	// rates holds the counts.
	rateStat rates.Statistic
	rates    *rateState
}

// k is the number of groups.
func (c *comparison) k() int { return len(c.levels) }

// Run carries out one comparison and is the package's entry point: it
// picks the tested areas, runs the group statistic under each shuffle
// scheme, the spectral surrogates and the false-positive check, estimates
// the effective sample size, checks for spatial clustering and says which
// p-value to read. Problems with the data are an *Error or one of the
// typed errors of this package; counts above this package's maxima (or
// shuffle.MaxPermutations) are a *shuffle.CountError, returned before any
// work.
func Run(in Input, opt Options) (*Result, error) {
	n := len(in.IDs)
	if in.Events != nil {
		var err error
		if in, err = withRates(in, opt.Rates); err != nil {
			return nil, err
		}
	}
	if len(in.Outcome) != n || len(in.Group) != n || in.Graph == nil || in.Graph.Len() != n {
		return nil, errors.New("compare: input columns and graph disagree in length")
	}
	if err := opt.checkCounts(); err != nil {
		return nil, err
	}
	res := &Result{Seed: opt.Seed, Cautions: Cautions, Warnings: []string{}, Excluded: []Exclusion{}}
	res.Input = InputInfo{Areas: n, Outcome: in.OutcomeName, Group: in.GroupName, Strata: in.StrataName}
	c, err := prepare(in, opt, res)
	if err != nil {
		return nil, err
	}
	t := &tester{opt: opt, data: c.data, stat: c.stat, alt: c.alt}
	if c.rates != nil && c.rates.stat != 0 {
		t.counts, t.rateStat, t.lab, t.k = c.rates.counts, c.rates.stat, c.lab, c.k()
	}
	if len(in.Covariates) > 0 {
		if err := t.adjustFor(c, res); err != nil {
			return nil, err
		}
	}
	if opt.FalsePositives > 0 {
		// Before any work: a check that cannot reject is a setting to fix.
		if err := checkShuffles(opt.checkShuffles(), opt.Alpha, t.testAlt()); err != nil {
			return nil, err
		}
	}
	if err := c.runShuffles(t, res); err != nil {
		return nil, err
	}
	if opt.Surrogates > 0 || opt.FalsePositives > 0 {
		if err := c.spectral(t, res); err != nil {
			return nil, err
		}
	}
	if err := c.effectiveSize(res); err != nil {
		return nil, err
	}
	if err := c.spatialCheck(res); err != nil {
		return nil, err
	}
	recommend(res)
	return res, nil
}

// checkMagnitude refuses values of a tested column (v[k] belongs to area
// keep[k]) too large for the statistics to square, naming the column and
// the area (autocorr.CheckMagnitude).
func (c *comparison) checkMagnitude(column string, v []float64) error {
	var tl *autocorr.TooLargeError
	if err := autocorr.CheckMagnitude(v); errors.As(err, &tl) {
		tl.Column, tl.ID = column, c.in.IDs[c.keep[tl.Index]]
		return err
	} else if err != nil {
		return err
	}
	return nil
}

// prepare picks the tested areas and their levels, chooses the statistic
// and fills the result's groups and observed statistic.
func prepare(in Input, opt Options, res *Result) (*comparison, error) {
	c := &comparison{in: in, opt: opt}
	var err error
	if c.keep, res.Excluded, err = selectAreas(in, opt.Contrast); err != nil {
		return nil, err
	}
	if err := c.setLevels(); err != nil {
		return nil, err
	}
	if err := c.checkMagnitude(in.OutcomeName, c.y); err != nil {
		return nil, err
	}
	res.Input.Tested = len(c.keep)
	if err := c.chooseStatistic(); err != nil {
		return nil, err
	}
	if c.data, err = groups.Prepare(c.y, c.lab, c.k()); err != nil {
		return nil, err
	}
	for g, s := range c.data.Summaries() {
		res.Groups = append(res.Groups, GroupResult{Level: c.levels[g], Summary: s})
	}
	res.Statistic = StatisticInfo{Name: c.stat.Flag(), Label: c.stat.String(), Observed: c.data.Observed(c.stat),
		InOutcomeUnits: c.stat.InOutcomeUnits()}
	if c.stat.TwoGroupsOnly() {
		res.Statistic.Contrast = []string{c.levels[0], c.levels[1]}
	}
	if in.Events != nil {
		if err := c.prepareRates(res); err != nil {
			return nil, err
		}
		if s := c.rateStat; s != 0 {
			res.Statistic = StatisticInfo{Name: s.Flag(), Label: s.String(), Observed: c.rates.counts.Value(s, c.lab, c.k())}
			if s.TwoGroupsOnly() {
				res.Statistic.Contrast = []string{c.levels[0], c.levels[1]}
			}
		}
	}
	if math.IsNaN(res.Statistic.Observed) || math.IsInf(res.Statistic.Observed, 0) {
		return nil, dataErr("the %s of %s is undefined for these data (is %s constant within each group?)", c.stat, in.OutcomeName, in.OutcomeName)
	}
	c.alt = opt.Alternative
	if directional := c.stat.Directional(); (c.rateStat == 0 && !directional || c.rateStat != 0 && !c.rateStat.Directional()) && c.alt != shuffle.Greater {
		// H and F grow with any separation of the groups; only their upper
		// tail is evidence.
		c.alt = shuffle.Greater
	}
	return c, nil
}

// selectAreas decides which areas take part, and counts the others by the
// reason they do not, in order of first appearance. When no area has a
// value of every column the comparison needs, it is an *Error that counts
// the areas by what they lack, rather than an empty test; a contrast level
// that none of the areas with data has is a *LevelError listing the levels
// those areas do have.
func selectAreas(in Input, contrast []string) ([]int, []Exclusion, error) {
	var inContrast map[string]bool
	if len(contrast) > 0 {
		if len(contrast) != 2 || contrast[0] == contrast[1] {
			return nil, nil, &ContrastError{Column: in.GroupName}
		}
		inContrast = map[string]bool{contrast[0]: true, contrast[1]: true}
	}
	keep := make([]int, 0, len(in.IDs))
	present := map[string]int{} // levels of the areas with data, contrast or not
	reasons := map[string]int{}
	excluded := []Exclusion{}
	for i := range in.IDs {
		why := missingReason(in, i)
		if why == "" {
			present[in.Group[i]]++
			if inContrast != nil && !inContrast[in.Group[i]] {
				why = fmt.Sprintf("%s not in the contrast", in.GroupName)
			}
		}
		if why == "" {
			keep = append(keep, i)
			continue
		}
		r, ok := reasons[why]
		if !ok {
			r = len(excluded)
			reasons[why] = r
			excluded = append(excluded, Exclusion{Reason: why})
		}
		excluded[r].Areas++
		excluded[r].IDs = append(excluded[r].IDs, in.IDs[i])
	}
	if len(present) == 0 {
		return nil, nil, noAreaError(in, excluded)
	}
	for _, c := range contrast {
		if present[c] == 0 {
			return nil, nil, &LevelError{Level: c, Column: in.GroupName, Present: sortedLevels(present)}
		}
	}
	return keep, excluded, nil
}

// missingReason says which of the columns the comparison needs area i
// lacks ("missing COLUMN"), or "" when it has them all.
func missingReason(in Input, i int) string {
	switch {
	case in.Events != nil && in.Events.Missing[i]:
		return "missing " + in.Events.Name
	case in.Events != nil && in.Population.Missing[i]:
		return "missing " + in.Population.Name
	case in.countProblem != nil && in.countProblem[i] != "":
		return in.countProblem[i]
	case in.OutcomeMissing[i]:
		return "missing " + in.OutcomeName
	case in.GroupMissing[i]:
		return "missing " + in.GroupName
	case in.Strata != nil && in.StrataMissing[i]:
		return "missing " + in.StrataName
	case missingCovariate(in.Covariates, i) != "":
		return "missing " + missingCovariate(in.Covariates, i)
	}
	return ""
}

// noAreaError is the error for a layer on which no area has a value of
// every column needed, with the areas counted by what they lack.
func noAreaError(in Input, excluded []Exclusion) error {
	parts := make([]string, len(excluded))
	for k, e := range excluded {
		parts[k] = fmt.Sprintf("%s %s", numtext.Count(e.Areas), e.Reason)
	}
	need := in.OutcomeName + " and " + in.GroupName
	if in.Strata != nil || len(in.Covariates) > 0 {
		need = "every column the comparison needs"
	}
	if len(parts) == 0 {
		return dataErr("no area can be tested: the layer has no areas")
	}
	return dataErr("no area can be tested: none of the %s areas has a value of %s (%s)", numtext.Count(len(in.IDs)), need, strings.Join(parts, ", "))
}

func missingCovariate(cs []Covariate, i int) string {
	for _, c := range cs {
		if c.Missing[i] {
			return c.Name
		}
	}
	return ""
}

// setLevels orders the levels of the tested areas, checks that there are
// two or more with two areas each, and codes the tested areas' groups.
func (c *comparison) setLevels() error {
	in := c.in
	present := map[string]int{}
	for _, i := range c.keep {
		present[in.Group[i]]++
	}
	levels := orderLevels(present, c.opt.Contrast)
	if len(levels) < 2 {
		return dataErr("%s has only one level (%q) among the %d areas with data; a comparison needs at least two groups", in.GroupName, levels[0], len(c.keep))
	}
	for _, l := range levels {
		if present[l] < 2 {
			return dataErr("group %s=%q has %d area with data; every group needs at least 2", in.GroupName, l, present[l])
		}
	}
	code := map[string]int32{}
	for k, l := range levels {
		code[l] = int32(k)
	}
	c.levels = levels
	c.y = make([]float64, len(c.keep))
	c.lab = make([]int32, len(c.keep))
	for k, i := range c.keep {
		c.y[k] = in.Outcome[i]
		c.lab[k] = code[in.Group[i]]
	}
	return nil
}

// chooseStatistic takes the statistic asked for, or by default the
// difference in medians for two groups and Kruskal–Wallis H for more.
func (c *comparison) chooseStatistic() error {
	if c.in.Events != nil && c.opt.Statistic == nil {
		return c.chooseRateStatistic()
	}
	c.stat = groups.KruskalWallis
	if c.k() == 2 {
		c.stat = groups.DiffMedians
	}
	if c.opt.Statistic != nil {
		c.stat = *c.opt.Statistic
		if c.stat.TwoGroupsOnly() && c.k() != 2 {
			return &TwoGroupError{Statistic: c.stat, Column: c.in.GroupName, Levels: c.levels, Instead: "kruskal-wallis or anova-f"}
		}
	}
	return nil
}

// chooseRateStatistic takes the statistic of pooled rates asked for, or
// by default the rate ratio for two groups and the homogeneity X² for
// more.
func (c *comparison) chooseRateStatistic() error {
	c.rateStat = c.opt.Rates.Statistic
	if c.rateStat == 0 {
		c.rateStat = rates.RateHomogeneity
		if c.k() == 2 {
			c.rateStat = rates.RateRatio
		}
	}
	if c.rateStat.TwoGroupsOnly() && c.k() != 2 {
		return &TwoGroupError{Statistic: c.rateStat, Column: c.in.GroupName, Levels: c.levels, Instead: "rate-homogeneity"}
	}
	// The area rates are summarised per group as any outcome is.
	c.stat = groups.DiffMeans
	if c.k() > 2 {
		c.stat = groups.OneWayF
	}
	return nil
}

// spatialY is the outcome the spatial parts read: the outcome, or, for a
// comparison of rates, the empirical-Bayes standardised rates.
func (c *comparison) spatialY() []float64 {
	if c.rates != nil {
		return c.rates.eb.Scores
	}
	return c.y
}
