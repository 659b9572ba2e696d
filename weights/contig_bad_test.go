package weights

import (
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

func contigSquare(x, y, side float64) orb.Ring {
	return orb.Ring{{x, y}, {x + side, y}, {x + side, y + side}, {x, y + side}, {x, y}}
}

// Geometry that makes contiguity meaningless is an error naming the area
// (by id when ids are given, by 0-based index otherwise) and the ring.
func TestContigBadGeometryErrors(t *testing.T) {
	good := orb.MultiPolygon{{contigSquare(0, 0, 1)}}
	cases := []struct {
		name string
		bad  orb.MultiPolygon
		want []string
	}{
		{"NaN coordinate", orb.MultiPolygon{{{{1, 0}, {2, 0}, {math.NaN(), 1}, {1, 0}}}},
			[]string{"position 3 of the outer ring of part 1", "not a finite number", "NaN"}},
		{"infinite coordinate", orb.MultiPolygon{{{{1, 0}, {2, math.Inf(1)}, {2, 1}, {1, 0}}}},
			[]string{"position 2 of the outer ring of part 1", "+Inf"}},
		{"unclosed ring", orb.MultiPolygon{{{{1, 0}, {2, 0}, {2, 1}, {1, 1}}}},
			[]string{"the outer ring of part 1 is not closed", "starts at (1, 0) and ends at (1, 1)"}},
		{"unclosed hole", orb.MultiPolygon{{contigSquare(1, 0, 3), {{2, 1}, {2, 2}, {3, 2}}}},
			[]string{"hole 1 of part 1 is not closed"}},
		{"no polygon", orb.MultiPolygon{}, []string{"has no polygon"}},
		{"polygon without rings", orb.MultiPolygon{{contigSquare(1, 0, 1)}, {}}, []string{"part 2 has no rings"}},
		{"ring without positions", orb.MultiPolygon{{orb.Ring{}}}, []string{"the outer ring of part 1 has no positions"}},
	}
	for _, c := range cases {
		geoms := []orb.MultiPolygon{good, c.bad}
		for _, ids := range [][]string{{"01001", "01003"}, nil} {
			name := `area "01003"`
			if ids == nil {
				name = "area index 1"
			}
			g, _, err := BuildContiguity(geoms, ContiguityOptions{IDs: ids})
			if err == nil || g != nil {
				t.Errorf("%s: no error", c.name)
				continue
			}
			for _, w := range append(c.want, name) {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("%s: error %q lacks %q", c.name, err, w)
				}
			}
		}
	}
}

func TestContigBadOptions(t *testing.T) {
	geoms := []orb.MultiPolygon{{{contigSquare(0, 0, 1)}}, {{contigSquare(1, 0, 1)}}}
	for _, c := range []struct {
		name string
		opt  ContiguityOptions
		want string
	}{
		{"negative snap", ContiguityOptions{Snap: -1}, "snap distance"},
		{"NaN snap", ContiguityOptions{Snap: math.NaN()}, "snap distance"},
		{"infinite snap", ContiguityOptions{Snap: math.Inf(1)}, "snap distance"},
		{"ids of another length", ContiguityOptions{IDs: []string{"a"}}, "1 ids for 2 areas"},
		{"unknown rule", ContiguityOptions{Rule: 7}, "unknown contiguity rule"},
	} {
		if _, _, err := BuildContiguity(geoms, c.opt); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one mentioning %q", c.name, err, c.want)
		}
	}
}

// Sliver rings and rings that meet themselves are warnings, one per area;
// the graph is still built. A sliver adds no contact of its own: below, the
// sliver part of "b" touches "c", yet b and c are not neighbours.
func TestContigGeometryWarnings(t *testing.T) {
	cases := []struct {
		name  string
		geoms []orb.MultiPolygon
		want  []string // substrings, one warning each, in order
		links [][2]int32
	}{
		{
			name: "sliver part touching another area",
			geoms: []orb.MultiPolygon{
				{{contigSquare(0, 0, 1)}},
				{{contigSquare(1, 0, 1)}, {{{2, 0.5}, {3, 0.5}, {2, 0.5}}}},
				{{contigSquare(3, 0, 1)}},
			},
			want:  []string{`area "b": the outer ring of part 2 has no area`},
			links: [][2]int32{{0, 1}},
		},
		{
			name: "collinear ring of four positions, and a thin ring that is kept",
			geoms: []orb.MultiPolygon{
				{{contigSquare(0, 0, 1)}},
				{{{{1, 0}, {1, 0.5}, {1, 1}, {1, 0}}}, {{{1, 0}, {1.00001, 0}, {1.00001, 1}, {1, 1}, {1, 0}}}},
				{{contigSquare(1.00001, 0, 1)}},
			},
			want:  []string{`area "b": the outer ring of part 1 has no area`},
			links: [][2]int32{{0, 1}, {1, 2}},
		},
		{
			name: "area made only of slivers",
			geoms: []orb.MultiPolygon{
				{{contigSquare(0, 0, 1)}},
				{{{{1, 0}, {1, 1}, {1, 0}}}},
			},
			want: []string{`area "b": the outer ring of part 1 has no area`, `area "b" has no ring with an area; it gets no neighbour`},
		},
		{
			name: "bow-tie ring next to a square",
			geoms: []orb.MultiPolygon{
				{{{{0, 0}, {1, 1}, {1, 0}, {0, 1}, {0, 0}}}},
				{{contigSquare(1, 0, 1)}},
			},
			want:  []string{`area "a": the outer ring of part 1 crosses or touches itself near (0.5, 0.5)`},
			links: [][2]int32{{0, 1}},
		},
		{
			// Zero area, and sides meeting only by retracing: a sliver,
			// whose end on the side of "c" makes no contact.
			name: "zig-zag line traced there and back",
			geoms: []orb.MultiPolygon{
				{{contigSquare(0, 0, 1)}},
				{{contigSquare(1, 0, 1)}, {{{2, 0.5}, {3, 0.7}, {4, 0.5}, {3, 0.7}, {2, 0.5}}}},
				{{contigSquare(4, 0, 1)}},
			},
			want:  []string{`area "b": the outer ring of part 2 has no area`},
			links: [][2]int32{{0, 1}},
		},
		{
			// Both signed areas cancel to zero; both rings cross
			// themselves, so both are land and they share a side.
			name: "two bow-ties side by side",
			geoms: []orb.MultiPolygon{
				{{{{0, 0}, {1, 1}, {1, 0}, {0, 1}, {0, 0}}}},
				{{{{1, 0}, {2, 1}, {2, 0}, {1, 1}, {1, 0}}}},
			},
			want: []string{`area "a": the outer ring of part 1 crosses or touches itself near (0.5, 0.5)`,
				`area "b": the outer ring of part 1 crosses or touches itself near (1.5, 0.5)`},
			links: [][2]int32{{0, 1}},
		},
		{
			name: "ring passing twice through one vertex, in a hole",
			geoms: []orb.MultiPolygon{
				{{contigSquare(0, 0, 4), {{1, 1}, {2, 2}, {1, 3}, {1, 1}, {3, 1}, {2, 2}, {1, 1}}}},
				{{contigSquare(4, 0, 1)}},
			},
			want:  []string{`area "a": hole 1 of part 1 crosses or touches itself near (`},
			links: [][2]int32{{0, 1}},
		},
	}
	ids := []string{"a", "b", "c"}
	for _, c := range cases {
		for _, rule := range []Contiguity{Queen, Rook} {
			g, warns, err := BuildContiguity(c.geoms, ContiguityOptions{Rule: rule, IDs: ids[:len(c.geoms)]})
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			if len(warns) != len(c.want) {
				t.Errorf("%s, %v: warnings %q, want %d", c.name, rule, warns, len(c.want))
				continue
			}
			for k, w := range c.want {
				if !strings.Contains(warns[k], w) {
					t.Errorf("%s, %v: warning %q lacks %q", c.name, rule, warns[k], w)
				}
			}
			want, _ := FromLinks(len(c.geoms), c.links, g.Kind)
			if d := contigGraphDiff(g, want); d != "" {
				t.Errorf("%s, %v: %s", c.name, rule, d)
			}
		}
	}
}

// Each kind of warning names 20 areas and counts the rest.
func TestContigWarningsAreCapped(t *testing.T) {
	var geoms []orb.MultiPolygon
	for k := 0; k < 25; k++ {
		x := float64(3 * k)
		geoms = append(geoms, orb.MultiPolygon{{{{x, 0}, {x + 1, 0}, {x, 0}}}})
	}
	_, warns, err := BuildContiguity(geoms, ContiguityOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(warns) != 42 || warns[20] != "weights: 5 more areas have sliver rings" || warns[41] != "weights: 5 more areas have no ring with an area" {
		t.Errorf("%d warnings: %q", len(warns), warns)
	}
}

// Extreme but finite input gives a graph or an error, never a panic.
func TestContigExtremeInputs(t *testing.T) {
	g, warns, err := BuildContiguity(nil, ContiguityOptions{})
	if err != nil || g.Len() != 0 || len(warns) != 0 {
		t.Errorf("no areas: %v, %v, %q", g, err, warns)
	}
	cases := []struct {
		name  string
		geoms []orb.MultiPolygon
		opt   ContiguityOptions
	}{
		{"coordinates near the float64 limit", []orb.MultiPolygon{{{contigSquare(-1e308, -1e308, 1e308)}}, {{contigSquare(0, 0, 1e308)}}}, ContiguityOptions{}},
		{"huge and tiny areas together", []orb.MultiPolygon{{{contigSquare(0, 0, 1e-12)}}, {{contigSquare(1e15, 1e15, 1e15)}}}, ContiguityOptions{}},
		{"huge snap", []orb.MultiPolygon{{{contigSquare(0, 0, 1)}}, {{contigSquare(5, 0, 1)}}}, ContiguityOptions{Snap: 1e300}},
		{"wide snap", []orb.MultiPolygon{{{contigSquare(0, 0, 100)}}, {{contigSquare(104, 0, 100)}}}, ContiguityOptions{Snap: 4.5}},
		{"tiny snap", []orb.MultiPolygon{{{contigSquare(0, 0, 1)}}, {{contigSquare(1, 0, 1)}}}, ContiguityOptions{Snap: 1e-300}},
	}
	for _, c := range cases {
		for _, rule := range []Contiguity{Queen, Rook} {
			c.opt.Rule = rule
			g, _, err := BuildContiguity(c.geoms, c.opt)
			if err == nil && g.Len() != len(c.geoms) {
				t.Errorf("%s, %v: %d areas", c.name, rule, g.Len())
			}
		}
	}
	// A tolerance wider than the areas themselves makes every ring a
	// sliver; one wider than the gap but narrower than the areas joins them;
	// a tiny one still sees an exactly shared side.
	if g, w, _ := BuildContiguity(cases[2].geoms, cases[2].opt); g == nil || g.Links() != 0 || len(w) != 4 {
		t.Errorf("huge snap: %v, %q", g, w)
	}
	if g, _, _ := BuildContiguity(cases[3].geoms, ContiguityOptions{Rule: Rook, Snap: 4.5}); g == nil || g.Links() != 2 {
		t.Errorf("wide snap: %v", g)
	}
	if g, _, _ := BuildContiguity(cases[4].geoms, ContiguityOptions{Rule: Rook, Snap: 1e-300}); g == nil || g.Links() != 2 {
		t.Errorf("tiny snap: %v", g)
	}
}
