package compare

import (
	"fmt"
	"math"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/shuffle"
)

// recommend says which p-value to read, and why, and writes the warning
// with its numbers when the free shuffle cannot be trusted.
//
// The rule: the free shuffle is suspect when the spatial check finds both
// the outcome and the grouping clustered, or when the false-positive check
// finds its rate above alpha; then a spatially constrained p-value is
// preferred. Otherwise the free shuffle's p-value is read — on the grounds
// that nothing clusters only when the spatial check ran; when it could not
// run, the reason says so and that the p-value holds only if neighbouring
// areas are not alike.
func recommend(res *Result) {
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
		recommendFree(res)
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

// recommendFree recommends the free shuffle, which nothing found
// suspect, with the grounds that hold: the spatial check's, or, when that
// could not run, only that it could not.
func recommendFree(res *Result) {
	reason := "The outcome and the grouping do not both cluster in space, so neighbouring areas can be treated as separate evidence: the free shuffle's p-value is fine."
	if why := res.Autocorrelation.Skipped; why != "" {
		reason = fmt.Sprintf("The spatial check could not run (%s), so nothing here shows whether the outcome and the grouping cluster in space. The free shuffle treats every area as separate evidence; its p-value holds only if neighbouring areas are not alike. Neighbours defined another way (nearest areas or a distance band) would let the check run.", why)
	}
	res.Recommended = Recommendation{Scheme: res.Tests[0].Scheme, PValue: res.Tests[0].PValue, Reason: reason}
	if fpr := res.FalsePositiveRate; fpr != nil {
		res.Recommended.Reason += fmt.Sprintf(" On %d surrogates with the outcome's spatial pattern it rejected %.1f%% of true nulls at the %g level.", fpr.Surrogates, 100*fpr.Rate, fpr.Alpha)
	}
}
