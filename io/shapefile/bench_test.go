package shapefile

import (
	"strconv"
	"testing"
)

// BenchmarkRead250k reads a shapefile of 250,000 squares (a 500 × 500
// grid) with a name and a value per square, written by the test writer in
// a temp folder.
func BenchmarkRead250k(b *testing.B) {
	const side = 500
	shapes := make([]testShape, 0, side*side)
	rows := make([][]string, 0, side*side)
	for y := range side {
		for x := range side {
			shapes = append(shapes, poly(square(-120+float64(x)*0.1, 20+float64(y)*0.1, 0.1)))
			rows = append(rows, []string{"area " + strconv.Itoa(len(rows)), strconv.Itoa(x * y % 977)})
		}
	}
	shp := writeFiles(b, b.TempDir(), "grid", makeFiles(shapes, rows))
	shapes, rows = nil, nil
	b.ReportAllocs()
	for b.Loop() {
		lay, _, err := ReadFile(shp, Options{IDColumn: "name"})
		if err != nil || lay.Len() != side*side {
			b.Fatal(err)
		}
	}
}
