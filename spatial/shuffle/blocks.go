package shuffle

import (
	"runtime"
	"sync"
	"sync/atomic"
)

// ForBlocks processes blocks 0..blocks−1 on up to workers goroutines (0:
// all cores). newWorker is called once per goroutine, so a worker can own
// scratch space, and returns the function that processes one block. Which
// goroutine takes which block is left to scheduling, so results stay the
// same for any number of workers only if each block's work depends on its
// block number alone — the rule every scheme here follows by seeding block
// b's stream from (seed, purpose, b).
func ForBlocks(blocks, workers int, newWorker func() func(block int)) {
	if blocks <= 0 {
		return
	}
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	workers = min(workers, blocks)
	var next atomic.Int64
	var wg sync.WaitGroup
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			work := newWorker()
			for {
				b := int(next.Add(1) - 1)
				if b >= blocks {
					return
				}
				work(b)
			}
		}()
	}
	wg.Wait()
}
