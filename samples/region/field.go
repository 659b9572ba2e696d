package region

import "math"

// field is smooth random noise on the unit square: random values at the nodes
// of a coarse lattice, blended with a quintic fade so the surface has no
// creases, plus finer octaves at half the amplitude each. It uses only
// additions and multiplications, so it gives the same bits everywhere, and its
// correlation length is set by the node spacing, which is what lets Build keep
// the clustering of an attribute the same at any number of districts.
type field struct {
	layers []fieldLayer
}

type fieldLayer struct {
	gx, gy int
	amp    float64
	v      []float64 // (gx+1) × (gy+1) node values in [-1, 1)
}

func newField(s *stream, gx, gy, octaves int) *field {
	f := &field{}
	amp := 1.0
	for range octaves {
		l := fieldLayer{gx: gx, gy: gy, amp: amp, v: make([]float64, (gx+1)*(gy+1))}
		for k := range l.v {
			l.v[k] = s.uniform(-1, 1)
		}
		f.layers = append(f.layers, l)
		gx, gy, amp = gx*2, gy*2, amp/2
	}
	return f
}

func fade(t float64) float64 {
	return float64(t*t) * float64(t) * (float64(t*(float64(t*6)-15)) + 10)
}

// at evaluates the field at (u, v); points outside the unit square take the
// value at the nearest edge.
func (f *field) at(u, v float64) float64 {
	u = math.Min(1, math.Max(0, u))
	v = math.Min(1, math.Max(0, v))
	var sum float64
	for _, l := range f.layers {
		x, y := float64(u*float64(l.gx)), float64(v*float64(l.gy))
		i, j := min(int(x), l.gx-1), min(int(y), l.gy-1)
		tx, ty := fade(x-float64(i)), fade(y-float64(j))
		w := l.gx + 1
		a, b := l.v[j*w+i], l.v[j*w+i+1]
		c, d := l.v[(j+1)*w+i], l.v[(j+1)*w+i+1]
		bottom := a + float64(tx*(b-a))
		top := c + float64(tx*(d-c))
		sum += float64(l.amp * (bottom + float64(ty*(top-bottom))))
	}
	return sum
}

// standardise rescales xs in place to mean 0 and standard deviation 1.
func standardise(xs []float64) {
	if len(xs) == 0 {
		return
	}
	var mean float64
	for _, x := range xs {
		mean += x
	}
	mean /= float64(len(xs))
	var ss float64
	for _, x := range xs {
		ss += float64((x - mean) * (x - mean))
	}
	sd := math.Sqrt(ss / float64(len(xs)))
	if sd == 0 {
		sd = 1
	}
	for k := range xs {
		xs[k] = (xs[k] - mean) / sd
	}
}
