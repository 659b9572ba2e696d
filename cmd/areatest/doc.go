// Command areatest tests spatial association on area-level data: whether an
// outcome differs between groups of areas beyond chance, whether a value
// clusters in space and where, with p-values that stay honest when
// neighbouring areas resemble each other.
//
// This package only parses flags and wires the library together; it holds
// no statistics and no geometry. Where to start: run (main.go) picks the
// command; each command has one file (compare.go, demo.go, autocorr.go,
// screen.go, local.go, weightscmd.go) that registers its flags, checks them,
// calls one library entry point and hands the result to a writer. The flags
// every command shares, and the reading of the layer and the building of
// the graph, are sharedFlags (main.go) and weightFlags (weightsflags.go);
// the help texts are help/*.txt. Library errors and notices that concern a
// setting are worded here in terms of the flag that sets it.
//
// Tests: every command runs in process (run, with its own streams); the
// golden files under testdata/golden pin every report byte for byte, and
// readme_test.go runs each example shown in README.md.
package main
