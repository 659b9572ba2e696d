package regress

import "math"

// Gauss–Kronrod 7–15 rule on [−1, 1] (Kronrod 1965; the nodes and weights
// as tabulated in QUADPACK, Piessens et al. 1983): kronrodX are the
// non-negative nodes, largest first; every odd-indexed one (1, 3, 5, 7) is
// also a node of the 7-point Gauss rule, with weight gaussW[(i−1)/2].
var (
	kronrodX = [8]float64{
		0.991455371120812639206854697526329, 0.949107912342758524526189684047851,
		0.864864423359769072789712788640926, 0.741531185599394439863864773280788,
		0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
		0.207784955007898467600689403773245, 0,
	}
	kronrodW = [8]float64{
		0.022935322010529224963732008058970, 0.063092092629978553290700663189204,
		0.104790010322250183839876322541518, 0.140653259715525918745189590510238,
		0.169004726639267902826583426598550, 0.190350578064785409913256402421014,
		0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
	}
	gaussW = [4]float64{
		0.129484966168869693270611432679082, 0.279705391489276667901467771423780,
		0.381830050505118944950369775488975, 0.417959183673469387755102040816327,
	}
)

// kronrod returns the 15-point Kronrod estimate of ∫_a^b f and the
// difference from the embedded 7-point Gauss estimate, a (pessimistic)
// measure of its error.
func kronrod(f func(float64) float64, a, b float64) (value, err float64) {
	c, h := (a+b)/2, (b-a)/2
	fc := f(c)
	k, g := kronrodW[7]*fc, gaussW[3]*fc
	for i := 0; i < 7; i++ {
		s := f(c-h*kronrodX[i]) + f(c+h*kronrodX[i])
		k += kronrodW[i] * s
		if i%2 == 1 {
			g += gaussW[(i-1)/2] * s
		}
	}
	return k * h, math.Abs(k-g) * h
}

// adapt integrates f over [a, b] to an absolute error of about tol, the
// globally adaptive way of QUADPACK's qag: the interval with the largest
// error estimate is bisected until the estimates sum to at most tol, or
// until maxIntervals pieces (then rounding, not the rule, limits the
// error).
func adapt(f func(float64) float64, a, b, tol float64) float64 {
	const maxIntervals = 2000
	type piece struct{ a, b, v, e float64 }
	v, e := kronrod(f, a, b)
	pieces := []piece{{a, b, v, e}}
	total, errSum := v, e
	for errSum > tol && len(pieces) < maxIntervals {
		worst := 0
		for i, p := range pieces {
			if p.e > pieces[worst].e {
				worst = i
			}
		}
		p := pieces[worst]
		m := (p.a + p.b) / 2
		lv, le := kronrod(f, p.a, m)
		rv, re := kronrod(f, m, p.b)
		pieces[worst] = piece{p.a, m, lv, le}
		pieces = append(pieces, piece{m, p.b, rv, re})
		total += lv + rv - p.v
		errSum += le + re - p.e
	}
	return total
}
