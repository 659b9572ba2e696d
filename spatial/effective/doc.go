// Package effective tests whether an outcome goes with a grouping of areas
// when both cluster in space, by the modified t-test of Clifford, Richardson
// & Hémon (1989, Biometrics 45:123–134) in the form of Dutilleul (1993,
// Biometrics 49:305–314).
//
// Pearson's r between two variables observed on n independent units has
// variance about 1/(n − 1) under the null of no association, and
// t = r·√((n − 2)/(1 − r²)) follows Student's t with n − 2 degrees of freedom.
// When both variables are autocorrelated in space, r varies far more than
// that and the ordinary test rejects too often. The modified test estimates
// the variance σ²_r of r from the spatial autocorrelation of the two
// variables, turns it into an effective sample size n_eff = 1 + 1/σ²_r (the
// number of independent units that would give r that variance), and refers
// t = r·√((n_eff − 2)/(1 − r²)) to Student's t with n_eff − 2 degrees of
// freedom.
//
// What it tests, for groups: with x the 0/1 indicator of group A, Pearson's
// r between the outcome y and x is the point-biserial correlation,
// r = (ȳ_A − ȳ_B)·√(n_A·n_B)/(n·s_y) with s_y the standard deviation of y
// about its mean (divisor n). r is zero exactly when the two group means are
// equal, and the ordinary t above is Student's pooled two-sample t. So the
// modified test is a test of the difference in means (not medians) that
// allows for spatial autocorrelation in both the outcome and the grouping.
//
// How the autocorrelation is estimated: areas are paired by contiguity order
// (the number of steps between them along the binary neighbour graph, as
// weights.Graph.HigherOrder counts them), and the correlation of a variable
// at order k is Moran's I of the variable on the binary graph of order k,
//
//	I_k = (n / N_k) · Σ_{d(i,j)=k} z_i z_j / Σ_i z_i²   (ordered pairs, N_k of them),
//
// which is Dutilleul's sample covariance at distance class k divided by the
// sample variance. The estimated correlation matrix R has ones on its
// diagonal, I_k for a pair at order k ≤ K, and zero for pairs farther apart
// or not connected at all (islands, separate groups of areas). With B the
// centring matrix I − 11ᵀ/n, Dutilleul's estimate is
//
//	σ²_r = tr(B R_y B R_x) / (tr(B R_y) · tr(B R_x)),
//
// which gives n_eff = n exactly when every estimated correlation is zero.
//
// Where to start: Test, from an outcome, a 0/1 grouping and the neighbour
// graph; NewLags shares the contiguity orders between calls.
//
// Checks: the unit tests here compare the variance with a dense
// computation of the formula and check its limiting cases (no
// autocorrelation gives n; the ordinary form is the pooled two-sample t);
// tests/effective_refs_test.go compares the whole test with numpy/scipy
// computations of the published expressions on small graphs and on US
// Census state boundaries (values stored in tests/testdata/scipy with the
// script that made them).
package effective
