package geojson

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

// Write writes the layer as an RFC 7946 FeatureCollection, one feature per
// line: each area's id, its geometry (a Polygon when it has one part, else a
// MultiPolygon) and its attributes, followed by the extra columns (results
// to add to the map). Missing values are written as null. An extra column
// whose name is already an attribute is an error, so a result never hides
// an input value.
func Write(w io.Writer, l *layer.Layer, extra []*layer.Column) error {
	names := map[string]bool{}
	for _, c := range l.Columns {
		names[c.Name] = true
	}
	for _, c := range extra {
		if names[c.Name] {
			return fmt.Errorf("geojson: the result column %q has the name of an attribute of %s", c.Name, l.Source)
		}
		if len(c.Missing) != l.Len() {
			return fmt.Errorf("geojson: result column %q has %d values for %d areas", c.Name, len(c.Missing), l.Len())
		}
		names[c.Name] = true
	}
	cols := append(append([]*layer.Column(nil), l.Columns...), extra...)
	keys := make([][]byte, len(cols))
	for k, c := range cols {
		b, err := json.Marshal(c.Name)
		if err != nil {
			return err
		}
		keys[k] = b
	}
	bw := bufio.NewWriterSize(w, 1<<16)
	bw.WriteString(`{"type":"FeatureCollection","features":[` + "\n")
	var buf []byte
	for i := 0; i < l.Len(); i++ {
		buf = buf[:0]
		if i > 0 {
			buf = append(buf, ",\n"...)
		}
		buf = append(buf, `{"type":"Feature","id":`...)
		buf = strconv.AppendQuote(buf, l.IDs[i])
		buf = append(buf, `,"properties":{`...)
		for k, c := range cols {
			if k > 0 {
				buf = append(buf, ',')
			}
			buf = append(buf, keys[k]...)
			buf = append(buf, ':')
			switch {
			case c.Missing[i] || (c.Kind == layer.Number && (math.IsNaN(c.Num[i]) || math.IsInf(c.Num[i], 0))):
				buf = append(buf, "null"...)
			case c.Kind == layer.Number:
				buf = strconv.AppendFloat(buf, c.Num[i], 'g', -1, 64)
			default:
				buf = strconv.AppendQuote(buf, c.Str[i])
			}
		}
		buf = append(buf, `},"geometry":`...)
		buf = AppendGeometry(buf, l.Geoms[i])
		buf = append(buf, '}')
		if _, err := bw.Write(buf); err != nil {
			return err
		}
	}
	bw.WriteString("\n]}\n")
	return bw.Flush()
}

// AppendGeometry appends mp as a GeoJSON geometry: a Polygon when it has one
// part, else a MultiPolygon, coordinates in their shortest exact decimal
// form (never with an exponent, which some GIS readers reject).
func AppendGeometry(buf []byte, mp orb.MultiPolygon) []byte {
	if len(mp) == 1 {
		buf = append(buf, `{"type":"Polygon","coordinates":`...)
		buf = appendPolygon(buf, mp[0])
		return append(buf, '}')
	}
	buf = append(buf, `{"type":"MultiPolygon","coordinates":[`...)
	for k, p := range mp {
		if k > 0 {
			buf = append(buf, ',')
		}
		buf = appendPolygon(buf, p)
	}
	return append(buf, "]}"...)
}

func appendPolygon(buf []byte, p orb.Polygon) []byte {
	buf = append(buf, '[')
	for r, ring := range p {
		if r > 0 {
			buf = append(buf, ',')
		}
		buf = append(buf, '[')
		for k, pt := range ring {
			if k > 0 {
				buf = append(buf, ',')
			}
			buf = append(buf, '[')
			buf = strconv.AppendFloat(buf, pt[0], 'f', -1, 64)
			buf = append(buf, ',')
			buf = strconv.AppendFloat(buf, pt[1], 'f', -1, 64)
			buf = append(buf, ']')
		}
		buf = append(buf, ']')
	}
	return append(buf, ']')
}
