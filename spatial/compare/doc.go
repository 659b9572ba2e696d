// Package compare runs the tool's main job: does an outcome differ between
// groups of areas beyond chance? It takes plain columns and a neighbour
// graph, runs the group statistic under every shuffle scheme asked for, and
// checks whether the outcome and the grouping cluster in space, which is
// when an ordinary shuffle overstates significance.
//
// The entry point is Run, with an Input (one entry per area of the layer)
// and Options. One run goes through these steps, one file each:
//
//   - run.go: the tested areas are picked (the others are counted in
//     Result.Excluded by reason), the group levels ordered (levels.go) and
//     the statistic chosen; from here on the stages share one prepared
//     comparison.
//   - schemes.go: the statistic is tested under the free shuffle and under
//     a shuffle within strata or automatic zones, all by spatial/shuffle;
//     with covariates every scheme tests the Freedman–Lane adjusted
//     statistic instead.
//   - spectral.go: the spatially constrained scheme, surrogate outcomes
//     from spatial/surrogate that keep the outcome's spatial pattern
//     (GroupTest, with the adapter GroupStatistic), and the false-positive
//     check of every label-shuffle row on such surrogates (fpr.go): one
//     surrogate draw shared by the rows, each sorted once, each row with
//     its own shuffle streams; every label-shuffle row of Result.Tests
//     carries its rate. With covariates the surrogates are those of the
//     outcome's residuals from the covariates-only model, the part of it
//     the Freedman–Lane rows permute: the spectral row tests the adjusted
//     statistic on them, and each label-shuffle row's check refits the
//     covariates to each surrogate and runs that row's Freedman–Lane test
//     (nulltest.go holds the one interface both kinds of test present to
//     the checks).
//   - sarcheck.go: the spectral row's own rate, which its own surrogates
//     cannot measure (that would be circular): a simultaneous
//     autoregressive model (spatial/sar) is fitted to the outcome (with
//     covariates, to its residuals from them) on the surrogates' graph, DefaultSARChecks outcomes are simulated from it
//     (independent of the grouping by construction) and each is run
//     through the spectral surrogate test with DefaultSARCheckSurrogates
//     surrogates of its own. The row's rate is the share rejected at
//     Alpha. Its p-value calibrated to that generator is (1 + #{p_s ≤
//     p})/(1 + S) over the simulated nulls' p-values p_s — the adjusted
//     p-value of the double bootstrap, Pr*(P* ≤ p) (Davison & Hinkley
//     1997, §4.5), counted as a Monte Carlo p-value — and α′, the level
//     at which the surrogate test rejects Alpha of the simulated nulls, is
//     the largest p_s with no more than Alpha·S of them at or below it.
//     Weights the model cannot take (asymmetric ones, such as k nearest
//     neighbours) skip this check with a warning.
//   - effective.go: the modified t-test, how many independent areas the
//     data are worth.
//   - spatialcheck.go: Moran's I of the outcome and of each group
//     indicator.
//   - recommend.go: which p-value to read, and why: the most powerful row
//     whose measured false-positive rate is sound (free, within strata or
//     zones, spectral surrogates, modified t-test); a row whose rate's
//     95% interval lies above Alpha is never recommended.
//
// Everything lands in one Result (result.go), which every report renders.
// Problems with the data are an *Error, or, where they concern one of the
// caller's settings, a typed error whose Facts a command can word in terms
// of its flags (errors.go).
//
// Counts are bounded (limits.go): MaxSurrogates, MaxFalsePositiveChecks
// and MaxCheckShuffles here (the last two also for the SAR check), shuffle.MaxPermutations for the shuffles; Run
// refuses more, and a false-positive check too short to reject at Alpha,
// before any work.
//
// Each stage draws its random numbers from a stream of its own (the
// stream constants in run.go), so that a seeded result does not depend on
// which other stages ran nor on the number of workers.
//
// Checks: the schemes are checked in spatial/shuffle, spatial/groups,
// spatial/surrogate and spatial/effective against exact enumeration and
// stored scipy values; the tests here check the pieces put together — level
// order and contrasts, exclusions, strata, islands, covariates, and that
// the free shuffle's measured false-positive rate is high exactly when both
// outcome and grouping cluster (fpr_test.go), and that each row's reported
// rate agrees with its actual rejections on simulated SAR layers, the
// recommended p-value holding 5% (rows_test.go, the spectral row measured
// by the SAR check), and the calibration against counts by hand
// (sarcheck_test.go).
package compare
