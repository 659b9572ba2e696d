package shuffle

import (
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strconv"
	"sync"
)

// Tally is one block's contribution to a stage's result, in the form a
// ledger keeps: integer counts (of null values at or beyond the
// observed one, of rejections) and floating values (sums of null values,
// p-values), whatever the stage folds, and the error the block met, if
// any. Values are written so that they read back bit for bit.
type Tally struct {
	Counts []int64     `json:"counts,omitempty"`
	Values ExactFloats `json:"values,omitempty"`
	Error  string      `json:"error,omitempty"`
}

// ExactFloats are floats that JSON carries bit for bit: finite values as
// the shortest decimal that reads back to the same float (strconv 'g',
// −1), NaN and the infinities as the strings "NaN", "+Inf", "-Inf".
type ExactFloats []float64

// MarshalJSON writes the values as a JSON array.
func (f ExactFloats) MarshalJSON() ([]byte, error) {
	b := []byte{'['}
	for i, v := range f {
		if i > 0 {
			b = append(b, ',')
		}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			b = strconv.AppendQuote(b, strconv.FormatFloat(v, 'g', -1, 64))
			continue
		}
		b = strconv.AppendFloat(b, v, 'g', -1, 64)
	}
	return append(b, ']'), nil
}

// UnmarshalJSON reads what MarshalJSON writes.
func (f *ExactFloats) UnmarshalJSON(b []byte) error {
	var raw []json.RawMessage
	if err := json.Unmarshal(b, &raw); err != nil {
		return err
	}
	out := make([]float64, len(raw))
	for i, r := range raw {
		s := string(r)
		if len(r) > 0 && r[0] == '"' {
			if err := json.Unmarshal(r, &s); err != nil {
				return err
			}
		}
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			return fmt.Errorf("value %d: %w", i, err)
		}
		out[i] = v
	}
	*f = out
	return nil
}

// Ledger holds the block tallies of a sharded run, by stage (the stage's
// purpose, which every stage of a run has of its own). Recording is safe
// for concurrent use.
type Ledger struct {
	mu     sync.Mutex
	stages map[uint64]*StageRecord
}

// StageRecord is one stage of a ledger: its purpose, its name, its
// number of blocks and the tallies of the blocks held, by block number.
type StageRecord struct {
	Purpose uint64 `json:"purpose"`
	Name    string `json:"name"`
	Blocks  int    `json:"blocks"`
	// Tallies are the blocks held, in block order.
	Tallies []BlockTally `json:"tallies"`
	byBlock map[int]int
}

// BlockTally is the tally of one block of a stage.
type BlockTally struct {
	Block int `json:"block"`
	Tally
}

// NewLedger is an empty ledger.
func NewLedger() *Ledger { return &Ledger{stages: map[uint64]*StageRecord{}} }

// Stages lists the stages in order of purpose, their tallies in block
// order: the form the partial-result document writes.
func (l *Ledger) Stages() []*StageRecord {
	l.mu.Lock()
	defer l.mu.Unlock()
	out := make([]*StageRecord, 0, len(l.stages))
	for _, st := range l.stages {
		slices.SortFunc(st.Tallies, func(a, b BlockTally) int { return a.Block - b.Block })
		st.byBlock = nil
		out = append(out, st)
	}
	slices.SortFunc(out, func(a, b *StageRecord) int {
		if a.Purpose < b.Purpose {
			return -1
		} else if a.Purpose > b.Purpose {
			return 1
		}
		return 0
	})
	return out
}

// MarshalJSON writes the stages (Stages).
func (l *Ledger) MarshalJSON() ([]byte, error) { return json.Marshal(l.Stages()) }

// UnmarshalJSON reads what MarshalJSON writes.
func (l *Ledger) UnmarshalJSON(b []byte) error {
	var stages []*StageRecord
	if err := json.Unmarshal(b, &stages); err != nil {
		return err
	}
	*l = Ledger{stages: map[uint64]*StageRecord{}}
	for _, st := range stages {
		if _, dup := l.stages[st.Purpose]; dup {
			return fmt.Errorf("stage %q (purpose %d) appears twice", st.Name, st.Purpose)
		}
		l.stages[st.Purpose] = st
	}
	return nil
}

// open starts a stage; a second stage of the same purpose is a mistake of
// the caller (two stages would share streams).
func (l *Ledger) open(purpose uint64, name string, blocks int) error {
	l.mu.Lock()
	defer l.mu.Unlock()
	if st, ok := l.stages[purpose]; ok {
		return &ShardError{Stage: name, Purpose: purpose, Problem: fmt.Sprintf("shares its stream with the stage %q", st.Name)}
	}
	l.stages[purpose] = &StageRecord{Purpose: purpose, Name: name, Blocks: blocks, Tallies: []BlockTally{}}
	return nil
}

func (l *Ledger) record(purpose uint64, b int, t Tally) {
	l.mu.Lock()
	defer l.mu.Unlock()
	st := l.stages[purpose]
	st.Tallies = append(st.Tallies, BlockTally{Block: b, Tally: t})
}

// index maps block numbers to positions in Tallies (built once).
func (st *StageRecord) index() map[int]int {
	if st.byBlock == nil {
		st.byBlock = make(map[int]int, len(st.Tallies))
		for i, t := range st.Tallies {
			st.byBlock[t.Block] = i
		}
	}
	return st.byBlock
}

// complete checks that stage purpose holds every one of blocks blocks
// with the shape given, before a replay folds them.
func (l *Ledger) complete(purpose uint64, name string, blocks int, shape func(int) (int, int)) error {
	l.mu.Lock()
	defer l.mu.Unlock()
	st, ok := l.stages[purpose]
	switch {
	case !ok:
		return &ShardError{Stage: name, Purpose: purpose, Problem: "is not in the parts"}
	case st.Blocks != blocks || st.Name != name:
		return &ShardError{Stage: name, Purpose: purpose, Problem: fmt.Sprintf("has %d blocks in the parts (as %q) and %d in this run", st.Blocks, st.Name, blocks)}
	}
	idx := st.index()
	for b := range blocks {
		i, ok := idx[b]
		if !ok {
			return &ShardError{Stage: name, Purpose: purpose, Problem: fmt.Sprintf("lacks block %d", b)}
		}
		c, v := shape(b)
		if t := st.Tallies[i]; t.Error == "" && (len(t.Counts) != c || len(t.Values) != v) {
			return &ShardError{Stage: name, Purpose: purpose, Problem: fmt.Sprintf("block %d holds %d counts and %d values, not %d and %d", b, len(t.Counts), len(t.Values), c, v)}
		}
	}
	return nil
}

func (l *Ledger) tally(purpose uint64, b int) Tally {
	l.mu.Lock()
	defer l.mu.Unlock()
	st := l.stages[purpose]
	return st.Tallies[st.index()[b]].Tally
}

// ShardError says that the parts do not hold what the replayed run
// needs (parts of another run, or of another release), or that two stages
// of a part share a purpose.
type ShardError struct {
	Stage   string
	Purpose uint64
	Problem string
}

func (e *ShardError) Error() string {
	return fmt.Sprintf("shuffle: the stage %q (stream %d) %s", e.Stage, e.Purpose, e.Problem)
}

// Combine joins the ledgers of parts 1..N (parts[k−1] is part k) into the
// ledger of the whole run: every part must list the same stages, and each
// block of a stage must be in the part that owns it (block b in part
// b mod N + 1) and in no other.
func Combine(parts []*Ledger) (*Ledger, error) {
	n := len(parts)
	out := NewLedger()
	for k, p := range parts {
		for _, st := range p.Stages() {
			all, ok := out.stages[st.Purpose]
			if !ok {
				if k > 0 {
					return nil, fmt.Errorf("shuffle: the stage %q is in part %d but not in part 1", st.Name, k+1)
				}
				all = &StageRecord{Purpose: st.Purpose, Name: st.Name, Blocks: st.Blocks}
				out.stages[st.Purpose] = all
			}
			if all.Name != st.Name || all.Blocks != st.Blocks {
				return nil, fmt.Errorf("shuffle: the stage of purpose %d is %q of %d blocks in part 1 and %q of %d blocks in part %d",
					st.Purpose, all.Name, all.Blocks, st.Name, st.Blocks, k+1)
			}
			for _, t := range st.Tallies {
				if t.Block < 0 || t.Block >= st.Blocks || t.Block%n != k {
					return nil, fmt.Errorf("shuffle: part %d of %d holds block %d of the stage %q, which is not its own", k+1, n, t.Block, st.Name)
				}
				all.Tallies = append(all.Tallies, t)
			}
		}
		if k > 0 && len(p.Stages()) != len(out.stages) {
			return nil, fmt.Errorf("shuffle: part %d of %d lists %d stages, part 1 %d", k+1, n, len(p.Stages()), len(out.stages))
		}
	}
	for _, st := range out.Stages() {
		for i, t := range st.Tallies {
			if t.Block != i {
				return nil, fmt.Errorf("shuffle: block %d of the stage %q is missing (part %d of %d owns it)", i, st.Name, i%n+1, n)
			}
		}
		if len(st.Tallies) != st.Blocks {
			b := len(st.Tallies)
			return nil, fmt.Errorf("shuffle: block %d of the stage %q is missing (part %d of %d owns it)", b, st.Name, b%n+1, n)
		}
	}
	return out, nil
}
