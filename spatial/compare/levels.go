package compare

import (
	"sort"
	"strconv"
	"strings"
)

// positive lists level names that usually mean "has it"; with two such
// levels, that one becomes group A so that the contrast reads
// "with − without" by default.
var positive = map[string]bool{"1": true, "yes": true, "true": true, "y": true, "t": true}

// orderLevels puts the group levels in report order. With a contrast, its
// order (selectAreas has checked that both levels are present); with two
// levels one of which reads as "yes", that one first; otherwise natural
// order (numbers by value, then text).
func orderLevels(present map[string]int, contrast []string) []string {
	if len(contrast) == 2 {
		return []string{contrast[0], contrast[1]}
	}
	levels := sortedLevels(present)
	if len(levels) == 2 {
		p0, p1 := positive[strings.ToLower(levels[0])], positive[strings.ToLower(levels[1])]
		if p1 && !p0 {
			levels[0], levels[1] = levels[1], levels[0]
		}
	}
	return levels
}

// sortedLevels lists the levels of present in natural order, for messages.
func sortedLevels(present map[string]int) []string {
	levels := make([]string, 0, len(present))
	for l := range present {
		levels = append(levels, l)
	}
	sort.Slice(levels, func(a, b int) bool { return naturalLess(levels[a], levels[b]) })
	return levels
}

func naturalLess(a, b string) bool {
	x, errA := strconv.ParseFloat(a, 64)
	y, errB := strconv.ParseFloat(b, 64)
	switch {
	case errA == nil && errB == nil:
		return x < y
	case errA == nil:
		return true
	case errB == nil:
		return false
	}
	return a < b
}

// codes numbers the text labels of the tested areas in order of first
// appearance, returning the codes (in keep order) and how many there are.
func codes(keep []int, labels []string) ([]int32, int) {
	code := map[string]int32{}
	out := make([]int32, len(keep))
	for k, i := range keep {
		c, ok := code[labels[i]]
		if !ok {
			c = int32(len(code))
			code[labels[i]] = c
		}
		out[k] = c
	}
	return out, len(code)
}
