package region

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// Helpers shared by the tests. They work from the public Region only, never
// from the lattice, so they check the output the way a reader of the file
// would see it.

// queenNeighbours links districts that share at least one vertex, matched by
// exact coordinates; the lists are sorted.
func queenNeighbours(r *Region) [][]int {
	at := make(map[orb.Point][]int)
	for d, mp := range r.Geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				for _, p := range ring[:len(ring)-1] {
					if l := at[p]; len(l) == 0 || l[len(l)-1] != d {
						at[p] = append(l, d)
					}
				}
			}
		}
	}
	nb := make([][]int, r.Len())
	for _, ds := range at {
		for _, a := range ds {
			for _, b := range ds {
				if a != b {
					nb[a] = append(nb[a], b)
				}
			}
		}
	}
	for d := range nb {
		slices.Sort(nb[d])
		nb[d] = slices.Compact(nb[d])
	}
	return nb
}

// moran is Moran's I with binary weights over the districts where x is not
// NaN (links to a district with NaN are dropped).
func moran(x []float64, nb [][]int) float64 { return moranOver(x, nb, false) }

// moranRow is Moran's I with row-standardised weights.
func moranRow(x []float64, nb [][]int) float64 { return moranOver(x, nb, true) }

// moranOver is Moran's I over the districts where x is not NaN, with
// binary weights or, with row set, row-standardised ones.
func moranOver(x []float64, nb [][]int, row bool) float64 {
	mean, n := nanMean(x)
	var num, den, s0 float64
	for i, v := range x {
		if math.IsNaN(v) {
			continue
		}
		den += (v - mean) * (v - mean)
		var lag, k float64
		for _, j := range nb[i] {
			switch {
			case math.IsNaN(x[j]):
			case row:
				lag += x[j] - mean
				k++
			default:
				num += (v - mean) * (x[j] - mean)
				s0++
			}
		}
		if k > 0 {
			num += (v - mean) * lag / k
			s0++
		}
	}
	return float64(n) / s0 * num / den
}

// nanMean is the mean of the values of x that are not NaN, and their
// number.
func nanMean(x []float64) (mean float64, n int) {
	for _, v := range x {
		if !math.IsNaN(v) {
			mean += v
			n++
		}
	}
	return mean / float64(n), n
}

// indicator turns a text column into 1 where it equals yes, 0 where it holds
// anything else, NaN where it is empty.
func indicator(col []string, yes string) []float64 {
	out := make([]float64, len(col))
	for k, v := range col {
		switch v {
		case "":
			out[k] = math.NaN()
		case yes:
			out[k] = 1
		}
	}
	return out
}

// shoelace is the signed area of a ring in square degrees.
func shoelace(r orb.Ring) float64 {
	var a float64
	for k := 0; k+1 < len(r); k++ {
		a += r[k][0]*r[k+1][1] - r[k+1][0]*r[k][1]
	}
	return a / 2
}
