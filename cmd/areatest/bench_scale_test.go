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
// areas, on square grids of 0.01° cells (queen contiguity, as a fishnet;
// 55², 141² and 292² cells) and on the generated region, in process from
// reading the GeoJSON to writing the text report, 999 shuffles and two
// workers. Target (issue 17): the time per area (ns/area) at 20,000 and
// 85,000 within 1.5× of the 3,000-area case. autocorr-range asks for the
// range of Moran's I at any size. The large ones take up to a minute each;
// run them once: go test ./cmd/areatest -run - -bench Scale -benchtime 1x
// (or -bench 'Scale/local/grid' and the like).
func BenchmarkScale(b *testing.B) {
	commands := []struct {
		name            string
		args            []string
		gridVar, regVar string
	}{
		{"autocorr", []string{"autocorr", "--variables"}, "value", "rate"},
		{"autocorr-range", []string{"autocorr", "--moran-range", "--variables"}, "value", "rate"},
		{"screen", []string{"screen"}, "", ""},
		{"local", []string{"local", "--variable"}, "value", "rate"},
	}
	for _, c := range commands {
		for _, n := range []int{3000, 20_000, 85_000} {
			for _, kind := range []string{"grid", "region"} {
				b.Run(fmt.Sprintf("%s/%s/%d", c.name, kind, n), func(b *testing.B) {
					layer, variable := scaleGrid(b, n), c.gridVar
					if kind == "region" {
						layer, variable = regionData(b, n), c.regVar
					}
					args := append([]string{}, c.args...)
					if variable != "" {
						args = append(args, variable)
					}
					benchScale(b, layer, append(args, "-i", "-", "-n", "999", "--workers", "2"))
				})
			}
		}
	}
}

// scaleGrid is the square grid nearest n cells.
func scaleGrid(tb testing.TB, n int) scaleLayer {
	return gridData(tb, int(math.Round(math.Sqrt(float64(n)))))
}

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
