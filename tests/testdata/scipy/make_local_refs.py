#!/usr/bin/python3
"""Write tests/testdata/scipy/local_refs.json: outside reference values for
areatest's per-area statistics and their conditional permutation tests.

Run with Debian's interpreter and numpy (python3-numpy from Debian 12):

    /usr/bin/python3 tests/testdata/scipy/make_local_refs.py

Everything here is computed independently of areatest's Go code, with plain
numpy and itertools, straight from the published formulas:

  * local Moran I_i = (z_i/m2) sum_j w_ij z_j (Anselin 1995, eq. 12), its
    bivariate form zx_i sum_j w_ij zy_j, local Geary
    c_i = sum_j w_ij (zs_i - zs_j)^2 on standardised values (Anselin 2019),
    and the Getis-Ord Gi (without i) and Gi* (with w_ii = 1) z-scores of
    Ord & Getis (1995), all from dense matrices;
  * on a tiny layer of eight areas, the exact conditional permutation
    distribution of every area's statistic: area i keeps its value and
    every choice of the other values fills its neighbour slots - every
    combination when the row's weights are equal, every ordered choice
    when they are not (Anselin 1995, "conditional randomization") - with
    the counts of values at least / at most the observed one, the mean and
    the standard deviation (divisor: the number of fillings), and the
    p-values: folded min(at_least, at_most)/N, greater, less and two-sided
    (twice the smaller, capped at 1);
  * on the US states layer (the 49 states with a queen neighbour, with the
    queen pairs and centroid latitudes stored in autocorr_refs.json by
    make_autocorr_refs.py), every area's statistic.

Ties: a value within 1e-9 * max(|observed|, 1) of the observed one counts
on both sides, the rule of areatest's shuffle package.

The output is deterministic; keys are sorted; versions are recorded.
"""

import itertools
import json
import os
import platform

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "local_refs.json")


def standardise(x):
    x = np.asarray(x, dtype=float)
    z = x - x.mean()
    return z / np.sqrt((z * z).mean())


def statistic(kind, i, x, y, W, slot_values):
    """kind's value at area i when area i's neighbour slots (the non-zero
    entries of row i of W, in column order) hold slot_values (a list of
    raw values, of y for the bivariate form, of x otherwise)."""
    n = len(x)
    cols = np.nonzero(W[i])[0]
    w = W[i, cols]
    v = np.asarray(slot_values, dtype=float)
    x = np.asarray(x, dtype=float)
    if kind == "moran":
        z = x - x.mean()
        m2 = (z * z).mean()
        return float(z[i] / m2 * np.dot(w, v - x.mean()))
    if kind == "bivariate":
        zx = standardise(x)
        yy = np.asarray(y, dtype=float)
        sy = np.sqrt(((yy - yy.mean()) ** 2).mean())
        return float(zx[i] * np.dot(w, (v - yy.mean()) / sy))
    if kind == "geary":
        zs = standardise(x)
        s = np.sqrt(((x - x.mean()) ** 2).mean())
        return float(np.dot(w, (zs[i] - (v - x.mean()) / s) ** 2))
    if kind == "gi":
        others = np.delete(x, i)
        xbar = others.mean()
        s = np.sqrt((others ** 2).mean() - xbar ** 2)
        wi, s1 = w.sum(), (w * w).sum()
        den = s * np.sqrt(((n - 1) * s1 - wi * wi) / (n - 2))
        return float((np.dot(w, v) - xbar * wi) / den)
    if kind == "gistar":
        xbar = x.mean()
        s = np.sqrt((x ** 2).mean() - xbar ** 2)
        wi, s1 = w.sum() + 1, (w * w).sum() + 1
        den = s * np.sqrt((n * s1 - wi * wi) / (n - 1))
        return float((np.dot(w, v) + x[i] - xbar * wi) / den)
    raise ValueError(kind)


def exact(kind, x, y, W):
    """Every area's exact conditional permutation distribution."""
    n = len(x)
    moving = y if kind == "bivariate" else x
    out = []
    for i in range(n):
        cols = list(np.nonzero(W[i])[0])
        d = len(cols)
        obs = statistic(kind, i, x, y, W, [moving[j] for j in cols])
        others = [j for j in range(n) if j != i]
        w = W[i, cols]
        ordered = d > 0 and not np.all(w == w[0])
        pick = itertools.permutations if ordered else itertools.combinations
        vals = np.array([statistic(kind, i, x, y, W, [moving[j] for j in c])
                         for c in pick(others, d)])
        tol = 1e-9 * max(abs(obs), 1)
        ge = int(np.sum(vals >= obs - tol))
        le = int(np.sum(vals <= obs + tol))
        N = len(vals)
        out.append({
            "observed": obs, "fillings": N, "ordered": bool(ordered),
            "at_least": ge, "at_most": le,
            "mean": float(vals.mean()), "sd": float(vals.std()),
            "p_folded": min(ge, le) / N, "p_greater": ge / N, "p_less": le / N,
            "p_two_sided": min(1.0, 2 * min(ge, le) / N),
        })
    return out


# --------------------------------------------------------------------------
# The tiny layer: a 2 x 4 grid with rook links and one diagonal (1-6).

TINY_PAIRS = [(0, 1), (1, 2), (2, 3), (4, 5), (5, 6), (6, 7),
              (0, 4), (1, 5), (2, 6), (3, 7), (1, 6)]
TINY_X = [3.1, 1.2, 4.4, 0.7, 2.9, 5.0, 1.8, 3.6]
TINY_Y = [0.5, 2.2, 1.1, 3.3, 0.9, 2.0, 4.1, 1.5]
n = len(TINY_X)
B = np.zeros((n, n))
for a, b in TINY_PAIRS:
    B[a, b] = B[b, a] = 1
R = B / B.sum(axis=1, keepdims=True)
# Unequal weights, so the order of the slots matters: 1/(1 + |i - j|).
U = np.zeros((n, n))
for a in range(n):
    for b in range(n):
        if B[a, b]:
            U[a, b] = 1 / (1 + abs(a - b))

tiny = {"pairs": TINY_PAIRS, "x": TINY_X, "y": TINY_Y, "weights": {}}
for name, W in (("binary", B), ("row", R), ("unequal", U)):
    tiny["weights"][name] = {k: exact(k, TINY_X, TINY_Y, W)
                             for k in ("moran", "bivariate", "geary", "gi", "gistar")}

# Sanity of the enumeration itself: the exact conditional mean of local
# Moran is -w_i z_i^2 / ((n-1) m2) (Anselin 1995, from the moments of
# sampling without replacement).
z = np.asarray(TINY_X) - np.mean(TINY_X)
m2 = (z * z).mean()
for name, W in (("binary", B), ("row", R), ("unequal", U)):
    for i, r in enumerate(tiny["weights"][name]["moran"]):
        want = -W[i].sum() * z[i] ** 2 / ((n - 1) * m2)
        assert abs(r["mean"] - want) < 1e-12, (name, i, r["mean"], want)

# --------------------------------------------------------------------------
# The states layer.

with open(os.path.join(HERE, "autocorr_refs.json")) as fh:
    ac = json.load(fh)
ids = ac["ids"]
pos = {s: k for k, s in enumerate(ids)}
lat = ac["centroid_lat"]
rates = ac["eb"]["rates"]
m = len(ids)
SB = np.zeros((m, m))
for a, b in ac["queen_pairs"]:
    SB[pos[a], pos[b]] = SB[pos[b], pos[a]] = 1
SR = SB / SB.sum(axis=1, keepdims=True)


def dense_all(kind, x, y, W):
    moving = y if kind == "bivariate" else x
    return [statistic(kind, i, x, y, W, [moving[j] for j in np.nonzero(W[i])[0]])
            for i in range(len(x))]


states = {"ids": ids, "centroid_lat": lat, "eb_rates": rates, "weights": {}}
for name, W in (("binary", SB), ("row", SR)):
    states["weights"][name] = {
        "moran": dense_all("moran", lat, None, W),
        "bivariate": dense_all("bivariate", lat, rates, W),
        "geary": dense_all("geary", lat, None, W),
        "gi": dense_all("gi", lat, None, W),
        "gistar": dense_all("gistar", lat, None, W),
    }
    # The sum identity sum_i I_i = S0 * I, with I from its own formula.
    zz = np.asarray(lat) - np.mean(lat)
    I = m / W.sum() * zz @ W @ zz / (zz @ zz)
    states["weights"][name]["global_moran"] = float(I)
    states["weights"][name]["s0"] = float(W.sum())
    assert abs(sum(states["weights"][name]["moran"]) - W.sum() * I) < 1e-9

doc = {
    "tiny": tiny,
    "states": states,
    "versions": {"numpy": np.__version__, "python": platform.python_version()},
}
with open(OUT, "w") as fh:
    json.dump(doc, fh, sort_keys=True, indent=1)
    fh.write("\n")
