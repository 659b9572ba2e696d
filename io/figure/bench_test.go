package figure

import (
	"io"
	"math"
	"sync"
	"testing"

	"github.com/areatest/areatest/samples/region"
)

var (
	bigOnce   sync.Once
	bigRegion *region.Region
	bigErr    error
)

// big85000 is the demo region at 85,000 districts (≈15 vertices each),
// built once per test binary.
func big85000(tb testing.TB) *region.Region {
	bigOnce.Do(func() {
		cfg := region.DefaultConfig()
		cfg.Areas = 85000
		bigRegion, bigErr = region.Build(cfg)
	})
	if bigErr != nil {
		tb.Fatal(bigErr)
	}
	return bigRegion
}

// bigCategories gives the large region made-up local categories from the
// rate alone: enough variety to exercise every colour.
func bigCategories(r *region.Region) []int {
	cats := make([]int, r.Len())
	for i, v := range r.Rate {
		switch {
		case math.IsNaN(v):
			cats[i] = -1
		case v > 450:
			cats[i] = HighHigh
		case v < 90:
			cats[i] = LowLow
		case i%37 == 0:
			cats[i] = HighLow
		case i%41 == 0:
			cats[i] = LowHigh
		default:
			cats[i] = NotSignificant
		}
	}
	return cats
}

// BenchmarkMaps85000 writes a choropleth and a category map of 85,000
// areas, each as SVG and as PNG: four pictures per iteration. Target: at
// most 15 s for all four on the 2-core development machine.
func BenchmarkMaps85000(b *testing.B) {
	r := big85000(b)
	cats := bigCategories(r)
	opt := MapOptions{Title: "Income by district", Subtitle: "85,000 districts", LonLat: true, Note: "invented data"}
	b.ResetTimer()
	for b.Loop() {
		for _, f := range []Format{SVG, PNG} {
			if err := Choropleth(io.Discard, f, r.Geoms, r.Income, nil, NaturalBreaks, 5, "income", opt); err != nil {
				b.Fatal(err)
			}
			if err := CategoryMap(io.Discard, f, r.Geoms, cats, LocalCategories(), opt); err != nil {
				b.Fatal(err)
			}
		}
	}
}
