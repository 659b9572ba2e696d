package contig

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

func square(x, y, side float64) orb.Ring {
	return orb.Ring{{x, y}, {x + side, y}, {x + side, y + side}, {x, y + side}, {x, y}}
}

// Geometry that makes contiguity meaningless is an error naming the area
// (by id when ids are given, by 0-based index otherwise) and the ring.
func TestContigBadGeometryErrors(t *testing.T) {
	good := orb.MultiPolygon{{square(0, 0, 1)}}
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
		{"unclosed hole", orb.MultiPolygon{{square(1, 0, 3), {{2, 1}, {2, 2}, {3, 2}}}},
			[]string{"hole 1 of part 1 is not closed"}},
		{"no polygon", orb.MultiPolygon{}, []string{"has no polygon"}},
		{"polygon without rings", orb.MultiPolygon{{square(1, 0, 1)}, {}}, []string{"part 2 has no rings"}},
		{"ring without positions", orb.MultiPolygon{{orb.Ring{}}}, []string{"the outer ring of part 1 has no positions"}},
	}
	for _, c := range cases {
		geoms := []orb.MultiPolygon{good, c.bad}
		for _, ids := range [][]string{{"01001", "01003"}, nil} {
			name := `area "01003"`
			if ids == nil {
				name = "area index 1"
			}
			pairs, _, err := Find(geoms, Options{IDs: ids})
			if err == nil || pairs != nil {
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

// warningCase is a layer with geometry worth a warning: the warnings it
// gives (substrings, one warning each, in order) and its neighbour pairs.
type warningCase struct {
	name  string
	geoms []orb.MultiPolygon
	want  []string
	links [][2]int32
}

var warningCases = []warningCase{
	{
		name: "sliver part touching another area",
		geoms: []orb.MultiPolygon{
			{{square(0, 0, 1)}},
			{{square(1, 0, 1)}, {{{2, 0.5}, {3, 0.5}, {2, 0.5}}}},
			{{square(3, 0, 1)}},
		},
		want:  []string{`area "b": the outer ring of part 2 has no area`},
		links: [][2]int32{{0, 1}},
	},
	{
		name: "collinear ring of four positions, and a thin ring that is kept",
		geoms: []orb.MultiPolygon{
			{{square(0, 0, 1)}},
			{{{{1, 0}, {1, 0.5}, {1, 1}, {1, 0}}}, {{{1, 0}, {1.00001, 0}, {1.00001, 1}, {1, 1}, {1, 0}}}},
			{{square(1.00001, 0, 1)}},
		},
		want:  []string{`area "b": the outer ring of part 1 has no area`},
		links: [][2]int32{{0, 1}, {1, 2}},
	},
	{
		name: "area made only of slivers",
		geoms: []orb.MultiPolygon{
			{{square(0, 0, 1)}},
			{{{{1, 0}, {1, 1}, {1, 0}}}},
		},
		want: []string{`area "b": the outer ring of part 1 has no area`, `area "b" has no ring with an area; it gets no neighbour`},
	},
	{
		name: "bow-tie ring next to a square",
		geoms: []orb.MultiPolygon{
			{{{{0, 0}, {1, 1}, {1, 0}, {0, 1}, {0, 0}}}},
			{{square(1, 0, 1)}},
		},
		want:  []string{`area "a": the outer ring of part 1 crosses or touches itself near (0.5, 0.5)`},
		links: [][2]int32{{0, 1}},
	},
	{
		// Zero area, and sides meeting only by retracing: a sliver,
		// whose end on the side of "c" makes no contact.
		name: "zig-zag line traced there and back",
		geoms: []orb.MultiPolygon{
			{{square(0, 0, 1)}},
			{{square(1, 0, 1)}, {{{2, 0.5}, {3, 0.7}, {4, 0.5}, {3, 0.7}, {2, 0.5}}}},
			{{square(4, 0, 1)}},
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
			{{square(0, 0, 4), {{1, 1}, {2, 2}, {1, 3}, {1, 1}, {3, 1}, {2, 2}, {1, 1}}}},
			{{square(4, 0, 1)}},
		},
		want:  []string{`area "a": hole 1 of part 1 crosses or touches itself near (`},
		links: [][2]int32{{0, 1}},
	},
}

// Sliver rings and rings that meet themselves are warnings, one per area;
// the graph is still built. A sliver adds no contact of its own: below, the
// sliver part of "b" touches "c", yet b and c are not neighbours.
func TestContigGeometryWarnings(t *testing.T) {
	ids := []string{"a", "b", "c"}
	for _, c := range warningCases {
		for _, rule := range rules {
			rule.IDs = ids[:len(c.geoms)]
			pairs, warns := build(t, c.geoms, rule)
			if len(warns) != len(c.want) {
				t.Errorf("%s, %s: warnings %q, want %d", c.name, ruleName(rule), warns, len(c.want))
				continue
			}
			for k, w := range c.want {
				if !strings.Contains(warns[k], w) {
					t.Errorf("%s, %s: warning %q lacks %q", c.name, ruleName(rule), warns[k], w)
				}
			}
			if d := pairsDiff(pairs, c.links); d != "" {
				t.Errorf("%s, %s: %s", c.name, ruleName(rule), d)
			}
		}
	}
}

// Every problem is listed, each kind in area order, with its area's index
// (capping the list is the reports' business).
func TestContigProblemsListEveryArea(t *testing.T) {
	var geoms []orb.MultiPolygon
	for k := 0; k < 25; k++ {
		x := float64(3 * k)
		geoms = append(geoms, orb.MultiPolygon{{{{x, 0}, {x + 1, 0}, {x, 0}}}})
	}
	geoms = append(geoms, orb.MultiPolygon{{{{0, 5}, {1, 6}, {1, 5}, {0, 6}, {0, 5}}}})
	_, problems, err := Find(geoms, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(problems) != 51 {
		t.Fatalf("%d problems: %q", len(problems), problems)
	}
	for k, p := range problems {
		want := Problem{Kind: Sliver, Area: k}
		switch {
		case k == 50:
			want = Problem{Kind: MeetsItself, Area: 25}
		case k >= 25:
			want = Problem{Kind: NoArea, Area: k - 25}
		}
		if p.Kind != want.Kind || p.Area != want.Area || !strings.Contains(p.Text, fmt.Sprintf("area index %d", want.Area)) {
			t.Errorf("problem %d: %+v, want kind %d area %d", k, p, want.Kind, want.Area)
		}
	}
}

// Extreme but finite input gives pairs or an error, never a panic.
func TestContigExtremeInputs(t *testing.T) {
	pairs, warns, err := Find(nil, Options{})
	if err != nil || len(pairs) != 0 || len(warns) != 0 {
		t.Errorf("no areas: %v, %v, %q", pairs, err, warns)
	}
	cases := []struct {
		name  string
		geoms []orb.MultiPolygon
		opt   Options
	}{
		{"coordinates near the float64 limit", []orb.MultiPolygon{{{square(-1e308, -1e308, 1e308)}}, {{square(0, 0, 1e308)}}}, Options{}},
		{"huge and tiny areas together", []orb.MultiPolygon{{{square(0, 0, 1e-12)}}, {{square(1e15, 1e15, 1e15)}}}, Options{}},
		{"huge snap", []orb.MultiPolygon{{{square(0, 0, 1)}}, {{square(5, 0, 1)}}}, Options{Snap: 1e300}},
		{"wide snap", []orb.MultiPolygon{{{square(0, 0, 100)}}, {{square(104, 0, 100)}}}, Options{Snap: 4.5}},
		{"tiny snap", []orb.MultiPolygon{{{square(0, 0, 1)}}, {{square(1, 0, 1)}}}, Options{Snap: 1e-300}},
	}
	for _, c := range cases {
		for _, rook := range []bool{false, true} {
			c.opt.Rook = rook
			pairs, _, err := Find(c.geoms, c.opt)
			for _, p := range pairs {
				if err == nil && (p[0] < 0 || p[1] >= int32(len(c.geoms)) || p[0] >= p[1]) {
					t.Errorf("%s, rook %v: pair %v", c.name, rook, p)
				}
			}
		}
	}
	// A tolerance wider than the areas themselves makes every ring a
	// sliver; one wider than the gap but narrower than the areas joins them;
	// a tiny one still sees an exactly shared side.
	if pairs, w, err := Find(cases[2].geoms, cases[2].opt); err != nil || len(pairs) != 0 || len(w) != 4 {
		t.Errorf("huge snap: %v, %q, %v", pairs, w, err)
	}
	if pairs, _, err := Find(cases[3].geoms, Options{Rook: true, Snap: 4.5}); err != nil || len(pairs) != 1 {
		t.Errorf("wide snap: %v, %v", pairs, err)
	}
	if pairs, _, err := Find(cases[4].geoms, Options{Rook: true, Snap: 1e-300}); err != nil || len(pairs) != 1 {
		t.Errorf("tiny snap: %v, %v", pairs, err)
	}
}
