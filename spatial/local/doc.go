// Package local computes a statistic for every area — local Moran, its
// cross form (x at the area, y at its neighbours), local Geary, Getis–Ord
// Gi and Gi* — and tests each one by
// conditional permutation through the shared shuffle machinery
// (shuffle.RunLocal): the area keeps its own value and the other values are
// drawn into its neighbour slots (Anselin 1995, Geogr. Anal. 27:93–115).
//
// The statistics read the neighbour graph as given (the caller restricts it
// to the areas with data and applies the transform, see weights.Restrict)
// and plain []float64 columns. Standardised values use the mean and the
// standard deviation with divisor n, the moments of the layer itself rather
// than estimates of a population's.
//
// Each area gets its own p-value, so a map of n areas is n tests: Run
// adjusts them for multiple testing when asked (shuffle.Adjust) and assigns
// every area a category in plain words from the signs of its value and of
// its neighbours' and from its p-value at the level alpha.
package local
