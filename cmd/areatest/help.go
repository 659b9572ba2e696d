package main

import "embed"

// The help text of each command lives in help/NAME.txt, as a reader sees
// it: what the command asks, its usage line and examples.
//
//go:embed help/*.txt
var helpFiles embed.FS

// help returns the help text of a command ("areatest" for the tool). The
// files are embedded at build time, and a test asks for every one.
func help(name string) string {
	b, _ := helpFiles.ReadFile("help/" + name + ".txt")
	return string(b)
}
