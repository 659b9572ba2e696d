// Package surrogate draws surrogate outcomes that keep an outcome's spatial
// structure and break its link to anything else, by Moran spectral
// randomisation (Wagner & Dray 2015, Methods Ecol. Evol. 6:1169–1178): the
// outcome is written in the eigenvectors of the doubly-centred symmetrised
// weights Ω = M W* M (W* = (W + Wᵀ)/2, M = I − 11ᵀ/n; the Moran eigenvector
// maps of Dray, Legendre & Peres-Neto 2006, Ecol. Model. 196:483–493), and
// a surrogate keeps the magnitude of every coefficient but draws its sign at
// random. The surrogate has the outcome's mean, variance and Moran's I —
// Moran's I of a centred z is (n/S0)·Σ_k λ_k c_k² / Σ_k c_k², which the
// signs do not touch — but no link to a grouping fixed beforehand.
//
// A reader starts at NewBasis, which finds the eigenvectors of a graph
// (densely for small layers, a filtered subspace of the extreme ones for
// large layers, sparse.go); Basis.Prepare writes one outcome in the basis,
// and Outcome.Draw (or Outcome.NewDraw, for the shuffle machinery's
// shuffle.RunSurrogates) draws surrogates from it, each from the given
// random stream alone. Outcome.MoranTolerance bounds how far a surrogate's
// Moran's I can move when the basis is incomplete. What the surrogates are
// used for — the spatially constrained test of a group statistic and the
// false-positive check of the free shuffle — belongs to spatial/compare.
//
// Checks: the tests here hold that dense surrogates keep Moran's I, mean
// and variance, that the sparse basis matches the dense one, and the size
// and power of the surrogate test on simulated autoregressive layers;
// tests/surrogate_states_test.go checks the basis on US Census state
// boundaries against numpy's eigendecomposition and the surrogates' Moran's
// I against gonum's stat/spatial.
package surrogate
