package local_test

import (
	"fmt"

	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/weights"
)

// Local Moran on a row of twelve areas, six low then six high: each area
// keeps its value and the other eleven are drawn into its neighbour slots.
// With so few areas every filling is enumerated (11 for an end, C(11, 2) =
// 55 for the others), so the p-values are exact — and a neighbourhood of
// two can only be so unusual among 55: even clear runs are rarely
// significant on a map this small.
func ExampleRun() {
	var pairs [][2]int32
	for i := int32(0); i < 11; i++ {
		pairs = append(pairs, [2]int32{i, i + 1})
	}
	g, err := weights.FromLinks(12, pairs, "path")
	if err != nil {
		panic(err)
	}
	x := []float64{1, 2, 1.5, 1, 2.5, 2, 8, 9, 8.5, 9.5, 8, 9}
	res, err := local.Run(local.Moran, x, nil, g.RowStandardised(), local.DefaultOptions())
	if err != nil {
		panic(err)
	}
	for _, r := range res {
		fmt.Printf("area %2d: I %6.3f, p %.3f over %2d fillings, %s\n", r.Index, r.Statistic, r.P, r.Permutations, r.Category)
	}
	s := local.Summarise(local.Moran, res, local.DefaultOptions())
	fmt.Printf("Σ I_i = %.3f; %d of %d areas significant at %.2f (%s p-values)\n",
		s.Total, s.Significant, s.Areas, s.Alpha, s.Alternative)
	// Output:
	// area  0: I  1.051, p 0.364 over 11 fillings, not significant
	// area  1: I  0.988, p 0.055 over 55 fillings, not significant
	// area  2: I  1.071, p 0.091 over 55 fillings, not significant
	// area  3: I  1.051, p 0.145 over 55 fillings, not significant
	// area  4: I  0.779, p 0.127 over 55 fillings, not significant
	// area  5: I -0.021, p 0.545 over 55 fillings, not significant
	// area  6: I  0.075, p 0.382 over 55 fillings, not significant
	// area  7: I  0.941, p 0.164 over 55 fillings, not significant
	// area  8: I  1.084, p 0.036 over 55 fillings, high-high
	// area  9: I  1.064, p 0.164 over 55 fillings, not significant
	// area 10: I  0.921, p 0.036 over 55 fillings, high-high
	// area 11: I  0.865, p 0.455 over 11 fillings, not significant
	// Σ I_i = 9.869; 2 of 12 areas significant at 0.05 (folded p-values)
}
