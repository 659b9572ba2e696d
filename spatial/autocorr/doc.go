// Package autocorr holds the global and per-area spatial autocorrelation
// statistics: how a variable clusters on the neighbour graph.
//
// Each statistic comes as a plain function of a column and a graph, with
// its analytic moments where they are known, and as a permutation test
// through the shared shuffle machinery (spatial/shuffle):
//   - Moran's I (MoransI, MoranMoments, RunTest; Moran 1950, Cliff & Ord
//     1981) and the range it can take on the weights (MoranBounds; de Jong,
//     Sprenger & van Veen 1984);
//   - Geary's C (GearysC, RunGeary; Geary 1954);
//   - Getis–Ord General G and Gi* (GeneralG, RunGeneralG, GiStar; Getis &
//     Ord 1992, Ord & Getis 1995);
//   - join counts of a categorical column (JoinCounts, RunJoins; Cliff &
//     Ord 1981);
//   - bivariate Moran's I (RunBivariate), the correlogram over graphs of
//     several lags (Correlogram, LagGraphs), and the empirical-Bayes
//     standardised Moran's I of rates (EBMoran; Assunção & Reis 1999).
//
// Where to start: RunTest, which spatial/clustering calls for every numeric
// column. Centre is the one centring of a column shared with spatial/local
// and spatial/effective.
//
// Checks: the unit tests here enumerate every arrangement of small cases
// and compare with gonum's stat/spatial; tests/autocorr_states_test.go
// checks every statistic on US Census state boundaries against numpy
// computations of the published formulas stored in tests/testdata/scipy,
// with the script that made them.
package autocorr
