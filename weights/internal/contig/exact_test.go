package contig

import (
	"slices"

	"github.com/paulmach/orb"
)

// exactPairs is the former exact-coordinate contiguity, kept as a reference
// for layers whose shared borders are bit-identical on both sides (built from
// one topology): there, a shared vertex is a queen contact and a shared pair
// of consecutive vertices a rook contact, with no tolerance needed, so the
// robust search must give the same pairs.
func exactPairs(geoms []orb.MultiPolygon, rook bool) [][2]int32 {
	type occ struct {
		p, q orb.Point
		area int32
	}
	var occs []occ
	for a, mp := range geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				for k := 0; k+1 < len(ring); k++ {
					p, q := ring[k], ring[k+1]
					if !rook {
						occs = append(occs, occ{p, p, int32(a)})
						continue
					}
					if p == q {
						continue
					}
					if q[0] < p[0] || (q[0] == p[0] && q[1] < p[1]) {
						p, q = q, p
					}
					occs = append(occs, occ{p, q, int32(a)})
				}
			}
		}
	}
	cmpPt := func(a, b orb.Point) int {
		if a[0] != b[0] {
			if a[0] < b[0] {
				return -1
			}
			return 1
		}
		if a[1] != b[1] {
			if a[1] < b[1] {
				return -1
			}
			return 1
		}
		return 0
	}
	slices.SortFunc(occs, func(a, b occ) int {
		if c := cmpPt(a.p, b.p); c != 0 {
			return c
		}
		if c := cmpPt(a.q, b.q); c != 0 {
			return c
		}
		return int(a.area) - int(b.area)
	})
	var pairs [][2]int32
	for s := 0; s < len(occs); {
		e := s + 1
		for e < len(occs) && occs[e].p == occs[s].p && occs[e].q == occs[s].q {
			e++
		}
		for i := s; i < e; i++ {
			for j := i + 1; j < e; j++ {
				if occs[i].area != occs[j].area {
					pairs = append(pairs, [2]int32{occs[i].area, occs[j].area})
				}
			}
		}
		s = e
	}
	// Areas come in order within each group of occurrences, so every pair
	// is (lower, higher) already.
	slices.SortFunc(pairs, cmpPair)
	return slices.Compact(pairs)
}
