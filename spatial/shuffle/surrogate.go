package shuffle

import (
	"errors"
	"fmt"
	"math"
	"sync/atomic"
)

// SurrogatePlan describes a test whose null distribution comes from
// surrogate outcomes rather than from rearranged labels: each draw writes a
// whole new outcome (for instance one that keeps the observed outcome's
// spatial structure but has no link to the grouping), and the statistic is
// evaluated on it with the labels held fixed. The conventions are those of
// Plan: p = (1 + b)/(1 + B), a Clopper–Pearson interval, the same
// alternatives and tie tolerance, and blocks of BlockSize draws, block k
// drawing from NewStream(Seed, Purpose, k), so the result does not depend on
// Workers.
type SurrogatePlan struct {
	// Scheme names the null model in reports.
	Scheme string
	// Draws is the number of surrogate outcomes B, at most MaxPermutations.
	Draws int
	// Seed fixes the random streams; Purpose separates them from the
	// streams of other tests that share the seed.
	Seed, Purpose uint64
	// Workers is the number of goroutines; 0 means all cores.
	Workers int
	// Alternative is the direction of the test.
	Alternative Alternative
	// Scale is the size of a typical value of the statistic, as in
	// Plan.Scale: null values within 1e-9·max(|observed|, Scale) of the
	// observed one count as ties.
	Scale float64
	// KeepNull asks for every null value, in draw order, in Result.Null.
	KeepNull bool
	// Progress, when set, is called after each block with the number of
	// draws done and the total; it must be safe for concurrent use.
	Progress func(done, total int)
	// Shard, when set, runs one part of the blocks or replays all parts'
	// (see Shard); nil runs them all.
	Shard *Shard
}

// OutcomeDraw writes one surrogate outcome into out, drawing its randomness
// from rng only, so that a block's draws depend on (seed, purpose, block)
// alone. It may keep scratch space between calls.
type OutcomeDraw func(rng *Stream, out []float64)

// OutcomeEvaluator computes the statistic for an outcome, with the grouping
// (or whatever else the statistic compares the outcome with) held fixed. It
// may keep scratch space between calls but must not keep or modify y.
type OutcomeEvaluator func(y []float64) float64

// RunSurrogates tests the observed value of a statistic against its values
// on p.Draws surrogate outcomes of length n. newDraw and newEval are called
// once per worker goroutine, so draws and evaluators can own scratch space
// without locks. The observed value is passed in rather than computed, so
// that it is the very number the other schemes of a comparison report.
func RunSurrogates(p SurrogatePlan, observed float64, newDraw func() OutcomeDraw, newEval func() OutcomeEvaluator, n int) (Result, error) {
	if n < 2 {
		return Result{}, errors.New("shuffle: need at least two units")
	}
	if p.Draws < 1 {
		return Result{}, errors.New("shuffle: the number of surrogate draws must be at least 1")
	}
	if err := CheckCount("surrogate draws", p.Draws, MaxPermutations); err != nil {
		return Result{}, err
	}
	if newDraw == nil || newEval == nil {
		return Result{}, errors.New("shuffle: a surrogate test needs a draw and an evaluator")
	}
	if math.IsNaN(observed) || math.IsInf(observed, 0) {
		return Result{}, fmt.Errorf("shuffle: the observed statistic is %v", observed)
	}
	scale := p.Scale
	if !(scale > 0) {
		scale = 1
	}
	tol := 1e-9 * math.Max(math.Abs(observed), scale)
	if err := checkShard(p.Shard, p.KeepNull); err != nil {
		return Result{}, err
	}
	B := p.Draws
	blocks := (B + BlockSize - 1) / BlockSize
	if err := p.Shard.Stage(p.Purpose, p.Scheme, blocks, tallyShape(1)); err != nil {
		return Result{}, err
	}
	window := make([]tally, min(blocks, foldWindow))
	var t tally
	var null []float64
	if p.KeepNull {
		null = make([]float64, B)
	}
	var done atomic.Int64
	forBlocksFolded(blocks, p.Workers, func() func(int, int) {
		draw, eval := newDraw(), newEval()
		y := make([]float64, n)
		var rng Stream
		return func(b, slot int) {
			lo, hi := b*BlockSize, min((b+1)*BlockSize, B)
			bt := window[slot : slot+1]
			bt[0] = tally{}
			if !p.Shard.take(p.Purpose, b, bt) {
				return
			}
			rng.Reset(p.Seed, p.Purpose, b)
			for d := lo; d < hi; d++ {
				draw(&rng, y)
				v := eval(y)
				bt[0].add(v, observed, tol)
				if null != nil {
					null[d] = v
				}
			}
			p.Shard.keep(p.Purpose, b, bt)
			if p.Progress != nil {
				p.Progress(int(done.Add(int64(hi-lo))), B)
			}
		}
	}, func(_, slot int) { t.merge(window[slot]) }) // block order, so float sums do not depend on scheduling
	res := Result{Scheme: p.Scheme, Alternative: p.Alternative.String(), Observed: observed,
		Permutations: B, Null: null}
	finishSampled(&res, t, B, p.Alternative)
	return res, nil
}

// finishSampled fills in the moments, the Monte Carlo p-value and its
// interval from the tally of B sampled null values, by the same rules as
// the label shuffles of Run.
func finishSampled(r *Result, t tally, B int, alt Alternative) {
	finishMoments(r, t, B)
	pg := float64(1+t.atLeast) / float64(1+B)
	pl := float64(1+t.atMost) / float64(1+B)
	r.PValue = combine(alt, pg, pl)
	loG, hiG := ClopperPearson(t.atLeast, B, 0.95)
	loL, hiL := ClopperPearson(t.atMost, B, 0.95)
	switch alt {
	case Greater:
		r.Interval = [2]float64{loG, hiG}
	case Less:
		r.Interval = [2]float64{loL, hiL}
	default:
		if pg <= pl {
			r.Interval = [2]float64{math.Min(1, 2*loG), math.Min(1, 2*hiG)}
		} else {
			r.Interval = [2]float64{math.Min(1, 2*loL), math.Min(1, 2*hiL)}
		}
	}
}
