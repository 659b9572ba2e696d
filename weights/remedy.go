package weights

import "strings"

// The remedies for islands, in the words the summary's warnings use. A
// command that knows its flags can find these phrases in a warning and name
// the flag beside them; the package itself names no flag.
const (
	RemedySnap      = "a larger snap distance"
	RemedyKeep      = "keeping the islands with a zero spatial lag"
	RemedyNearest   = "a nearest-neighbour rule"
	RemedyBand      = "a wider distance band"
	RemedyBandwidth = "a wider bandwidth"
	RemedyAdaptive  = "an adaptive bandwidth"
	RemedyEdgeList  = "links for them in the edge list"
	RemedyOtherRule = "another neighbour rule"
)

// islandRemedy says, for a graph of the given kind (Graph.Kind), why its
// islands have no neighbour and what would give them some: the remedy
// depends on the rule that left them alone. Contiguity islands are areas
// whose boundary comes within the snap distance of no other (often a small
// gap between boundaries); band and kernel islands lie farther than the
// band or bandwidth from every other area; a nearest-neighbour rule gives
// every area neighbours, so its islands come from areas left out afterwards.
// When every area is an island, keeping them would leave nothing to
// compute, so that remedy is not offered.
func islandRemedy(kind string, all bool) string {
	var why string
	var remedies []string
	switch {
	case strings.Contains(kind, "contiguity"):
		why = "Under contiguity an area is an island when its boundary comes within the snap distance of no other"
		remedies = []string{RemedySnap + " where boundaries have small gaps", RemedyNearest + ", which gives every area neighbours"}
	case strings.Contains(kind, "nearest neighbour"):
		why = "A nearest-neighbour rule gives every area neighbours; these lost theirs when areas without data were left out"
	case strings.Contains(kind, "kernel"):
		why = "They lie farther than the bandwidth from every other area"
		remedies = []string{RemedyBandwidth, RemedyAdaptive + ", which gives every area neighbours"}
	case strings.Contains(kind, "distance band"), strings.Contains(kind, "inverse distance"):
		why = "They lie farther than the band from every other area"
		remedies = []string{RemedyBand, RemedyNearest + ", which gives every area neighbours"}
	case strings.HasPrefix(kind, "edge list"):
		why = "The edge list links them to no area"
		remedies = []string{RemedyEdgeList}
	default:
		why = "The neighbour rule links them to no area"
		remedies = []string{RemedyOtherRule}
	}
	if !all {
		remedies = append(remedies, RemedyKeep)
	}
	switch len(remedies) {
	case 0:
		return why + "."
	case 1:
		return why + ". A remedy: " + remedies[0] + "."
	}
	return why + ". Remedies: " + strings.Join(remedies[:len(remedies)-1], "; ") + "; or " + remedies[len(remedies)-1] + "."
}
