// Package local computes a statistic for every area — local Moran, its
// cross form (x at the area, y at its neighbours), local Geary, Getis–Ord
// Gi and Gi* — and tests each one by conditional permutation through the
// shared shuffle machinery (shuffle.RunLocal): the area keeps its own value
// and the other values are drawn into its neighbour slots (Anselin 1995,
// Geogr. Anal. 27:93–115).
//
// The entry point for a layer is Analyse: from the layer's columns (with
// their missing masks), ids and the graph of all areas (Input) to a Result
// with every area of the layer — the analysed ones with their statistic,
// p-values and category, the others with the category that says why they
// were left out (NoData, NoNeighbours) — the counts per category, and the
// warnings. The reports render a Result as it is.
//
// Below it, Run tests the areas of a graph already restricted to the areas
// with data and scaled (see weights.Restrict), on plain []float64
// columns; Statistic and MoranMoments give the statistics without
// inference. Standardised values use the mean and the standard deviation
// with divisor n, the moments of the layer itself rather than estimates of
// a population's.
//
// Each area gets its own p-value, so a map of n areas is n tests: Run
// adjusts them for multiple testing when asked (shuffle.Adjust) and assigns
// every area a category in plain words from the signs of its value and of
// its neighbours' and from its p-value at the level alpha. Categories
// lists them in report and legend order, Legend gives their legend lines.
//
// Checks: the tests here compare each statistic with its formula and with
// gonum's stat/spatial (Getis–Ord), the conditional moments with exact
// enumeration, and the false flags on simulated layers without pattern
// (null_test.go); tests/local_states_test.go checks the statistics on US
// Census state boundaries against values stored from numpy.
package local
