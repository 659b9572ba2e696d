package clustering

import (
	"math"
	"testing"

	"github.com/areatest/areatest/samples/region"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Target (issue 4): screen 30 numeric columns of 3,000 areas with queen
// weights, 9,999 shuffles, ≤ 3 s on a 2-core machine. The columns are
// made-up transforms of the invented region's attributes, for timing only;
// two of them have missing values, so three groups of shared shuffles run.
func BenchmarkScreen30x3000(b *testing.B) {
	cfg := region.DefaultConfig()
	cfg.Areas = 3000
	r, err := region.Build(cfg)
	if err != nil {
		b.Fatal(err)
	}
	g, err := weights.ContiguityGraph(r.Geoms, weights.Queen)
	if err != nil {
		b.Fatal(err)
	}
	n := r.Len()
	base := [][]float64{r.Income, r.Population, r.Cases}
	var cols []Column
	for k := 0; k < 30; k++ {
		c := Column{Name: string(rune('a'+k%26)) + string(rune('0'+k/26)), Values: make([]float64, n), Missing: make([]bool, n)}
		src := base[k%3]
		for i := range c.Values {
			v := src[i]
			if math.IsNaN(v) {
				v = 0
			}
			c.Values[i] = v*(1+0.1*float64(k)) + math.Sin(float64(i*(k+1)))
		}
		if k >= 28 {
			c.Missing[k] = true
		}
		cols = append(cols, c)
	}
	in := ScreenInput{Input: Input{IDs: r.IDs, Graph: g, Numeric: cols}}
	opt := Options{Permutations: 9999, Seed: 1, Workers: 2, Adjust: shuffle.BenjaminiHochberg}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		res, err := Screen(in, opt)
		if err != nil {
			b.Fatal(err)
		}
		if len(res.Rows) != 30 {
			b.Fatalf("%d rows", len(res.Rows))
		}
	}
}
