package compare

import (
	"fmt"
	"math"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
)

// recommend says which p-value to read, and why, and writes the warning
// with its numbers when a p-value shown cannot be trusted.
//
// When the false-positive check ran, every label-shuffle row carries its
// measured rate, and the p-value read is that of the most powerful row
// whose rate is sound (its 95% interval not above alpha), in the order
// free, within strata or zones, spectral surrogates, modified t-test; the
// spectral surrogates' rate is the SAR check's, and when that check could
// not run they have no measured rate and count as sound. Without the check the free shuffle is suspect when the spatial
// check finds both the outcome and the grouping clustered; then a
// spatially constrained p-value is preferred. Otherwise the free shuffle's
// p-value is read — on the grounds that nothing clusters only when the
// spatial check ran; when it could not run, the reason says so and that
// the p-value holds only if neighbouring areas are not alike.
func recommend(res *Result) {
	if res.FalsePositiveRate != nil {
		recommendMeasured(res)
		return
	}
	if !res.Autocorrelation.Clustered {
		recommendFree(res)
		return
	}
	// The free shuffle is suspect: say so with numbers.
	var b strings.Builder
	clusterFacts(&b, res)
	b.WriteString("The free shuffle treats every area as independent evidence, so its p-value is likely too small. ")
	if k := findRow(res, SpectralScheme); k >= 0 {
		res.Recommended = Recommendation{Scheme: SpectralScheme, PValue: res.Tests[k].PValue,
			Reason: "Spectral surrogates keep the outcome's spatial pattern and break only its link to the grouping, so their p-value does not count neighbouring areas as separate evidence."}
		b.WriteString("Prefer the spatially constrained p-value (spectral surrogates).")
	} else if e := res.EffectiveSampleSize; e != nil {
		res.Recommended = Recommendation{Scheme: "modified t-test", PValue: e.PValue,
			Reason: "The modified t-test counts the areas by their effective number, not their raw number; it tests the difference in means."}
		b.WriteString("Prefer the modified t-test's p-value, which uses the effective number of areas.")
	} else {
		last := res.Tests[len(res.Tests)-1]
		res.Recommended = Recommendation{Scheme: last.Scheme, PValue: last.PValue,
			Reason: "No spatially constrained test was run; the free shuffle's p-value is likely too small."}
		b.WriteString("Treat the free shuffle's p-value as a lower bound, not as the strength of the evidence.")
	}
	res.Warnings = append(res.Warnings, b.String())
}

// findRow returns the index of the test row of the scheme, or −1.
func findRow(res *Result, scheme string) int {
	for k := range res.Tests {
		if res.Tests[k].Scheme == scheme {
			return k
		}
	}
	return -1
}

// clusterFacts writes what the spatial check and the effective sample
// size found, when the outcome and the grouping both cluster.
func clusterFacts(b *strings.Builder, res *Result) {
	out := res.Autocorrelation.Outcome
	if len(res.Autocorrelation.Group) > 0 && res.Autocorrelation.Clustered {
		g := res.Autocorrelation.Group[0]
		for _, m := range res.Autocorrelation.Group {
			if m.MoransI > g.MoransI {
				g = m
			}
		}
		fmt.Fprintf(b, "Both the outcome %s (Moran's I %.2f) and the grouping %s (Moran's I %.2f) cluster in space. ", out.Variable, out.MoransI, g.Variable, g.MoransI)
	}
	if e := res.EffectiveSampleSize; e != nil && !e.Capped {
		fmt.Fprintf(b, "The %s areas carry about %s areas' worth of independent information. ", numtext.Count(e.Areas), numtext.Count(int(math.Round(e.EffectiveSampleSize))))
	}
}

// rateText writes a measured rate with its interval: "25% (95% interval
// 9–49%)".
func rateText(f *FalsePositiveRate) string {
	return fmt.Sprintf("%.0f%% (95%% interval %.0f–%.0f%%)", 100*f.Rate, 100*f.Interval[0], 100*f.Interval[1])
}

// recommendMeasured recommends the most powerful row whose measured
// false-positive rate is sound, and warns of every row whose rate is not.
func recommendMeasured(res *Result) {
	fpr := res.FalsePositiveRate
	bad := []string{}
	zonesBad := false
	for _, t := range res.Tests {
		if t.Unsound() {
			entry := rowName(t.Scheme) + " rejected " + rateText(t.FalsePositives)
			if t.Scheme == SpectralScheme {
				entry += " of " + simulatedOn(res)
			}
			bad = append(bad, entry)
			zonesBad = zonesBad || strings.HasSuffix(t.Scheme, "automatic zones")
		}
	}
	calibrationWarning(res)
	pattern := "the outcome's spatial pattern"
	if res.Adjusted != nil || res.Rates != nil {
		pattern = "the spatial pattern of " + res.NullPattern()
	}
	on := fmt.Sprintf("on %s outcomes with %s and no link to the grouping", numtext.Count(fpr.Surrogates), pattern)
	rejected := strings.Join(bad, " and ") + " at the " + fmt.Sprint(fpr.Alpha) + " level"
	if len(bad) > 0 {
		defer func() { res.Warnings = append(res.Warnings, unsoundWarning(res, on, rejected, zonesBad)) }()
	}
	for _, t := range res.Tests {
		if f := t.FalsePositives; f != nil && !t.Unsound() {
			of := on[3:]
			if t.Scheme == SpectralScheme {
				of = simulatedOn(res)
			}
			reason := fmt.Sprintf("%s rejected %s of %s at the %g level, consistent with a sound test's %g%%", capitalise(rowName(t.Scheme)), rateText(f), of, f.Alpha, 100*f.Alpha)
			if len(bad) > 0 {
				reason += "; " + rejected
			}
			res.Recommended = Recommendation{Scheme: t.Scheme, PValue: t.PValue, Reason: reason + "."}
			return
		}
	}
	lead := capitalise(on) + ", " + rejected
	if k := findRow(res, SpectralScheme); k >= 0 && res.Tests[k].FalsePositives == nil {
		res.Recommended = Recommendation{Scheme: SpectralScheme, PValue: res.Tests[k].PValue,
			Reason: lead + ", so read the spectral surrogates, which keep that pattern and break only its link to the grouping; their own false-positive rate is not measured here."}
	} else if e := res.EffectiveSampleSize; e != nil && res.Adjusted == nil {
		// The modified t-test does not adjust for covariates, so it is
		// no answer to an adjusted question.
		res.Recommended = Recommendation{Scheme: "modified t-test", PValue: e.PValue,
			Reason: lead + ", so read the modified t-test, which counts the areas by their effective number and tests the difference in means; its false-positive rate is not measured here."}
	}
}

// unsoundWarning words the warning about rows with too many false
// positives, ending with the p-value recommended.
func unsoundWarning(res *Result, on, rejected string, zonesBad bool) string {
	var b strings.Builder
	clusterFacts(&b, res)
	fmt.Fprintf(&b, "Too many false positives: %s, %s, where a sound test rejects %g%%; do not read those p-values.", on, rejected, 100*res.FalsePositiveRate.Alpha)
	if zonesBad {
		b.WriteString(" Within an automatic zone the outcome and the grouping still cluster; strata of your own (regions the grouping does not follow) may make a restricted shuffle sound.")
	}
	switch rec := res.Recommended.Scheme; rec {
	case "":
		b.WriteString(" No p-value shown here holds its false-positive rate on these data.")
	case SpectralScheme:
		b.WriteString(" Prefer the spatially constrained p-value (spectral surrogates).")
	case "modified t-test":
		b.WriteString(" Prefer the modified t-test's p-value, which uses the effective number of areas.")
	default:
		fmt.Fprintf(&b, " Prefer the p-value of %s, whose rate is sound.", rowName(rec))
	}
	return b.String()
}

// rowName names a row in a sentence: "the free shuffle", "the shuffle
// within province", "the spectral surrogates".
func rowName(scheme string) string {
	switch {
	case scheme == "free":
		return "the free shuffle"
	case strings.HasPrefix(scheme, "free, "):
		return "the free shuffle" + scheme[len("free"):]
	case scheme == SpectralScheme:
		return "the " + SpectralScheme
	}
	return "the shuffle " + scheme
}

func capitalise(s string) string { return strings.ToUpper(s[:1]) + s[1:] }

// recommendFree recommends the free shuffle, which nothing found
// suspect, with the grounds that hold: the spatial check's, or, when that
// could not run, only that it could not.
func recommendFree(res *Result) {
	reason := "The outcome and the grouping do not both cluster in space, so neighbouring areas can be treated as separate evidence: the free shuffle's p-value is fine."
	if why := res.Autocorrelation.Skipped; why != "" {
		reason = fmt.Sprintf("The spatial check could not run (%s), so nothing here shows whether the outcome and the grouping cluster in space. The free shuffle treats every area as separate evidence; its p-value holds only if neighbouring areas are not alike. Neighbours defined another way (nearest areas or a distance band) would let the check run.", why)
	}
	res.Recommended = Recommendation{Scheme: res.Tests[0].Scheme, PValue: res.Tests[0].PValue, Reason: reason}
}

// simulatedOn describes the SAR check's null outcomes: "200 outcomes
// simulated from the SAR model fitted to the outcome (ρ 0.83; no
// link to the grouping)".
func simulatedOn(res *Result) string {
	fitted := "the outcome"
	if res.Adjusted != nil || res.Rates != nil {
		fitted = res.NullPattern()
	}
	return fmt.Sprintf("%s outcomes simulated from the SAR model fitted to %s (ρ %.2f; no link to the grouping)",
		numtext.Count(res.SARCheck.Simulations), fitted, res.SARCheck.Rho)
}

// calibrationWarning warns when the spectral surrogates rejected more
// than alpha of the SAR check's simulated nulls, giving their p-value
// calibrated to that generator.
func calibrationWarning(res *Result) {
	k := findRow(res, SpectralScheme)
	if k < 0 || res.Tests[k].FalsePositives == nil || res.Tests[k].Calibrated == nil {
		return
	}
	f, c := res.Tests[k].FalsePositives, res.Tests[k].Calibrated
	if f.Rate <= f.Alpha {
		return
	}
	level := fmt.Sprintf("they reject at most %g%% of those simulated nulls at p ≤ %.3g", 100*c.Alpha, c.Level)
	if c.Level == 0 {
		level = fmt.Sprintf("no threshold on their p-value rejects as few as %g%% of those simulated nulls (too many reach the smallest p-value their surrogates can give)", 100*c.Alpha)
	}
	res.Warnings = append(res.Warnings, fmt.Sprintf("The spectral surrogates rejected %s of %s at the %g level, more than %g%%. Calibrated to that generator their p-value is %.3g (calibrated), in place of %.3g: %s.",
		rateText(f), simulatedOn(res), f.Alpha, 100*f.Alpha, c.PValue, res.Tests[k].PValue, level))
}
