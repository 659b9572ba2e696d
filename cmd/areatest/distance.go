package main

import (
	"math"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/weights"
)

// distanceFlag is a distance on the command line: a number with an
// optional unit (25km, 15mi, 4000m). The number goes to dst at once, so
// the flag checks see its sign; the unit is converted once the layer's
// coordinate system is known (resolve). A bare number means km on a
// lon/lat layer and the layer's own units on a projected one.
type distanceFlag struct {
	name string
	v    float64
	unit string
	dst  *float64
	// degrees converts a unit to the layer's coordinates on a lon/lat
	// layer (degrees, for --snap) rather than to km.
	degrees bool
}

// distanceVar registers a distance flag.
func distanceVar(fs *pflag.FlagSet, dst *float64, name, usage string) *distanceFlag {
	d := &distanceFlag{name: name, dst: dst}
	fs.Var(d, name, usage)
	return d
}

func (d *distanceFlag) String() string {
	if d.v == 0 && d.unit == "" {
		return "0"
	}
	return layer.FormatNumber(d.v) + d.unit
}

func (d *distanceFlag) Set(s string) error {
	v, unit, err := layer.ParseDistance(s)
	if err != nil {
		return err
	}
	d.v, d.unit, *d.dst = v, unit, v
	return nil
}

func (d *distanceFlag) Type() string { return "distance" }

// resolve converts a distance given with a unit into the layer's distance
// units (see layer.CRS.InLayerUnits), or into degrees for a flag measured
// in the coordinates of a lon/lat layer, on a sphere of the mean Earth
// radius (the default snap's few centimetres make its ellipsoidal error
// immaterial).
func (d *distanceFlag) resolve(crs layer.CRS, into *float64) error {
	if d.unit == "" {
		*into = d.v
		return nil
	}
	v, err := crs.InLayerUnits(d.v, d.unit)
	if err != nil {
		return usagef("--%s: %v", d.name, err)
	}
	if d.degrees && !crs.Projected {
		v /= weights.EarthRadiusKm * math.Pi / 180
	}
	*into = v
	return nil
}

// distanceHelp is the part of the distance flags' help that says how units
// are read.
const distanceHelp = " (a number with an optional unit m, km, mi or ft: 25km; a bare number is km on lon/lat layers, the layer's own units on projected ones)"
