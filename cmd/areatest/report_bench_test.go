package main

import (
	"bytes"
	"io"
	"testing"

	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/weights"
)

// Targets (issue 13): the page of local on 3,000 areas, its two maps and
// the scatter inline as SVG, ≤ 3 MB and ≤ 2 s to write; on 85,000 areas,
// the pictures then PNG, ≤ 10 MB. Only the writing of the page is timed;
// "MB" is its size.
func BenchmarkLocalReport3000(b *testing.B)  { benchLocalReport(b, 3000) }
func BenchmarkLocalReport85000(b *testing.B) { benchLocalReport(b, 85000) }

// The page of local on 3,000 areas stays under 3 MB, its pictures inline
// SVG (under report.MaxInlineSVG each).
func TestLocalReportSize3000(t *testing.T) {
	if testing.Short() {
		t.Skip("builds a layer of 3,000 areas")
	}
	var page bytes.Buffer
	if err := localReport(t, 3000)(&page); err != nil {
		t.Fatal(err)
	}
	if page.Len() > 3e6 {
		t.Errorf("%d bytes, want at most 3 MB", page.Len())
	}
	if n := bytes.Count(page.Bytes(), []byte("<svg")); n != 3 {
		t.Errorf("%d inline SVG pictures, want 3", n)
	}
}

func benchLocalReport(b *testing.B, n int) {
	write := localReport(b, n)
	var page bytes.Buffer
	b.ResetTimer()
	for range b.N {
		page.Reset()
		if err := write(&page); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(page.Len())/1e6, "MB")
}

// localReport analyses an invented region of n areas (99 shuffles) and
// returns the writer of its page.
func localReport(b testing.TB, n int) func(io.Writer) error {
	lay, _, err := geojson.Read(bytes.NewReader(benchLayer(b, n)), "bench.geojson", geojson.Options{})
	if err != nil {
		b.Fatal(err)
	}
	g, err := weights.ContiguityGraph(lay.Geoms, weights.Queen)
	if err != nil {
		b.Fatal(err)
	}
	col, err := lay.NumericColumn("rate", "the variable")
	if err != nil {
		b.Fatal(err)
	}
	res, err := local.Analyse(local.Moran, local.Input{File: lay.Source, IDs: lay.IDs, Variable: "rate", Values: col.Num, Missing: col.Missing, Graph: g},
		local.Options{Permutations: 99, Seed: 1, Workers: 2})
	if err != nil {
		b.Fatal(err)
	}
	res.Version = Version
	return (&sharedFlags{}).page(res, 10, localPagePictures(report.LocalPictures{Layer: lay, Result: res, Classes: figure.Quantile})...)
}
