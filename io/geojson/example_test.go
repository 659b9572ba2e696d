package geojson_test

import (
	"fmt"
	"strings"

	"github.com/areatest/areatest/io/geojson"
)

func ExampleRead() {
	doc := `{
	  "type": "FeatureCollection",
	  "features": [
	    {"type": "Feature", "id": 48201,
	     "geometry": {"type": "Polygon", "coordinates": [[[-95.8, 29.5], [-94.9, 29.5], [-94.9, 30.2], [-95.8, 29.5]]]},
	     "properties": {"name": "Harris", "rate": "12.5"}},
	    {"type": "Feature", "id": 48113,
	     "geometry": {"type": "Polygon", "coordinates": [[[-97.0, 32.5], [-96.5, 32.5], [-96.5, 33.0], [-97.0, 32.5]]]},
	     "properties": {"name": "Dallas", "rate": "NA"}}
	  ]
	}`
	lay, warnings, err := geojson.Read(strings.NewReader(doc), "counties.geojson", geojson.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	rate, _ := lay.Column("rate")
	for i, id := range lay.IDs {
		fmt.Printf("%s rate=%q missing=%v\n", id, rate.Label(i), rate.Missing[i])
	}
	fmt.Println(rate.Kind, len(warnings))
	// Output:
	// 48201 rate="12.5" missing=false
	// 48113 rate="" missing=true
	// number 0
}
