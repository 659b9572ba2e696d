package shuffle

import (
	"math"
	"math/bits"
	"math/rand/v2"
)

// Stream is a random stream for one block of work. It is cheap to create and
// holds no pointers, so a worker can keep one in its scratch space.
type Stream struct {
	pcg rand.PCG
	// spare holds the unused low half of the last 64-bit draw, so that
	// small bounded draws cost half a generator step.
	spare    uint32
	hasSpare bool
}

// splitmix64 scrambles a counter into a well-mixed 64-bit value (Steele,
// Lea & Flood 2014); it keeps nearby seeds and block numbers far apart.
func splitmix64(x uint64) uint64 {
	x += 0x9e3779b97f4a7c15
	x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9
	x = (x ^ (x >> 27)) * 0x94d049bb133111eb
	return x ^ (x >> 31)
}

// NewStream returns the stream for block number block under seed. The same
// pair always gives the same sequence. Purpose separates independent uses of
// one seed (e.g. two different tests in a run) so they do not share draws.
func NewStream(seed uint64, purpose uint64, block int) Stream {
	var s Stream
	s.Reset(seed, purpose, block)
	return s
}

// Reset re-seeds the stream in place for another block.
func (s *Stream) Reset(seed uint64, purpose uint64, block int) {
	hi := splitmix64(seed ^ splitmix64(purpose))
	lo := splitmix64(hi ^ splitmix64(uint64(block)+0x632be59bd9b4e019))
	s.pcg.Seed(hi, lo)
	s.hasSpare = false
}

func (s *Stream) uint32() uint32 {
	if s.hasSpare {
		s.hasSpare = false
		return s.spare
	}
	v := s.pcg.Uint64()
	s.spare, s.hasSpare = uint32(v), true
	return uint32(v >> 32)
}

// intN32 is IntN for 0 < n < 2³², by the 32-bit form of the same method.
func (s *Stream) intN32(n uint32) uint32 {
	m := uint64(s.uint32()) * uint64(n)
	if uint32(m) < n {
		thresh := -n % n
		for uint32(m) < thresh {
			m = uint64(s.uint32()) * uint64(n)
		}
	}
	return uint32(m >> 32)
}

// Uint64 returns 64 random bits.
func (s *Stream) Uint64() uint64 { return s.pcg.Uint64() }

// IntN returns a uniform integer in [0, n) for n > 0, by Lemire's
// multiply-and-reject method (Lemire 2019, ACM TOMACS 29(1):3), which is
// unbiased and needs no division in the common case.
func (s *Stream) IntN(n int) int {
	bound := uint64(n)
	hi, lo := bits.Mul64(s.pcg.Uint64(), bound)
	if lo < bound {
		thresh := -bound % bound
		for lo < thresh {
			hi, lo = bits.Mul64(s.pcg.Uint64(), bound)
		}
	}
	return int(hi)
}

// Float64 returns a uniform value in [0, 1).
func (s *Stream) Float64() float64 {
	return float64(s.pcg.Uint64()>>11) / (1 << 53)
}

// Normals fills dst with independent standard normal draws by the
// Box–Muller transform (Box & Muller 1958, Ann. Math. Stat. 29:610–611),
// two per pair of uniforms, so that every value comes from this stream and
// nothing else. The one normal generator of the tool: the spectral
// surrogates and the simulated autoregressive fields both draw with it.
func (s *Stream) Normals(dst []float64) {
	n := len(dst)
	for i := 0; i < n; i += 2 {
		u := 1 - s.Float64() // in (0, 1], so the logarithm is finite
		v := s.Float64()
		r := math.Sqrt(-2 * math.Log(u))
		sn, c := math.Sincos(2 * math.Pi * v)
		dst[i] = r * c
		if i+1 < n {
			dst[i+1] = r * sn
		}
	}
}
