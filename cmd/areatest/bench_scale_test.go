package main

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strconv"
	"sync"
	"testing"
)

// Whole runs of autocorr, screen and local at 3,000, 20,000 and 85,000
// areas, on square grids of 0.01° cells (queen contiguity, as a fishnet)
// and on the generated region, in process from reading the GeoJSON to
// writing the text report, 999 shuffles and two workers. Target (issue 17):
// the time per area (ns/area) at 20,000 and 85,000 within 1.5× of the
// 3,000-area case. The large ones take a minute or more each; run them
// once: go test ./cmd/areatest -run - -bench 'Scale' -benchtime 1x.

func BenchmarkScaleAutocorrGrid3000(b *testing.B) {
	benchScale(b, gridData(b, 55), autocorrArgs("value"))
}
func BenchmarkScaleAutocorrGrid20000(b *testing.B) {
	benchScale(b, gridData(b, 141), autocorrArgs("value"))
}
func BenchmarkScaleAutocorrGrid85000(b *testing.B) {
	benchScale(b, gridData(b, 292), autocorrArgs("value"))
}

// The same with the range of Moran's I asked for at any size.
func BenchmarkScaleAutocorrRangeGrid85000(b *testing.B) {
	benchScale(b, gridData(b, 292), append(autocorrArgs("value"), "--moran-range"))
}

func BenchmarkScaleAutocorrRegion3000(b *testing.B) {
	benchScale(b, regionData(b, 3000), autocorrArgs("rate"))
}
func BenchmarkScaleAutocorrRegion20000(b *testing.B) {
	benchScale(b, regionData(b, 20_000), autocorrArgs("rate"))
}
func BenchmarkScaleAutocorrRegion85000(b *testing.B) {
	benchScale(b, regionData(b, 85_000), autocorrArgs("rate"))
}

func BenchmarkScaleScreenGrid3000(b *testing.B)    { benchScale(b, gridData(b, 55), screenArgs) }
func BenchmarkScaleScreenGrid20000(b *testing.B)   { benchScale(b, gridData(b, 141), screenArgs) }
func BenchmarkScaleScreenGrid85000(b *testing.B)   { benchScale(b, gridData(b, 292), screenArgs) }
func BenchmarkScaleScreenRegion3000(b *testing.B)  { benchScale(b, regionData(b, 3000), screenArgs) }
func BenchmarkScaleScreenRegion20000(b *testing.B) { benchScale(b, regionData(b, 20_000), screenArgs) }
func BenchmarkScaleScreenRegion85000(b *testing.B) { benchScale(b, regionData(b, 85_000), screenArgs) }

func BenchmarkScaleLocalGrid3000(b *testing.B)  { benchScale(b, gridData(b, 55), localArgs("value")) }
func BenchmarkScaleLocalGrid20000(b *testing.B) { benchScale(b, gridData(b, 141), localArgs("value")) }
func BenchmarkScaleLocalGrid85000(b *testing.B) { benchScale(b, gridData(b, 292), localArgs("value")) }
func BenchmarkScaleLocalRegion3000(b *testing.B) {
	benchScale(b, regionData(b, 3000), localArgs("rate"))
}
func BenchmarkScaleLocalRegion20000(b *testing.B) {
	benchScale(b, regionData(b, 20_000), localArgs("rate"))
}
func BenchmarkScaleLocalRegion85000(b *testing.B) {
	benchScale(b, regionData(b, 85_000), localArgs("rate"))
}

const scaleShuffles = "999"

func autocorrArgs(v string) []string {
	return []string{"autocorr", "-i", "-", "--variables", v, "-n", scaleShuffles, "--workers", "2"}
}

func localArgs(v string) []string {
	return []string{"local", "-i", "-", "--variable", v, "-n", scaleShuffles, "--workers", "2"}
}

var screenArgs = []string{"screen", "-i", "-", "-n", scaleShuffles, "--workers", "2"}

// benchScale times one command on a layer and reports the time per area.
func benchScale(b *testing.B, layer scaleLayer, args []string) {
	b.SetBytes(int64(len(layer.data)))
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		var stderr bytes.Buffer
		if code := run(args, bytes.NewReader(layer.data), io.Discard, &stderr); code != 0 {
			b.Fatalf("exit %d: %s", code, stderr.String())
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(layer.areas), "ns/area")
}

// scaleLayer is a GeoJSON layer and its number of areas.
type scaleLayer struct {
	data  []byte
	areas int
}

var scaleLayers sync.Map

// regionData is the generated region of n districts (benchLayer), made
// once per process.
func regionData(tb testing.TB, n int) scaleLayer {
	key := "region" + strconv.Itoa(n)
	if l, ok := scaleLayers.Load(key); ok {
		return l.(scaleLayer)
	}
	l := scaleLayer{benchLayer(tb, n), n}
	scaleLayers.Store(key, l)
	return l
}

// gridData is an m×m grid of 0.01° square cells with four made-up numeric
// columns (a smooth surface with a little noise, a trend, noise alone and
// a count), made once per process. Corners are computed from integer
// positions, so neighbouring cells share them bit for bit.
func gridData(tb testing.TB, m int) scaleLayer {
	key := "grid" + strconv.Itoa(m)
	if l, ok := scaleLayers.Load(key); ok {
		return l.(scaleLayer)
	}
	var buf bytes.Buffer
	buf.WriteString(`{"type":"FeatureCollection","features":[` + "\n")
	corner := func(i int) float64 { return float64(i) / 100 }
	for r := 0; r < m; r++ {
		for c := 0; c < m; c++ {
			k := r*m + c
			x0, x1, y0, y1 := corner(c), corner(c+1), corner(r)-30, corner(r+1)-30
			noise := math.Sin(float64(k)*12.9898) * 43758.5453
			noise -= math.Floor(noise)
			value := math.Sin(float64(c)/9) + math.Cos(float64(r)/7) + 0.3*noise
			sep := ","
			if k == m*m-1 {
				sep = ""
			}
			fmt.Fprintf(&buf, `{"type":"Feature","id":"c%d","geometry":{"type":"Polygon","coordinates":[[[%g,%g],[%g,%g],[%g,%g],[%g,%g],[%g,%g]]]},"properties":{"value":%g,"trend":%g,"noise":%g,"count":%d}}%s`+"\n",
				k, x0, y0, x1, y0, x1, y1, x0, y1, x0, y0, value, float64(r+c)/float64(m)+0.1*noise, noise, int(10*noise), sep)
		}
	}
	buf.WriteString("]}\n")
	l := scaleLayer{buf.Bytes(), m * m}
	scaleLayers.Store(key, l)
	return l
}
