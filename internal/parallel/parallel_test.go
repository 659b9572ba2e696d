package parallel

import (
	"sync/atomic"
	"testing"
)

// Every block runs exactly once whatever the number of workers, and each
// worker's scratch (made by newWorker) is used by one goroutine only.
func TestForBlocksEachBlockOnce(t *testing.T) {
	for _, workers := range []int{0, 1, 2, 3, 64} {
		for _, blocks := range []int{0, 1, 5, 100} {
			seen := make([]atomic.Int32, blocks)
			ForBlocks(blocks, workers, func() func(int) {
				var own int // scratch of this worker
				return func(b int) {
					own++
					seen[b].Add(1)
				}
			})
			for b := range seen {
				if n := seen[b].Load(); n != 1 {
					t.Fatalf("workers %d, blocks %d: block %d ran %d times", workers, blocks, b, n)
				}
			}
		}
	}
}

func TestForRangesCoverOnce(t *testing.T) {
	for _, c := range []struct{ n, size int }{{0, 4}, {1, 4}, {10, 3}, {12, 3}, {7, 0}} {
		hits := make([]atomic.Int32, c.n)
		ForRanges(c.n, c.size, 3, func(lo, hi int) {
			for i := lo; i < hi; i++ {
				hits[i].Add(1)
			}
		})
		for i := range hits {
			if hits[i].Load() != 1 {
				t.Fatalf("n %d size %d: index %d covered %d times", c.n, c.size, i, hits[i].Load())
			}
		}
	}
}
