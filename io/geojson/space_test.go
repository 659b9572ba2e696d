package geojson

import (
	"io"
	"runtime"
	"strconv"
	"strings"
	"testing"
)

// spaces yields n bytes of white space without holding them.
type spaces struct{ n int }

func (s *spaces) Read(p []byte) (int, error) {
	if s.n == 0 {
		return 0, io.EOF
	}
	k := min(len(p), s.n)
	for i := range k {
		p[i] = " \n\t\r"[i%4]
	}
	s.n -= k
	return k, nil
}

// A large input of white space only is refused without being held in
// memory: the bytes allocated stay far below its size.
func TestWhiteSpaceInputStreams(t *testing.T) {
	const size = 50 << 20
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	_, _, err := Read(&spaces{size}, "ws.geojson", Options{})
	runtime.ReadMemStats(&after)
	if err == nil || !strings.Contains(err.Error(), "only white space (52,428,800 bytes)") {
		t.Fatalf("error %v", err)
	}
	if alloc := after.TotalAlloc - before.TotalAlloc; alloc > size/50 {
		t.Errorf("%d bytes allocated reading %d bytes of white space", alloc, size)
	}
}

// White space before a layer, long or short, changes nothing but the
// positions in messages, which still count it.
func TestLeadingWhiteSpace(t *testing.T) {
	layer := `{"type":"FeatureCollection","features":[{"type":"Feature","id":"a","properties":{},` +
		`"geometry":{"type":"Polygon","coordinates":[[[0,0],[1,0],[1,1],[0,0]]]}}]}`
	for _, lead := range []int{0, 10, 255, 256, 257, spaceChunk - 1, spaceChunk, 3*spaceChunk + 7} {
		l, _, err := Read(io.MultiReader(&spaces{lead}, strings.NewReader(layer)), "x", Options{})
		if err != nil || len(l.IDs) != 1 {
			t.Errorf("%d spaces first: %v", lead, err)
		}
		bad := strings.Replace(layer, `"id":"a"`, `"id":a`, 1)
		_, _, err = Read(strings.NewReader(strings.Repeat(" ", lead)+bad), "x", Options{})
		want := "byte offset " // a strings.Reader seeks, so this is a line and column
		if err == nil || strings.Contains(err.Error(), want) {
			t.Errorf("%d spaces first: %v", lead, err)
		}
		if col := lead + strings.Index(bad, "a,") + 1; !strings.Contains(err.Error(), "column "+strconv.Itoa(col)) {
			t.Errorf("%d spaces first: %v, want column %d", lead, err, col)
		}
	}
}
