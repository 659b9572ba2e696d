package kdtree

import (
	"cmp"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// planar builds a tree over n random points of the unit square, on a grid
// of step 1/16 so that many distances tie, with the planar distance.
func planar(n int, seed uint64) *Tree {
	rng := rand.New(rand.NewPCG(seed, 3))
	pts := make([]Point, n)
	for i := range pts {
		x, y := float64(rng.IntN(16))/16, float64(rng.IntN(16))/16
		pts[i] = Point{C: [3]float64{x, y, 0}, E: [3]float64{x, y, 0}, Idx: int32(i)}
	}
	return Build(pts, func(a, b *[3]float64) float64 { return math.Hypot(a[0]-b[0], a[1]-b[1]) })
}

// at returns the tree position of every point, by Idx.
func at(t *Tree) []int {
	pos := make([]int, t.Len())
	for p, i := range t.Idx {
		pos[i] = p
	}
	return pos
}

// NearestRows agrees with ranking every other point by (distance, index).
func TestNearestRowsAgainstBruteForce(t *testing.T) {
	for _, k := range []int{1, 5, 40} {
		tr := planar(600, uint64(k))
		nb, dist := tr.NearestRows(k)
		pos := at(tr)
		for i := range tr.Len() {
			var all []int32
			for j := range tr.Len() {
				if j != i {
					all = append(all, int32(j))
				}
			}
			d := func(j int32) float64 { return tr.exact(&tr.E[pos[i]], &tr.E[pos[j]]) }
			slices.SortFunc(all, func(a, b int32) int { return cmp.Or(cmp.Compare(d(a), d(b)), cmp.Compare(a, b)) })
			if !slices.Equal(nb[i*k:(i+1)*k], all[:k]) {
				t.Fatalf("k=%d point %d: %v, want %v", k, i, nb[i*k:(i+1)*k], all[:k])
			}
			if dist[(i+1)*k-1] != d(all[k-1]) {
				t.Fatalf("k=%d point %d: distance %v, want %v", k, i, dist[(i+1)*k-1], d(all[k-1]))
			}
		}
	}
}

// Within visits exactly the points within the bound, each once.
func TestWithinAgainstBruteForce(t *testing.T) {
	tr := planar(500, 9)
	for _, r := range []float64{0, 0.07, 0.25, 2} {
		bound := r * r
		for q := range tr.Len() {
			seen := make([]int, tr.Len())
			tr.Within(&tr.C[q], bound, func(p int) { seen[p]++ })
			for p := range seen {
				want := 0
				if Chord2(&tr.C[q], &tr.C[p]) <= bound {
					want = 1
				}
				if seen[p] != want {
					t.Fatalf("r=%v query %d: position %d visited %d times, want %d", r, q, p, seen[p], want)
				}
			}
		}
	}
}
