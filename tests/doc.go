// Package tests holds the end-to-end test of the built command and the
// checks of the statistics against references outside the project: real
// boundaries (the US states from the Census Bureau, testdata/us-states.geojson)
// and values stored by scripts run with scipy, numpy and statsmodels
// (testdata/scipy). Each file under testdata/ has its provenance in
// testdata/README.md. Checks of one package that need no outside data
// (its formulas, and its null models on simulated layers, such as the false
// flags of spatial/local in spatial/local/null_test.go) live beside that
// package instead.
//
// The outside checks of each package:
//
//   - spatial/autocorr: autocorr_states_test.go (global statistics, EB
//     Moran, join counts, Gi*, correlogram on the states),
//     states_test.go (Moran's I against gonum) and bounds_states_test.go
//     (the range of Moran's I on the sparse path against numpy);
//   - spatial/rates: rates_states_test.go (pooled rates, their ratio,
//     global and spatial empirical-Bayes smoothing against numpy);
//   - spatial/regress: regress_states_test.go (OLS and its diagnostics
//     against statsmodels; residual Moran, exact p and LM tests against
//     dense numpy);
//   - io/input, io/gpkg, io/shapefile, io/geojson: formats_test.go (GDAL's
//     copies of the states in every format and a projected system give the
//     same areas, attributes, neighbours and Moran's I);
//   - spatial/local: local_states_test.go;
//   - spatial/surrogate: surrogate_states_test.go;
//   - spatial/sar: sar_states_test.go (the maximum-likelihood fit against
//     scipy);
//   - spatial/effective: effective_refs_test.go (modified t-test);
//   - spatial/shuffle: autocorr_multitest_test.go (p-value adjustments),
//     effective_refs_test.go (Freedman–Lane's partial F and t) and
//     scipy_test.go (exact enumeration, Clopper–Pearson);
//   - spatial/groups: scipy_test.go;
//   - weights: states_test.go and contiguity_test.go (contiguity of the
//     states), effective_zones_test.go (zones of the states);
//   - cmd/areatest: binary_test.go (the built binary) and shards_test.go
//     (four shard processes of the built binary and their merge against a
//     single run).
//
// helpers_test.go loads the states layer and its queen graph for all of
// them; what tests of any package share (golden files, dense matrices, SAR
// fields, the testdata locator) is in tests/testkit.
package tests
