package gpkg_test

import (
	"fmt"
	"path/filepath"

	"github.com/areatest/areatest/io/gpkg"
)

// Reading the projected fixture, with the ids from its "id" column.
func ExampleReadFile() {
	path := filepath.Join("..", "..", "tests", "testdata", "formats", "states-5070.gpkg")
	l, warnings, err := gpkg.ReadFile(path, gpkg.Options{IDColumn: "id"})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(l.Len(), "areas, first", l.IDs[0], "; warnings:", len(warnings))
	fmt.Printf("%s, distances in %s\n", l.CRS.Name, l.CRS.DistanceUnit())
	// Output:
	// 56 areas, first 01 ; warnings: 0
	// NAD83 / Conus Albers, distances in m
}

func ExampleSniff() {
	fmt.Println(gpkg.Sniff([]byte("SQLite format 3\x00\x10\x00")), gpkg.Sniff([]byte(`{"type":`)))
	// Output: true false
}
