package input

import (
	"archive/zip"
	"bytes"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/tests/testkit"
)

func TestSniff(t *testing.T) {
	for _, tc := range []struct {
		head string
		want Format
	}{
		{`{"type":"FeatureCollection"}`, GeoJSON},
		{"\ufeff \n {", GeoJSON},
		{"SQLite format 3\x00rest", GeoPackage},
		{"PK\x03\x04....", Zip},
		{"\x00\x00\x27\x0a\x00\x00", Shapefile},
		{"GEOID,rate\n", Unknown},
		{"", Unknown},
	} {
		if got := Sniff([]byte(tc.head)); got != tc.want {
			t.Errorf("Sniff(%q) = %v, want %v", tc.head, got, tc.want)
		}
	}
}

// The formats are told by content: the zipped states under a name that
// says nothing, and the same zip on standard input, read as the shapefile
// they hold; a bare .shp on stdin and a shapefile's companion given as the
// layer are explained.
func TestReadByContent(t *testing.T) {
	zipped, err := os.ReadFile(testkit.Testdata(t, "formats/states.shp.zip"))
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	odd := filepath.Join(dir, "boundaries.data")
	if err := os.WriteFile(odd, zipped, 0o644); err != nil {
		t.Fatal(err)
	}
	for name, read := range map[string]func() (int, error){
		"odd name": func() (int, error) { l, _, err := Read(odd, nil, Options{IDColumn: "fips"}); return lenOf(l), err },
		"stdin": func() (int, error) {
			l, _, err := Read("-", bytes.NewReader(zipped), Options{IDColumn: "fips"})
			return lenOf(l), err
		},
	} {
		if n, err := read(); err != nil || n != 56 {
			t.Errorf("%s: %d areas, %v", name, n, err)
		}
	}
	_, _, err = Read("-", strings.NewReader("\x00\x00\x27\x0a"+strings.Repeat("\x00", 96)), Options{})
	if err == nil || !strings.Contains(err.Error(), "pipe a zip") {
		t.Errorf("bare .shp on stdin: %v", err)
	}
	dbf := filepath.Join(dir, "states.dbf")
	if err := os.WriteFile(dbf, []byte{3, 1, 2, 3}, 0o644); err != nil {
		t.Fatal(err)
	}
	if _, _, err := Read(dbf, nil, Options{}); err == nil || !strings.Contains(err.Error(), "give the .shp file") {
		t.Errorf(".dbf as the layer: %v", err)
	}
}

// A zip of two shapefiles is an error whose Choices list them; Layer picks
// one.
func TestChoices(t *testing.T) {
	src, err := zip.OpenReader(testkit.Testdata(t, "formats/states.shp.zip"))
	if err != nil {
		t.Fatal(err)
	}
	defer src.Close()
	var buf bytes.Buffer
	zw := zip.NewWriter(&buf)
	for _, prefix := range []string{"east/", "west/"} {
		for _, f := range src.File {
			r, err := f.Open()
			if err != nil {
				t.Fatal(err)
			}
			w, err := zw.Create(prefix + strings.ReplaceAll(filepath.Base(f.Name), "states", strings.TrimSuffix(prefix, "/")))
			if err != nil {
				t.Fatal(err)
			}
			if _, err := io.Copy(w, r); err != nil {
				t.Fatal(err)
			}
			r.Close()
		}
	}
	if err := zw.Close(); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "two.zip")
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	_, _, err = Read(path, nil, Options{IDColumn: "fips"})
	if c := Choices(err); len(c) != 2 || c[0] != "east" || c[1] != "west" {
		t.Errorf("two shapefiles: choices %v, error %v", c, err)
	}
	if l, _, err := Read(path, nil, Options{IDColumn: "fips", Layer: "west"}); err != nil || l.Len() != 56 {
		t.Errorf("Layer west: %v", err)
	}
}

func lenOf(l *layer.Layer) int {
	if l == nil {
		return 0
	}
	return l.Len()
}
