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
func benchLayer(b testing.TB, n int) []byte {
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
	args := []string{"-y", "rate", "-g", "policy", "--zones", "none", "--surrogates", "0", "--false-positive-check", "0", "--workers", "2"}
	if strata != "" {
		args = append(args, "--strata", strata)
	}
	benchRun(b, args)
}

// benchRun times `areatest compare` on the 3,000-area region, in process,
// from reading the GeoJSON to writing the text report.
func benchRun(b *testing.B, args []string) {
	data := benchLayer(b, 3000)
	args = append([]string{"compare", "-i", "-"}, args...)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		var stderr bytes.Buffer
		if code := run(args, bytes.NewReader(data), io.Discard, &stderr); code != 0 {
			b.Fatalf("exit %d: %s", code, stderr.String())
		}
	}
}

// Target (issue 6): compare with every scheme on 3,000 areas — 9,999
// shuffles, 999 spectral surrogates, the false-positive check on 500
// surrogates × 199 shuffles, the effective sample size, automatic zones —
// ≤ 20 s.
func BenchmarkCompareAllSchemes3000(b *testing.B) {
	benchRun(b, []string{"-y", "rate", "-g", "policy", "--workers", "2"})
}

// Target (issue 14): compare with counts on 3,000 areas, every scheme as
// in BenchmarkCompareAllSchemes3000, within 1.2× its time.
func BenchmarkCompareRates3000(b *testing.B) {
	benchRun(b, []string{"--events", "cases", "--population", "population", "-g", "policy", "--workers", "2"})
}

// The free shuffle alone with counts, against BenchmarkCompareWhole3000.
func BenchmarkCompareRatesWhole3000(b *testing.B) {
	benchRun(b, []string{"--events", "cases", "--population", "population", "-g", "policy", "--zones", "none", "--surrogates", "0", "--false-positive-check", "0", "--workers", "2"})
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
