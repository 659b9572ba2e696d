package weights

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/weights/internal/kdtree"
)

// Metric says how distances between representative points are measured.
type Metric int

const (
	// Geographic treats points as longitude/latitude in degrees and measures
	// great-circle distance in kilometres on a sphere of radius EarthRadiusKm.
	Geographic Metric = iota
	// Planar measures straight-line distance in the layer's own units, for
	// projected layers.
	Planar
)

// EarthRadiusKm is the mean Earth radius R1 = (2a + b)/3 of the IUGG (Moritz
// 2000, Geodetic Reference System 1980, J. Geodesy 74:128–133), in km. On
// this sphere great-circle distances are within about 0.5% of the geodesic
// ones on the WGS 84 ellipsoid, far closer than area-level analyses need.
const EarthRadiusKm = 6371.0088

// MaxLinks caps the directed links any point-based graph may hold: 50
// million links take about 600 MB as a graph and make each shuffle of a
// permutation test touch every one of them. A request beyond it is an error
// that suggests a smaller k, band or bandwidth.
const MaxLinks = 50_000_000

// String returns "great-circle" or "planar".
func (m Metric) String() string {
	if m == Planar {
		return "planar"
	}
	return "great-circle"
}

// Unit returns the unit distances are given in under m: "km" for
// Geographic, "" (the layer's own units) for Planar.
func (m Metric) Unit() string {
	if m == Planar {
		return ""
	}
	return "km"
}

// DetectMetric returns Geographic when every coordinate of geoms lies within
// [-180, 180] × [-90, 90], the range of longitude/latitude, and Planar
// otherwise (also when a coordinate is not finite). A projected layer whose
// coordinates all happen to fall in that range (a small local grid) is taken
// for longitude/latitude; callers offer a way to force Planar. An empty
// layer counts as Geographic, as RFC 7946 GeoJSON always is.
func DetectMetric(geoms []orb.MultiPolygon) Metric {
	for _, mp := range geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				for _, p := range ring {
					if !(math.Abs(p[0]) <= 180 && math.Abs(p[1]) <= 90) {
						return Planar
					}
				}
			}
		}
	}
	return Geographic
}

// Distance returns the distance between a and b under m: for Geographic the
// great-circle distance in km between two longitude/latitude points, by the
// haversine formula in its atan2 form (Sinnott 1984, Sky & Telescope 68:159),
// which keeps full relative precision for points a few millimetres apart and
// stays well-conditioned up to antipodal points; for Planar the Euclidean
// distance. Every graph builder ranks and thresholds by exactly this value.
func Distance(m Metric, a, b orb.Point) float64 {
	ea, eb := exactData(m, a), exactData(m, b)
	return exactDistance(m == Geographic, &ea, &eb)
}

// exactData is what exactDistance needs of one point: (x, y, 0) for Planar;
// (latitude°, longitude°, cos latitude) for Geographic, in degrees so that
// the differences of nearby coordinates are taken before any rounding of the
// conversion to radians enters.
func exactData(m Metric, p orb.Point) [3]float64 {
	if m == Planar {
		return [3]float64{p[0], p[1], 0}
	}
	return [3]float64{p[1], p[0], math.Cos(p[1] * radPerDeg)}
}

const radPerDeg = math.Pi / 180

// exactDistance is the one distance formula of the package. It is symmetric to the
// last bit (the differences only change sign), so d(i, j) == d(j, i) and
// thresholds give symmetric graphs.
func exactDistance(geo bool, a, b *[3]float64) float64 {
	if !geo {
		dx := float64(a[0] - b[0])
		dy := float64(a[1] - b[1])
		return math.Sqrt(float64(dx*dx) + float64(dy*dy))
	}
	dlat := a[0] - b[0]
	dlon := a[1] - b[1]
	// Across the antimeridian take the short way round; this also keeps the
	// argument small where the sine is most precise.
	if dlon > 180 {
		dlon -= 360
	} else if dlon < -180 {
		dlon += 360
	}
	s1 := math.Sin(dlat * (radPerDeg / 2))
	s2 := math.Sin(dlon * (radPerDeg / 2))
	h := float64(s1*s1) + float64(float64(a[2]*b[2])*float64(s2*s2))
	h = min(h, 1)
	return 2 * EarthRadiusKm * math.Atan2(math.Sqrt(h), math.Sqrt(1-h))
}

// pointIndex is a set of validated points with their k-d tree; at maps an
// area's index to its position in the tree.
type pointIndex struct {
	m    Metric
	geo  bool
	tree *kdtree.Tree
	at   []int32
}

func (ix *pointIndex) len() int { return len(ix.at) }

// exact returns the exact-distance data of area i.
func (ix *pointIndex) exact(i int32) *[3]float64 { return &ix.tree.E[ix.at[i]] }

// newPointIndex checks the points (at least two, finite, in the range of
// longitude/latitude for Geographic) and builds their tree.
func newPointIndex(pts []orb.Point, m Metric) (*pointIndex, error) {
	if m != Geographic && m != Planar {
		return nil, fmt.Errorf("weights: unknown metric %d", m)
	}
	if len(pts) < 2 {
		return nil, fmt.Errorf("weights: distance-based neighbours need at least 2 areas, got %d", len(pts))
	}
	if len(pts) > math.MaxInt32 {
		return nil, fmt.Errorf("weights: %d areas is more than a graph can index", len(pts))
	}
	kp := make([]kdtree.Point, len(pts))
	for i, p := range pts {
		if math.IsNaN(p[0]) || math.IsNaN(p[1]) || math.IsInf(p[0], 0) || math.IsInf(p[1], 0) {
			return nil, fmt.Errorf("weights: area %d has no finite representative point (%v, %v)", i, p[0], p[1])
		}
		if m == Geographic && !(math.Abs(p[0]) <= 180 && math.Abs(p[1]) <= 90) {
			return nil, fmt.Errorf("weights: area %d has representative point (%v, %v), outside longitude/latitude range; use planar distances for projected layers", i, p[0], p[1])
		}
		kp[i].Idx = int32(i)
		kp[i].E = exactData(m, p)
		if m == Planar {
			kp[i].C = [3]float64{p[0], p[1], 0}
		} else {
			lat, lon := p[1]*radPerDeg, p[0]*radPerDeg
			cl := math.Cos(lat)
			kp[i].C = [3]float64{cl * math.Cos(lon), cl * math.Sin(lon), math.Sin(lat)}
		}
	}
	geo := m == Geographic
	exact := func(a, b *[3]float64) float64 { return exactDistance(geo, a, b) }
	ix := &pointIndex{m: m, geo: geo, tree: kdtree.Build(kp, exact), at: make([]int32, len(pts))}
	for p, i := range ix.tree.Idx {
		ix.at[i] = int32(p)
	}
	return ix, nil
}

// reach converts a metric distance r into the squared embedding distance
// within which every point at metric distance ≤ r lies (with kdtree.Slack's margin).
func (ix *pointIndex) reach(r float64) float64 {
	if !ix.geo {
		return kdtree.Slack(r * r)
	}
	theta := r / EarthRadiusKm
	if theta >= math.Pi {
		return math.Inf(1)
	}
	c := 2 * math.Sin(theta/2)
	return kdtree.Slack(c * c)
}

// nearestRows finds the k nearest other areas of every area: row i is
// nb[i*k:(i+1)*k], nearest first, ties in distance by lower index, with the
// distances in dist.
func (ix *pointIndex) nearestRows(k int) (nb []int32, dist []float64) {
	return ix.tree.NearestRows(k)
}

// NearestDistances returns, for every area, the distance under m from its
// representative point to the nearest other one. Its largest value is the
// smallest distance band that leaves no area without a neighbour.
func NearestDistances(pts []orb.Point, m Metric) ([]float64, error) {
	ix, err := newPointIndex(pts, m)
	if err != nil {
		return nil, err
	}
	_, d := ix.nearestRows(1)
	return d, nil
}

// CoincidentError reports two areas whose representative points coincide
// where a builder needs them apart (inverse distance divides by the
// distance). A and B are area indices, A < B, the first such pair in index order.
type CoincidentError struct {
	A, B  int
	Point orb.Point
}

func (e *CoincidentError) Error() string {
	return fmt.Sprintf("weights: areas %d and %d have the same representative point (%v, %v), so inverse-distance weights between them are infinite",
		e.A, e.B, e.Point[0], e.Point[1])
}

// NoNeighboursError reports a distance threshold (band or fixed bandwidth)
// under which no area has a neighbour. Closest is the smallest distance
// between two areas and Widest the largest nearest-neighbour distance: a
// threshold above Closest gives some area a neighbour, one of at least Widest
// gives every area one.
type NoNeighboursError struct {
	Kind      string
	Threshold float64
	Metric    Metric
	Closest   float64
	Widest    float64
	// Unit names the unit of planar distances when the caller knows it
	// ("m"); "" says "layer units".
	Unit string
}

func (e *NoNeighboursError) Error() string {
	length := func(v float64) string {
		if e.Metric == Planar && e.Unit != "" {
			return formatNumber(v) + " " + e.Unit
		}
		return formatLength(v, e.Metric)
	}
	kind := e.Kind
	if e.Metric == Planar && e.Unit != "" {
		kind = strings.ReplaceAll(kind, " (layer units)", " "+e.Unit)
	}
	return fmt.Sprintf("weights: %s gives no area a neighbour: the closest two areas are %s apart, and every area has a neighbour within %s",
		kind, length(roundSignificant(e.Closest, false)), length(roundSignificant(e.Widest, true)))
}

// noNeighbours builds the error for a threshold that linked nothing.
func noNeighbours(ix *pointIndex, kind string, threshold float64) error {
	_, d := ix.nearestRows(1)
	e := &NoNeighboursError{Kind: kind, Threshold: threshold, Metric: ix.m, Closest: math.Inf(1)}
	for _, v := range d {
		e.Closest = min(e.Closest, v)
		e.Widest = max(e.Widest, v)
	}
	return e
}

// checkThreshold rejects a distance that is not a positive finite number.
func checkThreshold(what string, d float64) error {
	if !(d > 0) || math.IsInf(d, 1) {
		return fmt.Errorf("weights: %s must be a positive distance, not %v", what, d)
	}
	return nil
}

// formatNumber writes v for a graph's Kind: plain decimals where they are
// short, exponent form for very large or small values.
func formatNumber(v float64) string {
	if a := math.Abs(v); a == 0 || (a >= 1e-4 && a < 1e15) {
		return strconv.FormatFloat(v, 'f', -1, 64)
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// formatLength writes a distance with its unit.
func formatLength(v float64, m Metric) string {
	if m == Planar {
		return formatNumber(v) + " (layer units)"
	}
	return formatNumber(v) + " km"
}

// roundSignificant rounds v to four significant digits, upwards when up is set so
// that a suggested threshold is never short of the true one.
func roundSignificant(v float64, up bool) float64 {
	if v == 0 || math.IsInf(v, 0) || math.IsNaN(v) {
		return v
	}
	scale := math.Pow(10, math.Floor(math.Log10(math.Abs(v)))-3)
	r := math.Round(v/scale) * scale
	if up && r < v {
		r = math.Ceil(v/scale) * scale
	}
	// Strip the noise the multiplication leaves in the last digits.
	r, _ = strconv.ParseFloat(strconv.FormatFloat(r, 'g', 4, 64), 64)
	return r
}
