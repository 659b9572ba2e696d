package weights

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/areatest/areatest/weights/internal/contig"
)

// The kinds of GeometryProblem.
const (
	// SliverRing is a ring of about zero area (a mean width at most the
	// snap distance), left out of the neighbour search.
	SliverRing = "sliver-ring"
	// NoRingWithArea is an area all of whose rings are slivers: it gets no
	// neighbour.
	NoRingWithArea = "no-ring-with-area"
	// RingMeetsItself is a ring that crosses or touches itself; its sides
	// are still used.
	RingMeetsItself = "ring-meets-itself"
)

// GeometryProblem is something wrong with an area's rings that contiguity
// works around: never fatal, always worth telling the user.
type GeometryProblem struct {
	// Kind is SliverRing, NoRingWithArea or RingMeetsItself.
	Kind string `json:"kind"`
	// ID names the area: its id, or its 0-based index when no ids were
	// given.
	ID string `json:"id"`
	// Text says what is wrong in a sentence, the area and ring named.
	Text string `json:"text"`
}

// String returns the problem's text.
func (p GeometryProblem) String() string { return p.Text }

// geometryProblems gives the engine's problems their kinds' names and the
// areas' ids.
func geometryProblems(ps []contig.Problem, ids []string) []GeometryProblem {
	kinds := map[contig.Kind]string{contig.Sliver: SliverRing, contig.NoArea: NoRingWithArea, contig.MeetsItself: RingMeetsItself}
	out := make([]GeometryProblem, len(ps))
	for k, p := range ps {
		id := strconv.Itoa(p.Area)
		if ids != nil {
			id = ids[p.Area]
		}
		out[k] = GeometryProblem{Kind: kinds[p.Kind], ID: id, Text: p.Text}
	}
	return out
}

// ProblemsListed is how many areas GeometrySummary names for each kind of
// problem before it only counts the rest.
const ProblemsListed = 5

// GeometrySummary sums up problems in one line per kind, in the order
// SliverRing, NoRingWithArea, RingMeetsItself: how many areas have it and
// the first ProblemsListed of them, in layer order. A layer with many
// slivers (a national file of counties has dozens) then gives three lines,
// not one per area; the list itself is for those who ask for it.
func GeometrySummary(problems []GeometryProblem) []string {
	var out []string
	const sliver = " without area (a mean width at most the snap distance), left out of the neighbour search"
	for _, kind := range []struct{ name, one, many string }{
		{SliverRing, "area has a ring" + sliver, "areas have rings" + sliver},
		{NoRingWithArea, "area has no ring with an area and gets no neighbour", "areas have no ring with an area and get no neighbour"},
		{RingMeetsItself, "area has a ring that crosses or touches itself; its sides are still used to find neighbours",
			"areas have rings that cross or touch themselves; their sides are still used to find neighbours"},
	} {
		var areas []string
		for _, p := range problems {
			if p.Kind == kind.name && (len(areas) == 0 || areas[len(areas)-1] != p.ID) {
				areas = append(areas, p.ID)
			}
		}
		what := kind.many
		switch len(areas) {
		case 0:
			continue
		case 1:
			what = kind.one
		}
		out = append(out, fmt.Sprintf("%d %s: %s", len(areas), what, quotedList(areas, ProblemsListed)))
	}
	return out
}

// quotedList quotes the first n ids and counts the rest.
func quotedList(ids []string, n int) string {
	q := make([]string, 0, min(n, len(ids)))
	for _, id := range ids[:min(n, len(ids))] {
		q = append(q, strconv.Quote(id))
	}
	s := strings.Join(q, ", ")
	if len(ids) > n {
		s += fmt.Sprintf(" and %d more", len(ids)-n)
	}
	return s
}
