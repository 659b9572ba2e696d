#!/usr/bin/python3
"""Write tests/testdata/scipy/regress_refs.json: outside reference values for
areatest's least-squares fit and its residual diagnostics (spatial/regress)
on the US states layer.

Run with Debian's interpreter and libraries (python3-numpy 1.24.2,
python3-scipy 1.10.1, python3-statsmodels 0.13.5 from Debian 12):

    /usr/bin/python3 tests/testdata/scipy/make_regress_refs.py

Inputs, both in this repository:
  tests/testdata/us-states.geojson   (Census Bureau state boundaries)
  tests/testdata/scipy/population_engineers_hurricanes.csv
      (a verbatim copy from the npm package vega-datasets 3.2.1; see
      tests/testdata/README-autocorr.md)

Areas: the 49 with a queen neighbour (48 contiguous states and DC, in file
order); two states are neighbours when their boundaries share a vertex. W
is that binary matrix divided by its row sums.

Covariates: centroid_lon and centroid_lat are the area-weighted centroid of
each state's polygons, by the shoelace formula on the longitudes and
latitudes as planar coordinates (outer rings add, holes subtract). Two
models:
  engineers:      y = engineers per thousand residents,
                  x = centroid_lon, centroid_lat, log(population)
  log_population: y = log(population),
                  x = centroid_lon, centroid_lat, hurricanes
The outcome and covariate columns are stored with the values, so the test
reads exactly what was fitted.

From statsmodels: the OLS fit (coefficients, standard errors, t, p,
R-squared, adjusted R-squared, F and its p, residual standard error,
internally studentised residuals), variance_inflation_factor,
stattools.jarque_bera, het_breuschpagan with robust=False (Breusch and
Pagan 1979) and robust=True (Koenker 1981). The condition number is
numpy.linalg.cond of the design with every column (intercept included)
divided by its length (Belsley, Kuh and Welsch 1980).

With dense numpy, from the formulas (an implementation independent of the
Go one, which never forms an n x n matrix): M = I - X (X'X)^-1 X', the
residual Moran's I = (n/S0) e'We/e'e, its exact mean (n/S0) tr(MW)/(n-k) and
variance (n/S0)^2 [tr(MWMW') + tr(MWMW) + tr(MW)^2]/((n-k)(n-k+2)) - mean^2
(Cliff and Ord 1981), z and its upper normal p; the exact upper p-value
P(I >= observed) under normal errors by Imhof's (1961) formula, with the
eigenvalues of M((W+W')/2 - c I)M, c = I S0/n, from numpy.linalg.eigvalsh
and the integral by scipy.integrate.quad on (0, inf); and the Lagrange
multiplier tests (Anselin 1988; Anselin, Bera, Florax and Yoon 1996) with
s2 = e'e/n, T = tr(W'W + WW):
  LMerr  = (e'We/s2)^2 / T
  LMlag  = (e'Wy/s2)^2 / D,   D = [(WXb)'M(WXb) + T s2]/s2
  RLMerr = (e'We/s2 - T/D e'Wy/s2)^2 / (T - T^2/D)
  RLMlag = (e'Wy/s2 - e'We/s2)^2 / (D - T)
  SARMA  = RLMlag + LMerr  (chi-square, 2 df; the others 1 df)

The output is deterministic; keys are sorted; versions are recorded.
"""

import csv
import json
import math
import os
import platform

import numpy as np

import linked_states
import scipy
import statsmodels
import statsmodels.api as sm
from scipy import integrate, stats
from statsmodels.stats.diagnostic import het_breuschpagan
from statsmodels.stats.outliers_influence import variance_inflation_factor
from statsmodels.stats.stattools import jarque_bera

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.dirname(HERE)
OUT = os.path.join(HERE, "regress_refs.json")

features, links, linked, where, C, ids = linked_states.load()
n = len(linked)
W = C / C.sum(axis=1)[:, None]


def centroid(geom):
    """Area-weighted centroid of a (multi)polygon, planar in lon/lat."""
    polygons = geom["coordinates"] if geom["type"] == "MultiPolygon" else [geom["coordinates"]]
    total = sx = sy = 0.0
    for polygon in polygons:
        for r, ring in enumerate(polygon):
            pts = np.array(ring, dtype=float)
            x, y = pts[:, 0], pts[:, 1]
            x1, y1 = np.roll(x, -1), np.roll(y, -1)
            cross = x * y1 - x1 * y
            a = cross.sum() / 2
            cx = ((x + x1) * cross).sum() / (6 * a)
            cy = ((y + y1) * cross).sum() / (6 * a)
            sign = 1.0 if r == 0 else -1.0
            total += sign * abs(a)
            sx += sign * abs(a) * cx
            sy += sign * abs(a) * cy
    return sx / total, sy / total


lon = np.array([centroid(features[i]["geometry"])[0] for i in linked])
lat = np.array([centroid(features[i]["geometry"])[1] for i in linked])

pop, eng, hur = {}, {}, {}
with open(os.path.join(HERE, "population_engineers_hurricanes.csv")) as fh:
    for row in csv.DictReader(fh):
        fips = "%02d" % int(row["id"])
        pop[fips] = float(row["population"])
        eng[fips] = float(row["engineers"])
        hur[fips] = float(row["hurricanes"])
logpop = np.log(np.array([pop[i] for i in ids]))


def imhof_upper(lam):
    """P(sum lam_j z_j^2 > 0), Imhof (1961)."""
    lam = lam[np.abs(lam) > 1e-12 * np.abs(lam).max()]
    lam = lam / np.abs(lam).max()

    def f(u):
        theta = 0.5 * np.arctan(lam * u).sum()
        rho = np.exp(0.25 * np.log1p((lam * u) ** 2).sum())
        return math.sin(theta) / (u * rho)

    val, err = integrate.quad(f, 0, np.inf, limit=1000, epsabs=1e-13, epsrel=1e-12)
    assert err < 1e-9, err
    return 0.5 + val / math.pi


def spatial(y, X):
    k = X.shape[1]
    M = np.eye(n) - X @ np.linalg.solve(X.T @ X, X.T)
    e = M @ y
    s0 = W.sum()
    scale = n / s0
    moran = scale * (e @ W @ e) / (e @ e)
    MW = M @ W
    mean = scale * np.trace(MW) / (n - k)
    second = scale**2 * (np.trace(MW @ M @ W.T) + np.trace(MW @ MW) + np.trace(MW) ** 2) / ((n - k) * (n - k + 2))
    var = second - mean**2
    z = (moran - mean) / math.sqrt(var)
    c = moran * s0 / n
    lam = np.linalg.eigvalsh(M @ ((W + W.T) / 2 - c * np.eye(n)) @ M)
    s2 = e @ e / n
    T = np.trace(W.T @ W + W @ W)
    dl, dr = e @ W @ e / s2, e @ W @ y / s2
    wxb = W @ (y - e)
    D = (wxb @ M @ wxb + T * s2) / s2
    lm = {
        "error": dl**2 / T,
        "lag": dr**2 / D,
        "robust_error": (dl - T / D * dr) ** 2 / (T - T**2 / D),
        "robust_lag": (dr - dl) ** 2 / (D - T),
    }
    lm["joint"] = lm["robust_lag"] + lm["error"]
    assert abs(lm["joint"] - lm["robust_error"] - lm["lag"]) < 1e-9 * lm["joint"]
    return {
        "moran": {"i": moran, "mean": mean, "variance": var, "z": z,
                  "p_greater": float(stats.norm.sf(z)), "exact_p_greater": imhof_upper(lam)},
        "lm": {key: {"statistic": float(v), "p": float(stats.chi2.sf(v, 2 if key == "joint" else 1))}
               for key, v in lm.items()},
    }


def case(y, cols, names):
    X = sm.add_constant(np.column_stack(cols))
    res = sm.OLS(y, X).fit()
    jb, jbp, _, _ = jarque_bera(res.resid)
    bp = het_breuschpagan(res.resid, X, robust=False)
    kb = het_breuschpagan(res.resid, X, robust=True)
    scaled = X / np.linalg.norm(X, axis=0)
    out = {
        "y": [float(v) for v in y],
        "x": [[float(v) for v in c] for c in cols],
        "names": names,
        "estimate": [float(v) for v in res.params],
        "se": [float(v) for v in res.bse],
        "t": [float(v) for v in res.tvalues],
        "p": [float(v) for v in res.pvalues],
        "r2": float(res.rsquared),
        "adj_r2": float(res.rsquared_adj),
        "f": float(res.fvalue),
        "f_p": float(res.f_pvalue),
        "sigma": float(math.sqrt(res.scale)),
        "df": int(res.df_resid),
        "standardised": [float(v) for v in res.get_influence().resid_studentized_internal],
        "condition_number": float(np.linalg.cond(scaled)),
        "vif": [float(variance_inflation_factor(X, j)) for j in range(1, X.shape[1])],
        "jarque_bera": {"statistic": float(jb), "p": float(jbp)},
        "breusch_pagan": {"statistic": float(bp[0]), "p": float(bp[1])},
        "koenker": {"statistic": float(kb[0]), "p": float(kb[1])},
    }
    out.update(spatial(y, X))
    return out


out = {
    "ids": ids,
    "cases": {
        "engineers": case(1000 * np.array([eng[i] for i in ids]), [lon, lat, logpop],
                          ["centroid_lon", "centroid_lat", "log_population"]),
        "log_population": case(logpop, [lon, lat, np.array([hur[i] for i in ids])],
                               ["centroid_lon", "centroid_lat", "hurricanes"]),
    },
    "versions": {"python": platform.python_version(), "numpy": np.__version__,
                 "scipy": scipy.__version__, "statsmodels": statsmodels.__version__},
}
with open(OUT, "w") as fh:
    json.dump(out, fh, indent=1, sort_keys=True)
    fh.write("\n")
