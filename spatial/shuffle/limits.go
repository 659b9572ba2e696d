package shuffle

import (
	"fmt"
	"sync"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/internal/parallel"
)

// MaxPermutations is the most Monte Carlo draws one test takes: label
// shuffles (Run, RunMany, and so Freedman–Lane), conditional permutation
// per area (RunLocal) and surrogate outcomes (RunSurrogates) refuse more
// with a *CountError. Five million draws resolve a p-value to 2·10⁻⁷, far
// below any level a practitioner reads, even after adjusting a few
// thousand areas' p-values (0.05/5,000 = 10⁻⁵ is then known to within
// about 1%); more only costs time. The counting streams, so memory does
// not grow with the draws; a null distribution kept on purpose (KeepNull,
// for a histogram) holds at most 40 MB.
const MaxPermutations = 5_000_000

// CountError is a number of draws (or of surrogates, checks…) above the
// most that a test takes, so that no count can make a run exhaust memory
// or time. What names the count in the library's terms; a command words
// it with its own flag.
type CountError struct {
	What       string
	Count, Max int
}

func (e *CountError) Error() string {
	return fmt.Sprintf("%s %s are more than the maximum of %s", numtext.Count(e.Count), e.What, numtext.Count(e.Max))
}

// CheckCount returns a *CountError when count is above max, else nil.
func CheckCount(what string, count, max int) error {
	if count > max {
		return &CountError{What: what, Count: count, Max: max}
	}
	return nil
}

// foldWindow is the most blocks of draws whose tallies are held at once:
// the blocks run in windows of this many, and a window's tallies are
// folded into the totals, in block order, before the next window starts.
// Memory thus does not grow with the number of draws, and folding in
// block order keeps the float sums, and so every result, the same for any
// number of workers. It does not change the draws, which depend on the
// block number alone.
const foldWindow = 256

// forBlocksFolded runs blocks 0..blocks−1 as parallel.ForBlocks does, in
// windows of foldWindow blocks: work(b, slot) runs block b and writes its
// tallies into slot (0 ≤ slot < foldWindow) of scratch the caller made
// once, and fold(b, slot) is called for every block of the window, in
// block order, once the whole window has run. The workers newWorker makes
// are made once and used again in later windows, so their scratch space
// is not made anew for each window.
func forBlocksFolded(blocks, workers int, newWorker func() func(block, slot int), fold func(block, slot int)) {
	var mu sync.Mutex
	var made, idle []func(int, int)
	for lo := 0; lo < blocks; lo += foldWindow {
		hi := min(lo+foldWindow, blocks)
		parallel.ForBlocks(hi-lo, workers, func() func(int) {
			mu.Lock()
			var w func(int, int)
			if n := len(idle); n > 0 {
				w, idle = idle[n-1], idle[:n-1]
			}
			mu.Unlock()
			if w == nil {
				w = newWorker()
				mu.Lock()
				made = append(made, w)
				mu.Unlock()
			}
			return func(k int) { w(lo+k, k) }
		})
		// Every worker of the window is done with its scratch.
		idle = append(idle[:0], made...)
		for b := lo; b < hi; b++ {
			fold(b, b-lo)
		}
	}
}
