// Package clustering answers "does this variable cluster in space, how
// strongly, and can I trust it?" for the columns of a layer. It assembles
// the global statistics of package autocorr, tested through the shared
// shuffle machinery, on the neighbour graph among the areas that have
// data, and holds the result structs the reports render.
//
// Two entry points take plain columns and the graph of all areas (Input):
//
//   - Autocorr: for each numeric variable Moran's I with its moments and
//     range, Geary's C, General G, optionally the bivariate Moran's I
//     against another column and a correlogram over neighbour orders or
//     distance classes; join counts for text columns; and the raw and
//     empirical-Bayes Moran's I of a rate events/population.
//   - Screen: Moran's I and Geary's C for every numeric column at once,
//     adjusted across columns and ranked, with the columns left out and
//     why.
//
// Each column is analysed on the areas that have a value, with the graph
// cut down to them (weights.Restrict). Values too large for the sums of the
// statistics are an error naming the column and the area
// (autocorr.TooLargeError), and a reason to skip the column in Screen;
// join counts run only on plainly categorical columns (NotCategoriesError). The results state facts only: a
// caller that offers settings words its own advice from them (for example
// Result.IslandsLeftOut).
//
// Checks: the statistics themselves are checked in spatial/autocorr (and,
// on US Census state boundaries, in tests/autocorr_states_test.go); the
// tests here check how columns, missing values and rates are handled. The
// adjustment across columns is shuffle.Adjust, checked against statsmodels
// in tests/autocorr_multitest_test.go.
package clustering
