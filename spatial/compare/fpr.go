package compare

import (
	"cmp"
	"errors"
	"fmt"
	"sync"
	"sync/atomic"

	"github.com/areatest/areatest/internal/parallel"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
)

// FPRBlock is the number of surrogates in one block of the false-positive
// estimate: block k draws its surrogates from NewStream(seed, purpose, k),
// so, like BlockSize for the shuffles, it is part of the definition of a
// seeded result. It is smaller than shuffle.BlockSize because each
// surrogate carries a whole permutation test, and 500 surrogates must
// still spread over the cores.
const FPRBlock = 25

// DefaultFalsePositiveChecks and DefaultCheckShuffles are the numbers of
// surrogates and of shuffles per surrogate of FalsePositives when
// FPROptions leaves them 0.
const (
	DefaultFalsePositiveChecks = 500
	DefaultCheckShuffles       = 199
)

// FPROptions tune FalsePositives. Zero values take the defaults.
type FPROptions struct {
	// Surrogates is the number of surrogate outcomes S (default
	// DefaultFalsePositiveChecks, at most MaxFalsePositiveChecks).
	Surrogates int
	// Permutations is the number of Monte Carlo free shuffles B per
	// surrogate (default DefaultCheckShuffles, at most MaxCheckShuffles).
	// The check never enumerates arrangements, however few there are: its
	// cost is S·B shuffles whatever the layer, and the report's count is
	// the count used.
	Permutations int
	// Alpha is the level at which a shuffle test rejects (default 0.05).
	Alpha float64
	// Alternative of the shuffle tests; as in the comparison, the
	// Kruskal–Wallis H and the F ratio are always tested in their upper
	// tail.
	Alternative shuffle.Alternative
	// Seed and Purpose fix the streams; surrogate s's shuffle test uses
	// the seed with a purpose derived from (Purpose, s).
	Seed, Purpose uint64
	// Workers is the number of goroutines; 0 means all cores. The result
	// does not depend on it.
	Workers int
	// Progress, when set, is called after each block with the surrogates
	// done and the total; it must be safe for concurrent use.
	Progress func(done, total int)
}

// FalsePositiveRate is the measured share of true nulls that the free
// shuffle rejects: on surrogate outcomes that keep the outcome's spatial
// structure and have no link to the grouping, every rejection is a false
// positive. A rate well above Alpha means the free shuffle's p-values on
// these data are too small.
type FalsePositiveRate struct {
	// Scheme is the shuffle whose rate was measured ("free").
	Scheme string  `json:"scheme"`
	Alpha  float64 `json:"alpha"`
	// Rate is Rejected / Surrogates.
	Rate float64 `json:"rate"`
	// Interval is the 95% Clopper–Pearson interval for the rate.
	Interval     [2]float64 `json:"interval"`
	Surrogates   int        `json:"surrogates"`
	Permutations int        `json:"permutations"`
	Rejected     int        `json:"rejected"`
}

// FalsePositives draws opt.Surrogates surrogates of o and runs on each the
// ordinary free label shuffle of stat (shuffle.Run, groups.Prepare and
// groups.Data.Factory: the very test the comparison reports, by Monte Carlo
// with opt.Permutations shuffles), counting the rejections at opt.Alpha.
// labels[i] in 0..k−1 is the group of area i. Counts above the maxima are
// a *shuffle.CountError, too few shuffles to reject at Alpha a
// *CheckShufflesError. Only the count of rejections is kept, so memory does
// not grow with the number of surrogates.
func FalsePositives(o *surrogate.Outcome, stat groups.Statistic, labels []int32, k int, opt FPROptions) (FalsePositiveRate, error) {
	n := o.Len()
	if len(labels) != n {
		return FalsePositiveRate{}, fmt.Errorf("compare: %d labels for %d areas", len(labels), n)
	}
	if _, err := NewGroupStatistic(stat, labels, k); err != nil {
		return FalsePositiveRate{}, err
	}
	S, B, alpha := cmp.Or(opt.Surrogates, DefaultFalsePositiveChecks), cmp.Or(opt.Permutations, DefaultCheckShuffles), cmp.Or(opt.Alpha, 0.05)
	if S < 1 || B < 1 || !(alpha > 0 && alpha < 1) {
		return FalsePositiveRate{}, errors.New("compare: the false-positive estimate needs surrogates ≥ 1, permutations ≥ 1 and 0 < alpha < 1")
	}
	if err := (Options{FalsePositives: S, FalsePositiveShuffles: B}).checkCounts(); err != nil {
		return FalsePositiveRate{}, err
	}
	alt := opt.Alternative
	if !stat.Directional() {
		alt = shuffle.Greater
	}
	if err := checkShuffles(B, alpha, alt); err != nil {
		return FalsePositiveRate{}, err
	}
	blocks := (S + FPRBlock - 1) / FPRBlock
	var rejected, done atomic.Int64
	var failed firstError
	parallel.ForBlocks(blocks, opt.Workers, func() func(int) {
		draw := o.NewDraw()
		y := make([]float64, n)
		// One groups.Data per worker, re-sorted for each surrogate; the
		// labels were checked above, so Prepare cannot fail here.
		data, _ := groups.Prepare(y, labels, k)
		var rng shuffle.Stream
		return func(b int) {
			rng.Reset(opt.Seed, opt.Purpose, b)
			lo, hi := b*FPRBlock, min((b+1)*FPRBlock, S)
			for d := lo; d < hi; d++ {
				draw(&rng, y)
				p, err := freeShuffle(data, y, stat, alt, B, opt.Seed, innerPurpose(opt.Purpose, d))
				if err != nil {
					failed.set(b, err)
					break
				}
				if p <= alpha {
					rejected.Add(1) // a count: the same total in any order
				}
			}
			if opt.Progress != nil {
				opt.Progress(int(done.Add(int64(hi-lo))), S)
			}
		}
	})
	if failed.err != nil {
		return FalsePositiveRate{}, failed.err
	}
	r := FalsePositiveRate{Scheme: "free", Alpha: alpha, Surrogates: S, Permutations: B, Rejected: int(rejected.Load())}
	r.Rate = float64(r.Rejected) / float64(S)
	r.Interval[0], r.Interval[1] = shuffle.ClopperPearson(r.Rejected, S, 0.95)
	return r, nil
}

// firstError keeps the error of the lowest-numbered block that failed, so
// that the error reported does not depend on scheduling.
type firstError struct {
	mu    sync.Mutex
	block int
	err   error
}

func (f *firstError) set(block int, err error) {
	f.mu.Lock()
	defer f.mu.Unlock()
	if f.err == nil || block < f.block {
		f.block, f.err = block, err
	}
}

// freeShuffle is the comparison's free shuffle test of one outcome: the
// outcome sorted once into d (groups.Data.Reprepare), labels shuffled B
// times at random (never enumerated), the tie scale the range of the
// outcome. It returns the p-value.
func freeShuffle(d *groups.Data, y []float64, stat groups.Statistic, alt shuffle.Alternative, B int, seed, purpose uint64) (float64, error) {
	if err := d.Reprepare(y); err != nil {
		return 0, err
	}
	scale := 1.0
	if stat.InOutcomeUnits() {
		scale = d.Y[len(d.Y)-1] - d.Y[0]
	}
	// ExactLimit −1: Monte Carlo always, so that the check costs B shuffles
	// per surrogate and reports the count it used.
	res, err := shuffle.Run(shuffle.Plan{Scheme: "free", Labels: d.Labels, Permutations: B, ExactLimit: -1,
		Seed: seed, Purpose: purpose, Workers: 1, Alternative: alt, Scale: scale}, d.Factory(stat))
	if err != nil {
		return 0, err
	}
	return res.PValue, nil
}

// innerPurpose gives surrogate s's shuffle test its own streams, apart from
// the surrogates' (which use purpose itself) and from every other test.
func innerPurpose(purpose uint64, s int) uint64 {
	return purpose ^ (0x9e3779b97f4a7c15 * (uint64(s) + 1))
}
