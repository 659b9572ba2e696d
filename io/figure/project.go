package figure

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
)

// projector turns layer coordinates into a plane with y pointing north.
//
// Longitude/latitude layers are drawn in the Lambert cylindrical
// equal-area projection with its standard parallel at the middle latitude
// of the layer and its central meridian at the middle longitude:
// x = (λ − λ0)·cos φs, y = sin φ / cos φs. Areas keep their true relative
// size, which a map of rates must (a big area must not look more important
// than it is), and shapes are true along the standard parallel, so a layer
// of modest north–south extent looks as it does on a globe. A layer that
// crosses the antimeridian is recognised (its longitudes span less once
// shifted to 0…360) and drawn in one piece.
//
// Other layers are drawn as they are, x east and y north.
type projector struct {
	lonlat bool
	wrap   bool    // longitudes below 0 are shifted by 360
	lam0   float64 // central meridian, radians
	cosS   float64 // cosine of the standard parallel
}

func newProjector(geoms []orb.MultiPolygon, lonlat bool) (projector, error) {
	p := projector{lonlat: lonlat}
	if !lonlat {
		return p, nil
	}
	lonLo, lonHi := math.Inf(1), math.Inf(-1)
	shLo, shHi := math.Inf(1), math.Inf(-1)
	latLo, latHi := math.Inf(1), math.Inf(-1)
	for i, mp := range geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				for _, q := range ring {
					if math.Abs(q[0]) > 180 || math.Abs(q[1]) > 90 {
						return p, fmt.Errorf("plot: area %d has the point (%g, %g), which is not longitude/latitude; draw it without the LonLat option", i+1, q[0], q[1])
					}
					lonLo, lonHi = min(lonLo, q[0]), max(lonHi, q[0])
					latLo, latHi = min(latLo, q[1]), max(latHi, q[1])
					sh := q[0]
					if sh < 0 {
						sh += 360
					}
					shLo, shHi = min(shLo, sh), max(shHi, sh)
				}
			}
		}
	}
	if math.IsInf(lonLo, 1) {
		return p, nil
	}
	lam0 := (lonLo + lonHi) / 2
	if shHi-shLo < lonHi-lonLo-1e-9 {
		p.wrap = true
		lam0 = (shLo + shHi) / 2
	}
	p.lam0 = lam0 * math.Pi / 180
	// Near a pole the cosine vanishes; beyond 80° the map stretches, but it
	// stays finite.
	phiS := math.Min(math.Abs(latLo+latHi)/2, 80)
	p.cosS = math.Cos(phiS * math.Pi / 180)
	return p, nil
}

func (p projector) xy(q orb.Point) (x, y float64) {
	if !p.lonlat {
		return q[0], q[1]
	}
	lon := q[0]
	if p.wrap && lon < 0 {
		lon += 360
	}
	return (lon*math.Pi/180 - p.lam0) * p.cosS, math.Sin(q[1]*math.Pi/180) / p.cosS
}
