package geojson

import (
	"bytes"
	"errors"
	"strings"
	"testing"
)

func FuzzRead(f *testing.F) {
	f.Add([]byte(fc(sq(`"a"`), sq(`2`))), false)
	f.Add([]byte(fc(feat(``, poly(`[[[0,0],[4,0],[4,4],[0,4]],[[1,1],[1,2],[2,2],[1,1]]]`), `{"GEOID":"01","v":"1.5","w":null,"x":{"k":[1]}}`))), true)
	f.Add([]byte(`{"features":[{"type":"Feature","geometry":{"type":"MultiPolygon","coordinates":[[[[0,0],[1,0],[1,1],[0,0]]]]},"properties":{"GEOID":7}}],"crs":{"type":"name","properties":{"name":"EPSG:2263"}},"type":"FeatureCollection"}`), false)
	f.Add([]byte(fc(feat(`"a"`, `{"type":"Point","coordinates":[0,0]}`, `{}`), sq(`"b"`))), true)
	f.Add([]byte(fc(feat(`"a"`, poly(`[[[500000,0],[1,0],[1,1],[0,0]]]`), `{}`))), false)
	f.Add([]byte(`{"type":"FeatureCollection","features":[{"type":"Feature","id":"01","geometry":{"type":"Polygon","coordinates":[[[736249.0,825225.8],[741178.7,824190.4],[747923.2,826368.9],[736249.0,825225.8]]]},"properties":{}}],"crs":{"type":"name","properties":{"name":"urn:ogc:def:crs:EPSG::5070"}}}`), false)
	f.Add([]byte(`{"crs":{"type":"name","properties":{"name":"EPSG:4326"}},"type":"FeatureCollection","features":[{"type":"Feature","id":1,"geometry":{"type":"Polygon","coordinates":[[[45,120],[45,121],[46,121],[45,120]]]},"properties":{}}]}`), false)
	f.Add([]byte(`{"type":"Feature"}`), false)
	f.Add([]byte(`[1,2`), false)
	// Columns of numbers with bad values, repeated keys of different kinds,
	// and a CSV table given as GeoJSON.
	f.Add([]byte(fc(feat(`"a"`, poly(square), `{"v":"12,5","w":"x","w":2,"c":"01001"}`), feat(`"b"`, poly(square), `{"v":3,"w":{"k":1},"c":1e999}`))), false)
	f.Add([]byte("GEOID,rate\r\n01001,2.5\r\n"), false)
	f.Add([]byte("<?xml version=\"1.0\"?>"), false)
	f.Fuzz(func(t *testing.T, data []byte, idColumn bool) {
		opt := Options{SkipBadGeometry: len(data)%2 == 0}
		if idColumn {
			opt.IDColumn = "GEOID"
		}
		lay, _, err := Read(bytes.NewReader(data), "fuzz.geojson", opt)
		if err != nil {
			if lay != nil {
				t.Fatalf("layer along with error %v", err)
			}
			var ge *Error
			if !errors.As(err, &ge) {
				t.Fatalf("error %T is not an *Error: %v", err, err)
			}
			if msg := err.Error(); strings.ContainsAny(msg, "\n\r") || !strings.HasPrefix(msg, "fuzz.geojson: ") {
				t.Fatalf("bad message %q", msg)
			}
			return
		}
		if lay == nil {
			t.Fatal("nil layer without error")
		}
		checkShape(t, lay)
		// Every column asked for as numbers: no panic, one line naming the
		// source.
		for _, c := range lay.Columns {
			c.MostlyNumbers()
			if _, err := lay.NumericColumn(c.Name, "the variable"); err != nil {
				if msg := err.Error(); strings.ContainsAny(msg, "\n\r") || !strings.HasPrefix(msg, "fuzz.geojson: ") {
					t.Fatalf("bad column message %q", msg)
				}
			}
		}
	})
}
