// Package sar fits the simultaneous autoregressive (SAR) model
//
//	y = ρWy + μ1 + ε,  ε ~ N(0, σ²I)
//
// to an outcome on a neighbour graph by maximum likelihood, and draws
// fields from the fitted model: an independent null generator for tests
// whose own null keeps the outcome's spatial pattern (the spectral
// surrogates of spatial/surrogate), since its fields share the outcome's
// autocorrelation but not its eigenvector structure, and owe nothing to
// any grouping.
//
// # Weights
//
// W is the row-standardised form D⁻¹C of a symmetric matrix C (a binary
// contiguity graph, or any symmetric weights); Prepare also accepts the
// row-standardised graph itself when every row's weights are equal. W is
// not symmetric, but it is similar to S = D^{-1/2} C D^{-1/2}: W =
// D^{-1/2} S D^{1/2}. So W's eigenvalues are S's, real and in [−1, 1],
// found by a symmetric solver; and every solve with I − ρW becomes one
// with the symmetric positive definite I − ρS. On each linked component, S
// has the eigenvalue 1 with the eigenvector D^{1/2}1, known exactly.
//
// # Fit
//
// With μ and σ² concentrated out, the log-likelihood in ρ is (Ord 1975,
// J. Am. Stat. Assoc. 70:120–126; Anselin 1988, Spatial Econometrics,
// ch. 6)
//
//	ℓ(ρ) = −n/2 (ln 2π + 1) − n/2 ln(RSS(ρ)/n) + ln|I − ρW|,
//
// RSS(ρ) = ‖(I − ρW)y − mean((I − ρW)y)‖², a quadratic in ρ. Fit
// maximises it over Interval by a grid, a golden-section search and
// Newton steps on the analytic score; μ = mean((I − ρW)y) and σ² =
// RSS(ρ)/n follow. The standard error of ρ is 1/√(−d²ℓ/dρ²), from the curvature of
// the concentrated (profile) likelihood, which equals the ρ entry of the
// inverse observed information of the full model.
//
// # Log-determinant
//
// Up to Options.ExactLimit areas (1,200 by default, about 0.6 s),
// ln|I − ρW| = Σ ln(1 − ρλ_i) from the dense eigenvalues of S (Ord 1975),
// and the interval is (1/λ_min, 1/λ_max) = (1/λ_min, 1).
//
// Above it, stochastic Lanczos quadrature (Ubaru, Chen & Saad 2017, SIAM
// J. Matrix Anal. Appl. 38:1075–1099): ln|I − ρS| = tr ln(I − ρS), the
// trace estimated by Hutchinson's estimator (Hutchinson 1989, Commun.
// Stat. Simul. Comput. 18:1059–1076) over Rademacher probes z, each
// quadratic form zᵀ f(S) z by the Gauss quadrature that Lanczos on S from
// z yields (Golub & Meurant 2010, Matrices, Moments and Quadrature). One
// Lanczos run per probe serves every ρ, so the fit's search costs nothing
// more. Two things reduce the variance: the eigenvalue 1 of each component
// is taken out exactly (the probes are deflated against D^{1/2}1, adding c
// ln(1 − ρ) for c components), and the first two terms of the series
// ln(1 − ρθ) = −ρθ − ρ²θ²/2 − … are exact (tr S = 0, tr S² = Σ s_ij²), so
// the probes estimate only a remainder of order θ³. The interval searched
// is (−1, 1), inside the admissible one for any row-standardised W.
//
// Accuracy, measured against the exact form (TestQuadratureAgainstExact,
// BenchmarkQuadratureAccuracy3000), with the default 48 probes of 40
// steps: the Lanczos truncation is below 1e-5 at ρ = 0.99 and far smaller
// elsewhere, so the error is the probes' Monte Carlo error, which LogDet
// reports. Near ρ = 1 it is about 1% of the log-determinant (1.7 of −200
// on a 30×30 lattice, 2.3 at 3,000 areas), but smooth in ρ, so the fitted
// ρ lies within 0.1 of its standard error of the exact fit (0.02–0.09
// measured on 900 to 3,000 areas at ρ = 0.5 and 0.9). The probes are
// fixed by Options.Seed.
//
// # Draws
//
// Model.Simulate draws ε from a stream of spatial/shuffle (Stream.Normals,
// the tool's one normal generator) and solves (I − ρW)y = μ1 + ε by conjugate
// gradients on the symmetrised system (Hestenes & Stiefel 1952) to a
// relative residual of Tolerance: about 60 steps at ρ = 0.95 on a
// contiguity graph, allocation-free given a Scratch. ForDraws draws many
// on all cores, four fields per pass over the links, draw k from the stream
// (seed, purpose, k) and equal to what Simulate draws from it, so the
// fields are the same for any number of workers. Weights.Model sets up
// draws at chosen parameters, for simulation studies on layers too large
// for a dense generator.
//
// Checks: the tests here compare the exact log-determinant with gonum's
// dense LU, the quadrature with the exact form, the fit's recovery of a
// known ρ on simulated lattices, and the draws' means and covariances with
// the dense formula; tests/sar_states_test.go compares the fit on US
// Census state boundaries with numpy/scipy (tests/testdata/scipy,
// make_sar_refs.py).
package sar
