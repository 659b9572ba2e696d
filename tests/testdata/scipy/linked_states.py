"""The queen-linked US states, shared by the reference scripts here.

Reads ../us-states.geojson (Census Bureau boundaries, see ../README.md) and
links two states when their boundaries share a vertex: 109 pairs among the
49 states with a neighbour (the 48 contiguous states and DC), in file order.
"""

import json
import os
from collections import defaultdict

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
DATA = os.path.dirname(HERE)


def load():
    """Return (features, links, linked, where, C, ids): every feature of the
    file, the linked pairs of feature indices, the linked features in file
    order, each one's position among them, the binary matrix among them and
    their ids."""
    with open(os.path.join(DATA, "us-states.geojson")) as fh:
        features = json.load(fh)["features"]
    owners = defaultdict(set)
    for idx, feat in enumerate(features):
        geom = feat["geometry"]
        polygons = geom["coordinates"] if geom["type"] == "MultiPolygon" else [geom["coordinates"]]
        for polygon in polygons:
            for ring in polygon:
                for point in ring:
                    owners[tuple(point)].add(idx)
    links = set()
    for group in owners.values():
        for a in group:
            for b in group:
                if a < b:
                    links.add((a, b))
    assert len(links) == 109, len(links)
    linked = sorted({i for pair in links for i in pair})
    assert len(linked) == 49, len(linked)
    where = {feat: k for k, feat in enumerate(linked)}
    n = len(linked)
    C = np.zeros((n, n))
    for a, b in links:
        C[where[a], where[b]] = C[where[b], where[a]] = 1.0
    ids = [features[i]["id"] for i in linked]
    return features, links, linked, where, C, ids
