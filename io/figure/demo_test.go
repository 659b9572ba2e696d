package figure

import (
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/geojson"
)

// TestDemoPictures draws the demo region's maps and plots into the folder
// named by AREATEST_PLOT_DIR, for people to look at; without it the test
// is skipped.
func TestDemoPictures(t *testing.T) {
	dir := os.Getenv("AREATEST_PLOT_DIR")
	if dir == "" {
		t.Skip("set AREATEST_PLOT_DIR to draw the demo pictures")
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	lay, _, err := geojson.ReadFile("../../samples/region.geojson", geojson.Options{})
	if err != nil {
		t.Fatal(err)
	}
	rate, err := lay.Column("rate")
	if err != nil {
		t.Fatal(err)
	}
	note := "Invented data (Halvaren demo region). seed 1 · 9,999 shuffles · areatest 0.1.0"
	write := func(name string, draw func(f *os.File, fm Format) error) {
		t.Helper()
		path := filepath.Join(dir, name)
		fm, err := FormatFromPath(path)
		if err != nil {
			t.Fatal(err)
		}
		f, err := os.Create(path)
		if err != nil {
			t.Fatal(err)
		}
		if err := draw(f, fm); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if err := f.Close(); err != nil {
			t.Fatal(err)
		}
	}
	for _, ext := range []string{".png", ".svg"} {
		write("rate-natural"+ext, func(f *os.File, fm Format) error {
			return Choropleth(f, fm, lay.Geoms, rate.Num, rate.Missing, NaturalBreaks, 5, "rate per 100,000", MapOptions{
				Title: "Rate of the condition by district", Subtitle: "Halvaren, 200 districts", LonLat: true, Note: note, IDs: lay.IDs,
			})
		})
		write("rate-quantile"+ext, func(f *os.File, fm Format) error {
			return Choropleth(f, fm, lay.Geoms, rate.Num, rate.Missing, Quantile, 7, "rate per 100,000", MapOptions{
				Title: "Rate of the condition by district", Subtitle: "quantile classes", LonLat: true, Note: note,
			})
		})
	}
	rng := rand.New(rand.NewPCG(1, 2))
	cats := demoCategories(rate.Num, rate.Missing, rng)
	z, lag, nb := demoLag(lay.Geoms, rate.Num)
	area, null := demoNull(z, lag, nb, rng)
	for _, ext := range []string{".png", ".svg"} {
		write("scatter"+ext, func(f *os.File, fm Format) error {
			return MoranScatter(f, fm, z, lag, cats, LocalCategories(), demoMoran(z, lag), ChartOptions{
				Title: "Rate against the mean rate of the neighbours", Subtitle: "Halvaren, queen contiguity, row-standardised",
				XLabel: "rate (standardised)", YLabel: "mean rate of the neighbours (standardised)", Note: note,
			})
		})
		write("histogram"+ext, func(f *os.File, fm Format) error {
			return Histogram(f, fm, null, z[area]*lag[area], ChartOptions{
				Title: "Local statistic of " + lay.IDs[area] + " under 9,999 shuffles", Subtitle: "conditional permutation: the area keeps its value, its neighbours are drawn at random",
				XLabel: "local Moran statistic", Note: note,
			})
		})
		write("categories"+ext, func(f *os.File, fm Format) error {
			return CategoryMap(f, fm, lay.Geoms, cats, LocalCategories(), MapOptions{
				Title: "Local clusters and outliers of the rate", Subtitle: "made-up categories, for the look only", LegendTitle: "local pattern", LonLat: true, Note: note, IDs: lay.IDs,
			})
		})
	}
}

// demoCategories makes up local categories for the demo pictures: the top
// and bottom tenths of the values as clusters, a few areas at random as
// outliers.
func demoCategories(vals []float64, missing []bool, rng *rand.Rand) []int {
	known := slices.DeleteFunc(slices.Clone(vals), math.IsNaN)
	slices.Sort(known)
	hi, lo := known[len(known)*9/10], known[len(known)/10]
	cats := make([]int, len(vals))
	for i, v := range vals {
		switch {
		case missing[i]:
			cats[i] = -1
		case v >= hi:
			cats[i] = HighHigh
		case v <= lo:
			cats[i] = LowLow
		case rng.IntN(20) == 0:
			cats[i] = HighLow
		case rng.IntN(20) == 0:
			cats[i] = LowHigh
		default:
			cats[i] = NotSignificant
		}
	}
	return cats
}

// demoMoran is Moran's I from the standardised values and their
// row-standardised lag, over the areas that have both: the slope of the
// scatter.
func demoMoran(z, lag []float64) float64 {
	var szl, szz float64
	for i := range z {
		if !math.IsNaN(lag[i]) && !math.IsNaN(z[i]) {
			szl += z[i] * lag[i]
			szz += z[i] * z[i]
		}
	}
	return szl / szz
}

// demoNull picks the area with the largest local statistic z_i · lag_i
// and draws its permutation distribution: z_i times the mean of z over
// |N_i| other areas drawn at random, 9,999 times.
func demoNull(z, lag []float64, nb [][]int, rng *rand.Rand) (area int, null []float64) {
	for i := range z {
		if !math.IsNaN(lag[i]) && z[i]*lag[i] > z[area]*lag[area] {
			area = i
		}
	}
	var pool []float64
	for j := range z {
		if j != area && !math.IsNaN(z[j]) {
			pool = append(pool, z[j])
		}
	}
	null = make([]float64, 9999)
	for b := range null {
		rng.Shuffle(len(pool), func(a, c int) { pool[a], pool[c] = pool[c], pool[a] })
		var s float64
		for _, v := range pool[:len(nb[area])] {
			s += v
		}
		null[b] = z[area] * s / float64(len(nb[area]))
	}
	return area, null
}

// demoLag standardises v (NaN stays NaN) and averages it over each area's
// neighbours: areas sharing at least one vertex. Areas without neighbours
// with values get a NaN lag.
func demoLag(geoms []orb.MultiPolygon, v []float64) (z, lag []float64, nb [][]int) {
	n := len(v)
	var sum, cnt float64
	for _, x := range v {
		if !math.IsNaN(x) {
			sum += x
			cnt++
		}
	}
	mean := sum / cnt
	var ss float64
	for _, x := range v {
		if !math.IsNaN(x) {
			ss += (x - mean) * (x - mean)
		}
	}
	sd := math.Sqrt(ss / cnt)
	z = make([]float64, n)
	for i, x := range v {
		z[i] = (x - mean) / sd
	}
	at := map[orb.Point][]int{}
	for i, mp := range geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				for _, q := range ring {
					if l := at[q]; len(l) == 0 || l[len(l)-1] != i {
						at[q] = append(l, i)
					}
				}
			}
		}
	}
	sets := make([]map[int]bool, n)
	for i := range sets {
		sets[i] = map[int]bool{}
	}
	for _, l := range at {
		for _, a := range l {
			for _, b := range l {
				if a != b {
					sets[a][b] = true
				}
			}
		}
	}
	nb = make([][]int, n)
	lag = make([]float64, n)
	for i := range sets {
		var s, c float64
		for j := range sets[i] {
			if !math.IsNaN(z[j]) {
				nb[i] = append(nb[i], j)
				s += z[j]
				c++
			}
		}
		lag[i] = math.NaN()
		if c > 0 {
			lag[i] = s / c
		}
	}
	return z, lag, nb
}
