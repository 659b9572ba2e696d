#!/usr/bin/python3
"""Write tests/testdata/scipy/sar_refs.json: outside reference values for the
maximum-likelihood fit of areatest's simultaneous autoregressive model
(spatial/sar) on the US states layer.

Run with Debian's interpreter, numpy and scipy (python3-numpy 1.24.2 and
python3-scipy 1.10.1 from Debian 12):

    /usr/bin/python3 tests/testdata/scipy/make_sar_refs.py

Inputs, both in this repository:
  tests/testdata/us-states.geojson   (Census Bureau state boundaries)
  tests/testdata/scipy/population_engineers_hurricanes.csv
      (a verbatim copy from the npm package vega-datasets 3.2.1; see
      tests/testdata/README-autocorr.md)

The layer is the 49 areas with a queen neighbour (48 contiguous states and
DC, in file order); two states are neighbours when their boundaries share a
vertex. W is that binary matrix divided by its row sums. The model is

    y = rho W y + mu 1 + eps,   eps ~ N(0, sigma2 I),

and its log-likelihood concentrated in rho (Ord 1975; Anselin 1988, ch. 6)

    l(rho) = -n/2 (log 2 pi + 1) - n/2 log(e'e / n) + log|I - rho W|,
    e = (I - rho W) y - mean((I - rho W) y).

Here log|I - rho W| is the sum of log(1 - rho lambda) over the eigenvalues of
W from numpy.linalg.eigvals of the dense, non-symmetric W (checked against
numpy.linalg.slogdet), and l is maximised by scipy.optimize.minimize_scalar
(bounded Brent search) over (1/lambda_min, 1/lambda_max), its end point
refined by scipy.optimize.brentq on the analytic score. The standard error
of rho is 1/sqrt(-l''), l'' by a central finite difference of l; the
expected-information standard error of the full (mu, sigma2, rho) model
(Anselin 1988, eq. 6.30 ff.) is stored beside it as a second, asymptotically
equal, figure. Outcomes: the engineer share of each state, and the log of
its population.

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
from scipy.optimize import brentq, minimize_scalar

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.dirname(HERE)
OUT = os.path.join(HERE, "sar_refs.json")

features, links, linked, where, C, ids = linked_states.load()
n = len(linked)
W = C / C.sum(axis=1)[:, None]

lam = np.linalg.eigvals(W)
assert np.abs(lam.imag).max() < 1e-10
lam = np.sort(lam.real)
lo, hi = 1 / lam[0], 1 / lam[-1]


def logdet(rho):
    return float(np.log1p(-rho * lam).sum())


for rho in (-0.8, 0.3, 0.9):
    sign, ld = np.linalg.slogdet(np.eye(n) - rho * W)
    assert sign > 0 and abs(ld - logdet(rho)) < 1e-10, (rho, ld, logdet(rho))


def concentrated(y, rho):
    a = y - rho * (W @ y)
    e = a - a.mean()
    return -n / 2 * (math.log(2 * math.pi) + 1) - n / 2 * math.log(e @ e / n) + logdet(rho)


def information_se(y, rho, mu, sigma2):
    A = np.eye(n) - rho * W
    WA = W @ np.linalg.inv(A)
    xb = WA @ (mu * np.ones(n))
    one = np.ones(n)
    info = np.array([
        [n / sigma2, 0.0, one @ xb / sigma2],
        [0.0, n / (2 * sigma2**2), np.trace(WA) / sigma2],
        [one @ xb / sigma2, np.trace(WA) / sigma2,
         np.trace(WA @ WA) + np.trace(WA.T @ WA) + xb @ xb / sigma2],
    ])
    return float(math.sqrt(np.linalg.inv(info)[2, 2]))


def fit(y):
    res = minimize_scalar(lambda r: -concentrated(y, r), bounds=(lo + 1e-9, hi - 1e-9),
                          method="bounded", options={"xatol": 1e-12, "maxiter": 1000})
    assert res.success
    # The maximum is flat to rounding over ~1e-7 in rho, so the search's end
    # point is refined to the root of the analytic score
    #   l'(rho) = n (b - rho c) / (a - 2 rho b + rho^2 c) - sum lambda / (1 - rho lambda),
    # with z0 = y - mean(y), z1 = Wy - mean(Wy), a = z0'z0, b = z0'z1, c = z1'z1.
    z0, z1 = y - y.mean(), W @ y - (W @ y).mean()
    a, b, c = z0 @ z0, z0 @ z1, z1 @ z1

    def score(r):
        return n * (b - r * c) / (a - 2 * r * b + r * r * c) - float((lam / (1 - r * lam)).sum())

    rho = float(brentq(score, res.x - 1e-3, res.x + 1e-3, xtol=1e-15, rtol=1e-15))
    assert abs(rho - res.x) < 1e-6, (rho, res.x)
    a = y - rho * (W @ y)
    mu = float(a.mean())
    sigma2 = float(((a - mu) ** 2).mean())
    h = 1e-4
    d2 = (concentrated(y, rho + h) - 2 * concentrated(y, rho) + concentrated(y, rho - h)) / h**2
    return {
        "y": [float(v) for v in y],
        "rho": rho,
        "intercept": mu,
        "sigma2": sigma2,
        "loglik": float(concentrated(y, rho)),
        "rho_se_profile": float(1 / math.sqrt(-d2)),
        "rho_se_information": information_se(y, rho, mu, sigma2),
    }


pop, eng = {}, {}
with open(os.path.join(HERE, "population_engineers_hurricanes.csv")) as fh:
    for row in csv.DictReader(fh):
        fips = "%02d" % int(row["id"])
        pop[fips] = float(row["population"])
        eng[fips] = float(row["engineers"])

out = {
    "ids": ids,
    "interval": [float(lo), float(hi)],
    "logdet": {"%g" % r: logdet(r) for r in (-0.9, -0.5, 0.25, 0.5, 0.75, 0.9, 0.99)},
    "fits": {
        "engineer_share": fit(np.array([eng[i] for i in ids])),
        "log_population": fit(np.log(np.array([pop[i] for i in ids]))),
    },
    "versions": {"python": platform.python_version(), "numpy": np.__version__, "scipy": scipy.__version__},
}
with open(OUT, "w") as fh:
    json.dump(out, fh, indent=1, sort_keys=True)
    fh.write("\n")
