// Package regress fits an ordinary least-squares model of an outcome on
// covariates across areas and tests what it leaves behind: is there
// spatial structure in the residuals, and if so of which kind — a
// spatially lagged outcome or spatially correlated errors?
//
// # The fit
//
// OLS fits y = β₀ + Σ β_j x_j + e by Householder QR of the design X
// (intercept first), with standard errors, t and two-sided p (Student's t,
// n − k degrees of freedom), R², adjusted R², the F test of all covariates
// and the residual standard error. Diagnostics that need no graph come
// with it: the condition number of the design scaled to unit column length
// and the variance inflation factors (Belsley, Kuh & Welsch 1980,
// Regression Diagnostics), flagged over the rules of thumb ConditionLimit
// and VIFLimit; the Jarque–Bera test of normal residuals (Jarque & Bera
// 1980); the Breusch–Pagan test of variance depending on the covariates
// (Breusch & Pagan 1979) and its studentised form (Koenker 1981), which
// keeps its level when the errors are not normal.
//
// # What the residuals keep
//
// Fit.Moran computes Moran's I of the residuals with its exact mean and
// variance under normal errors and the projection M = I − X(XᵀX)⁻¹Xᵀ
// (Cliff & Ord 1981, Spatial Processes), the normal-approximation z and p,
// and, for at most ExactLimit areas, the exact p-value under normal errors
// by Imhof's (1961) inversion of the characteristic function of a
// quadratic form, as Tiefelsdorf (2000, Modelling Spatial Processes)
// applies it to Moran's I. Fit.LagrangeMultipliers computes the LM tests
// of a spatial error (Burridge 1980) and a spatial lag (Anselin 1988),
// their robust forms and the joint test (Anselin, Bera, Florax & Yoon
// 1996); Suggest and Reading apply the decision rule published with the
// robust tests and word it, with the caution that these are diagnostics
// for the next model, not a choice of model by themselves.
//
// Every trace the moments and the LM tests need comes from the sparse
// graph and the n×k orthonormal basis of the design (see traces), so a
// fit with Moran and LM tests takes O(links·k + n·k²): about 2 ms at 3,000
// areas and 40 ms at 85,000 with 5 covariates (BenchmarkResiduals3000x5,
// BenchmarkResiduals85000x5). Only the exact p-value forms a dense matrix.
//
// # Checks
//
// tests/regress_states_test.go compares the fit and its diagnostics on the
// US states with statsmodels, and the residual Moran's I, its moments,
// exact p-value and the LM tests with a dense numpy implementation
// (tests/testdata/scipy/make_regress_refs.py). The tests here check the
// moments against a Monte Carlo and against the dense traces, the
// intercept-only moments against Moran's I under normality, Imhof's
// formula against closed forms, the exact p-value against simulation at
// 30 areas and the normal approximation at 900, and the LM tests' null
// distribution (Kolmogorov–Smirnov against χ²), level and power.
package regress
