package region

import (
	"bufio"
	"encoding/json"
	"io"
	"math"
	"strconv"

	"github.com/areatest/areatest/io/geojson"
)

// WriteGeoJSON writes the region as an RFC 7946 FeatureCollection, one feature
// per line so that a change to a district shows up as a one-line diff. Each
// feature carries the district code as its "id", a Polygon geometry (a
// MultiPolygon for a district in several parts) and the columns of
// ColumnNames as properties, missing values as null. Coordinates were rounded
// to 6 decimals when the region was built, so they are written exactly and
// read back as the same float64 values.
func (r *Region) WriteGeoJSON(w io.Writer) error {
	bw := bufio.NewWriterSize(w, 1<<16)
	note, err := json.Marshal(r.Name + ": an invented region for demonstrations; not real data")
	if err != nil {
		return err
	}
	bw.WriteString(`{"type":"FeatureCollection","note":`)
	bw.Write(note)
	bw.WriteString(`,"features":[` + "\n")
	var buf []byte
	for d := range r.IDs {
		buf = r.appendFeature(buf[:0], d)
		if d+1 < len(r.IDs) {
			buf = append(buf, ',')
		}
		buf = append(buf, '\n')
		if _, err := bw.Write(buf); err != nil {
			return err
		}
	}
	bw.WriteString("]}\n")
	return bw.Flush()
}

func (r *Region) appendFeature(b []byte, d int) []byte {
	b = append(b, `{"type":"Feature","id":`...)
	b = appendString(b, r.IDs[d])
	b = append(b, `,"geometry":`...)
	b = geojson.AppendGeometry(b, r.Geoms[d])
	b = append(b, `,"properties":{"name":`...)
	b = appendString(b, r.Names[d])
	b = append(b, `,"province":`...)
	b = appendString(b, r.Province[d])
	b = append(b, `,"population":`...)
	b = appendNumber(b, r.Population[d])
	b = append(b, `,"cases":`...)
	b = appendNumber(b, r.Cases[d])
	b = append(b, `,"rate":`...)
	b = appendNumber(b, r.Rate[d])
	b = append(b, `,"policy":`...)
	b = appendString(b, r.Policy[d])
	b = append(b, `,"income":`...)
	b = appendNumber(b, r.Income[d])
	b = append(b, `,"urban":`...)
	b = appendString(b, r.Urban[d])
	return append(b, "}}"...)
}

// appendString writes s as a JSON string, or null when s is empty (missing).
func appendString(b []byte, s string) []byte {
	if s == "" {
		return append(b, "null"...)
	}
	q, _ := json.Marshal(s) // a string always marshals
	return append(b, q...)
}

// appendNumber writes x in its shortest exact form, or null for NaN (missing).
func appendNumber(b []byte, x float64) []byte {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return append(b, "null"...)
	}
	return strconv.AppendFloat(b, x, 'f', -1, 64)
}
