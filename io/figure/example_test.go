package figure_test

import (
	"bytes"
	"fmt"
	"math"
	"regexp"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/figure"
)

func ExampleChoropleth() {
	// Six unit squares in a row, one of them without a value. A real
	// caller takes the geometries and a column from a layer.
	var geoms []orb.MultiPolygon
	for i := range 6 {
		x := float64(i)
		geoms = append(geoms, orb.MultiPolygon{{{{x, 0}, {x + 1, 0}, {x + 1, 1}, {x, 1}, {x, 0}}}})
	}
	rate := []float64{1.5, 2, 2.5, 10, 11, math.NaN()}

	f, err := figure.FormatFromPath("rate.svg") // the caller's output path
	if err != nil {
		fmt.Println(err)
		return
	}
	var out bytes.Buffer // a file, in a real program
	err = figure.Choropleth(&out, f, geoms, rate, nil, figure.NaturalBreaks, 2, "rate", figure.MapOptions{
		Title: "Rate by area",
		Note:  "invented data",
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	// The legend: the heading, how the classes were made, then each class
	// as the range of its values and the number of areas in it.
	for _, m := range regexp.MustCompile(`<text [^>]*>([^<]*)</text>`).FindAllStringSubmatch(out.String(), -1) {
		fmt.Println(m[1])
	}
	// Output:
	// Rate by area
	// rate
	// 2 classes, natural breaks
	// areas
	// 1.50 – 2.50
	// 3
	// 10.00 – 11.00
	// 2
	// no data
	// 1
	// invented data
}
