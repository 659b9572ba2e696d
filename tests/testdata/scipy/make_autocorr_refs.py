#!/usr/bin/python3
"""Write tests/testdata/scipy/autocorr_refs.json: outside reference values for
areatest's global clustering statistics on the US states layer.

Run with Debian's interpreter and numpy (python3-numpy from Debian 12):

    /usr/bin/python3 tests/testdata/scipy/make_autocorr_refs.py

Inputs, both in this repository:
  tests/testdata/us-states.geojson   (Census Bureau state boundaries)
  tests/testdata/scipy/population_engineers_hurricanes.csv
      (a verbatim copy of data/population_engineers_hurricanes.csv from the
      npm package vega-datasets 3.2.1; per-state population and the share of
      it employed as engineers, US government data)

Everything here is computed independently of areatest's Go code, with dense
numpy matrices and written straight from the published formulas:

  * queen contiguity by exact shared vertices, straight from the GeoJSON;
  * the empirical-Bayes standardised rates of Assuncao & Reis (1999) and
    Moran's I of them, with events = round(engineer share x population);
  * Geary's C with its normality and randomisation variances (Cliff & Ord
    1981) and General G with its randomisation variance (Getis & Ord 1992)
    of the centroid latitude;
  * join counts BB, WW, BW of "centroid north of 39 degrees" with their
    moments under sampling without replacement, from the two-colour
    formulas of Cliff & Ord (1981) in their S0/S1/S2 form (a different
    route from the Go code, which sums per-category covariances); the
    script first checks those formulas by brute-force enumeration on a
    small lattice;
  * the bounds of Moran's I (de Jong, Sprenger & van Veen 1984) from
    numpy.linalg.eigh of M W* M.

The output is deterministic; keys are sorted; versions are recorded.
"""

import csv
import itertools
import json
import os
import platform
import sys

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.dirname(HERE)
OUT = os.path.join(HERE, "autocorr_refs.json")


def f(v):
    v = float(v)
    assert np.isfinite(v), v
    return v


# --------------------------------------------------------------------------
# The layer and its queen graph.

with open(os.path.join(DATA, "us-states.geojson")) as fh:
    fc = json.load(fh)
feats = fc["features"]
ids = [ft["id"] for ft in feats]
lat = {ft["id"]: ft["properties"]["centroid_lat"] for ft in feats}


def vertices(geom):
    polys = geom["coordinates"] if geom["type"] == "MultiPolygon" else [geom["coordinates"]]
    out = set()
    for poly in polys:
        for ring in poly:
            for x, y in ring:
                out.add((x, y))
    return out


verts = [vertices(ft["geometry"]) for ft in feats]
pairs = []
for a in range(len(feats)):
    for b in range(a + 1, len(feats)):
        if verts[a] & verts[b]:
            pairs.append((a, b))
assert len(pairs) == 109, len(pairs)  # testdata/README.md: 109 queen pairs
linked = sorted({i for p in pairs for i in p})
keep = [ids[i] for i in linked]
assert len(keep) == 49, len(keep)  # 48 contiguous states and DC
pos = {ids[i]: k for k, i in enumerate(linked)}
n = len(keep)
W = np.zeros((n, n))
for a, b in pairs:
    W[pos[ids[a]], pos[ids[b]]] = 1
    W[pos[ids[b]], pos[ids[a]]] = 1
R = W / W.sum(axis=1, keepdims=True)


def sums(w):
    s0 = w.sum()
    s1 = 0.5 * ((w + w.T) ** 2).sum()
    s2 = ((w.sum(axis=1) + w.sum(axis=0)) ** 2).sum()
    return s0, s1, s2


def moran(x, w):
    z = x - x.mean()
    return len(x) / w.sum() * (z @ w @ z) / (z @ z)


# --------------------------------------------------------------------------
# Empirical-Bayes standardised rates (Assuncao & Reis 1999):
#   r = e/p, b = sum e / sum p, s2 = sum p (r-b)^2 / sum p,
#   a = s2 - b / mean(p), v = a + b/p (b/p where that is <= 0),
#   z = (r - b)/sqrt(v); EB Moran = Moran's I of z.

pop, eng = {}, {}
with open(os.path.join(HERE, "population_engineers_hurricanes.csv")) as fh:
    for row in csv.DictReader(fh):
        fips = "%02d" % int(row["id"])
        pop[fips] = int(row["population"])
        eng[fips] = float(row["engineers"])
events = np.array([float(np.floor(eng[i] * pop[i] + 0.5)) for i in keep])
popn = np.array([float(pop[i]) for i in keep])
r = events / popn
b = events.sum() / popn.sum()
s2 = (popn * (r - b) ** 2).sum() / popn.sum()
a = s2 - b / popn.mean()
v = a + b / popn
floored = [int(k) for k in np.nonzero(v <= 0)[0]]
v = np.where(v <= 0, b / popn, v)
zeb = (r - b) / np.sqrt(v)
eb = {
    "events": [f(e) for e in events],
    "population": [f(p) for p in popn],
    "rates": [f(x) for x in r],
    "mean_rate": f(b),
    "between_variance": f(a),
    "floored": floored,
    "scores": [f(x) for x in zeb],
    "moran_binary": f(moran(zeb, W)),
    "moran_row": f(moran(zeb, R)),
    "moran_raw_rates_row": f(moran(r, R)),
}

# --------------------------------------------------------------------------
# Geary's C and General G of the centroid latitude.

x = np.array([lat[i] for i in keep])


def geary(x, w):
    nn = len(x)
    z = x - x.mean()
    d = (x[:, None] - x[None, :]) ** 2
    c = (nn - 1) * (w * d).sum() / (2 * w.sum() * (z @ z))
    s0, s1, s2 = sums(w)
    b2 = nn * (z ** 4).sum() / (z @ z) ** 2
    var_n = ((2 * s1 + s2) * (nn - 1) - 4 * s0 ** 2) / (2 * (nn + 1) * s0 ** 2)
    var_r = ((nn - 1) * s1 * (nn * nn - 3 * nn + 3 - (nn - 1) * b2)
             - 0.25 * (nn - 1) * s2 * (nn * nn + 3 * nn - 6 - (nn * nn - nn + 2) * b2)
             + s0 ** 2 * (nn * nn - 3 - (nn - 1) ** 2 * b2)) / (nn * (nn - 2) * (nn - 3) * s0 ** 2)
    return c, var_n, var_r


def general_g(x, w):
    nn = len(x)
    num = x @ w @ x  # w has a zero diagonal
    den = x.sum() ** 2 - (x ** 2).sum()
    s0, s1, s2 = sums(w)
    m1, m2, m3, m4 = (x.sum(), (x ** 2).sum(), (x ** 3).sum(), (x ** 4).sum())
    b0 = (nn * nn - 3 * nn + 3) * s1 - nn * s2 + 3 * s0 ** 2
    b1 = -((nn * nn - nn) * s1 - 2 * nn * s2 + 6 * s0 ** 2)
    b2 = -(2 * nn * s1 - (nn + 3) * s2 + 6 * s0 ** 2)
    b3 = 4 * (nn - 1) * s1 - 2 * (nn + 1) * s2 + 8 * s0 ** 2
    b4 = s1 - s2 + s0 ** 2
    eg2 = (b0 * m2 ** 2 + b1 * m4 + b2 * m1 ** 2 * m2 + b3 * m1 * m3 + b4 * m1 ** 4) / (
        (m1 ** 2 - m2) ** 2 * nn * (nn - 1) * (nn - 2) * (nn - 3))
    e = s0 / (nn * (nn - 1))
    return num / den, e, eg2 - e * e


stats = {}
for name, w in (("binary", W), ("row", R)):
    c, vn, vr = geary(x, w)
    g, e, vg = general_g(x, w)
    stats[name] = {"gearys_c": f(c), "geary_var_normality": f(vn), "geary_var_randomisation": f(vr),
                   "general_g": f(g), "general_g_expected": f(e), "general_g_variance": f(vg),
                   "morans_i": f(moran(x, w))}

# --------------------------------------------------------------------------
# Join counts, two colours, binary symmetric joins (Cliff & Ord 1981):
#   BB = 1/2 sum w x_i x_j, BW = 1/2 sum w (x_i - x_j)^2, with n^(k) falling
#   factorials and sampling without replacement,
#   E[BB] = 1/2 S0 n1^(2)/n^(2)
#   Var[BB] = 1/4 [S1 n1^(2)/n^(2) + (S2 - 2 S1) n1^(3)/n^(3)
#                  + (S0^2 + S1 - S2) n1^(4)/n^(4)] - E[BB]^2
#   E[BW] = S0 n1 n2 / n^(2)
#   Var[BW] = 1/4 [2 S1 n1 n2/n^(2) + (S2 - 2 S1) n1 n2 (n1 + n2 - 2)/n^(3)
#                  + 4 (S0^2 + S1 - S2) n1^(2) n2^(2)/n^(4)] - E[BW]^2


def ff(m, k):
    out = 1.0
    for t in range(k):
        out *= m - t
    return out


def join_moments(w, n1, nn):
    n2 = nn - n1
    s0, s1, s2 = sums(w)
    ebb = 0.5 * s0 * ff(n1, 2) / ff(nn, 2)
    vbb = 0.25 * (s1 * ff(n1, 2) / ff(nn, 2) + (s2 - 2 * s1) * ff(n1, 3) / ff(nn, 3)
                  + (s0 ** 2 + s1 - s2) * ff(n1, 4) / ff(nn, 4)) - ebb ** 2
    ebw = s0 * n1 * n2 / ff(nn, 2)
    vbw = 0.25 * (2 * s1 * n1 * n2 / ff(nn, 2) + (s2 - 2 * s1) * n1 * n2 * (n1 + n2 - 2) / ff(nn, 3)
                  + 4 * (s0 ** 2 + s1 - s2) * ff(n1, 2) * ff(n2, 2) / ff(nn, 4)) - ebw ** 2
    return ebb, vbb, ebw, vbw


def join_counts(w, y):
    bb = 0.5 * (w * np.outer(y, y)).sum()
    ww = 0.5 * (w * np.outer(1 - y, 1 - y)).sum()
    bw = 0.5 * (w * (y[:, None] - y[None, :]) ** 2).sum()
    return bb, ww, bw


# Brute force on a 3x3 rook lattice with 4 black areas: the formulas must
# give the mean and variance over all C(9, 4) = 126 arrangements.
L = np.zeros((9, 9))
for i in range(3):
    for j in range(3):
        k = 3 * i + j
        if j < 2:
            L[k, k + 1] = L[k + 1, k] = 1
        if i < 2:
            L[k, k + 3] = L[k + 3, k] = 1
vals = {"bb": [], "bw": []}
for black in itertools.combinations(range(9), 4):
    y = np.zeros(9)
    y[list(black)] = 1
    bb, _, bw = join_counts(L, y)
    vals["bb"].append(bb)
    vals["bw"].append(bw)
ebb, vbb, ebw, vbw = join_moments(L, 4, 9)
assert abs(np.mean(vals["bb"]) - ebb) < 1e-12 and abs(np.var(vals["bb"]) - vbb) < 1e-12
assert abs(np.mean(vals["bw"]) - ebw) < 1e-12 and abs(np.var(vals["bw"]) - vbw) < 1e-12

north = np.array([1.0 if lat[i] >= 39 else 0.0 for i in keep])
n1 = int(north.sum())
bb, ww, bw = join_counts(W, north)
ebb, vbb, ebw, vbw = join_moments(W, n1, n)
eww, vww, _, _ = join_moments(W, n - n1, n)
joins = {"north": [int(v) for v in north], "threshold": 39, "joins": int(W.sum() / 2),
         "bb": int(bb), "ww": int(ww), "bw": int(bw),
         "bb_expected": f(ebb), "bb_variance": f(vbb), "ww_expected": f(eww), "ww_variance": f(vww),
         "bw_expected": f(ebw), "bw_variance": f(vbw)}

# --------------------------------------------------------------------------
# Bounds of Moran's I: extreme eigenvalues of M W* M on the complement of
# the constant vector, times n/S0.

bounds = {}
for name, w in (("binary", W), ("row", R)):
    ws = (w + w.T) / 2
    M = np.eye(n) - np.ones((n, n)) / n
    vals_, vecs = np.linalg.eigh(M @ ws @ M)
    constant = np.argmax(np.abs(vecs.sum(axis=0)))
    rest = np.delete(vals_, constant)
    bounds[name] = {"min": f(n / w.sum() * rest.min()), "max": f(n / w.sum() * rest.max())}

out = {
    "versions": {"python": platform.python_version(), "numpy": np.__version__},
    "ids": keep,
    "queen_pairs": [[ids[a], ids[b]] for a, b in pairs],
    "centroid_lat": [f(v) for v in x],
    "eb": eb,
    "stats": stats,
    "joins": joins,
    "bounds": bounds,
}
with open(OUT, "w") as fh:
    json.dump(out, fh, indent=1, sort_keys=True)
    fh.write("\n")
print("wrote", OUT, file=sys.stderr)
