package weights

import (
	"fmt"
	"sort"

	"github.com/paulmach/orb"
)

// Contiguity says which shared boundary makes two areas neighbours.
type Contiguity int

const (
	// Queen makes areas neighbours when they share at least one boundary
	// vertex (a corner is enough).
	Queen Contiguity = iota
	// Rook makes areas neighbours only when they share at least one boundary
	// segment (an edge of positive length).
	Rook
)

func (c Contiguity) String() string {
	if c == Rook {
		return "rook"
	}
	return "queen"
}

// ParseContiguity reads "queen" or "rook".
func ParseContiguity(s string) (Contiguity, error) {
	switch s {
	case "queen":
		return Queen, nil
	case "rook":
		return Rook, nil
	}
	return Queen, fmt.Errorf("contiguity must be queen or rook, not %q", s)
}

// ContiguityGraph builds a binary contiguity graph from polygon boundaries,
// matching vertices by exact coordinate equality. Queen links areas that share
// a vertex; rook links areas that share a segment, i.e. the same pair of
// consecutive vertices (in either direction) appears in both boundaries.
//
// Exact matching is right for layers whose neighbours were built from one
// topology (shared arcs give bit-identical coordinates); it misses neighbours
// whose shared border was digitised twice.
func ContiguityGraph(geoms []orb.MultiPolygon, rule Contiguity) (*Graph, error) {
	// Each key (a vertex, or a canonical segment) is mapped to the areas
	// whose boundary holds it; every pair among those areas is a link. The
	// occurrence list is sorted rather than hashed into nested maps so that
	// memory stays flat and the result does not depend on map order.
	type occ[K comparable] struct {
		key  K
		area int32
	}
	var pairs [][2]int32
	switch rule {
	case Queen:
		occs := make([]occ[orb.Point], 0, 1024)
		for a, mp := range geoms {
			for _, poly := range mp {
				for _, ring := range poly {
					for k, p := range ring {
						if k == len(ring)-1 && len(ring) > 1 && p == ring[0] {
							continue
						}
						occs = append(occs, occ[orb.Point]{p, int32(a)})
					}
				}
			}
		}
		sort.Slice(occs, func(i, j int) bool {
			if occs[i].key != occs[j].key {
				return lessPoint(occs[i].key, occs[j].key)
			}
			return occs[i].area < occs[j].area
		})
		pairs = pairsFromRuns(len(occs), func(i, j int) bool { return occs[i].key == occs[j].key },
			func(i int) int32 { return occs[i].area })
	case Rook:
		occs := make([]occ[[2]orb.Point], 0, 1024)
		for a, mp := range geoms {
			for _, poly := range mp {
				for _, ring := range poly {
					for k := 0; k+1 < len(ring); k++ {
						p, q := ring[k], ring[k+1]
						if p == q {
							continue
						}
						if lessPoint(q, p) {
							p, q = q, p
						}
						occs = append(occs, occ[[2]orb.Point]{[2]orb.Point{p, q}, int32(a)})
					}
				}
			}
		}
		sort.Slice(occs, func(i, j int) bool {
			a, b := occs[i].key, occs[j].key
			if a[0] != b[0] {
				return lessPoint(a[0], b[0])
			}
			if a[1] != b[1] {
				return lessPoint(a[1], b[1])
			}
			return occs[i].area < occs[j].area
		})
		pairs = pairsFromRuns(len(occs), func(i, j int) bool { return occs[i].key == occs[j].key },
			func(i int) int32 { return occs[i].area })
	default:
		return nil, fmt.Errorf("weights: unknown contiguity rule %d", rule)
	}
	return FromLinks(len(geoms), pairs, rule.String()+" contiguity")
}

// pairsFromRuns walks a sorted occurrence list and emits every pair of
// distinct areas within each run of equal keys.
func pairsFromRuns(n int, same func(i, j int) bool, area func(i int) int32) [][2]int32 {
	var pairs [][2]int32
	for start := 0; start < n; {
		end := start + 1
		for end < n && same(start, end) {
			end++
		}
		for i := start; i < end; i++ {
			for j := i + 1; j < end; j++ {
				if a, b := area(i), area(j); a != b {
					pairs = append(pairs, [2]int32{a, b})
				}
			}
		}
		start = end
	}
	return pairs
}

func lessPoint(a, b orb.Point) bool {
	if a[0] != b[0] {
		return a[0] < b[0]
	}
	return a[1] < b[1]
}
