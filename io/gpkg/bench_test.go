package gpkg

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

// grid is an n×n grid of squares 0.1 degree wide, with a number and a
// text column, as a layer.
func grid(n int) *layer.Layer {
	l := &layer.Layer{Source: "grid"}
	pop, name := layer.NewBuilder("POP", 0), layer.NewBuilder("NAME", 0)
	for i := range n * n {
		x, y := -100+float64(i%n)*0.1, float64(i/n)*0.1
		l.IDs = append(l.IDs, fmt.Sprintf("%06d", i))
		l.Geoms = append(l.Geoms, orb.MultiPolygon{{{{x, y}, {x + 0.1, y}, {x + 0.1, y + 0.1}, {x, y + 0.1}, {x, y}}}})
		pop.AddNumber(float64(1000+i*7), "")
		name.AddText(fmt.Sprintf("Area %d", i))
	}
	l.Columns = []*layer.Column{pop.Column(), name.Column()}
	return l
}

// BenchmarkRead250k reads a GeoPackage of 250,000 squares (a 500×500
// grid) that Write made in the setup.
func BenchmarkRead250k(b *testing.B) {
	path := filepath.Join(b.TempDir(), "grid.gpkg")
	f, err := os.Create(path)
	if err != nil {
		b.Fatal(err)
	}
	if err := Write(f, grid(500), nil, "grid"); err != nil {
		b.Fatal(err)
	}
	if err := f.Close(); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		l, _, err := ReadFile(path, Options{IDColumn: "id"})
		if err != nil || l.Len() != 250000 {
			b.Fatal(err)
		}
	}
}

// BenchmarkWrite250k writes the same grid.
func BenchmarkWrite250k(b *testing.B) {
	l := grid(500)
	b.ReportAllocs()
	for b.Loop() {
		if err := Write(io.Discard, l, nil, "grid"); err != nil {
			b.Fatal(err)
		}
	}
}
