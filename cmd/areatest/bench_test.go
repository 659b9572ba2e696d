package main

import (
	"bytes"
	"io"
	"testing"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/samples/region"
	"github.com/areatest/areatest/weights"
)

// benchLayer is an invented region of n districts written as GeoJSON, for
// timing only.
func benchLayer(b *testing.B, n int) []byte {
	cfg := region.DefaultConfig()
	cfg.Areas = n
	r, err := region.Build(cfg)
	if err != nil {
		b.Fatal(err)
	}
	var buf bytes.Buffer
	if err := r.WriteGeoJSON(&buf); err != nil {
		b.Fatal(err)
	}
	return buf.Bytes()
}

// Target (issue 2): the whole compare run on 3,000 areas — read the GeoJSON,
// build queen contiguity, the free shuffle of the difference in medians and
// the Moran's I nulls of outcome and grouping, 9,999 shuffles each — ≤ 1.5 s.
func BenchmarkCompareWhole3000(b *testing.B) {
	benchCompare(b, "")
}

// The same with a second, within-province shuffle scheme.
func BenchmarkCompareWhole3000Strata(b *testing.B) {
	benchCompare(b, "province")
}

func benchCompare(b *testing.B, strata string) {
	data := benchLayer(b, 3000)
	c := compareFlags{outcome: "rate", group: "policy", strata: strata, alternative: "two-sided", zones: "none", fpShuffles: 199,
		permutations: 9999, seed: 1, workers: 2, alpha: 0.05, format: "text"}
	c.weights = weightFlags{contiguity: "queen", points: "centroid", order: 1, transform: "row", islands: "drop", changed: func(string) bool { return false }}
	opt, spec, err := c.options()
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		lay, _, err := geojson.Read(bytes.NewReader(data), "bench.geojson", geojson.Options{})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := compareLayer(lay, &c, opt, spec, io.Discard); err != nil {
			b.Fatal(err)
		}
	}
}

// Target (issue 6): compare with every scheme on 3,000 areas — 9,999
// shuffles, 999 spectral surrogates, the false-positive check on 500
// surrogates × 199 shuffles, the effective sample size, automatic zones —
// ≤ 20 s.
func BenchmarkCompareAllSchemes3000(b *testing.B) {
	data := benchLayer(b, 3000)
	c := compareFlags{outcome: "rate", group: "policy", alternative: "two-sided", zones: "auto",
		permutations: 9999, surrogates: 999, fpChecks: 500, fpShuffles: 199, seed: 1, workers: 2, alpha: 0.05, format: "text"}
	c.weights = weightFlags{contiguity: "queen", points: "centroid", order: 1, transform: "row", islands: "drop", changed: func(string) bool { return false }}
	opt, spec, err := c.options()
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		lay, _, err := geojson.Read(bytes.NewReader(data), "bench.geojson", geojson.Options{})
		if err != nil {
			b.Fatal(err)
		}
		res, err := compareLayer(lay, &c, opt, spec, io.Discard)
		if err != nil {
			b.Fatal(err)
		}
		if len(res.Tests) != 3 || res.FalsePositiveRate == nil {
			b.Fatalf("%d schemes", len(res.Tests))
		}
	}
}

// Reading and contiguity alone, for the breakdown of the whole run.
func BenchmarkReadAndQueen3000(b *testing.B) {
	data := benchLayer(b, 3000)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		lay, _, err := geojson.Read(bytes.NewReader(data), "bench.geojson", geojson.Options{})
		if err != nil {
			b.Fatal(err)
		}
		if _, err := weights.ContiguityGraph(lay.Geoms, weights.Queen); err != nil {
			b.Fatal(err)
		}
	}
}
