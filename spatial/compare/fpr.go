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
	// Shard, when set, runs one part of the blocks of surrogates or
	// replays the parts' counts of rejections (see shuffle.Shard).
	Shard *shuffle.Shard
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

// CheckScheme is one label-shuffle scheme whose false-positive rate the
// check measures: labels exchanged freely (Strata nil) or only between
// areas of the same stratum (Strata[i] is area i's, in the order of the
// labels).
type CheckScheme struct {
	// Name is the scheme as the comparison's row names it.
	Name   string
	Strata []int32
}

// FalsePositives is FalsePositivesOf for the free shuffle alone.
func FalsePositives(o *surrogate.Outcome, stat groups.Statistic, labels []int32, k int, opt FPROptions) (FalsePositiveRate, error) {
	r, err := FalsePositivesOf(o, stat, labels, k, []CheckScheme{{Name: "free"}}, opt)
	if err != nil {
		return FalsePositiveRate{}, err
	}
	return r[0], nil
}

// FalsePositivesOf draws opt.Surrogates surrogates of o and runs on each,
// for every scheme, the ordinary label shuffle of stat (shuffle.Run,
// groups.Prepare and groups.Data.Factory: the very test the comparison
// reports, by Monte Carlo with opt.Permutations shuffles), counting the
// rejections at opt.Alpha; it returns one rate per scheme, in order. All
// schemes see the same surrogates, sorted once each
// (groups.Data.Reprepare); scheme j's shuffles of surrogate d draw from
// the seed with a purpose derived from (Purpose, d, j), so a scheme's rate
// does not depend on which other schemes are measured. labels[i] in
// 0..k−1 is the group of area i. Counts above the maxima are a
// *shuffle.CountError, too few shuffles to reject at Alpha a
// *CheckShufflesError. Only the counts of rejections are kept, so memory
// does not grow with the number of surrogates.
func FalsePositivesOf(o *surrogate.Outcome, stat groups.Statistic, labels []int32, k int, schemes []CheckScheme, opt FPROptions) ([]FalsePositiveRate, error) {
	S, B, alpha, alt, err := checkSettings(o.Len(), stat, labels, k, schemes, opt)
	if err != nil {
		return nil, err
	}
	gs, err := NewGroupStatistic(stat, labels, k)
	if err != nil {
		return nil, err
	}
	return falsePositives(o, func() (nullTest, error) { return newGroupNull(gs, alt), nil }, schemes, S, B, alpha, opt)
}

// falsePositives is FalsePositivesOf for any test (nullTest), with the
// counts and alpha already checked: S surrogates of o, each loaded into
// every worker's own test and tested under each scheme with B shuffles.
func falsePositives(o *surrogate.Outcome, newTest func() (nullTest, error), schemes []CheckScheme, S, B int, alpha float64, opt FPROptions) ([]FalsePositiveRate, error) {
	n := o.Len()
	blocks := (S + FPRBlock - 1) / FPRBlock
	shape := func(int) (int, int) { return len(schemes), 0 }
	if err := opt.Shard.Stage(opt.Purpose, "false-positive check", blocks, shape); err != nil {
		return nil, err
	}
	rejected := make([]atomic.Int64, len(schemes))
	var done atomic.Int64
	var failed firstError
	parallel.ForBlocks(blocks, opt.Workers, func() func(int) {
		draw := o.NewDraw()
		y := make([]float64, n)
		test, terr := newTest()
		var rng shuffle.Stream
		return func(b int) {
			if opt.Shard.Replaying() {
				for j, r := range opt.Shard.Recorded(opt.Purpose, b).Counts {
					rejected[j].Add(r) // counts: the same total in any order
				}
				return
			}
			if !opt.Shard.Draws(b) {
				return
			}
			if terr != nil {
				failed.set(b, terr)
				return
			}
			rng.Reset(opt.Seed, opt.Purpose, b)
			lo, hi := b*FPRBlock, min((b+1)*FPRBlock, S)
			mine := make([]int64, len(schemes)) // this block's rejections, for the ledger
			for d := lo; d < hi; d++ {
				draw(&rng, y)
				if _, err := test.load(y); err != nil {
					failed.set(b, err)
					return
				}
				for j, sc := range schemes {
					p, err := test.shuffled(sc.Strata, B, opt.Seed, schemePurpose(opt.Purpose, d, j))
					if err != nil {
						failed.set(b, err)
						return
					}
					if p <= alpha {
						rejected[j].Add(1) // a count: the same total in any order
						mine[j]++
					}
				}
			}
			opt.Shard.Record(opt.Purpose, b, shuffle.Tally{Counts: mine})
			if opt.Progress != nil {
				opt.Progress(int(done.Add(int64(hi-lo))), S)
			}
		}
	})
	if failed.err != nil {
		return nil, failed.err
	}
	out := make([]FalsePositiveRate, len(schemes))
	for j, sc := range schemes {
		r := FalsePositiveRate{Scheme: sc.Name, Alpha: alpha, Surrogates: S, Permutations: B, Rejected: int(rejected[j].Load())}
		r.Rate = float64(r.Rejected) / float64(S)
		r.Interval[0], r.Interval[1] = shuffle.ClopperPearson(r.Rejected, S, 0.95)
		out[j] = r
	}
	return out, nil
}

// checkSettings checks the inputs of FalsePositivesOf and returns the
// counts with their defaults, alpha and the alternative tested.
func checkSettings(n int, stat groups.Statistic, labels []int32, k int, schemes []CheckScheme, opt FPROptions) (S, B int, alpha float64, alt shuffle.Alternative, err error) {
	if len(labels) != n {
		return 0, 0, 0, 0, fmt.Errorf("compare: %d labels for %d areas", len(labels), n)
	}
	if len(schemes) == 0 {
		return 0, 0, 0, 0, errors.New("compare: no scheme to check")
	}
	for _, sc := range schemes {
		if sc.Strata != nil && len(sc.Strata) != n {
			return 0, 0, 0, 0, fmt.Errorf("compare: %d strata for %d areas in scheme %q", len(sc.Strata), n, sc.Name)
		}
	}
	if _, err := NewGroupStatistic(stat, labels, k); err != nil {
		return 0, 0, 0, 0, err
	}
	S, B, alpha = cmp.Or(opt.Surrogates, DefaultFalsePositiveChecks), cmp.Or(opt.Permutations, DefaultCheckShuffles), cmp.Or(opt.Alpha, 0.05)
	if S < 1 || B < 1 || !(alpha > 0 && alpha < 1) {
		return 0, 0, 0, 0, errors.New("compare: the false-positive estimate needs surrogates ≥ 1, permutations ≥ 1 and 0 < alpha < 1")
	}
	if err := (Options{FalsePositives: S, FalsePositiveShuffles: B}).checkCounts(); err != nil {
		return 0, 0, 0, 0, err
	}
	alt = opt.Alternative
	if !stat.Directional() {
		alt = shuffle.Greater
	}
	if err := checkShuffles(B, alpha, alt); err != nil {
		return 0, 0, 0, 0, err
	}
	return S, B, alpha, alt, nil
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

// shuffleSorted is the comparison's shuffle test of one outcome already
// sorted into d (groups.Data.Reprepare): labels shuffled B times at random
// (never enumerated), within strata when strata is set (given in area
// order; buf receives them in d's sorted order), the tie scale the range
// of the outcome. It returns the p-value.
func shuffleSorted(d *groups.Data, strata, buf []int32, stat groups.Statistic, alt shuffle.Alternative, B int, seed, purpose uint64) (float64, error) {
	scale := 1.0
	if stat.InOutcomeUnits() {
		scale = d.Y[len(d.Y)-1] - d.Y[0]
	}
	var sorted []int32
	if strata != nil {
		// The group statistics see areas in sorted order of the outcome.
		for pos, o := range d.Order {
			buf[pos] = strata[o]
		}
		sorted = buf
	}
	// ExactLimit −1: Monte Carlo always, so that the check costs B shuffles
	// per surrogate and reports the count it used.
	res, err := shuffle.Run(shuffle.Plan{Scheme: "check", Labels: d.Labels, Strata: sorted, Permutations: B, ExactLimit: -1,
		Seed: seed, Purpose: purpose, Workers: 1, Alternative: alt, Scale: scale}, d.Factory(stat))
	if err != nil {
		return 0, err
	}
	return res.PValue, nil
}

// schemePurpose gives scheme j's shuffle test of surrogate d its own
// streams; scheme 0's are innerPurpose(purpose, d), those of the free
// shuffle when it was the only scheme measured.
func schemePurpose(purpose uint64, d, j int) uint64 {
	return innerPurpose(purpose, d) ^ (0xbf58476d1ce4e5b9 * uint64(j))
}

// innerPurpose gives surrogate s's shuffle test its own streams, apart from
// the surrogates' (which use purpose itself) and from every other test.
func innerPurpose(purpose uint64, s int) uint64 {
	return purpose ^ (0x9e3779b97f4a7c15 * (uint64(s) + 1))
}
