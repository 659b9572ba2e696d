// Package progress draws a one-line progress bar on a terminal while a long
// run works. It draws only when the writer is a terminal and only once a
// stage has lasted a second, so pipes, files and quick runs see nothing.
package progress
