package gpkg

import (
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/tests/testkit"
)

// TestWriteReadBack: what Write writes reads back with the same ids,
// columns and geometry, and the result columns after the layer's.
func TestWriteReadBack(t *testing.T) {
	src, _, err := ReadFile(testkit.Testdata(t, "formats/states-5070.gpkg"), Options{IDColumn: "fips"})
	if err != nil {
		t.Fatal(err)
	}
	n := src.Len()
	rate := layer.NewBuilder("rate", 0)
	class := layer.NewBuilder("Name", 0) // clashes with "name": becomes Name_2
	for i := range n {
		if i%7 == 0 {
			rate.AddMissing()
		} else {
			rate.AddNumber(float64(i)/3, "")
		}
		class.AddText([]string{"high-high", "low-low", "not significant"}[i%3])
	}
	extra := []*layer.Column{rate.Column(), class.Column()}
	path := writeFile(t, t.TempDir(), "out.gpkg", src, extra, "states")
	got, warns, err := ReadFile(path, Options{IDColumn: "fips"})
	if err != nil || len(warns) > 0 {
		t.Fatal(err, warns)
	}
	if !slices.Equal(got.IDs, src.IDs) || got.CRS != (layer.CRS{Projected: true, Unit: "metre", MetresPerUnit: 1, Name: "NAD83 / Conus Albers", EPSG: 5070}) {
		t.Fatalf("ids %v…, CRS %+v", got.IDs[:3], got.CRS)
	}
	var names []string
	for _, c := range got.Columns {
		names = append(names, c.Name)
	}
	// The ids come first, under the name of the column they came from.
	if want := []string{"fips", "id", "name", "centroid_lon", "centroid_lat", "rate", "Name_2"}; !slices.Equal(names, want) {
		t.Fatalf("columns %v, want %v", names, want)
	}
	for k, want := range append(slices.Clone(src.Columns[:2]), append(src.Columns[3:], extra...)...) {
		g := got.Columns[k+1]
		for i := range n {
			if g.Kind != want.Kind || g.Label(i) != want.Label(i) || g.Missing[i] != want.Missing[i] {
				t.Fatalf("column %s, area %d: %v %q, wrote %v %q", g.Name, i, g.Kind, g.Label(i), want.Kind, want.Label(i))
			}
		}
	}
	for i := range n {
		for p := range src.Geoms[i] {
			for r := range src.Geoms[i][p] {
				if !slices.Equal(got.Geoms[i][p][r], src.Geoms[i][p][r]) {
					t.Fatalf("area %s: geometry differs", src.IDs[i])
				}
			}
		}
	}
	checkWithGDAL(t, path, n, []string{"id: String", "fips: String", "name: String", "centroid_lon: Real", "rate: Real", "Name_2: String"})
}

// checkWithGDAL has GDAL's ogrinfo, when installed, list the file: the
// outside check that it is a GeoPackage others read.
func checkWithGDAL(t *testing.T, path string, count int, columns []string) {
	t.Helper()
	if _, err := os.Stat("/usr/bin/ogrinfo"); err != nil {
		t.Log("GDAL's ogrinfo is not installed; the file is not checked with it")
		return
	}
	out, err := exec.Command("/usr/bin/ogrinfo", "-so", "-al", path).CombinedOutput()
	text := string(out)
	if err != nil || strings.Contains(text, "ERROR") || strings.Contains(text, "Warning") {
		t.Fatalf("ogrinfo: %v\n%s", err, text)
	}
	for _, want := range append([]string{"using driver `GPKG' successful", "Geometry: Multi Polygon", "Feature Count: " + itoa(count)}, columns...) {
		if !strings.Contains(text, want) {
			t.Errorf("ogrinfo's listing lacks %q:\n%s", want, text)
		}
	}
}

func itoa(n int) string { return layer.FormatNumber(float64(n)) }

// TestWriteCoordinateSystems: each kind of system the layer model holds
// is written so that it reads back the same.
func TestWriteCoordinateSystems(t *testing.T) {
	for _, c := range []layer.CRS{
		{},
		{Name: "NAD83", EPSG: 4269},
		{Projected: true, Unit: "metre", MetresPerUnit: 1, Name: "WGS 84 / UTM zone 15N", EPSG: 32615},
		{Projected: true, Unit: "US survey foot", MetresPerUnit: 1200.0 / 3937, Name: "county grid"},
	} {
		l := smallLayer()
		l.CRS = c
		if c.Projected {
			for _, g := range l.Geoms {
				for k := range g[0][0] {
					g[0][0][k][0] += 500000
				}
			}
		}
		got, warns, err := ReadFile(writeFile(t, t.TempDir(), "crs.gpkg", l, nil, ""), Options{IDColumn: "id"})
		if err != nil || len(warns) > 0 {
			t.Fatal(err, warns)
		}
		want := c
		if c == (layer.CRS{}) {
			want = layer.CRS{Name: "WGS 84", EPSG: 4326}
		}
		if want.Name == "" {
			want.Name = got.CRS.Name
		}
		if got.CRS != want {
			t.Errorf("wrote %+v, read %+v", c, got.CRS)
		}
	}
	// A projected layer whose unit is unknown: GeoPackage's undefined
	// Cartesian system, read back as projected with a warning.
	l := smallLayer()
	l.CRS = layer.CRS{Projected: true}
	l.Geoms[0][0][0][1][0] = 9000
	got, warns, err := ReadFile(writeFile(t, t.TempDir(), "crs.gpkg", l, nil, ""), Options{})
	if err != nil || got.CRS != l.CRS || len(warns) != 1 || !strings.Contains(warns[0], "has no coordinate system definition and its coordinates are not longitude/latitude") {
		t.Errorf("unknown unit: %v %+v %q", err, got.CRS, warns)
	}
}

// TestWriteChecks: columns of the wrong length are refused, and no
// temporary file is left behind.
func TestWriteChecks(t *testing.T) {
	tmp := t.TempDir()
	t.Setenv("TMPDIR", tmp)
	l := smallLayer()
	short := &layer.Column{Name: "short", Kind: layer.Number, Num: []float64{1}, Missing: []bool{false}}
	err := Write(&strings.Builder{}, l, []*layer.Column{short}, "")
	if err == nil || !strings.Contains(err.Error(), `gpkg: column "short" has 1 values for 3 areas`) {
		t.Errorf("short column: %v", err)
	}
	writeFile(t, t.TempDir(), "ok.gpkg", l, nil, `odd "name"`)
	if left := listDir(t, tmp); len(left) > 0 {
		t.Errorf("left behind: %v", left)
	}
}

func TestWriteToGDAL(t *testing.T) {
	path := writeFile(t, t.TempDir(), "small.gpkg", smallLayer(), nil, "")
	checkWithGDAL(t, path, 3, []string{"Layer name: areas", "id: String", "name: String", "pop: Real", "code: String"})
	if _, err := os.Stat(filepath.Join(filepath.Dir(path), "small.gpkg-journal")); err == nil {
		t.Error("a journal was left beside the file")
	}
}
