package shuffle

import (
	"errors"
	"fmt"
)

// Shard cuts the random work of a run into parts for a batch scheduler,
// or replays the parts' work. Every random stage is already cut into
// blocks that draw from their own streams (seed, purpose, block); part K
// of N owns the blocks b with b mod N = K−1 of every stage, draws only
// those and records each one's tally (the very values the fold reads) in
// its Ledger. A replay draws nothing: it folds the tallies of a Ledger
// that holds every block, in block order, so that its result is the one
// the whole run gives, bit for bit.
//
// A nil *Shard is the whole run. Nested tests (the shuffles inside one
// surrogate of a check) are not sharded: the outer block owns them.
type Shard struct {
	part, parts int
	ledger      *Ledger
	replay      bool
}

// NewPart is part k of n (1 ≤ k ≤ n), recording its blocks in a new
// ledger.
func NewPart(k, n int) (*Shard, error) {
	if n < 1 || k < 1 || k > n {
		return nil, fmt.Errorf("shuffle: part %d of %d: need 1 ≤ part ≤ parts", k, n)
	}
	return &Shard{part: k, parts: n, ledger: NewLedger()}, nil
}

// NewReplay folds the tallies of l, which must hold every block of every
// stage the run meets (Ledger.Combine checks the parts).
func NewReplay(l *Ledger) *Shard { return &Shard{ledger: l, replay: true} }

// Ledger is the ledger the shard records into or replays from.
func (s *Shard) Ledger() *Ledger { return s.ledger }

// Replaying reports whether the tallies come from the ledger.
func (s *Shard) Replaying() bool { return s != nil && s.replay }

// Draws reports whether this run draws block b itself: every block of a
// whole run, its own blocks in a part, none in a replay.
func (s *Shard) Draws(b int) bool {
	switch {
	case s == nil:
		return true
	case s.replay:
		return false
	}
	return b%s.parts == s.part-1
}

// Stage announces a random stage of blocks blocks under purpose (name
// for messages). In a part it opens the stage in the ledger (also when
// the part owns none of its blocks, so that the merge knows the stage);
// in a replay it checks that the ledger holds every block with the shape
// that shape(b) gives (the lengths of Counts and Values), so that the
// fold never meets a missing tally. Nil s: nothing to do.
func (s *Shard) Stage(purpose uint64, name string, blocks int, shape func(b int) (counts, values int)) error {
	if s == nil {
		return nil
	}
	if !s.replay {
		return s.ledger.open(purpose, name, blocks)
	}
	return s.ledger.complete(purpose, name, blocks, shape)
}

// Record keeps block b's tally of stage purpose (a part's own block).
func (s *Shard) Record(purpose uint64, b int, t Tally) {
	if s != nil && !s.replay {
		s.ledger.record(purpose, b, t)
	}
}

// Recorded is the tally of block b of stage purpose in a replay; Stage
// has checked that it is there.
func (s *Shard) Recorded(purpose uint64, b int) Tally {
	return s.ledger.tally(purpose, b)
}

// errKeepNull refuses the one thing a shard cannot give back: every null
// value of a stage (only the blocks' tallies travel).
var errKeepNull = errors.New("shuffle: a sharded run keeps no null distribution")

// checkShard refuses a shard with KeepNull.
func checkShard(s *Shard, keepNull bool) error {
	if s != nil && keepNull {
		return errKeepNull
	}
	return nil
}

// tallyOf is the ledger form of a block's tallies, one per statistic:
// the counts at-least and at-most, the sum and the sum of squares.
func tallyOf(ts []tally) Tally {
	t := Tally{Counts: make([]int64, 0, 2*len(ts)), Values: make([]float64, 0, 2*len(ts))}
	for _, x := range ts {
		t.Counts = append(t.Counts, int64(x.atLeast), int64(x.atMost))
		t.Values = append(t.Values, x.sum, x.sumSq)
	}
	return t
}

// fromTally fills ts from the ledger form made by tallyOf.
func fromTally(ts []tally, t Tally) {
	for s := range ts {
		ts[s] = tally{atLeast: int(t.Counts[2*s]), atMost: int(t.Counts[2*s+1]), sum: t.Values[2*s], sumSq: t.Values[2*s+1]}
	}
}

// tallyShape is the shape of k statistics' tallies (tallyOf).
func tallyShape(k int) func(int) (int, int) {
	return func(int) (int, int) { return 2 * k, 2 * k }
}

// take decides block b of a stage whose block tallies ts are folded:
// in a replay it fills ts from the ledger, and it reports whether this run
// draws the block itself (then keep records ts once drawn). The caller
// clears ts first, so a block of another part folds as nothing. No
// closure: the check runs once per block of every test.
func (s *Shard) take(purpose uint64, b int, ts []tally) (draw bool) {
	if s.Replaying() {
		fromTally(ts, s.Recorded(purpose, b))
		return false
	}
	return s.Draws(b)
}

// keep records the tallies of a block this part drew.
func (s *Shard) keep(purpose uint64, b int, ts []tally) {
	if s != nil && !s.replay {
		s.Record(purpose, b, tallyOf(ts))
	}
}
