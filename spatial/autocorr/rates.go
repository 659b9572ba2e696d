package autocorr

import (
	"fmt"

	"github.com/areatest/areatest/spatial/rates"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// EBTest is the empirical-Bayes standardised Moran's I of a rate: the
// scores and Moran's I of the scores with its permutation test.
type EBTest struct {
	rates.EBScores
	Moran Test `json:"moran"`
}

// EBMoran computes the empirical-Bayes standardised Moran's I of the rate
// events/population on g (Assunção & Reis 1999): Moran's I of the scores
// z_i of EBStandardise, which puts areas of small population, whose raw
// rates swing widely by chance, on the same footing as large ones. The
// permutation test shuffles the scores over the areas (plan's Labels are
// filled in). I is computed as Moran's I of z, centred on its mean like any
// other variable.
func EBMoran(events, population []float64, g *weights.Graph, plan shuffle.Plan) (EBTest, error) {
	var t EBTest
	if len(events) != g.Len() {
		return t, fmt.Errorf("%d areas of rates for a graph of %d areas", len(events), g.Len())
	}
	var err error
	if t.EBScores, err = rates.EBStandardise(events, population); err != nil {
		return t, err
	}
	t.Moran, err = RunTest(t.Scores, g, plan)
	return t, err
}
