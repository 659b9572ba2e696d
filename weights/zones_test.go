package weights

import (
	"slices"
	"testing"

	"github.com/areatest/areatest/samples/region"
)

// zonesLattice is the rook (or, with diagonals, queen) graph of a
// rows×cols grid.
func zonesLattice(t testing.TB, rows, cols int, diagonals bool) *Graph {
	t.Helper()
	var pairs [][2]int32
	id := func(r, c int) int32 { return int32(r*cols + c) }
	for r := 0; r < rows; r++ {
		for c := 0; c < cols; c++ {
			if c+1 < cols {
				pairs = append(pairs, [2]int32{id(r, c), id(r, c+1)})
			}
			if r+1 < rows {
				pairs = append(pairs, [2]int32{id(r, c), id(r+1, c)})
			}
			if diagonals && r+1 < rows && c+1 < cols {
				pairs = append(pairs, [2]int32{id(r, c), id(r+1, c+1)}, [2]int32{id(r, c+1), id(r+1, c)})
			}
		}
	}
	g, err := FromLinks(rows*cols, pairs, "lattice")
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// zonesDemo is the queen graph of the demo region with the given number of
// areas.
func zonesDemo(t testing.TB, areas int) *Graph {
	t.Helper()
	cfg := region.DefaultConfig()
	cfg.Areas = areas
	r, err := region.Build(cfg)
	if err != nil {
		t.Fatal(err)
	}
	g, err := ContiguityGraph(r.Geoms, Queen)
	if err != nil {
		t.Fatal(err)
	}
	return g
}

// zonesCheck verifies what Zones promises: every area in a zone, zones
// numbered by first area, each zone connected within itself, and — for
// zones in components of at least half the target — between half and
// limit times the target areas. It returns the sizes.
func zonesCheck(t *testing.T, g *Graph, zones []int32, target int, limit float64) []int {
	t.Helper()
	n := g.Len()
	if len(zones) != n {
		t.Fatalf("%d zones for %d areas", len(zones), n)
	}
	next := int32(0)
	for i, c := range zones {
		if c > next || c < 0 {
			t.Fatalf("area %d: zone %d before zone %d appeared", i, c, next)
		}
		if c == next {
			next++
		}
	}
	sizes := ZoneSizes(zones)
	comp := zonesComponentSize(g)
	// Connected: a search from each zone's first area, through links inside
	// the zone, reaches all of it.
	seen := make([]bool, n)
	for i := 0; i < n; i++ {
		if seen[i] {
			continue
		}
		c := zones[i]
		queue := []int{i}
		seen[i] = true
		for h := 0; h < len(queue); h++ {
			nb, _ := g.Row(queue[h])
			for _, v := range nb {
				if !seen[v] && zones[v] == c {
					seen[v] = true
					queue = append(queue, int(v))
				}
			}
		}
		if len(queue) != sizes[c] {
			t.Fatalf("zone %d is not connected: %d of its %d areas reachable from area %d", c, len(queue), sizes[c], i)
		}
		if 2*comp[i] < target {
			if sizes[c] != comp[i] {
				t.Fatalf("area %d: its component of %d areas should be one zone, got a zone of %d", i, comp[i], sizes[c])
			}
			continue
		}
		if 2*sizes[c] < target || float64(sizes[c]) > limit*float64(target) {
			t.Fatalf("zone %d has %d areas, outside [%d/2, %.1f·%d]", c, sizes[c], target, limit, target)
		}
	}
	return sizes
}

// zonesComponentSize gives each area the size of its connected component.
func zonesComponentSize(g *Graph) []int {
	n := g.Len()
	out := make([]int, n)
	seen := make([]bool, n)
	for s := 0; s < n; s++ {
		if seen[s] {
			continue
		}
		comp := []int{s}
		seen[s] = true
		for h := 0; h < len(comp); h++ {
			nb, _ := g.Row(comp[h])
			for _, v := range nb {
				if !seen[v] {
					seen[v] = true
					comp = append(comp, int(v))
				}
			}
		}
		for _, v := range comp {
			out[v] = len(comp)
		}
	}
	return out
}

func zonesSpread(sizes []int) (lo, hi int) {
	return slices.Min(sizes), slices.Max(sizes)
}

// Lattices: zones connected, sizes within [½, 2]× the target, about n/target
// of them, and the same result on every call.
func TestZonesLattices(t *testing.T) {
	for _, c := range []struct {
		name       string
		rows, cols int
		queen      bool
		target     int
	}{
		{"rook 30×30, default", 30, 30, false, 0},
		{"queen 30×30, 50", 30, 30, true, 50},
		{"rook 10×90, 20", 10, 90, false, 20},
		{"rook 1×100 chain, 10", 1, 100, false, 10},
		{"rook 7×7, 3", 7, 7, false, 3},
	} {
		t.Run(c.name, func(t *testing.T) {
			g := zonesLattice(t, c.rows, c.cols, c.queen)
			target := c.target
			if target == 0 {
				target = DefaultZoneSize(g.Len())
			}
			zones, err := Zones(g, c.target)
			if err != nil {
				t.Fatal(err)
			}
			sizes := zonesCheck(t, g, zones, target, 2)
			lo, hi := zonesSpread(sizes)
			t.Logf("%d areas, target %d: %d zones of %d–%d areas", g.Len(), target, len(sizes), lo, hi)
			want := float64(g.Len()) / float64(target)
			if float64(len(sizes)) < 0.5*want || float64(len(sizes)) > 1.5*want {
				t.Fatalf("%d zones, want about %.0f", len(sizes), want)
			}
			again, _ := Zones(g, c.target)
			if !slices.Equal(zones, again) {
				t.Fatal("a second call gave different zones")
			}
		})
	}
}

// The demo region of 3,000 areas (queen contiguity, two islands): about √n
// zones of about √n areas, connected, within [½, 2]× the target; the islands
// are zones of their own.
func TestZonesDemoRegion(t *testing.T) {
	g := zonesDemo(t, 3000)
	zones, err := Zones(g, 0)
	if err != nil {
		t.Fatal(err)
	}
	target := DefaultZoneSize(3000)
	sizes := zonesCheck(t, g, zones, target, 2)
	lo, hi := 1<<30, 0
	for _, i := range g.Islands() {
		if sizes[zones[i]] != 1 {
			t.Fatalf("island %d shares zone %d of %d areas", i, zones[i], sizes[zones[i]])
		}
	}
	var big []int
	for _, s := range sizes {
		if s > 1 {
			big = append(big, s)
			lo, hi = min(lo, s), max(hi, s)
		}
	}
	t.Logf("3,000 areas, target %d: %d zones (%d islands alone), mainland zones of %d–%d areas", target, len(sizes), len(sizes)-len(big), lo, hi)
	if len(big) < 45 || len(big) > 65 {
		t.Fatalf("%d mainland zones, want about √3000 ≈ 55", len(big))
	}
}

// Islands, small components and asymmetric links.
func TestZonesSpecialGraphs(t *testing.T) {
	// A 6×6 rook lattice (areas 0–35), a chain of three (36–38) and two
	// islands (39, 40).
	var pairs [][2]int32
	base := zonesLattice(t, 6, 6, false)
	for i := 0; i < 36; i++ {
		nb, _ := base.Row(i)
		for _, j := range nb {
			if int(j) > i {
				pairs = append(pairs, [2]int32{int32(i), j})
			}
		}
	}
	pairs = append(pairs, [2]int32{36, 37}, [2]int32{37, 38})
	g, err := FromLinks(41, pairs, "mixed")
	if err != nil {
		t.Fatal(err)
	}
	zones, err := Zones(g, 9)
	if err != nil {
		t.Fatal(err)
	}
	sizes := zonesCheck(t, g, zones, 9, 2)
	if zones[36] != zones[38] || sizes[zones[36]] != 3 || sizes[zones[39]] != 1 || zones[39] == zones[40] {
		t.Fatalf("small component and islands: zones %v, sizes %v", zones[36:], sizes)
	}
	// A one-way version of the lattice's links gives the same zones: links
	// count in either direction.
	var links []Link
	for _, p := range pairs {
		links = append(links, Link{From: p[0], To: p[1], Weight: 1})
	}
	oneWay, err := FromEntries(41, links, "one-way", "binary")
	if err != nil {
		t.Fatal(err)
	}
	z2, err := Zones(oneWay, 9)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(zones, z2) {
		t.Fatal("one-way links gave different zones")
	}
	// A target above the layer's size leaves each component one zone.
	whole, _ := Zones(g, 1000)
	if s := ZoneSizes(whole); len(s) != 4 || s[0] != 36 {
		t.Fatalf("target 1000: sizes %v", s)
	}
	if _, err := Zones(g, 1); err == nil {
		t.Fatal("target 1: no error")
	}
	if _, err := Zones(g, -3); err == nil {
		t.Fatal("negative target: no error")
	}
	if _, err := Zones(&Graph{Offsets: []int32{0}}, 0); err == nil {
		t.Fatal("no areas: no error")
	}
}

// Zones on the demo region at 85,000 areas (queen contiguity): the default
// target, about 292 zones of about 292 areas.
func BenchmarkZones85000(b *testing.B) {
	g := zonesDemo(b, 85000)
	var zones []int32
	b.ResetTimer()
	for b.Loop() {
		var err error
		if zones, err = Zones(g, 0); err != nil {
			b.Fatal(err)
		}
	}
	sizes := ZoneSizes(zones)
	b.ReportMetric(float64(len(sizes)), "zones")
	lo, hi := 1<<30, 0
	for _, s := range sizes {
		if s > 1 {
			lo, hi = min(lo, s), max(hi, s)
		}
	}
	b.ReportMetric(float64(lo), "smallest")
	b.ReportMetric(float64(hi), "largest")
}
