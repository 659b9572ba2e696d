package autocorr

import (
	"math"

	"github.com/areatest/areatest/weights"
)

// GiStar returns the local Getis–Ord Gi* z-score of every area (Ord &
// Getis 1995, Geogr. Anal. 27:286–306; their standardised form, as recalled):
//
//	Gi* = (Σ_j w_ij x_j − x̄ W_i) / (S √((n S1_i − W_i²) / (n − 1)))
//
// where the sums run over j including i itself with the self-weight
// w_ii = 1 (the "star": an area belongs to its own neighbourhood), W_i =
// Σ_j w_ij, S1_i = Σ_j w_ij², x̄ the mean and S² = Σ x²/n − x̄² the
// variance with divisor n. A large positive value marks an area whose
// neighbourhood holds high values. The self-weight 1 is on the scale of
// binary weights, as in Ord & Getis; with row-standardised rows it
// outweighs the neighbours together. An area whose neighbourhood is the
// whole map with equal weights has no variance and gets 0. A constant x is
// ErrConstant.
func GiStar(x []float64, g *weights.Graph) ([]float64, error) {
	if err := checkColumn(x, g); err != nil {
		return nil, err
	}
	z, ss, err := centre(x)
	if err != nil {
		return nil, err
	}
	n := float64(len(x))
	s := math.Sqrt(ss / n)
	out := make([]float64, len(x))
	for i := range out {
		nb, w := g.Row(i)
		// Centred values make Σ_j w_ij x_j − x̄ W_i a single sum, without
		// the cancellation of two large terms.
		num := z[i] // the self-weight 1
		wi, s1 := 1.0, 1.0
		for k, j := range nb {
			num += w[k] * z[j]
			wi += w[k]
			s1 += w[k] * w[k]
		}
		d := (n*s1 - wi*wi) / (n - 1)
		if d <= 1e-12*n*s1 {
			continue
		}
		out[i] = num / (s * math.Sqrt(d))
	}
	return out, nil
}
