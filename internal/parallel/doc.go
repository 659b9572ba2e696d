// Package parallel is the project's one scheduler of work across
// goroutines: numbered blocks handed out to a pool of workers. The
// neighbour searches in weights and every random scheme in spatial/shuffle
// use it. It sits below every layer (Go keeps internal/ out of the API).
//
// Results stay the same for any number of workers only if each block's
// work depends on its block number alone: callers cut the work into fixed
// blocks, seed block b's random stream from (seed, purpose, b) and write
// each block's results into slots of its own.
package parallel
