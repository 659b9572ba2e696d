// Package shuffle is the one place where areatest draws null
// distributions. A statistic never loops over permutations itself: it hands
// this package evaluators, and the package decides how the arrangements are
// produced.
//
// The schemes, one entry point each:
//   - Run and RunMany: label shuffles, free or within strata, with exact
//     enumeration of every distinct arrangement when there are few enough
//     (RunMany shares each draw among several statistics);
//   - NewFreedmanLane: shuffles of reduced-model residuals, for a group
//     effect adjusted for covariates (Freedman & Lane 1983);
//   - RunLocal: conditional permutation per area (Anselin 1995), each area
//     with its own stream;
//   - RunSurrogates: null values from surrogate outcomes made elsewhere
//     (spatial/surrogate), finished like the other schemes.
//
// Around them: permutation p-values (1 + b)/(1 + B) with Clopper–Pearson
// intervals for their Monte Carlo uncertainty (Phipson & Smyth 2010),
// multiple-testing adjustment (Adjustment, Adjust: Holm, Benjamini–Hochberg,
// Benjamini–Yekutieli), and the seeded random streams (Stream).
//
// Counts: no test takes more than MaxPermutations draws (limits.go), and
// the counting streams — tallies are folded a window of blocks at a time —
// so memory does not grow with the draws unless a null distribution is
// kept on purpose (KeepNull).
//
// Reproducibility: work is cut into fixed blocks of draws, scheduled by
// internal/parallel; block k always uses the stream derived from (seed,
// purpose, k), so results do not depend on how many goroutines share the
// blocks.
//
// Checks: the unit tests here enumerate small cases exactly and check the
// adjustments on small cases worked by hand from their published
// definitions; tests/scipy_test.go compares exact and Monte Carlo p-values
// with values stored from scipy (tests/testdata/scipy, with the scripts
// that made them) and runs Fisher's tea tasting (p = 1/70);
// tests/autocorr_multitest_test.go compares Adjust with statsmodels'
// multipletests, and tests/effective_refs_test.go the Freedman–Lane
// statistic with statsmodels' partial F.
package shuffle
