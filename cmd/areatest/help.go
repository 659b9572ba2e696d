package main

import (
	"embed"
	"strings"
)

// The help text of each command lives in help/NAME.txt, as a reader sees
// it: what the command asks, its usage line and examples.
//
//go:embed help/*.txt
var helpFiles embed.FS

// help returns the help text of a command ("areatest" for the tool).
func help(name string) string {
	b, err := helpFiles.ReadFile("help/" + name + ".txt")
	if err != nil {
		panic("no help text for " + name) // the files are embedded at build time
	}
	return strings.ReplaceAll(string(b), "\r\n", "\n")
}
