#!/usr/bin/python3
"""Write tests/testdata/scipy/rates_refs.json: outside reference values for
areatest's rates (spatial/rates) on real state counts.

Run with Debian's interpreter and numpy (python3-numpy 1.24.2, Debian 12):

    /usr/bin/python3 tests/testdata/scipy/make_rates_refs.py

Inputs, both in this repository:
  tests/testdata/us-states.geojson   (Census Bureau state boundaries)
  tests/testdata/scipy/population_engineers_hurricanes.csv
      (vega-datasets 3.2.1; see tests/testdata/README-autocorr.md)

Counts: for the 49 states with a queen neighbour (48 contiguous states and
DC, in file order; neighbours share a vertex), the population and the
number of engineers, round(engineers share x population). Groups: east
(group 0) and west (group 1) of longitude -95 by the layer's centroid_lon.

Values, each computed here with numpy from the published formulas, written
independently of the Go code:
  raw rates r = e / p;
  pooled rate of each group (sum e / sum p), their ratio east/west and
  difference;
  the global empirical-Bayes smoothed rates of Marshall (1991):
    b = sum e / sum p, s2 = sum p (r - b)^2 / sum p, a = max(0, s2 - b / mean p),
    theta = b + a / (a + b / p) (r - b);
  the spatial version with each state's neighbourhood (itself and its queen
  neighbours) in place of the whole map;
  the Assuncao-Reis standardised rates z = (r - b) / sqrt(a' + b / p) with
  a' = s2 - b / mean p (not floored; floored to b / p where a' + b/p <= 0).
Twice: for the state counts as they are ("states"), and for the same counts
and populations divided by 2,000 and the counts rounded ("small": 0 to 140
events per state), where the shrinkage is visible.

The output is deterministic; keys are sorted; versions are recorded.
"""

import csv
import json
import os
import platform

import numpy as np

import linked_states

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.dirname(HERE)
OUT = os.path.join(HERE, "rates_refs.json")

features, links, linked, where, C, ids = linked_states.load()
n = len(linked)
lon = np.array([features[i]["properties"]["centroid_lon"] for i in linked])

pop, eng = {}, {}
with open(os.path.join(HERE, "population_engineers_hurricanes.csv")) as fh:
    for row in csv.DictReader(fh):
        fips = "%02d" % int(row["id"])
        pop[fips] = float(row["population"])
        eng[fips] = float(row["engineers"])
p = np.array([pop[i] for i in ids])
e = np.round(np.array([eng[i] for i in ids]) * p)
group = np.where(lon > -95.0, 0, 1)

def compute(e, p):
    """Every reference value for counts e over populations p."""
    r = e / p
    b = e.sum() / p.sum()
    s2 = (p * (r - b) ** 2).sum() / p.sum()
    a_raw = s2 - b / p.mean()
    a = max(a_raw, 0.0)
    theta = b + a / (a + b / p) * (r - b) if a > 0 else np.full(n, b)
    v = a_raw + b / p
    v = np.where(v <= 0, b / p, v)
    z = (r - b) / np.sqrt(v)

    spatial = np.empty(n)
    for i in range(n):
        nb = np.concatenate(([i], np.nonzero(C[i])[0]))
        bi = e[nb].sum() / p[nb].sum()
        s2i = (p[nb] * (r[nb] - bi) ** 2).sum() / p[nb].sum()
        ai = max(s2i - bi / p[nb].mean(), 0.0)
        spatial[i] = bi + ai / (ai + bi / p[i]) * (r[i] - bi) if ai > 0 else bi

    pooled = []
    for g in (0, 1):
        m = group == g
        pooled.append({"areas": int(m.sum()), "events": float(e[m].sum()), "population": float(p[m].sum()),
                       "rate": float(e[m].sum() / p[m].sum())})
    return {
        "events": e.tolist(),
        "population": p.tolist(),
        "raw": r.tolist(),
        "pooled": pooled,
        "ratio": pooled[0]["rate"] / pooled[1]["rate"],
        "difference": pooled[0]["rate"] - pooled[1]["rate"],
        "map_rate": float(b),
        "between_variance": float(a_raw),
        "global_eb": theta.tolist(),
        "spatial_eb": spatial.tolist(),
        "eb_scores": z.tolist(),
    }


out = {
    "source": "make_rates_refs.py: numpy %s, Python %s" % (np.__version__, platform.python_version()),
    "ids": ids,
    "group": group.tolist(),
    "queen_pairs": sorted([[ids[where[a]], ids[where[b]]] for a, b in links]),
    "states": compute(e, p),
    # The same states shrunk 2,000-fold: 0 to 140 events each, where the
    # empirical-Bayes estimators shrink small areas visibly.
    "small": compute(np.round(e / 2000), p / 2000),
}
with open(OUT, "w") as fh:
    json.dump(out, fh, indent=1, sort_keys=True)
    fh.write("\n")
