package surrogate

import (
	"math"

	"github.com/areatest/areatest/spatial/shuffle"
)

// normals fills dst with independent standard normal draws by the
// Box–Muller transform (Box & Muller 1958, Ann. Math. Stat. 29:610–611),
// two per pair of uniforms, so that every value comes from the block's
// stream and nothing else.
func normals(rng *shuffle.Stream, dst []float64) {
	n := len(dst)
	for i := 0; i < n; i += 2 {
		u := 1 - rng.Float64() // in (0, 1], so the logarithm is finite
		v := rng.Float64()
		r := math.Sqrt(-2 * math.Log(u))
		s, c := math.Sincos(2 * math.Pi * v)
		dst[i] = r * c
		if i+1 < n {
			dst[i+1] = r * s
		}
	}
}
