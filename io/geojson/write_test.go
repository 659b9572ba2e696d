package geojson

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/layer"
)

// Writing a layer with result columns and reading it back gives the same
// ids, geometry (holes and parts included) and values, and the result
// columns as new attributes.
func TestWriteRoundTrip(t *testing.T) {
	doc := `{"type":"FeatureCollection","features":[
{"type":"Feature","id":"a","properties":{"rate":1.5,"name":"Ash","code":"007"},"geometry":{"type":"Polygon","coordinates":[[[0,0],[4,0],[4,4],[0,4],[0,0]],[[1,1],[1,2],[2,2],[2,1],[1,1]]]}},
{"type":"Feature","id":"b","properties":{"rate":null,"name":"Birch \"B\"","code":"012"},"geometry":{"type":"MultiPolygon","coordinates":[[[[5,0],[6,0],[6,1],[5,0]]],[[[7,0],[8,0],[8,1],[7,0]]]]}}]}`
	l, _, err := Read(strings.NewReader(doc), "in.geojson", Options{})
	if err != nil {
		t.Fatal(err)
	}
	extra := []*layer.Column{
		{Name: "p_value", Kind: layer.Number, Num: []float64{0.0123, 0}, Missing: []bool{false, true}},
		{Name: "cluster", Kind: layer.Text, Str: []string{"high-high", "not significant"}, Missing: []bool{false, false}},
	}
	var buf bytes.Buffer
	if err := Write(&buf, l, extra); err != nil {
		t.Fatal(err)
	}
	var generic map[string]any
	if err := json.Unmarshal(buf.Bytes(), &generic); err != nil {
		t.Fatalf("not JSON: %v", err)
	}
	back, _, err := Read(&buf, "out.geojson", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if back.IDs[0] != "a" || back.IDs[1] != "b" || len(back.Geoms[0][0]) != 2 || len(back.Geoms[1]) != 2 {
		t.Fatalf("ids %v, rings %d, parts %d", back.IDs, len(back.Geoms[0][0]), len(back.Geoms[1]))
	}
	for _, c := range []struct{ col, want0, want1 string }{
		{"rate", "1.5", ""}, {"name", "Ash", `Birch "B"`}, {"code", "007", "012"}, {"p_value", "0.0123", ""}, {"cluster", "high-high", "not significant"},
	} {
		col, err := back.Column(c.col)
		if err != nil {
			t.Fatal(err)
		}
		if col.Label(0) != c.want0 || col.Label(1) != c.want1 {
			t.Errorf("%s: %q %q, want %q %q", c.col, col.Label(0), col.Label(1), c.want0, c.want1)
		}
	}
	if err := Write(&buf, l, []*layer.Column{{Name: "rate", Kind: layer.Number, Num: []float64{1, 2}, Missing: []bool{false, false}}}); err == nil {
		t.Fatal("a result column may not replace an attribute")
	}
}
