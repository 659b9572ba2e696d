package geojson

import (
	"fmt"

	"github.com/areatest/areatest/io/crs"
	"github.com/areatest/areatest/io/layer"
)

// coordinateSystem decides, once the whole file is read, what the
// coordinates are: the projected system a legacy "crs" member names, or
// else longitude/latitude when every position lies in range, or else
// planar coordinates in unknown units, unless the member names a
// geographic system, which the coordinates then contradict.
func (rd *reader) coordinateSystem() (layer.CRS, error) {
	fs := &rd.feat
	var named layer.CRS
	known := false
	if rd.crs != "" {
		named, known = crs.FromName(rd.crs)
	}
	switch {
	case known && named.Projected:
		rd.warn(`the legacy "crs" member names %s, a projected system (EPSG:%d, unit %s); the coordinates are read as planar coordinates in it`, quote(rd.crs), named.EPSG, named.Unit)
		return named, nil
	case fs.outside == "":
		if rd.crs != "" && !isWGS84(rd.crs) {
			rd.warn(`the legacy "crs" member names %s; the coordinates were read as lon/lat WGS84, as RFC 7946 requires`, quote(rd.crs))
		}
		return layer.CRS{}, nil
	case known:
		msg := fmt.Sprintf(`coordinate %s is not a longitude/latitude pair, yet the legacy "crs" member names %s, a geographic system; the file contradicts itself`, fs.outside, quote(rd.crs))
		if !fs.geom.unswappable {
			msg += ", unless its positions are written [latitude, longitude] instead of [longitude, latitude]"
		}
		return layer.CRS{}, rd.fail(fs.outsidePos, fs.outsideID, "%s", msg)
	}
	first := fmt.Sprintf("(first: %s in %s)", fs.outside, featureLabel(fs.outsidePos, fs.outsideID))
	what := "has no coordinate system definition"
	if rd.crs != "" {
		what = fmt.Sprintf(`has a legacy "crs" member naming %s, a system not known here,`, quote(rd.crs))
	}
	msg := fmt.Sprintf("%s and its coordinates are not longitude/latitude %s; they are read as planar coordinates in unknown units, and distances will be in those units", what, first)
	if !fs.geom.unswappable {
		msg += "; if they are degrees, its positions are written [latitude, longitude] and must be swapped"
	}
	rd.warn("%s", msg)
	return layer.CRS{Projected: true, Name: rd.crs}, nil
}
