package main

import (
	"strings"

	"github.com/areatest/areatest/weights"
)

// remedyFlags names, beside each remedy the weights package words (see
// weights.RemedySnap …), the flag of this tool that applies it.
var remedyFlags = []struct{ phrase, flags string }{
	{weights.RemedySnap, "--snap"},
	{weights.RemedyKeep, "--islands keep"},
	{weights.RemedyNearest, "--knn K"},
	{weights.RemedyBand, "--band"},
	{weights.RemedyBandwidth, "--bandwidth"},
	{weights.RemedyAdaptive, "--adaptive K"},
	{weights.RemedyEdgeList, "--weights FILE"},
}

// withFlags puts the flag beside every remedy the message words, once:
// "a larger snap distance" becomes "a larger snap distance (--snap)".
func withFlags(msg string) string {
	for _, r := range remedyFlags {
		if strings.Contains(msg, r.phrase) && !strings.Contains(msg, r.phrase+" (--") {
			msg = strings.Replace(msg, r.phrase, r.phrase+" ("+r.flags+")", 1)
		}
	}
	return msg
}

// nameFlags rewrites the warnings in place with withFlags, so that every
// view of the result (text, JSON, HTML, stderr) carries the flags.
func nameFlags(warnings []string) {
	for i, w := range warnings {
		warnings[i] = withFlags(w)
	}
}
