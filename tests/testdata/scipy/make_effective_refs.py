#!/usr/bin/python3
"""Write tests/testdata/scipy/effective_refs.json: outside reference values
for areatest's modified t-test (effective sample size) and for the classical
partial F-test that its Freedman-Lane permutation test is checked against.

Run with Debian's interpreter and packages (python3-numpy, python3-scipy,
python3-statsmodels from Debian 12 "bookworm"):

    /usr/bin/python3 tests/testdata/scipy/make_effective_refs.py

Inputs, both in this repository:
  tests/testdata/us-states.geojson
  tests/testdata/scipy/population_engineers_hurricanes.csv
(see tests/testdata/README.md and README-autocorr.md for their provenance).

Modified t-test (Clifford, Richardson & Hemon 1989, Biometrics 45:123-134;
Dutilleul 1993, Biometrics 49:305-314), written here from the published
expressions with dense numpy matrices, independently of the Go code:

  * the order of every pair of areas is its shortest-path length on the
    binary neighbour graph (scipy.sparse.csgraph.shortest_path, unweighted);
  * the autocorrelation of a variable at order k is
        I_k = (n / N_k) * sum_{d(i,j)=k} z_i z_j / sum_i z_i^2
    over the N_k ordered pairs at order k (Dutilleul's sample covariance of
    class k over the sample variance);
  * R has ones on the diagonal, I_k for pairs at order k <= K, zero beyond
    K or between areas not connected; B = I - 11'/n;
  * var(r) = tr(B Rx B Ry) / (tr(B Rx) tr(B Ry)),  n_eff = 1 + 1/var(r);
    areatest's rule: n_eff is taken as n when the estimate is n or more, or
    when tr(B Rx B Ry) <= 0;
  * t = r sqrt((n_eff - 2)/(1 - r^2)) on n_eff - 2 degrees of freedom
    (scipy.stats.t).

Partial F-test of group terms given covariates: statsmodels OLS of the full
and the reduced model, compare_f_test; the t of the group-0 indicator for
two groups from the full fit.

The random inputs come from numpy's default_rng with the seeds written below
and are stored in the output, so the Go tests read them rather than redraw
them. Keys are sorted; versions are recorded.
"""

import csv
import json
import os
import platform

import numpy as np
import scipy
import scipy.sparse as sp
import scipy.stats as st
from scipy.sparse.csgraph import shortest_path
import statsmodels
import statsmodels.api as sm

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.dirname(HERE)
OUT = os.path.join(HERE, "effective_refs.json")


def f(v):
    v = float(v)
    assert np.isfinite(v), v
    return v


def graph_matrix(n, edges):
    w = np.zeros((n, n))
    for a, b in edges:
        w[a, b] = w[b, a] = 1
    return w


def modified_t(y, x, w, max_order):
    """Dutilleul's modified t-test; max_order 0 means every order."""
    n = len(y)
    d = shortest_path(sp.csr_matrix(w), unweighted=True, directed=False)
    finite = np.isfinite(d)
    top = int(d[finite].max())
    K = top if max_order == 0 else min(max_order, top)
    zy, zx = y - y.mean(), x - x.mean()
    orders = []
    Ry, Rx = np.eye(n), np.eye(n)
    for k in range(1, K + 1):
        mask = finite & (d == k)
        nk = int(mask.sum())  # ordered pairs
        if nk == 0:
            break
        iy = n / nk * (np.outer(zy, zy)[mask].sum()) / (zy @ zy)
        ix = n / nk * (np.outer(zx, zx)[mask].sum()) / (zx @ zx)
        Ry[mask] = iy
        Rx[mask] = ix
        orders.append({"order": k, "pairs": nk // 2, "outcome": f(iy), "group": f(ix)})
    B = np.eye(n) - np.ones((n, n)) / n
    num = np.trace(B @ Ry @ B @ Rx)
    den = np.trace(B @ Ry) * np.trace(B @ Rx)
    r = (zy @ zx) / np.sqrt((zy @ zy) * (zx @ zx))
    capped = False
    if num <= 0:
        neff, capped = float(n), True
    else:
        neff = 1 + den / num
        if neff >= n:
            neff, capped = float(n), True
    df = neff - 2
    t = r * np.sqrt(df / (1 - r * r))
    t0 = r * np.sqrt((n - 2) / (1 - r * r))
    return {
        "orders": orders,
        "correlation": f(r),
        "raw_correlation_variance": f(num / den),
        "correlation_variance": f(1 / (neff - 1)),
        "effective_sample_size": f(neff),
        "capped": capped,
        "t": f(t),
        "df": f(df),
        "p_two_sided": f(2 * st.t.sf(abs(t), df)),
        "p_greater": f(st.t.sf(t, df)),
        "ordinary_t": f(t0),
        "ordinary_p_two_sided": f(2 * st.t.sf(abs(t0), n - 2)),
    }


def sar(w, rho, rng):
    n = w.shape[0]
    rs = w.sum(axis=1, keepdims=True)
    ws = np.divide(w, rs, out=np.zeros_like(w), where=rs > 0)
    return np.linalg.solve(np.eye(n) - rho * ws, rng.standard_normal(n))


def above_median(v):
    return (v > np.median(v)).astype(float)


cases = []

# A 7 x 6 rook lattice, areas numbered row by row: an autocorrelated outcome
# and an autocorrelated grouping, independent of each other.
rows, cols = 7, 6
edges = []
for rr in range(rows):
    for cc in range(cols):
        i = rr * cols + cc
        if cc + 1 < cols:
            edges.append((i, i + 1))
        if rr + 1 < rows:
            edges.append((i, i + cols))
w = graph_matrix(rows * cols, edges)
rng = np.random.default_rng(20240611)
y = sar(w, 0.8, rng)
x = above_median(sar(w, 0.8, rng))
for K in (0, 3):
    c = {"case": "rook lattice 7x6, SAR 0.8", "n": rows * cols, "edges": edges,
         "y": [f(v) for v in y], "x": [f(v) for v in x], "max_order": K}
    c.update(modified_t(y, x, w, K))
    cases.append(c)

# A small irregular graph: a five-cycle with a tail, a second group of three
# areas and an island (area 11).
edges = [(0, 1), (1, 2), (2, 3), (3, 4), (4, 0), (2, 5), (5, 6), (6, 7), (1, 6), (8, 9), (9, 10)]
w = graph_matrix(12, edges)
rng = np.random.default_rng(20240612)
y = rng.standard_normal(12) + np.array([0, 0, 0, 0, 0, 1, 1, 1, 2, 2, 2, 0.0])
x = np.array([1, 1, 1, 0, 0, 1, 1, 0, 0, 0, 1, 0.0])
c = {"case": "irregular, island and two groups", "n": 12, "edges": edges,
     "y": [f(v) for v in y], "x": [f(v) for v in x], "max_order": 0}
c.update(modified_t(y, x, w, 0))
cases.append(c)

# Opposite autocorrelation (a smooth outcome, a chessboard grouping) on a
# 10 x 10 rook lattice with one order: the estimate is capped at n.
rows = cols = 10
edges = []
for rr in range(rows):
    for cc in range(cols):
        i = rr * cols + cc
        if cc + 1 < cols:
            edges.append((i, i + 1))
        if rr + 1 < rows:
            edges.append((i, i + cols))
w = graph_matrix(100, edges)
y = np.array([i // 10 + 0.3 * np.sin(7 * i) for i in range(100)], dtype=float)
x = np.array([((i // 10) + (i % 10)) % 2 for i in range(100)], dtype=float)
c = {"case": "chessboard grouping, one order (capped)", "n": 100, "edges": edges,
     "y": [f(v) for v in y], "x": [f(v) for v in x], "max_order": 1}
c.update(modified_t(y, x, w, 1))
assert c["capped"]
cases.append(c)

# --------------------------------------------------------------------------
# The US states: the 49 with a queen neighbour (shared vertices, as in
# make_autocorr_refs.py), outcome the share of the population working as
# engineers, grouping "centroid north of 39 degrees".

with open(os.path.join(DATA, "us-states.geojson")) as fh:
    feats = json.load(fh)["features"]
ids = [ft["id"] for ft in feats]


def vertices(geom):
    polys = geom["coordinates"] if geom["type"] == "MultiPolygon" else [geom["coordinates"]]
    return {(px, py) for poly in polys for ring in poly for px, py in ring}


verts = [vertices(ft["geometry"]) for ft in feats]
pairs = [(a, b) for a in range(len(feats)) for b in range(a + 1, len(feats)) if verts[a] & verts[b]]
assert len(pairs) == 109, len(pairs)
linked = sorted({i for p in pairs for i in p})
assert len(linked) == 49
pos = {i: k for k, i in enumerate(linked)}
sedges = [(pos[a], pos[b]) for a, b in pairs]
keep = [ids[i] for i in linked]
share = {}
with open(os.path.join(HERE, "population_engineers_hurricanes.csv")) as fh:
    for row in csv.DictReader(fh):
        share["%02d" % int(row["id"])] = float(row["engineers"])
sy = np.array([share[i] for i in keep])
lat = np.array([feats[i]["properties"]["centroid_lat"] for i in linked])
lon = np.array([feats[i]["properties"]["centroid_lon"] for i in linked])
sx = (lat >= 39).astype(float)
ws = graph_matrix(49, sedges)
states = {"case": "US states, engineer share by north", "ids": keep, "n": 49, "edges": sedges,
          "y": [f(v) for v in sy], "x": [f(v) for v in sx], "max_order": 0}
states.update(modified_t(sy, sx, ws, 0))

# --------------------------------------------------------------------------
# Partial F-tests (statsmodels).


def partial_f(case, y, covs, labels, k):
    n = len(y)
    Z = np.column_stack([np.ones(n)] + [np.asarray(c) for c in covs])
    X = np.column_stack([(labels == g).astype(float) for g in range(k - 1)])
    full = sm.OLS(y, np.column_stack([Z, X])).fit()
    red = sm.OLS(y, Z).fit()
    F, p, dfd = full.compare_f_test(red)
    out = {"case": case, "y": [f(v) for v in y], "covariates": [[f(v) for v in c] for c in covs],
           "labels": [int(v) for v in labels], "k": k, "f": f(F), "p": f(p),
           "df_groups": int(dfd), "df_residual": int(full.df_resid)}
    if k == 2:
        j = Z.shape[1]
        out["t"] = f(full.tvalues[j])
        out["t_p_two_sided"] = f(full.pvalues[j])
    return out


fcases = []
rng = np.random.default_rng(20240613)
n = 30
z1, z2 = rng.standard_normal(n), rng.standard_normal(n)
lab = rng.permutation(np.arange(n) % 2)
yy = 1 + 0.8 * z1 - 0.5 * z2 + 0.6 * (lab == 0) + rng.standard_normal(n)
fcases.append(partial_f("synthetic, two groups, two covariates", yy, [z1, z2], lab, 2))
lab3 = rng.permutation(np.arange(n) % 3)
yy = 2 - 0.7 * z1 + 0.4 * (lab3 == 1) + rng.standard_normal(n)
fcases.append(partial_f("synthetic, three groups, one covariate", yy, [z1], lab3, 3))
fcases.append(partial_f("synthetic, three groups, no covariate", yy, [], lab3, 3))
slab = (1 - sx).astype(int)  # group 0 = north, group 1 = south
fcases.append(partial_f("US states, engineer share by north given longitude", sy, [lon], slab, 2))

out = {
    "versions": {"python": platform.python_version(), "numpy": np.__version__,
                 "scipy": scipy.__version__, "statsmodels": statsmodels.__version__},
    "modified_t": cases,
    "states_modified_t": states,
    "partial_f": fcases,
}
with open(OUT, "w") as fh:
    json.dump(out, fh, indent=1, sort_keys=True)
    fh.write("\n")
print("wrote", OUT)
