package weights

import (
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

// One line per kind, areas counted once however many rings they have,
// singular for one area; ids keep layer order.
func TestGeometrySummary(t *testing.T) {
	sq := func(x float64) orb.Ring { return orb.Ring{{x, 0}, {x + 1, 0}, {x + 1, 1}, {x, 1}, {x, 0}} }
	line := func(x, y float64) orb.Ring { return orb.Ring{{x, y}, {x + 0.5, y}, {x + 0.25, y}, {x, y}} }
	bowtie := orb.Ring{{0, 5}, {0.5, 5.5}, {0.5, 5}, {0, 5.5}, {0, 5}}
	for _, c := range []struct {
		name  string
		geoms []orb.MultiPolygon
		want  []string
	}{
		{"none", []orb.MultiPolygon{{{sq(0)}}, {{sq(1)}}}, nil},
		{"one area, two sliver rings", []orb.MultiPolygon{{{sq(0)}, {line(0, 3)}, {line(0, 4)}}, {{sq(1)}}}, []string{
			`1 area has a ring without area (a mean width at most the snap distance), left out of the neighbour search: "a"`}},
		{"every kind", []orb.MultiPolygon{{{sq(0)}, {bowtie}}, {{line(1, 3)}}, {{sq(2)}, {line(2, 3)}}}, []string{
			`2 areas have rings without area (a mean width at most the snap distance), left out of the neighbour search: "b", "c"`,
			`1 area has no ring with an area and gets no neighbour: "b"`,
			`1 area has a ring that crosses or touches itself; its sides are still used to find neighbours: "a"`}},
	} {
		_, problems, err := BuildContiguity(c.geoms, ContiguityOptions{IDs: []string{"a", "b", "c"}[:len(c.geoms)]})
		if err != nil {
			t.Fatal(err)
		}
		if got := GeometrySummary(problems); !slices.Equal(got, c.want) {
			t.Errorf("%s: %q, want %q", c.name, got, c.want)
		}
	}
	many := make([]GeometryProblem, 7)
	for k := range many {
		many[k] = GeometryProblem{Kind: RingMeetsItself, ID: string(rune('a' + k))}
	}
	want := `7 areas have rings that cross or touch themselves; their sides are still used to find neighbours: "a", "b", "c", "d", "e" and 2 more`
	if got := GeometrySummary(many); len(got) != 1 || got[0] != want {
		t.Errorf("%q, want %q", got, want)
	}
}
