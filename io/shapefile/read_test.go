package shapefile

import (
	"archive/zip"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/tests/testkit"
)

// fixture is the path of a file under tests/testdata/formats.
func fixture(t testing.TB, name string) string {
	return testkit.Testdata(t, "formats/"+name)
}

// unzipTo unpacks a fixture into dir, folders flattened, and returns the
// path of its .shp.
func unzipTo(t testing.TB, name, dir string) string {
	t.Helper()
	zr, err := zip.OpenReader(fixture(t, name))
	if err != nil {
		t.Fatal(err)
	}
	defer zr.Close()
	shp := ""
	for _, f := range zr.File {
		if strings.HasSuffix(f.Name, "/") {
			continue
		}
		rc, err := f.Open()
		if err != nil {
			t.Fatal(err)
		}
		data, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			t.Fatal(err)
		}
		p := filepath.Join(dir, filepath.Base(f.Name))
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
		if strings.HasSuffix(p, ".shp") {
			shp = p
		}
	}
	return shp
}

// shortNames maps the GeoJSON property names to the dBASE field names
// ogr2ogr made of them (at most 10 characters).
var shortNames = map[string]string{"centroid_lon": "centroid_l", "centroid_lat": "centroid_1"}

// TestFixtures reads the shapefiles ogr2ogr made from the states GeoJSON
// and checks them against geojson.ReadFile of the GeoJSON: ids, columns
// with their values and kinds, geometry, coordinate system.
func TestFixtures(t *testing.T) {
	ref, _, err := geojson.ReadFile(testkit.Testdata(t, "us-states.geojson"), geojson.Options{IDColumn: "fips"})
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	loose := unzipTo(t, "states.shp.zip", dir)
	albers := layer.CRS{Projected: true, Unit: "metre", MetresPerUnit: 1, Name: "NAD_1983_Contiguous_USA_Albers"}
	for _, tc := range []struct {
		name, path string
		crs        layer.CRS
	}{
		{"zip", fixture(t, "states.shp.zip"), layer.CRS{Name: "GCS_WGS_1984"}},
		{"loose files", loose, layer.CRS{Name: "GCS_WGS_1984"}},
		// ESRI's form of the definition, which GDAL writes to .prj files,
		// carries no EPSG code.
		{"projected, in a folder of a zip", fixture(t, "states-5070.zip"), albers},
	} {
		t.Run(tc.name, func(t *testing.T) {
			lay, warns, err := ReadFile(tc.path, Options{IDColumn: "fips"})
			if err != nil {
				t.Fatal(err)
			}
			if len(warns) != 0 {
				t.Errorf("warnings: %q", warns)
			}
			if lay.CRS != tc.crs || lay.IDColumn != "fips" || lay.Source != tc.path {
				t.Errorf("CRS %+v, id column %q, source %q", lay.CRS, lay.IDColumn, lay.Source)
			}
			compareLayers(t, lay, ref, !tc.crs.Projected)
		})
	}
}

func compareLayers(t *testing.T, lay, ref *layer.Layer, lonLat bool) {
	if strings.Join(lay.IDs, ",") != strings.Join(ref.IDs, ",") {
		t.Fatalf("ids %v, want %v", lay.IDs, ref.IDs)
	}
	for _, want := range ref.Columns {
		name := want.Name
		if s, ok := shortNames[name]; ok {
			name = s
		}
		got, err := lay.Column(name)
		if err != nil {
			t.Error(err)
			continue
		}
		if got.Kind != want.Kind {
			t.Errorf("column %s: kind %v, want %v", name, got.Kind, want.Kind)
		}
		for i := range ref.IDs {
			if got.Label(i) != want.Label(i) || got.Missing[i] != want.Missing[i] {
				t.Errorf("column %s, area %s: %q, want %q", name, ref.IDs[i], got.Label(i), want.Label(i))
			}
		}
	}
	if id, err := lay.Column("id"); err != nil || strings.Join(id.Labels(), ",") != strings.Join(ref.IDs, ",") {
		t.Errorf("column id: %v", err)
	}
	for i := range ref.IDs {
		if msg := sameShape(lay.Geoms[i], ref.Geoms[i], lonLat); msg != "" {
			t.Errorf("area %s: %s", ref.IDs[i], msg)
		}
	}
}

// sameShape compares two areas part by part and ring by ring: the same
// numbers of positions and, when both are lon/lat, the same positions
// within 1e-9 degrees, in the same or the reverse order (the shapefile
// winds shells clockwise, GeoJSON counter-clockwise).
func sameShape(got, want orb.MultiPolygon, compare bool) string {
	if len(got) != len(want) {
		return "parts " + strconv.Itoa(len(got)) + ", want " + strconv.Itoa(len(want))
	}
	for p := range want {
		if len(got[p]) != len(want[p]) {
			return "rings differ in part " + strconv.Itoa(p+1)
		}
		for r, w := range want[p] {
			g := got[p][r]
			if len(g) != len(w) {
				return "positions differ in part " + strconv.Itoa(p+1)
			}
			if compare && !near(g, w, false) && !near(g, w, true) {
				return "positions differ in part " + strconv.Itoa(p+1) + ", ring " + strconv.Itoa(r+1)
			}
		}
	}
	return ""
}

func near(g, w orb.Ring, reverse bool) bool {
	for k := range w {
		q := g[k]
		if reverse {
			q = g[len(g)-1-k]
		}
		if math.Abs(q[0]-w[k][0]) > 1e-9 || math.Abs(q[1]-w[k][1]) > 1e-9 {
			return false
		}
	}
	return true
}

// TestRecordNumbers: without an id column the areas are numbered by
// record, with a warning, and every field is a column.
func TestRecordNumbers(t *testing.T) {
	lay, warns, err := ReadFile(fixture(t, "states.shp.zip"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if lay.IDColumn != "#" || lay.IDs[0] != "1" || lay.IDs[55] != "56" || len(lay.Columns) != 5 {
		t.Errorf("ids %q…%q from %q, %d columns", lay.IDs[0], lay.IDs[len(lay.IDs)-1], lay.IDColumn, len(lay.Columns))
	}
	want := fixture(t, "states.shp.zip") + ":states.shp: no id column was named; the areas are numbered by their record in the file (1 to 56)"
	if len(warns) != 1 || warns[0] != want {
		t.Errorf("warnings %q", warns)
	}
	if c, _ := lay.Column("centroid_l"); c == nil || c.Kind != layer.Number {
		t.Errorf("centroid_l: %+v", c)
	}
}
