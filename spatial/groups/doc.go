// Package groups holds the statistics that compare an outcome across groups
// of areas: for two groups the difference in medians or means, Welch's t and
// the rank sum; for two or more, the Kruskal–Wallis H and the one-way F.
//
// A reader starts at Prepare, which sorts the outcome once; an arrangement
// is then only a vector of group labels in that sorted order, which is what
// the shuffle machinery permutes. Data.Factory gives the evaluators of a
// Statistic for those shuffles: evaluating walks the vector once and
// allocates nothing. Data.OnOutcomes turns the roles round for the
// surrogate nulls, where the labels stay and the outcome changes.
// Data.Summaries and Data.Observed give what a report shows.
//
// Checks: tests/scipy_test.go compares every statistic and its exact
// permutation p-values with values stored from scipy (tests/testdata/scipy,
// with the script that made them).
package groups
