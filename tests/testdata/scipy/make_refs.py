#!/usr/bin/python3
"""Write tests/testdata/scipy/refs.json: outside reference values for areatest.

Run with Debian's interpreter and packages (python3-scipy, python3-numpy,
python3-statsmodels, python3-mpmath from Debian 12 "bookworm"):

    apt-get install -y python3-scipy python3-statsmodels python3-mpmath
    /usr/bin/python3 tests/testdata/scipy/make_refs.py

The output is deterministic (no random numbers are drawn; every permutation
reference is an exact enumeration), keys are sorted, and library versions are
recorded in the "versions" block. All samples are small hand-chosen numbers
written literally below.

Besides calling scipy/statsmodels, the script recomputes each exact
permutation-type result by brute-force enumeration with exact rational
arithmetic (fractions.Fraction) and asserts agreement, and it stores the
integer counts behind each exact p-value so tests can compare counts rather
than floating-point p-values.
"""

import itertools
import json
import math
import os
import platform
import sys
import warnings
from fractions import Fraction

import numpy as np
import scipy
import scipy.stats as st

import mpmath  # Debian python3-mpmath
try:
    import statsmodels
    from statsmodels.stats.multitest import multipletests
except ImportError:  # pragma: no cover - documented fallback
    statsmodels = None

OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "refs.json")
ALTS = ["two-sided", "greater", "less"]


def f(v):
    """Plain Python float (shortest round-trip repr in JSON)."""
    v = float(v)
    assert np.isfinite(v), v
    return v


def has_ties(*samples):
    z = [v for s in samples for v in s]
    return len(set(z)) != len(z)


def partitions(n, k):
    """All ways to pick k of n pooled positions as the first sample."""
    for c in itertools.combinations(range(n), k):
        cs = set(c)
        yield list(c), [i for i in range(n) if i not in cs]


# ---------------------------------------------------------------------------
# a. Mann-Whitney U, method="exact", samples WITHOUT ties.
#
# scipy 1.10 (scipy/stats/_mannwhitneyu.py):
#   ranks = rankdata(concat(x, y)) (midranks);  R1 = sum of ranks of x
#   U1 = R1 - n1(n1+1)/2  = #{(i,j): x_i > y_j} + 0.5 #{x_i == y_j}
#   The returned statistic is always U1, the U of the FIRST sample x,
#   whatever the alternative.
#   greater:   p = P(U >= U1)              (exact null distribution of U)
#   less:      p = P(U >= U2), U2 = n1 n2 - U1, i.e. P(U <= U1) by symmetry
#   two-sided: p = min(1, 2 P(U >= max(U1, U2)))
#              = min(1, 2 min(p_greater, p_less))   (checked below)
#   The exact null distribution assumes no ties; with ties scipy neither
#   warns nor switches method when method="exact" is given: it uses the
#   no-ties distribution and truncates U to an integer (U.astype(int)), so
#   its p-value is then not the exact conditional one. Tied two-sample
#   cases are therefore kept only in the permutation_test section (b).
# ---------------------------------------------------------------------------
MWU_CASES = [
    ([1.1, 2.3, 4.0], [3.2, 5.5, 6.1]),
    ([8.0, 9.5, 10.2, 11.7], [1.0, 2.5, 3.3]),
    ([1.0, 4.0, 5.0, 8.0], [2.0, 3.0, 6.0, 7.0]),  # U1 = 8 = n1 n2 / 2
    ([0.5, 2.2, 3.9, 7.4, 9.0], [1.3, 4.8, 5.6, 6.2, 8.1, 10.5]),
    ([12.1, 15.3, 9.8, 20.4, 18.2, 11.0, 16.6], [7.7, 10.4, 8.9, 13.5]),
    ([3.3, 1.7, 2.9, 6.4, 5.1, 4.2, 0.8, 7.9], [9.2, 8.4, 11.3, 6.9, 10.1, 12.6, 7.3, 13.8, 5.8]),
    ([2.0, 7.0, 13.0, 19.0, 23.0, 29.0, 31.0, 37.0, 41.0, 43.0],
     [1.0, 3.0, 5.0, 11.0, 17.0, 47.0, 53.0]),
    ([-1.5, -0.2, 0.3, 1.9, 2.4, 3.6], [-3.1, -2.2, -0.9, 0.1, 0.8, 1.2, 4.4, 5.0, 6.3, 7.7]),
]
# Each record carries "case" = "m1".."m8" (mannwhitneyu) or "p1".."p5"
# (permutation_test), numbering the sample pairs in the order listed here.


def u_stat(x, y):
    return Fraction(sum(2 * (a > b) + (a == b) for a in x for b in y), 2)


def mwu_block():
    out = []
    for ci, (x, y) in enumerate(MWU_CASES, 1):
        assert not has_ties(x, y)
        assert 3 <= len(x) <= 10 and 3 <= len(y) <= 10
        z = x + y
        u_obs = u_stat(x, y)
        us = [u_stat([z[i] for i in a], [z[i] for i in b])
              for a, b in partitions(len(z), len(x))]
        n_arr = len(us)
        ge = sum(u >= u_obs for u in us)
        le = sum(u <= u_obs for u in us)
        res = {}
        for alt in ALTS:
            with warnings.catch_warnings():
                warnings.simplefilter("error")
                r = st.mannwhitneyu(x, y, alternative=alt, method="exact")
            assert Fraction(float(r.statistic)) == u_obs
            res[alt] = r
            out.append({
                "case": "m%d" % ci, "x": x, "y": y, "alternative": alt,
                "statistic": f(r.statistic), "pvalue": f(r.pvalue),
                "n_arrangements": n_arr, "count_ge": ge, "count_le": le,
            })
        # brute force agrees with scipy
        pg, pl = Fraction(ge, n_arr), Fraction(le, n_arr)
        assert abs(float(pg) - res["greater"].pvalue) < 1e-12
        assert abs(float(pl) - res["less"].pvalue) < 1e-12
        # two-sided == min(1, 2 * min(one-sided))
        two = min(1.0, 2 * min(res["greater"].pvalue, res["less"].pvalue))
        assert abs(two - res["two-sided"].pvalue) < 1e-12, (x, y)
    return out


# ---------------------------------------------------------------------------
# b. scipy.stats.permutation_test, permutation_type="independent",
#    n_resamples=np.inf (every distinct split of the pooled data into groups
#    of the original sizes, each once, the observed split included;
#    C(n1+n2, n1) of them; no +1 adjustment for an exact test).
#
# scipy 1.10 (scipy/stats/_resampling.py, permutation_test):
#   gamma = max(1e-14, |1e-14 * observed|)
#   less:      p = #{T* <= observed + gamma} / N
#   greater:   p = #{T* >= observed - gamma} / N
#   two-sided: p = min(1, 2 * min(p_less, p_greater))
#   (a relative tolerance of 1e-14 with an absolute floor of 1e-14, so that
#    values that are equal in exact arithmetic but differ by rounding count as
#    ties with the observed value).
# The counts stored here (count_ge, count_le) are computed with exact
# rational arithmetic on the decimal values as written, independently of
# scipy, and asserted equal to scipy's p-value times N.
# ---------------------------------------------------------------------------
PERM_CASES = [
    ([4.1, 5.3, 6.8, 7.2], [2.0, 3.4, 3.9, 5.0, 1.7]),
    ([3.0, 5.0, 5.0, 8.0, 9.0], [1.0, 3.0, 4.0, 5.0]),              # ties
    ([10.0, 12.0, 12.0, 15.0, 11.0, 14.0], [9.0, 12.0, 8.0, 13.0, 10.0, 7.0, 9.0]),  # ties
    ([2.5, 0.4, 3.75, 1.25, 6.0, 4.5, 5.25], [3.0, 1.5, 2.0, 0.75, 4.0, 0.5]),
    # Rounding trap: with one-decimal data many rearrangements have a mean
    # difference equal to the observed one in decimal arithmetic but not in
    # binary floating point. Plain float comparisons (no tolerance) on
    # scipy's own null distribution give count_ge 79 / count_le 54 for the
    # mean difference instead of the decimal-exact 82 / 59 stored here;
    # scipy's tolerance gamma recovers 82 / 59.
    ([0.1, 0.7, 0.2, 0.4, 0.3], [0.6, 0.3, 0.1, 0.5]),
]


def dec(a):
    """The decimal number as written (0.1 -> 1/10), not its binary double."""
    return Fraction(repr(a))


def frac_mean(v):
    return sum(dec(a) for a in v) / len(v)


def frac_median(v):
    s = sorted(dec(a) for a in v)
    n = len(s)
    return s[n // 2] if n % 2 else (s[n // 2 - 1] + s[n // 2]) / 2


def stat_mean_diff(x, y, axis=-1):
    return np.mean(x, axis=axis) - np.mean(y, axis=axis)


def stat_median_diff(x, y, axis=-1):
    return np.median(x, axis=axis) - np.median(y, axis=axis)


def stat_u(x, y, axis=-1):
    # Mann-Whitney U of x with midranks for ties, via pairwise comparison
    x = np.asarray(x)[..., :, None]
    y = np.asarray(y)[..., None, :]
    return ((x > y) + 0.5 * (x == y)).sum(axis=(-2, -1))


PERM_STATS = {
    "mean_diff": (stat_mean_diff, lambda a, b: frac_mean(a) - frac_mean(b)),
    "median_diff": (stat_median_diff, lambda a, b: frac_median(a) - frac_median(b)),
    "mann_whitney_u": (stat_u, u_stat),
}


def perm_block():
    out = []
    for ci, (x, y) in enumerate(PERM_CASES, 1):
        assert 4 <= len(x) <= 7 and 4 <= len(y) <= 7
        z = x + y
        for sname, (fn, exact_fn) in sorted(PERM_STATS.items()):
            obs = exact_fn(x, y)
            null = [exact_fn([z[i] for i in a], [z[i] for i in b])
                    for a, b in partitions(len(z), len(x))]
            n_arr = len(null)
            ge = sum(t >= obs for t in null)
            le = sum(t <= obs for t in null)
            res = {}
            for alt in ALTS:
                r = st.permutation_test((x, y), fn, permutation_type="independent",
                                        n_resamples=np.inf, alternative=alt)
                assert len(r.null_distribution) == n_arr
                res[alt] = r
                out.append({
                    "case": "p%d" % ci, "x": x, "y": y,
                    "statistic_name": sname, "alternative": alt,
                    "statistic": f(r.statistic), "pvalue": f(r.pvalue),
                    "ties": has_ties(x, y),
                    "n_arrangements": n_arr, "count_ge": ge, "count_le": le,
                })
            assert abs(float(obs) - res["greater"].statistic) < 1e-12
            assert abs(float(Fraction(ge, n_arr)) - res["greater"].pvalue) < 1e-12
            assert abs(float(Fraction(le, n_arr)) - res["less"].pvalue) < 1e-12
            two = min(1.0, 2 * min(res["greater"].pvalue, res["less"].pvalue))
            assert abs(two - res["two-sided"].pvalue) < 1e-12
    return out


# ---------------------------------------------------------------------------
# c. Welch t (ttest_ind equal_var=False), Kruskal-Wallis H (tie-corrected),
#    one-way ANOVA F.
# ---------------------------------------------------------------------------
WELCH_CASES = [
    ([19.8, 20.4, 19.6, 17.8, 18.5, 18.9, 18.3, 18.9, 19.5, 22.0],
     [28.2, 26.6, 20.1, 23.3, 25.2, 22.1, 17.7, 27.6, 20.6, 13.7, 23.2, 17.5, 20.6, 18.0, 23.9]),
    ([3.1, 2.8, 4.0, 3.6], [2.0, 2.2, 1.9, 2.7, 2.4, 2.1, 2.6]),
    ([0.12, -0.45, 1.33, 0.87, -0.21, 0.56], [1.9, 2.4, -0.3, 3.1, 0.2]),
]

KRUSKAL_CASES = [
    [[2.9, 3.0, 2.5, 2.6, 3.2], [3.8, 2.7, 4.0, 2.4], [2.8, 3.4, 3.7, 2.2, 2.0]],
    [[1, 2, 2, 3, 4], [2, 3, 3, 5, 6, 6], [4, 4, 5, 7]],                    # ties
    [[10, 12, 12, 14], [11, 12, 15, 15, 16], [9, 10, 10, 13], [14, 16, 17, 17, 18]],  # ties
]

ANOVA_CASES = [
    [[6.0, 8.0, 4.0, 5.0, 3.0, 4.0], [8.0, 12.0, 9.0, 11.0, 6.0, 8.0], [13.0, 9.0, 11.0, 8.0, 7.0, 12.0]],
    [[1.2, 3.4, 2.2], [4.5, 3.9, 5.1, 4.4], [2.8, 3.0, 3.3, 2.9, 3.6]],
    [[20.1, 19.4, 22.3, 21.0], [18.2, 17.9, 19.0, 18.8, 18.1], [23.4, 22.0, 24.1], [19.9, 20.7, 21.3, 20.2]],
]


def welch_df(x, y):
    # Welch-Satterthwaite degrees of freedom (computed here, not by scipy:
    # scipy 1.10's ttest_ind does not return df).
    x, y = np.asarray(x, float), np.asarray(y, float)
    vx, vy = x.var(ddof=1) / len(x), y.var(ddof=1) / len(y)
    return (vx + vy) ** 2 / (vx ** 2 / (len(x) - 1) + vy ** 2 / (len(y) - 1))


def tests_block():
    welch = []
    for x, y in WELCH_CASES:
        r = st.ttest_ind(x, y, equal_var=False)
        welch.append({"x": x, "y": y, "statistic": f(r.statistic),
                      "pvalue_two_sided": f(r.pvalue), "df": f(welch_df(x, y))})
    kw = []
    for groups in KRUSKAL_CASES:
        r = st.kruskal(*groups)
        kw.append({"groups": groups, "statistic": f(r.statistic), "pvalue": f(r.pvalue),
                   "df": len(groups) - 1, "ties": has_ties(*groups)})
    an = []
    for groups in ANOVA_CASES:
        r = st.f_oneway(*groups)
        n = sum(len(g) for g in groups)
        an.append({"groups": groups, "statistic": f(r.statistic), "pvalue": f(r.pvalue),
                   "df_between": len(groups) - 1, "df_within": n - len(groups)})
    return welch, kw, an


# ---------------------------------------------------------------------------
# d. Clopper-Pearson ("exact") 95% intervals for a binomial proportion.
#
# scipy 1.10 (scipy/stats/_binomtest.py) finds each limit by brentq root
# finding on the binomial cdf/sf (default xtol 2e-12, absolute), with
# alpha = (1 - confidence_level) / 2; low = 0 when k = 0, high = 1 when k = n.
# So "low"/"high" are accurate only to about 1e-12 absolute (about 1e-8
# relative for the smallest lower limit here).
# "low_precise"/"high_precise" are the same limits as beta quantiles,
# low = Beta(k, n-k+1) quantile at 0.025, high = Beta(k+1, n-k) quantile at
# 0.975 (alpha exactly 0.025), solved to 40 significant digits with mpmath
# (Debian python3-mpmath) and rounded to the nearest double. The script
# asserts that scipy's binomtest limits are within 1e-12 absolute of them,
# that scipy's beta quantiles are within 1e-14 relative, and that the closed
# forms for k = 0, 1, n agree.
# ---------------------------------------------------------------------------
CP_CASES = [(0, 9999), (1, 9999), (12, 9999), (500, 9999), (9999, 9999), (3, 20), (0, 10), (10, 10)]


def beta_quantile_precise(a, b, q, guess):
    mpmath.mp.dps = 40
    g = lambda x: mpmath.betainc(a, b, 0, x, regularized=True) - q
    lo = mpmath.mpf(guess) * (1 - mpmath.mpf(10) ** -6)
    hi = min(mpmath.mpf(guess) * (1 + mpmath.mpf(10) ** -6), mpmath.mpf(1))
    root = mpmath.findroot(g, (lo, hi), solver="anderson", tol=mpmath.mpf(10) ** -60)
    assert abs(g(root)) < mpmath.mpf(10) ** -35
    return float(root)


def cp_block():
    out = []
    q = mpmath.mpf(1) / 40  # 0.025 exactly
    for k, n in CP_CASES:
        with warnings.catch_warnings():
            # the root finder probes p in {0, 1}, where the binomial pmf
            # evaluates log(0); harmless
            warnings.simplefilter("ignore", RuntimeWarning)
            ci = st.binomtest(k, n).proportion_ci(confidence_level=0.95, method="exact")
        lo_s = 0.0 if k == 0 else st.beta.ppf(0.025, k, n - k + 1)
        hi_s = 1.0 if k == n else st.beta.isf(0.025, k + 1, n - k)
        lo = 0.0 if k == 0 else beta_quantile_precise(k, n - k + 1, q, lo_s)
        hi = 1.0 if k == n else beta_quantile_precise(k + 1, n - k, 1 - q, hi_s)
        assert abs(ci.low - lo) < 1e-12 and abs(ci.high - hi) < 1e-12
        assert abs(lo_s - lo) <= 1e-14 * lo and abs(hi_s - hi) <= 1e-14 * hi
        if k == 0:
            assert abs(hi - -math.expm1(math.log(0.025) / n)) <= 4e-16 * hi
        if k == n:
            assert abs(lo - math.exp(math.log(0.025) / n)) <= 4e-16 * lo
        if k == 1:
            assert abs(lo - -math.expm1(math.log1p(-0.025) / n)) <= 4e-16 * lo
        out.append({"k": k, "n": n, "confidence_level": 0.95,
                    "low": f(ci.low), "high": f(ci.high),
                    "low_precise": f(lo), "high_precise": f(hi)})
    return out


# ---------------------------------------------------------------------------
# e. Fisher's tea-tasting experiment: 8 cups, 4 milk-first, all identified.
# ---------------------------------------------------------------------------
def fisher_block():
    table = [[4, 0], [0, 4]]
    _, p = st.fisher_exact(table, alternative="greater")
    assert abs(p - 1 / 70) < 1e-15
    return {"table": table, "alternative": "greater", "pvalue": f(p),
            "pvalue_fraction": [1, 70]}


# ---------------------------------------------------------------------------
# f. Multiple-testing adjustment. The 15 p-values are the worked example of
#    Benjamini & Hochberg (1995), section 3.1, as recalled from memory (not
#    copied from the paper); tests should treat them as an input list, and
#    the adjusted values as statsmodels' output for that list.
# ---------------------------------------------------------------------------
BH_PVALUES = [0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344,
              0.0459, 0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.000]


def multitest_block():
    if statsmodels is None:
        raise SystemExit("python3-statsmodels is required")
    out = {"pvalues": BH_PVALUES, "alpha": 0.05, "methods": {}}
    for m in ["bonferroni", "holm", "fdr_bh", "fdr_by"]:
        reject, adj, _, _ = multipletests(BH_PVALUES, alpha=0.05, method=m)
        out["methods"][m] = {"adjusted": [f(v) for v in adj],
                             "reject": [bool(v) for v in reject]}
    # plain re-derivation of BH step-up, as a check of the call
    m = len(BH_PVALUES)
    order = np.argsort(BH_PVALUES)
    q = np.minimum.accumulate((np.array(BH_PVALUES)[order] * m / np.arange(1, m + 1))[::-1])[::-1]
    bh = np.empty(m)
    bh[order] = np.minimum(q, 1)
    assert np.allclose(bh, out["methods"]["fdr_bh"]["adjusted"], rtol=0, atol=1e-15)
    return out


def main():
    welch, kw, an = tests_block()
    refs = {
        "versions": {
            "python": platform.python_version(),
            "mpmath": mpmath.__version__,
            "numpy": np.__version__,
            "scipy": scipy.__version__,
            "statsmodels": statsmodels.__version__ if statsmodels else None,
        },
        "mannwhitneyu_exact": mwu_block(),
        "permutation_test_exact": perm_block(),
        "welch_t": welch,
        "kruskal": kw,
        "f_oneway": an,
        "clopper_pearson": cp_block(),
        "fisher_tea": fisher_block(),
        "multitest": multitest_block(),
    }
    with open(OUT, "w") as fh:
        json.dump(refs, fh, sort_keys=True, indent=1, allow_nan=False)
        fh.write("\n")
    print("wrote", OUT, file=sys.stderr)


if __name__ == "__main__":
    main()
