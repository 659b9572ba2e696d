package parallel

import (
	"runtime"
	"sync"
	"sync/atomic"
)

// ForBlocks processes blocks 0..blocks−1 on up to workers goroutines (0 or
// less: as many as GOMAXPROCS). newWorker is called once per goroutine, so
// a worker can own scratch space, and returns the function that processes
// one block. Which goroutine takes which block is left to scheduling. With
// one worker, or one block, everything runs on the calling goroutine.
func ForBlocks(blocks, workers int, newWorker func() func(block int)) {
	if blocks <= 0 {
		return
	}
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, blocks)
	if workers == 1 {
		work := newWorker()
		for b := range blocks {
			work(b)
		}
		return
	}
	var next atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Go(func() {
			work := newWorker()
			for {
				b := int(next.Add(1) - 1)
				if b >= blocks {
					return
				}
				work(b)
			}
		})
	}
	wg.Wait()
}

// ForRanges cuts [0, n) into consecutive ranges of size (the last may be
// shorter) and calls work on each, on up to workers goroutines (0 or
// less: as many as GOMAXPROCS).
func ForRanges(n, size, workers int, work func(lo, hi int)) {
	if n <= 0 {
		return
	}
	size = max(size, 1)
	ForBlocks((n+size-1)/size, workers, func() func(int) {
		return func(b int) { work(b*size, min((b+1)*size, n)) }
	})
}
