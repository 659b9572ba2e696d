package weights

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/internal/numtext"
)

// KernelKind names the shape of a kernel weight K(u), u = d/h the distance
// in units of the bandwidth. Every kind is zero for u > 1.
type KernelKind int

const (
	// Triangular is K(u) = 1 − u.
	Triangular KernelKind = iota
	// Bisquare is K(u) = (1 − u²)², smooth at the edge of the bandwidth.
	Bisquare
	// Gaussian is K(u) = exp(−u²/2) for u ≤ 1, truncated to zero beyond, so
	// the bandwidth is one standard deviation and the weight drops from
	// exp(−½) ≈ 0.61 to zero at the bandwidth; the truncation keeps the graph
	// sparse.
	Gaussian
)

// String returns the kernel's name as it appears in a graph's Kind.
func (k KernelKind) String() string {
	switch k {
	case Bisquare:
		return "bisquare"
	case Gaussian:
		return "Gaussian"
	}
	return "triangular"
}

var kernelNames = []choice.Name[KernelKind]{{Name: "triangular", Value: Triangular}, {Name: "bisquare", Value: Bisquare}, {Name: "gaussian", Value: Gaussian}}

// ParseKernelKind reads "triangular", "bisquare" or "gaussian" (any case).
func ParseKernelKind(s string) (KernelKind, error) {
	return choice.Parse("kernel", s, kernelNames...)
}

// value returns K(u) for u ≥ 0.
func (k KernelKind) value(u float64) float64 {
	if u > 1 {
		return 0
	}
	switch k {
	case Bisquare:
		v := 1 - u*u
		return v * v
	case Gaussian:
		return math.Exp(-u * u / 2)
	}
	return 1 - u
}

// Kernel weights the links of each area i by K(d_ij/h_i), for the other
// areas j with d_ij ≤ h_i under m; an area's weight on itself (K(0) = 1) is
// not part of the graph, which has no self-links.
//
// Give exactly one of bandwidth and adaptiveK. A fixed bandwidth > 0 sets
// h_i = bandwidth for every area (km for Geographic, layer units for Planar),
// and the graph is symmetric; like DistanceBand, a bandwidth under which no
// area has a neighbour is a *NoNeighboursError. An adaptive adaptiveK ≥ 1 sets
// h_i to the distance from i to its adaptiveK-th nearest neighbour, so dense
// parts of the map get narrow kernels; the graph is then asymmetric.
//
// Triangular and bisquare kernels are zero at u = 1, so the links at exactly
// the bandwidth are left out: an adaptive triangular or bisquare kernel links
// each area to those strictly nearer than its adaptiveK-th neighbour (usually
// adaptiveK−1 of them). The truncated Gaussian keeps the links at u = 1 and so
// links each area to at least adaptiveK others (more when there are ties at
// the bandwidth). An adaptive bandwidth of zero (adaptiveK other areas at the
// same point) is an error naming the area.
func Kernel(pts []orb.Point, kind KernelKind, bandwidth float64, adaptiveK int, m Metric) (*Graph, error) {
	if kind != Triangular && kind != Bisquare && kind != Gaussian {
		return nil, fmt.Errorf("weights: unknown kernel %d", kind)
	}
	n := len(pts)
	if adaptiveK != 0 {
		if bandwidth != 0 {
			return nil, fmt.Errorf("weights: give a kernel either a fixed bandwidth or a number of neighbours for an adaptive one, not both")
		}
		if adaptiveK < 1 {
			return nil, fmt.Errorf("weights: an adaptive kernel needs at least 1 neighbour, not %d", adaptiveK)
		}
		if kind != Gaussian && adaptiveK < 2 {
			return nil, fmt.Errorf("weights: an adaptive %s kernel needs at least 2 neighbours: its bandwidth is the distance to the farthest of them, which gets weight zero", kind)
		}
		if n >= 2 && adaptiveK > n-1 {
			return nil, fmt.Errorf("weights: an adaptive kernel can use at most n−1 = %d neighbours for %d areas, not %d", n-1, n, adaptiveK)
		}
		if n >= 2 && int64(n)*int64(adaptiveK) > MaxLinks {
			return nil, fmt.Errorf("weights: an adaptive kernel over %d neighbours of %s areas would make about %s links, more than %s; choose fewer neighbours",
				adaptiveK, numtext.Count(int64(n)), numtext.Count(int64(n)*int64(adaptiveK)), numtext.Count(MaxLinks))
		}
	} else if err := checkThreshold("the kernel bandwidth", bandwidth); err != nil {
		return nil, err
	}
	ix, err := newPointIndex(pts, m)
	if err != nil {
		return nil, err
	}
	if adaptiveK == 0 {
		h := bandwidth
		q := radiusQuery{
			ix:     ix,
			radius: func(int32) float64 { return h },
			weigh:  func(_, _ int32, d float64) float64 { return kind.value(d / h) },
			kind:   fmt.Sprintf("%s kernel (bandwidth %s)", kind, formatLength(h, m)),
			what:   "bandwidth",
		}
		return q.graph("weighted", h, nil)
	}

	_, dist := ix.nearestRows(adaptiveK)
	h := make([]float64, n)
	for i := range n {
		h[i] = dist[(i+1)*adaptiveK-1]
		if h[i] == 0 {
			return nil, fmt.Errorf("weights: area %d has %d other areas at its representative point, so its adaptive bandwidth is zero; use more neighbours",
				i, adaptiveK)
		}
	}
	kindText := fmt.Sprintf("%s kernel (adaptive, %d neighbours)", kind, adaptiveK)
	if adaptiveK == 1 {
		kindText = fmt.Sprintf("%s kernel (adaptive, 1 neighbour)", kind)
	}
	q := radiusQuery{
		ix:     ix,
		radius: func(i int32) float64 { return h[i] },
		weigh:  func(i, _ int32, d float64) float64 { return kind.value(d / h[i]) },
		kind:   kindText,
		what:   "number of neighbours",
		none: func() error {
			return fmt.Errorf("weights: %s gives no area a neighbour: every area's %d nearest are all equally far, at the bandwidth, where the %s kernel is zero; use more neighbours or the gaussian kernel",
				kindText, adaptiveK, kind)
		},
	}
	return q.graph("weighted", 0, nil)
}
