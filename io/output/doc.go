// Package output writes a command's result files safely: the whole result
// is rendered first, then written to a temporary file beside the target and
// renamed into place, so a failed or interrupted run never leaves half a
// file; and a path that is one of the run's inputs (even through a link) is
// refused, so no output ever overwrites its data.
//
// The path "-" (or "") means standard output.
package output
