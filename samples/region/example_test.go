package region_test

import (
	"bytes"
	"fmt"
	"math"
	"testing"

	"github.com/areatest/areatest/samples"
	"github.com/areatest/areatest/samples/region"
)

func Example() {
	r, err := region.Build(region.DefaultConfig())
	if err != nil {
		fmt.Println(err)
		return
	}
	var yes, unknownRate int
	for d := range r.IDs {
		if r.Policy[d] == "yes" {
			yes++
		}
		if math.IsNaN(r.Rate[d]) {
			unknownRate++
		}
	}
	fmt.Printf("%s: %d districts in %d provinces, %d with the policy, %d without a rate\n",
		r.Name, r.Len(), len(r.ProvinceNames), yes, unknownRate)
	// Output:
	// Halvaren: 200 districts in 5 provinces, 79 with the policy, 2 without a rate
}

// TestShippedFile keeps samples/region.geojson from drifting away from the
// generator.
func TestShippedFile(t *testing.T) {
	r, err := region.Build(region.DefaultConfig())
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := r.WriteGeoJSON(&buf); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(buf.Bytes(), samples.RegionGeoJSON) {
		t.Fatalf("samples/%s differs from what region.Build(region.DefaultConfig()) writes; "+
			"regenerate it with: go run ./samples/makeregion -o samples/%s", samples.RegionFile, samples.RegionFile)
	}
	if len(samples.RegionGeoJSON) > 1<<20 {
		t.Errorf("samples/%s is %d bytes, keep it under 1 MiB", samples.RegionFile, len(samples.RegionGeoJSON))
	}
}
