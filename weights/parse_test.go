package weights

import "testing"

// Option names are read in any case and with surrounding space, and an
// unknown name is an error listing the names there are.
func TestParseNames(t *testing.T) {
	parse := map[string]func(string) (any, error){
		"contiguity": func(s string) (any, error) { return ParseContiguity(s) },
		"points":     func(s string) (any, error) { return ParsePointMode(s) },
		"kernel":     func(s string) (any, error) { return ParseKernelKind(s) },
		"transform":  func(s string) (any, error) { return ParseTransform(s) },
		"scaling":    func(s string) (any, error) { return ParseScaling(s) },
	}
	for _, c := range []struct {
		parser, in string
		want       any
	}{
		{"contiguity", "Rook", Rook}, {"contiguity", " QUEEN ", Queen},
		{"points", "INSIDE", Inside}, {"points", "centroid", Centroid},
		{"kernel", "Gaussian", Gaussian}, {"kernel", "bisquare", Bisquare},
		{"transform", "Row", RowStandardised}, {"transform", "row-standardised", RowStandardised},
		{"transform", "binary", Binary}, {"transform", "Variance-Stabilising", VarianceStabilising},
		{"scaling", "row", RowStandardised}, {"scaling", "None", AsBuilt}, {"scaling", "stabilised", VarianceStabilising},
	} {
		if got, err := parse[c.parser](c.in); err != nil || got != c.want {
			t.Errorf("%s %q: %v, %v; want %v", c.parser, c.in, got, err, c.want)
		}
	}
	for _, c := range []struct{ parser, in, want string }{
		{"contiguity", "bishop", `contiguity must be queen or rook, not "bishop"`},
		{"points", "middle", `point mode must be centroid or inside, not "middle"`},
		{"kernel", "epanechnikov", `kernel must be triangular, bisquare or gaussian, not "epanechnikov"`},
		{"transform", "cube", `transform must be row, binary or variance, not "cube"`},
		{"scaling", "variance", `scaling must be row, none or stabilised, not "variance"`},
	} {
		if _, err := parse[c.parser](c.in); err == nil || err.Error() != c.want {
			t.Errorf("%s %q: error %v, want %q", c.parser, c.in, err, c.want)
		}
	}
}
