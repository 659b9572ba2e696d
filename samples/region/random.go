package region

import (
	"math"
	"math/bits"
	"math/rand/v2"
)

// stream is a seeded source of random numbers whose every output is defined by
// this file alone. Only the raw PCG output is taken from the standard library:
// the PCG-DXSM algorithm is fixed, whereas the helper methods of rand.Rand
// (IntN, NormFloat64, Shuffle) are free to change between Go releases, and a
// change there would silently alter the committed demo file.
type stream struct {
	src *rand.PCG
}

// Stream tags keep each stage of the build on its own random sequence, so that
// changing how (say) names are made leaves the geometry untouched.
const (
	tagLattice uint64 = 0x6c61747469636501 + iota
	tagCoast
	tagGrow
	tagIslands
	tagFields
	tagValues
	tagNames
	tagMissing
	tagCases
)

func newStream(seed, tag uint64) *stream {
	return &stream{src: rand.NewPCG(seed, tag)}
}

// float64 returns a uniform value in [0, 1) with 53 random bits.
func (s *stream) float64() float64 {
	return float64(s.src.Uint64()>>11) * 0x1p-53
}

// uniform returns a uniform value in [lo, hi).
func (s *stream) uniform(lo, hi float64) float64 {
	return lo + float64((hi-lo)*s.float64())
}

// intN returns a uniform integer in [0, n) without modulo bias (Lemire 2019,
// ACM TOMACS 29(1):3). n must be positive.
func (s *stream) intN(n int) int {
	un := uint64(n)
	hi, lo := bits.Mul64(s.src.Uint64(), un)
	if lo < un {
		thresh := -un % un
		for lo < thresh {
			hi, lo = bits.Mul64(s.src.Uint64(), un)
		}
	}
	return int(hi)
}

// shuffle permutes idx in place (Fisher–Yates).
func (s *stream) shuffle(idx []int32) {
	for i := len(idx) - 1; i > 0; i-- {
		j := s.intN(i + 1)
		idx[i], idx[j] = idx[j], idx[i]
	}
}

// normal returns an approximately standard normal value as the centred sum of
// twelve uniforms. Its tails stop at ±6, which suits invented data and avoids
// math.Log, whose assembly versions differ between platforms in the last bit.
func (s *stream) normal() float64 {
	var t float64
	for range 12 {
		t += s.float64()
	}
	return t - 6
}

// poisson draws a Poisson count with mean lambda: by multiplying uniforms
// (Knuth) for small means, by a rounded normal approximation for large ones,
// where the difference no longer matters for demo counts.
func (s *stream) poisson(lambda float64) int {
	if lambda <= 0 {
		return 0
	}
	if lambda < 40 {
		limit := expDet(-lambda)
		k, p := 0, s.float64()
		for p > limit {
			k++
			p = float64(p * s.float64())
		}
		return k
	}
	v := math.Round(lambda + float64(math.Sqrt(lambda)*s.normal()))
	if v < 0 {
		return 0
	}
	return int(v)
}

// expDet is e^x computed with plain arithmetic, so that it gives the same bits
// on every platform (math.Exp has assembly versions on some). The explicit
// float64 conversions forbid fused multiply–adds, which the Go compiler may
// otherwise emit on some architectures. Accuracy is a few ulps, far more than
// invented data needs.
func expDet(x float64) float64 {
	switch {
	case x > 700:
		return math.Inf(1)
	case x < -700:
		return 0
	}
	const ln2 = 0.693147180559945309417232121458176568
	k := math.Round(x / ln2)
	r := x - float64(k*ln2)
	// Taylor series of e^r for |r| <= ln2/2, Horner form.
	p := 1.0
	for n := 16; n >= 1; n-- {
		p = 1 + float64(float64(p*r)/float64(n))
	}
	return math.Ldexp(p, int(k))
}
