// Package output writes a command's result files safely. A run lists its
// outputs in a Plan when it starts: each target is checked then (not a
// directory, its directory exists and is writable, not one of the run's
// inputs even through a link, not the same file as another output of the
// run), before anything is computed. When the run ends, Commit renders
// every output into memory and only then places them all: a regular file
// (or a new one) through a temporary file beside it and a rename, anything
// else (a device such as /dev/null, a FIFO) by writing straight to it, and a
// symbolic link by writing to the file it points to. If rendering or placing
// fails, the files the run created are removed again, so a failed run leaves
// no new file and never half a file.
//
// The path "-" (or "") means standard output.
//
// Start with NewPlan and Plan.Add (plan.go), then Plan.Commit (commit.go).
package output
