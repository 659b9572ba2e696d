#!/usr/bin/env node
// Conversion script for tests/testdata/us-states.geojson.
//
// Source: npm package us-atlas 3.0.1, file states-10m.json (US Census Bureau
// cartographic state boundaries, 2017 edition, as quantized and simplified
// TopoJSON in unprojected lon/lat degrees - NOT states-albers-10m.json,
// which is projected to screen units).
// Converter: npm package topojson-client 3.1.0 (topojson.feature).
//
// Commands used (Node.js 20), from a scratch directory outside the repository:
//
//   mkdir -p /tmp/usatlas && cd /tmp/usatlas
//   npm init -y
//   npm install us-atlas@3.0.1 topojson-client@3.1.0
//   node /work/main/tests/testdata/us-states.js \
//        /work/main/tests/testdata/us-states.geojson
//
// (Add --raw after the output path to skip the clean-up step below; the raw
// output was used only to check that clean-up changes no neighbour relation.)
//
// The script resolves both packages from the current working directory
// (so run it from the directory where they were installed).
//
// What it does:
//   * converts the "states" object of the topology to GeoJSON features with
//     topojson.feature; coordinates are kept exactly as topojson-client emits
//     them (no rounding), so vertices on shared borders stay bit-identical
//     between neighbouring features (TopoJSON stores each shared arc once);
//   * keeps every feature the file has (50 states, District of Columbia,
//     Puerto Rico and four island areas), sorted by FIPS code;
//   * feature "id" = 2-digit FIPS string; properties: name, fips,
//     centroid_lon, centroid_lat;
//   * clean-up (removes positions, never changes a coordinate value):
//     quantization and simplification in the source leave a few degenerate
//     bits, which are removed: (a) repeated consecutive positions (zero-length
//     arcs at border junctions: Arkansas/Texas, Michigan/Wisconsin),
//     (b) zero-width spikes A,B,A -> A (one, in Oregon at the
//     California/Nevada/Oregon junction), (c) rings left with fewer than 4
//     positions or zero area, and parts whose exterior ring is dropped (one
//     collapsed sliver of Delaware along the New Jersey shore). Clean-up
//     runs on the ring as a cycle (the closing position is re-added);
//   * rewinds rings to the RFC 7946 right-hand rule (exterior rings
//     counter-clockwise, holes clockwise, measured by planar signed area in
//     lon/lat). Rewinding only reverses vertex order; no coordinate changes;
//   * centroid_lon / centroid_lat: planar area-weighted centroid (shoelace
//     formula in raw lon/lat degrees) of the largest polygon part of the
//     feature (largest by planar area of exterior ring minus its holes; holes
//     are subtracted from the centroid too), rounded to 6 decimals;
//   * checks that every ring is closed, has >= 4 positions, and that all
//     positions are finite lon in [-180,180], lat in [-90,90].
'use strict';

const path = require('path');
const fs = require('fs');
const { createRequire } = require('module');

const req = createRequire(path.join(process.cwd(), 'noop.js'));
const topojson = req('topojson-client');
const topology = req('us-atlas/states-10m.json');

const outPath = process.argv[2];
const raw = process.argv[3] === '--raw';
if (!outPath) {
  console.error('usage: node us-states.js OUTPUT.geojson [--raw]');
  process.exit(2);
}

// Guard against picking up the projected file by mistake.
const [x0, y0, x1, y1] = topology.bbox;
if (x0 < -180 || x1 > 180 || y0 < -90 || y1 > 90) {
  throw new Error('topology bbox is not lon/lat: ' + topology.bbox);
}

// Signed planar area (shoelace) of a closed ring; > 0 means counter-clockwise.
function signedArea(ring) {
  let a = 0;
  for (let i = 0; i + 1 < ring.length; i++) {
    a += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
  }
  return a / 2;
}

// Area-weighted centroid numerator pieces of a closed ring.
function ringMoments(ring) {
  let a = 0, cx = 0, cy = 0;
  for (let i = 0; i + 1 < ring.length; i++) {
    const [xa, ya] = ring[i];
    const [xb, yb] = ring[i + 1];
    const c = xa * yb - xb * ya;
    a += c;
    cx += (xa + xb) * c;
    cy += (ya + yb) * c;
  }
  return { a: a / 2, cx: cx / 6, cy: cy / 6 };
}

function checkRing(ring, where) {
  if (ring.length < 4) throw new Error(where + ': ring has < 4 positions');
  const f = ring[0], l = ring[ring.length - 1];
  if (f[0] !== l[0] || f[1] !== l[1]) throw new Error(where + ': ring not closed');
  for (const p of ring) {
    if (p.length !== 2 || !Number.isFinite(p[0]) || !Number.isFinite(p[1]) ||
        p[0] < -180 || p[0] > 180 || p[1] < -90 || p[1] > 90) {
      throw new Error(where + ': bad position ' + JSON.stringify(p));
    }
  }
}

const removed = { duplicates: 0, spikes: 0, rings: 0, parts: 0 };

function samePos(a, b) {
  return a[0] === b[0] && a[1] === b[1];
}

// Clean one closed ring; returns a closed ring or null when degenerate.
function cleanRing(ring) {
  let pts = ring.slice(0, ring.length - 1); // open cycle
  let changed = true;
  while (changed && pts.length > 0) {
    changed = false;
    // (a) repeated consecutive positions, cyclically
    const dedup = [];
    for (let i = 0; i < pts.length; i++) {
      const prev = dedup.length ? dedup[dedup.length - 1] : null;
      if (prev && samePos(prev, pts[i])) { removed.duplicates++; changed = true; continue; }
      dedup.push(pts[i]);
    }
    while (dedup.length > 1 && samePos(dedup[0], dedup[dedup.length - 1])) {
      dedup.pop(); removed.duplicates++; changed = true;
    }
    pts = dedup;
    // (b) spikes A,B,A -> A, cyclically (one at a time, then re-scan)
    const n = pts.length;
    if (n >= 3) {
      for (let i = 0; i < n; i++) {
        const a = pts[(i + n - 1) % n], c = pts[(i + 1) % n];
        if (samePos(a, c)) {
          // drop B (index i) and the second A (index i+1)
          const j = (i + 1) % n;
          pts = pts.filter((_, k) => k !== i && k !== j);
          removed.spikes++; changed = true;
          break;
        }
      }
    }
  }
  if (pts.length < 3) return null;
  const closed = pts.concat([pts[0]]);
  if (signedArea(closed) === 0) return null;
  return closed;
}

function cleanPolys(polys) {
  const out = [];
  for (const poly of polys) {
    const ext = cleanRing(poly[0]);
    if (!ext) { removed.parts++; removed.rings += poly.length; continue; }
    const rings = [ext];
    for (const h of poly.slice(1)) {
      const c = cleanRing(h);
      if (c) rings.push(c); else removed.rings++;
    }
    out.push(rings);
  }
  return out;
}

function round6(v) {
  return Number(v.toFixed(6));
}

const fc = topojson.feature(topology, topology.objects.states);
const features = [];
for (const f of fc.features) {
  const g = f.geometry;
  let polys = g.type === 'Polygon' ? [g.coordinates]
    : g.type === 'MultiPolygon' ? g.coordinates
      : null;
  if (!polys) throw new Error(f.id + ': unexpected geometry ' + g.type);
  if (!raw) {
    polys = cleanPolys(polys);
    if (polys.length === 0) throw new Error(f.id + ': nothing left after clean-up');
    g.coordinates = g.type === 'Polygon' ? polys[0] : polys;
  }

  let best = null;
  polys.forEach((poly, pi) => {
    poly.forEach((ring, ri) => {
      checkRing(ring, `${f.id} part ${pi} ring ${ri}`);
      const s = signedArea(ring);
      // exterior (ri==0) must be CCW (s>0); holes CW (s<0)
      if ((ri === 0 && s < 0) || (ri > 0 && s > 0)) ring.reverse();
    });
    // part moments: exterior (positive) plus holes (negative after rewinding)
    let a = 0, cx = 0, cy = 0;
    for (const ring of poly) {
      const m = ringMoments(ring);
      a += m.a; cx += m.cx; cy += m.cy;
    }
    if (best === null || a > best.a) best = { a, cx, cy };
  });

  const fips = String(f.id);
  if (!/^\d{2}$/.test(fips)) throw new Error('bad FIPS id ' + fips);
  features.push({
    type: 'Feature',
    id: fips,
    properties: {
      name: f.properties.name,
      fips: fips,
      centroid_lon: round6(best.cx / best.a),
      centroid_lat: round6(best.cy / best.a),
    },
    geometry: g,
  });
}
features.sort((a, b) => (a.id < b.id ? -1 : a.id > b.id ? 1 : 0));

// One feature per line keeps the file diff-friendly.
const lines = features.map((f) => JSON.stringify(f));
const text = '{"type":"FeatureCollection","features":[\n' + lines.join(',\n') + '\n]}\n';
fs.writeFileSync(outPath, text);
if (!raw) console.error('clean-up removed: ' + JSON.stringify(removed));
console.error(`wrote ${features.length} features, ${text.length} bytes to ${outPath}`);
