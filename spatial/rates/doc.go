// Package rates turns counts of events and populations at risk into the
// rates epidemiologists read, and says which of them are too unstable to
// read: raw rates, rates pooled over groups of areas and their ratio and
// difference, the empirical-Bayes standardised rates of Assunção & Reis
// (1999) that the spatial statistics test, the empirical-Bayes smoothed
// rates of Marshall (1991) — towards the map's rate (global) or towards
// each area's neighbourhood (spatial) — for maps, and the flag of rates
// resting on few events.
//
// Sources: Marshall, R. J. (1991) Mapping disease and mortality rates using
// empirical Bayes estimators, Applied Statistics 40:283–294 (the moment
// estimators and the shrinkage factor); Assunção, R. M. & Reis, E. A.
// (1999) A new proposal to adjust Moran's I for population density,
// Statistics in Medicine 18:2147–2162. The formulas are as commonly
// stated for these estimators, recalled from memory; the tests check the
// code against a separate numpy implementation of the same formulas on real
// state counts (testdata/make_rates_refs.py) and against worked examples in
// exact fractions.
//
// Everything takes plain []float64 columns (and, for the spatial smoother,
// the neighbour graph); nothing here knows files.
package rates
