// Package testkit holds the helpers the project's tests share, so that no
// test writes them again:
//
//   - golden files and the -update flag that rewrites them (Golden);
//   - graphs as dense matrices, from compressed rows (Dense), and the
//     centring and doubly-centred matrices of the published formulas
//     (Centring, DoublyCentred);
//   - simultaneous autoregressive fields y = (I − ρW)⁻¹ε (NewSAR);
//   - the files under tests/testdata, found from any package's test
//     directory (Testdata), and the stored reference values decoded from
//     JSON (LoadJSON);
//   - the mean and sample variance of a column (MeanVar).
//
// The helpers are small plain functions on slices and gonum matrices. The
// package is imported by tests only and depends on no package of the
// project (a graph is passed as its offsets, neighbours and weights, not as
// a weights.Graph), so that any package's own tests can use it without an
// import cycle.
package testkit
