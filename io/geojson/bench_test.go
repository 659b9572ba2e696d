package geojson

import (
	"bytes"
	"fmt"
	"math"
	"strings"
	"testing"
)

// synthetic writes n polygon features with m positions each and a few
// properties, in the compact style of common converters.
func synthetic(n, m int) []byte {
	var b bytes.Buffer
	b.WriteString(`{"type":"FeatureCollection","features":[`)
	for i := range n {
		if i > 0 {
			b.WriteByte(',')
		}
		fmt.Fprintf(&b, `{"type":"Feature","id":"%05d","properties":{"NAME":"Area %d","POP":%d,"RATE":"%.3f","URBAN":%v},"geometry":{"type":"Polygon","coordinates":[[`, i, i, 1000+i*7, float64(i%97)/7, i%3 == 0)
		cx, cy := -100+float64(i%1000)*0.1, -60+float64(i/1000)*0.1
		for k := range m {
			a := 2 * math.Pi * float64(k%(m-1)) / float64(m-1)
			if k > 0 {
				b.WriteByte(',')
			}
			fmt.Fprintf(&b, "[%.6f,%.6f]", cx+0.04*math.Cos(a), cy+0.04*math.Sin(a))
		}
		b.WriteString(`]]}}`)
	}
	b.WriteString(`]}`)
	return b.Bytes()
}

func BenchmarkRead(b *testing.B) {
	data := synthetic(5000, 60)
	b.SetBytes(int64(len(data)))
	b.ReportAllocs()
	for b.Loop() {
		lay, _, err := Read(bytes.NewReader(data), "bench.geojson", Options{})
		if err != nil || lay.Len() != 5000 {
			b.Fatal(err)
		}
	}
}

func TestSyntheticReads(t *testing.T) {
	data := synthetic(700, 9)
	lay, warns, err := Read(strings.NewReader(string(data)), "s.geojson", Options{})
	if err != nil || len(warns) != 0 {
		t.Fatal(err, warns)
	}
	checkShape(t, lay)
	if lay.Len() != 700 || len(lay.Columns) != 4 || lay.Columns[2].Kind != 0 || lay.Columns[3].Str[0] != "true" {
		t.Errorf("got %d areas, columns %+v", lay.Len(), lay.Columns)
	}
}
