package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// isletLayerGeoJSON is a made-up layer like a county layer: 4×4 areas one
// degree a side, three of them without a rate; areas 2 and 7 (no rate)
// and area 0 (a rate) each have an islet a hundredth of a degree across,
// half a degree out to sea, a pixel or two on the map.
func isletLayerGeoJSON() string {
	ring := func(x, y, s float64) string {
		return fmt.Sprintf("[[[%g,%g],[%g,%g],[%g,%g],[%g,%g],[%g,%g]]]", x, y, x+s, y, x+s, y+s, x, y+s, x, y)
	}
	islets := map[int][2]float64{0: {9.5, 50.2}, 2: {12.2, 49.5}, 7: {14.5, 51.4}}
	var feats []string
	for i := range 16 {
		x, y := 10+float64(i%4), 50+float64(i/4)
		parts := ring(x, y, 1)
		if p, ok := islets[i]; ok {
			parts += "," + ring(p[0], p[1], 0.01)
		}
		rate := fmt.Sprint((i*7)%11 + 1)
		if i == 2 || i == 7 || i == 13 {
			rate = "null"
		}
		feats = append(feats, fmt.Sprintf(`{"type":"Feature","properties":{"id":"C%02d","rate":%s},"geometry":{"type":"MultiPolygon","coordinates":[%s]}}`, i, rate, parts))
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(feats, ",\n") + "]}\n"
}

// local --map and --choropleth draw a layer whose areas without a value
// have islets (they once panicked with a palette index of −1): in SVG one
// marker per islet, hatched for the two areas without a rate, and PNGs
// written.
func TestLocalMapsWithIsletsWithoutValue(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	if err := os.WriteFile("islets.geojson", []byte(isletLayerGeoJSON()), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, ext := range []string{"svg", "png"} {
		m, c := "map."+ext, "rate."+ext
		r := runIn("", "local", "-i", "islets.geojson", "--variable", "rate", "-n", "99", "--map", m, "--choropleth", c)
		if r.code != 0 {
			t.Fatalf("%s: exit %d: %s", ext, r.code, r.stderr)
		}
		for _, f := range []string{m, c} {
			data, err := os.ReadFile(filepath.Join(dir, f))
			if err != nil || len(data) == 0 {
				t.Fatalf("%s: %v, %d bytes", f, err, len(data))
			}
			if ext != "svg" {
				continue
			}
			s := string(data)
			if n := strings.Count(s, "<circle"); n != 3 {
				t.Errorf("%s: %d markers, want 3", f, n)
			}
			if h := strings.Count(s, `r="3.2" fill="url(#`); h != 2 {
				t.Errorf("%s: %d hatched markers, want 2 (areas C02 and C07)", f, h)
			}
		}
	}
}
