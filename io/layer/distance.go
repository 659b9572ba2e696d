package layer

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// metresPer gives the length of the distance units a user may write after
// a number ("25km", "15 mi", "4000m"), in metres: the international mile
// and foot (exact by definition, common knowledge).
var metresPer = map[string]float64{
	"m": 1, "km": 1000, "mi": 1609.344, "ft": 0.3048,
}

// DistanceUnits lists the unit suffixes ParseDistance accepts.
const DistanceUnits = "m, km, mi or ft"

// ParseDistance reads a distance as a user writes it: a positive number,
// optionally followed by a unit (m, km, mi, ft; spaces allowed, any case).
// It returns the number and the unit, "" when none was given.
func ParseDistance(s string) (v float64, unit string, err error) {
	t := strings.TrimSpace(s)
	if f, err := strconv.ParseFloat(t, 64); err == nil && (math.IsNaN(f) || math.IsInf(f, 0)) {
		return 0, "", fmt.Errorf("%q: a distance must be a finite number", s)
	}
	end := len(t)
	for end > 0 && (t[end-1] >= 'a' && t[end-1] <= 'z' || t[end-1] >= 'A' && t[end-1] <= 'Z') {
		end--
	}
	unit = strings.ToLower(t[end:])
	num := strings.TrimSpace(t[:end])
	if unit != "" {
		if _, ok := metresPer[unit]; !ok {
			return 0, "", fmt.Errorf("%q has the unit %q; distances take %s, or no unit", s, t[end:], DistanceUnits)
		}
	}
	v, perr := strconv.ParseFloat(num, 64)
	if perr != nil || !IsDecimal(num) {
		return 0, "", fmt.Errorf("%q is not a distance: write a number, optionally with a unit (%s), such as 25km", s, DistanceUnits)
	}
	return v, unit, nil
}

// InLayerUnits converts a distance v given in unit (a ParseDistance unit,
// or "" for none) to the units distances are measured in on a layer of
// this coordinate system: kilometres on a geographic layer, the
// coordinates' own unit on a projected one. A bare number keeps that
// meaning (km, or layer units). A unit on a projected layer whose unit is
// unknown cannot be converted: an error that says to give layer units.
func (c CRS) InLayerUnits(v float64, unit string) (float64, error) {
	if unit == "" {
		return v, nil
	}
	m := v * metresPer[unit]
	if !c.Projected {
		return m / 1000, nil
	}
	if c.MetresPerUnit <= 0 {
		return 0, fmt.Errorf("the layer's coordinate unit is unknown, so %v%s cannot be converted; give the distance as a bare number in the layer's units", v, unit)
	}
	return m / c.MetresPerUnit, nil
}
