package crs

import (
	"strconv"
	"strings"

	"github.com/areatest/areatest/io/layer"
)

// FromName reads a coordinate system named the ways GeoJSON's legacy "crs"
// member and other inputs name one: "EPSG:5070", "urn:ogc:def:crs:EPSG::5070",
// "http://www.opengis.net/def/crs/EPSG/0/5070", or OGC's CRS84 (longitude,
// latitude on WGS 84). known is false for a name it cannot place; the
// returned CRS then keeps the name, and the caller decides from the
// coordinates whether they are degrees.
func FromName(name string) (c layer.CRS, known bool) {
	s := strings.TrimSpace(name)
	u := strings.ToUpper(s)
	if strings.Contains(u, "CRS84") || strings.Contains(u, "CRS:84") || u == "WGS84" || u == "WGS 84" {
		return layer.CRS{Name: s}, true
	}
	if !strings.Contains(u, "EPSG") {
		return layer.CRS{Name: s}, false
	}
	code, err := strconv.Atoi(u[strings.LastIndexAny(u, ":/")+1:])
	if err != nil {
		return layer.CRS{Name: s}, false
	}
	c, known = Lookup(code)
	c.Name = s
	return c, known
}

// Lookup places an EPSG code: the geographic systems in everyday use and
// the projected ones whose unit is the metre or a foot (world and
// continental projections, the UTM zones on WGS 84, NAD83 and ETRS89,
// national grids, the NAD83 state planes). known is false for other codes.
// The list is ours, taken from the EPSG dataset's definitions of these
// codes; a definition in the input (a .prj or GeoPackage) always takes
// precedence over it.
func Lookup(code int) (c layer.CRS, known bool) {
	c.EPSG = code
	if geographicCodes[code] {
		return c, true
	}
	metre := layer.CRS{Projected: true, Unit: "metre", MetresPerUnit: 1, EPSG: code}
	usFoot := layer.CRS{Projected: true, Unit: "US survey foot", MetresPerUnit: 1200.0 / 3937, EPSG: code}
	foot := layer.CRS{Projected: true, Unit: "foot", MetresPerUnit: 0.3048, EPSG: code}
	switch {
	case metreCodes[code],
		code >= 32601 && code <= 32660, code >= 32701 && code <= 32760, // WGS 84 / UTM north and south
		code >= 26901 && code <= 26923, // NAD83 / UTM
		code >= 25828 && code <= 25838, // ETRS89 / UTM
		code >= 26929 && code <= 26998, // NAD83 / state planes in metres
		code >= 28348 && code <= 28358, // GDA94 / MGA
		code >= 7846 && code <= 7859:   // GDA2020 / MGA
		return metre, true
	case usFootCodes[code]:
		return usFoot, true
	case footCodes[code]:
		return foot, true
	}
	return c, false
}

var geographicCodes = map[int]bool{
	4326: true, // WGS 84
	4269: true, // NAD83
	4267: true, // NAD27
	4258: true, // ETRS89
	4283: true, // GDA94
	7844: true, // GDA2020
	4617: true, // NAD83(CSRS)
	4674: true, // SIRGAS 2000
	4167: true, // NZGD2000
	4612: true, // JGD2000
	6668: true, // JGD2011
	4490: true, // China Geodetic Coordinate System 2000
	4148: true, // Hartebeesthoek94
	4230: true, // ED50
	4277: true, // OSGB36
	4171: true, // RGF93
	6318: true, // NAD83(2011)
	4759: true, // NAD83(NSRS2007)
	4152: true, // NAD83(HARN)
	4019: true, // Unknown datum based upon the GRS 1980 ellipsoid
}

var metreCodes = map[int]bool{
	3857:   true, // WGS 84 / Pseudo-Mercator
	3395:   true, // WGS 84 / World Mercator
	6933:   true, // WGS 84 / NSIDC EASE-Grid 2.0 Global (equal area)
	8857:   true, // WGS 84 / Equal Earth Greenwich
	5070:   true, // NAD83 / Conus Albers
	2163:   true, // US National Atlas Equal Area
	9311:   true, // NAD27 / US National Atlas Equal Area
	6350:   true, // NAD83(2011) / Conus Albers
	3338:   true, // NAD83 / Alaska Albers
	3035:   true, // ETRS89-extended / LAEA Europe
	3034:   true, // ETRS89-extended / LCC Europe
	27700:  true, // OSGB36 / British National Grid
	2154:   true, // RGF93 v1 / Lambert-93
	3005:   true, // NAD83 / BC Albers
	3347:   true, // NAD83 / Statistics Canada Lambert
	3978:   true, // NAD83 / Canada Atlas Lambert
	3577:   true, // GDA94 / Australian Albers
	9473:   true, // GDA2020 / Australian Albers
	2193:   true, // NZGD2000 / New Zealand Transverse Mercator 2000
	3006:   true, // SWEREF99 TM
	3067:   true, // ETRS89 / TM35FIN(E,N)
	25832:  true, // ETRS89 / UTM zone 32N (also in the range above)
	31467:  true, // DHDN / 3-degree Gauss-Kruger zone 3
	2056:   true, // CH1903+ / LV95
	3763:   true, // ETRS89 / Portugal TM06
	5514:   true, // S-JTSK / Krovak East North
	3310:   true, // NAD83 / California Albers
	3081:   true, // NAD83 / Texas State Mapping System
	3083:   true, // NAD83 / Texas Centric Albers Equal Area
	102003: true, // ESRI: USA Contiguous Albers Equal Area Conic
}

// usFootCodes are NAD83 state planes in US survey feet (a selection of the
// most used; the rest are placed from their definitions).
var usFootCodes = map[int]bool{
	2225: true, 2226: true, 2227: true, 2228: true, 2229: true, 2230: true, // California I–VI
	2263: true,                         // New York Long Island
	2260: true, 2261: true, 2262: true, // New York East, Central, West
	2276: true, 2277: true, 2278: true, 2279: true, 2275: true, // Texas
	2236: true, 2237: true, 2238: true, // Florida East, West, North
	2240: true, 2239: true, // Georgia West, East
	2248: true,             // Maryland
	2272: true, 2271: true, // Pennsylvania South, North
	2283: true, 2284: true, // Virginia North, South
	2264: true,             // North Carolina
	2926: true, 2927: true, // Washington North, South (HARN)
	3435: true, 3436: true, // Illinois East, West
	2267: true, 2268: true, // Oklahoma North, South
}

// footCodes are state planes in international feet.
var footCodes = map[int]bool{
	2251: true, 2252: true, 2253: true, // Michigan North, Central, South
	2269: true, 2270: true, // Oregon North, South
	2222: true, 2223: true, 2224: true, // Arizona East, Central, West
}
