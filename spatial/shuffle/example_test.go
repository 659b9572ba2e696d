package shuffle_test

import (
	"fmt"

	"github.com/areatest/areatest/spatial/shuffle"
)

// A statistic hands Run a factory of evaluators; Run decides how the labels
// are rearranged. Here: eight cups, the four called "milk first" listed
// first, and the statistic counts how many of them truly were. With only
// C(8,4) = 70 arrangements Run enumerates them all.
func ExampleRun() {
	truth := []int32{1, 1, 1, 1, 0, 0, 0, 0}
	correct := func() shuffle.Evaluator {
		return func(labels []int32) float64 {
			var hits float64
			for _, l := range labels[:4] {
				hits += float64(l)
			}
			return hits
		}
	}
	res, err := shuffle.Run(shuffle.Plan{Scheme: "free", Labels: truth, Permutations: 9999,
		Alternative: shuffle.Greater}, correct)
	if err != nil {
		panic(err)
	}
	fmt.Printf("%s: %v correct, p = %.4f (exact %v over %d arrangements)\n",
		res.Scheme, res.Observed, res.PValue, res.Exact, res.Permutations)
	// Output: free: 4 correct, p = 0.0143 (exact true over 70 arrangements)
}
