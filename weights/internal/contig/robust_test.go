package contig

import (
	"cmp"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/samples/region"
)

// pairsDiff describes the first difference between two sorted pair lists,
// or returns "" when they are equal.
func pairsDiff(got, want [][2]int32) string {
	for k := range min(len(got), len(want)) {
		if got[k] != want[k] {
			return fmt.Sprintf("pair %d is %v, want %v", k, got[k], want[k])
		}
	}
	if len(got) != len(want) {
		return fmt.Sprintf("%d pairs, want %d", len(got), len(want))
	}
	return ""
}

// build runs Find, failing the test on an error, and returns the pairs
// and the problems' texts.
func build(t *testing.T, geoms []orb.MultiPolygon, opt Options) ([][2]int32, []string) {
	t.Helper()
	pairs, problems, err := Find(geoms, opt)
	if err != nil {
		t.Fatal(err)
	}
	texts := make([]string, len(problems))
	for k, p := range problems {
		texts[k] = p.Text
	}
	return pairs, texts
}

// rules are the two contiguity rules, for loops over both.
var rules = []Options{{Rook: false}, {Rook: true}}

// ruleName names a rule in test messages.
func ruleName(o Options) string {
	if o.Rook {
		return "rook"
	}
	return "queen"
}

// jitter returns a copy of geoms with every vertex of every ring moved by up
// to amp in each coordinate, each polygon on its own — as if each area had
// been digitised separately — so that vertices shared in the original no
// longer coincide. Rings stay closed.
func jitter(geoms []orb.MultiPolygon, amp float64, seed uint64) []orb.MultiPolygon {
	rng := rand.New(rand.NewPCG(seed, 7))
	out := make([]orb.MultiPolygon, len(geoms))
	for a, mp := range geoms {
		for _, poly := range mp {
			var np orb.Polygon
			for _, ring := range poly {
				nr := make(orb.Ring, len(ring))
				for v := range ring[:len(ring)-1] {
					nr[v] = orb.Point{ring[v][0] + amp*(2*rng.Float64()-1), ring[v][1] + amp*(2*rng.Float64()-1)}
				}
				nr[len(ring)-1] = nr[0]
				np = append(np, nr)
			}
			out[a] = append(out[a], np)
		}
	}
	return out
}

// lattice returns an m×m grid of unit squares, row by row. With extra, each
// interior shared edge gets extra vertices on one side only: two on the
// right side of every square that has a right-hand neighbour, one on the
// top side of every square that has one above. The neighbour across then
// has a plain edge with the extra vertices lying on it (T-junctions).
func lattice(m int, extra bool) []orb.MultiPolygon {
	var out []orb.MultiPolygon
	for r := 0; r < m; r++ {
		for c := 0; c < m; c++ {
			x, y := float64(c), float64(r)
			ring := orb.Ring{{x, y}, {x + 1, y}}
			if extra && c < m-1 {
				ring = append(ring, orb.Point{x + 1, y + 1.0/3}, orb.Point{x + 1, y + 2.0/3})
			}
			ring = append(ring, orb.Point{x + 1, y + 1})
			if extra && r < m-1 {
				ring = append(ring, orb.Point{x + 0.5, y + 1})
			}
			ring = append(ring, orb.Point{x, y + 1}, orb.Point{x, y})
			out = append(out, orb.MultiPolygon{orb.Polygon{ring}})
		}
	}
	return out
}

// On an m×m lattice of unit squares rook contiguity has 2·m·(m−1) pairs and
// queen adds the 2·(m−1)² diagonal ones (geometry of the lattice). Moving
// every vertex by less than the snap distance, each square on its own, or
// putting extra vertices on one side of shared edges only, must not change
// the graph.
func TestContigLatticeVariantsGiveTheCleanGraph(t *testing.T) {
	for _, m := range []int{1, 2, 3, 5, 10} {
		clean := lattice(m, false)
		snap := DefaultSnap(clean)
		amp := 0.3 * snap // two copies of a corner end up at most 0.85·snap apart
		variants := []struct {
			name  string
			geoms []orb.MultiPolygon
		}{
			{"clean", clean},
			{"jittered", jitter(clean, amp, uint64(m))},
			{"T-junctions", lattice(m, true)},
			{"T-junctions, jittered", jitter(lattice(m, true), amp, uint64(m)+100)},
		}
		for _, rule := range rules {
			want, _ := build(t, clean, rule)
			pairs := 2 * m * (m - 1)
			if !rule.Rook {
				pairs += 2 * (m - 1) * (m - 1)
			}
			if len(want) != pairs {
				t.Fatalf("m=%d %s: clean lattice has %d pairs, want %d", m, ruleName(rule), len(want), pairs)
			}
			for _, v := range variants {
				got, warns := build(t, v.geoms, rule)
				if d := pairsDiff(got, want); d != "" {
					t.Errorf("m=%d %s %s: %s", m, ruleName(rule), v.name, d)
				}
				if len(warns) != 0 {
					t.Errorf("m=%d %s %s: warnings %q", m, ruleName(rule), v.name, warns)
				}
			}
		}
	}
}

// Two areas in longitude/latitude whose common border was digitised twice,
// with vertices in different places along it and copies of the corners up
// to 1e-7° (about 1 cm) apart, are neighbours; areas 1e-4° (about 10 m)
// apart are not. All with the default snap distance.
func TestContigIndependentlyDigitisedBorders(t *testing.T) {
	// West area: its east side at longitude −100 has vertices at 40.1, 40.3.
	west := orb.MultiPolygon{{{{-100.5, 40}, {-100, 40}, {-100, 40.1}, {-100, 40.3}, {-100, 40.5}, {-100.5, 40.5}, {-100.5, 40}}}}
	// east returns an area whose west side runs at −100+dx, with vertices
	// at other latitudes and corners moved by dy.
	east := func(dx, dy float64) orb.MultiPolygon {
		x := -100 + dx
		return orb.MultiPolygon{{{{x, 40 + dy}, {-99.5, 40}, {-99.5, 40.5}, {x, 40.5 + dy}, {x, 40.4}, {x, 40.2}, {x, 40.05}, {x, 40 + dy}}}}
	}
	// corner returns an area meeting west only at its north-east corner,
	// the copy of the corner moved by (dx, dy).
	corner := func(dx, dy float64) orb.MultiPolygon {
		x, y := -100+dx, 40.5+dy
		return orb.MultiPolygon{{{{x, y}, {x + 0.5, y}, {x + 0.5, y + 0.5}, {x, y + 0.5}, {x, y}}}}
	}
	cases := []struct {
		name        string
		other       orb.MultiPolygon
		queen, rook bool
	}{
		{"border 1e-7° apart", east(1e-7, -1e-7), true, true},
		{"border overlapping by 1e-7°", east(-1e-7, 1e-7), true, true},
		{"border shared exactly", east(0, 0), true, true},
		{"border 1e-4° apart", east(1e-4, 0), false, false},
		{"corner 1e-7° apart", corner(7e-8, 7e-8), true, false},
		{"corner 1e-4° apart", corner(1e-4, 0), false, false},
	}
	for _, c := range cases {
		geoms := []orb.MultiPolygon{west, c.other}
		if s := DefaultSnap(geoms); !(s > 1e-7 && s < 1e-6) {
			t.Fatalf("%s: default snap %g, expected between 1e-7 and 1e-6 degrees", c.name, s)
		}
		for _, r := range []struct {
			rule Options
			want bool
		}{{rules[0], c.queen}, {rules[1], c.rook}} {
			pairs, _ := build(t, geoms, r.rule)
			if got := len(pairs) == 1; got != r.want {
				t.Errorf("%s, %s: neighbours %v, want %v", c.name, ruleName(r.rule), got, r.want)
			}
		}
	}
}

// Rook needs a shared stretch longer than RookMinShared·Snap; anything
// shorter is a point contact, which only queen counts.
func TestContigRookMinimumSharedLength(t *testing.T) {
	const snap = 1e-3
	a := orb.MultiPolygon{{{{0, 0}, {1, 0}, {1, 1}, {0, 1}, {0, 0}}}}
	for _, c := range []struct {
		shared      float64
		queen, rook bool
	}{{0, true, false}, {2 * snap, true, false}, {5 * snap, true, true}, {0.5, true, true}} {
		// b sits to the right of a, overlapping a's right side for c.shared.
		y := 1 - c.shared
		b := orb.MultiPolygon{{{{1, y}, {2, y}, {2, y + 1}, {1, y + 1}, {1, y}}}}
		for _, r := range []struct {
			rule Options
			want bool
		}{{rules[0], c.queen}, {rules[1], c.rook}} {
			r.rule.Snap = snap
			pairs, _ := build(t, []orb.MultiPolygon{a, b}, r.rule)
			if got := len(pairs) == 1; got != r.want {
				t.Errorf("shared %g, %s: neighbours %v, want %v", c.shared, ruleName(r.rule), got, r.want)
			}
		}
	}
}

// Two triangles that meet only at one vertex are queen neighbours and
// never rook ones, whatever the angle between their nearest sides: a side
// leaving the corner at an angle θ stays within snap of the other for
// snap/tan θ (plane geometry), which a length threshold alone would take
// for a border at small angles. Checked with the default snap and a wide
// one, with the corner copies apart by 0.3·snap, on a lon/lat patch, turned
// so that no side is axis-aligned.
func TestContigRookCornerAtAnyAngle(t *testing.T) {
	tri := func(x0, y0, turn float64, angles ...float64) orb.MultiPolygon {
		ring := orb.Ring{{x0, y0}}
		for _, a := range angles {
			s, c := math.Sincos((a + turn) * math.Pi / 180)
			ring = append(ring, orb.Point{x0 + 0.5*c, y0 + 0.5*s})
		}
		return orb.MultiPolygon{{append(ring, ring[0])}}
	}
	for _, deg := range []float64{2, 5, 15, 30, 60} {
		for _, snap := range []float64{0, 1e-3} {
			for _, shift := range []float64{0, 0.3} {
				for _, turn := range []float64{0, 37} {
					// a lies below the side at angle 0, b above the side at deg.
					a := tri(-100, 40, turn, -40, 0)
					s := snap
					if s == 0 {
						s = DefaultSnap([]orb.MultiPolygon{a, a})
					}
					b := tri(-100+shift*s, 40, turn, deg, deg+20)
					geoms := []orb.MultiPolygon{a, b}
					for _, r := range []struct {
						rule Options
						want bool
					}{{rules[0], true}, {rules[1], false}} {
						r.rule.Snap = snap
						pairs, warns := build(t, geoms, r.rule)
						if got := len(pairs) == 1; got != r.want || len(warns) != 0 {
							t.Errorf("%g° snap %g shift %g turn %g, %s: neighbours %v, want %v (warnings %q)", deg, snap, shift, turn, ruleName(r.rule), got, r.want, warns)
						}
					}
				}
			}
		}
	}
}

// A side far longer than the grid cells (the top of a 1000×1000 square under
// a row of unit squares standing on it, all turned by 30° so that no
// coordinate is round) is cut into pieces; every small square is still found
// to touch it, through T-junctions only, and the small ones do not touch
// each other.
func TestContigLongSidesAndRotation(t *testing.T) {
	sin, cos := math.Sincos(math.Pi / 6)
	turn := func(r orb.Ring) orb.MultiPolygon {
		out := make(orb.Ring, len(r))
		for k, p := range r {
			out[k] = orb.Point{p[0]*cos - p[1]*sin, p[0]*sin + p[1]*cos}
		}
		return orb.MultiPolygon{{out}}
	}
	geoms := []orb.MultiPolygon{turn(orb.Ring{{0, 0}, {1000, 0}, {1000, 1000}, {0, 1000}, {0, 0}})}
	for k := 0; k < 100; k++ {
		x := 5 + 10*float64(k)
		geoms = append(geoms, turn(orb.Ring{{x, 1000}, {x + 1, 1000}, {x + 1, 1001}, {x, 1001}, {x, 1000}}))
	}
	for _, rule := range rules {
		pairs, _ := build(t, geoms, rule)
		big := 0
		for _, p := range pairs {
			if p[0] == 0 {
				big++
			}
		}
		if big != 100 || len(pairs) != 100 {
			t.Errorf("%s: big square has %d neighbours, %d pairs in all; want 100 and 100", ruleName(rule), big, len(pairs))
		}
	}
}

// A jittered enclave: the hole and the area filling it were digitised
// separately, with extra vertices on the hole only.
func TestContigJitteredHoleNeighbour(t *testing.T) {
	outer := orb.Ring{{0, 0}, {4, 0}, {4, 4}, {0, 4}, {0, 0}}
	hole := orb.Ring{{1, 1}, {1, 2}, {1, 3}, {2, 3}, {3, 3}, {3, 1}, {1, 1}}
	inner := orb.Ring{{1, 1}, {3, 1}, {3, 3}, {1, 3}, {1, 1}}
	clean := []orb.MultiPolygon{{{outer, hole}}, {{inner}}}
	geoms := jitter(clean, 0.3*DefaultSnap(clean), 3)
	for _, rule := range rules {
		if pairs, _ := build(t, geoms, rule); len(pairs) != 1 {
			t.Errorf("%s: %d pairs, want 1", ruleName(rule), len(pairs))
		}
	}
}

// On the demo generator's regions every shared border is bit-identical on
// both sides (the generator traces all outlines along one lattice), so
// exact coordinate matching is a correct reference there. The robust search
// must agree with it on the region as built, and still agree when every
// district is jittered on its own by less than the snap distance.
func TestContigRegionAgainstExactMatching(t *testing.T) {
	for _, n := range []int{200, 3000} {
		cfg := region.DefaultConfig()
		cfg.Areas = n
		r, err := region.Build(cfg)
		if err != nil {
			t.Fatal(err)
		}
		jittered := jitter(r.Geoms, 0.3*DefaultSnap(r.Geoms), uint64(n))
		for _, rule := range rules {
			want := exactPairs(r.Geoms, rule.Rook)
			rule.IDs = r.IDs
			for name, geoms := range map[string][]orb.MultiPolygon{"as built": r.Geoms, "jittered": jittered} {
				got, warns := build(t, geoms, rule)
				if d := pairsDiff(got, want); d != "" {
					t.Errorf("n=%d %s %s: %s", n, ruleName(rule), name, d)
				}
				if len(warns) != 0 {
					t.Errorf("n=%d %s %s: warnings %q", n, ruleName(rule), name, warns)
				}
			}
		}
	}
}

// The graph and the warnings do not depend on the number of cores: the
// same jittered region, with a few rings made to cross themselves, built on
// one and on two.
func TestContigSameResultOnAnyNumberOfCores(t *testing.T) {
	cfg := region.DefaultConfig()
	cfg.Areas = 3000
	r, err := region.Build(cfg)
	if err != nil {
		t.Fatal(err)
	}
	geoms := jitter(r.Geoms, 0.3*DefaultSnap(r.Geoms), 11)
	// Make the outer ring of every 300th district pass through its first
	// vertex a second time (v0 v1 v2 v0 v3 …): the ring then touches itself.
	var twisted []string
	for a := 5; a < len(geoms); a += 300 {
		ring := geoms[a][0][0]
		loop := append(orb.Ring{}, ring[:3]...)
		loop = append(loop, ring[0])
		geoms[a][0][0] = append(loop, ring[3:]...)
		twisted = append(twisted, r.IDs[a])
	}
	defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(0))
	for _, rule := range rules {
		rule.IDs = r.IDs
		runtime.GOMAXPROCS(1)
		p1, w1 := build(t, geoms, rule)
		runtime.GOMAXPROCS(2)
		p2, w2 := build(t, geoms, rule)
		if d := pairsDiff(p2, p1); d != "" {
			t.Errorf("%s: two cores vs one: %s", ruleName(rule), d)
		}
		if !slices.Equal(w1, w2) {
			t.Errorf("%s: warnings differ:\n%q\n%q", ruleName(rule), w1, w2)
		}
		joined := strings.Join(w1, "\n")
		for _, id := range twisted {
			if !strings.Contains(joined, fmt.Sprintf("area %q: the outer ring of part 1 crosses or touches itself", id)) {
				t.Errorf("%s: no warning for twisted district %s in %q", ruleName(rule), id, w1)
			}
		}
		if len(w1) != len(twisted) {
			t.Errorf("%s: %d warnings for %d twisted districts: %q", ruleName(rule), len(w1), len(twisted), w1)
		}
	}
}

// Queen contacts include all rook contacts, and both lists are proper
// pairs (lower area first, sorted, no repeats).
func TestContigQueenContainsRook(t *testing.T) {
	cfg := region.DefaultConfig()
	cfg.Areas = 1000
	r, err := region.Build(cfg)
	if err != nil {
		t.Fatal(err)
	}
	geoms := jitter(r.Geoms, 0.3*DefaultSnap(r.Geoms), 5)
	queen, _ := build(t, geoms, rules[0])
	rook, _ := build(t, geoms, rules[1])
	for _, pairs := range [][][2]int32{queen, rook} {
		for k, p := range pairs {
			if p[0] >= p[1] || (k > 0 && cmpPair(pairs[k-1], p) >= 0) {
				t.Fatalf("pair %d is %v after %v", k, p, pairs[max(k-1, 0)])
			}
		}
	}
	for _, p := range rook {
		if _, ok := slices.BinarySearchFunc(queen, p, cmpPair); !ok {
			t.Fatalf("rook pair %v is not a queen pair", p)
		}
	}
	if len(queen) <= len(rook) {
		t.Errorf("queen %d pairs, rook %d: expected some corner-only contacts", len(queen), len(rook))
	}
}

func cmpPair(a, b [2]int32) int { return cmp.Or(cmp.Compare(a[0], b[0]), cmp.Compare(a[1], b[1])) }

// DefaultSnap follows the documented rule.
func TestContigDefaultSnap(t *testing.T) {
	cases := []struct {
		name  string
		geoms []orb.MultiPolygon
		want  float64
	}{
		// 10×10 unit lattice: the diagonal √200 dominates.
		{"unit lattice", lattice(10, false), 2e-9 * math.Sqrt(200)},
		// A 1 km square in metres far from the origin (5,000 km north):
		// the magnitude of the coordinates dominates, 1 cm.
		{"projected metres", []orb.MultiPolygon{{{{{500000, 5e6}, {501000, 5e6}, {501000, 5e6 + 1000}, {500000, 5e6 + 1000}, {500000, 5e6}}}}}, 2e-9 * (5e6 + 1000)},
		// Squares 1e-3 wide far from the origin: the cap at 1/100 of the
		// median side.
		{"tiny areas", []orb.MultiPolygon{{{{{1e6, 0}, {1e6 + 1e-3, 0}, {1e6 + 1e-3, 1e-3}, {1e6, 1e-3}, {1e6, 0}}}}}, 1e-5},
		{"no segments", []orb.MultiPolygon{{{{{1, 1}}}}}, 0},
	}
	for _, c := range cases {
		if got := DefaultSnap(c.geoms); math.Abs(got-c.want) > 1e-6*c.want {
			t.Errorf("%s: %g, want %g", c.name, got, c.want)
		}
	}
}
