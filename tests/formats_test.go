package tests

import (
	"math"
	"sort"
	"testing"

	"github.com/areatest/areatest/io/input"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/spatial/autocorr"
	"github.com/areatest/areatest/tests/testkit"
	"github.com/areatest/areatest/weights"
)

// formatFixtures are the copies of the US states layer that Debian's
// gdal-bin made in other formats and coordinate systems
// (testdata/formats, each with the script that made it), with what each
// must say of its coordinate system.
var formatFixtures = []struct {
	file      string
	projected bool
	// id names the id column of formats without feature ids.
	id string
	// renamed gives the fixture's names of the GeoJSON's columns where
	// they differ (dBASE cuts names to 10 characters).
	renamed map[string]string
}{
	{"formats/states-5070.geojson", true, "", nil},
	{"formats/states.shp.zip", false, "fips", dbaseNames},
	{"formats/states-5070.zip", true, "fips", dbaseNames},
	{"formats/states.gpkg", false, "fips", nil},
	{"formats/states-5070.gpkg", true, "fips", nil},
}

// dbaseNames are the column names ogr2ogr gives the states' properties in
// a shapefile: cut to 10 characters, the second of two equal cuts numbered.
var dbaseNames = map[string]string{"centroid_lon": "centroid_l", "centroid_lat": "centroid_1"}

// Every fixture read through io/input gives the GeoJSON's areas and
// attributes, the same queen and rook neighbour pairs with the default
// snap, the same Moran's I of a real-valued attribute on queen weights,
// and the same four nearest neighbours except where the projection
// reorders distances that nearly tie (within 2%): the outside check of
// every reader, with GDAL as the writer.
func TestFormatsGiveTheSameLayer(t *testing.T) {
	ref := loadStates(t)
	refQueen, refRook := contiguityPairs(t, ref, weights.Queen), contiguityPairs(t, ref, weights.Rook)
	refI := statesMoran(t, ref, "centroid_lat")
	for _, fx := range formatFixtures {
		t.Run(fx.file, func(t *testing.T) {
			l, _, err := input.Read(testkit.Testdata(t, fx.file), nil, input.Options{IDColumn: fx.id})
			if err != nil {
				t.Fatal(err)
			}
			// ESRI's form of a .prj carries no EPSG code: the unit is what
			// counts.
			if l.CRS.Projected != fx.projected || (fx.projected && (l.CRS.MetresPerUnit != 1 || l.CRS.EPSG != 5070 && l.CRS.EPSG != 0)) {
				t.Errorf("coordinate system %+v", l.CRS)
			}
			sameAttributes(t, ref, l, fx.renamed)
			if got := contiguityPairs(t, l, weights.Queen); !equalPairs(got, refQueen) {
				t.Errorf("queen: %d pairs, GeoJSON %d", len(got), len(refQueen))
			}
			if got := contiguityPairs(t, l, weights.Rook); !equalPairs(got, refRook) {
				t.Errorf("rook: %d pairs, GeoJSON %d", len(got), len(refRook))
			}
			if i := statesMoran(t, l, fixtureName(fx.renamed, "centroid_lat")); math.Abs(i-refI) > 1e-12 {
				t.Errorf("Moran's I %v, GeoJSON %v", i, refI)
			}
			sameNearest(t, ref, l, 4)
		})
	}
}

// contiguityPairs lists the neighbour pairs by id.
func contiguityPairs(t *testing.T, l *layer.Layer, rule weights.Contiguity) map[[2]string]bool {
	t.Helper()
	g, err := weights.ContiguityGraph(l.Geoms, rule)
	if err != nil {
		t.Fatal(err)
	}
	pairs := map[[2]string]bool{}
	for i := range l.IDs {
		nb, _ := g.Row(i)
		for _, j := range nb {
			a, b := l.IDs[i], l.IDs[j]
			if a > b {
				a, b = b, a
			}
			pairs[[2]string{a, b}] = true
		}
	}
	return pairs
}

func equalPairs(a, b map[[2]string]bool) bool {
	if len(a) != len(b) {
		return false
	}
	for p := range a {
		if !b[p] {
			return false
		}
	}
	return true
}

// fixtureName is the fixture's name of a GeoJSON column.
func fixtureName(renamed map[string]string, column string) string {
	if n, ok := renamed[column]; ok {
		return n
	}
	return column
}

// statesMoran is Moran's I of the column (centroid_lat) on the row-standardised queen
// graph of the states with a neighbour.
func statesMoran(t *testing.T, l *layer.Layer, column string) float64 {
	t.Helper()
	queen, keep := linkedStates(t, l)
	col, err := l.NumericColumn(column, "the variable")
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, len(keep))
	for k, i := range keep {
		x[k] = col.Num[i]
	}
	i, err := autocorr.MoransI(x, queen.Subset(keep).RowStandardised())
	if err != nil {
		t.Fatal(err)
	}
	return i
}

// sameAttributes checks ids, column names, kinds and values.
func sameAttributes(t *testing.T, ref, l *layer.Layer, renamed map[string]string) {
	t.Helper()
	if len(l.IDs) != len(ref.IDs) {
		t.Fatalf("%d areas, GeoJSON %d", len(l.IDs), len(ref.IDs))
	}
	for i := range ref.IDs {
		if l.IDs[i] != ref.IDs[i] {
			t.Fatalf("area %d is %q, GeoJSON %q", i, l.IDs[i], ref.IDs[i])
		}
	}
	for _, rc := range ref.Columns {
		c, err := l.Column(fixtureName(renamed, rc.Name))
		if err != nil {
			t.Errorf("%v", err)
			continue
		}
		if c.Kind != rc.Kind {
			t.Errorf("column %s is %v, GeoJSON %v", rc.Name, c.Kind, rc.Kind)
			continue
		}
		for i := range ref.IDs {
			if c.Label(i) != rc.Label(i) {
				t.Errorf("column %s, area %s: %q, GeoJSON %q", rc.Name, ref.IDs[i], c.Label(i), rc.Label(i))
				break
			}
		}
	}
}

// sameNearest compares the k nearest neighbours of every area on both
// layers, each measured in its own metric (great-circle km on lon/lat,
// planar on projected), allowing the sets to differ only where the k-th
// and (k+1)-th distances lie within 2% of each other on either layer.
func sameNearest(t *testing.T, ref, l *layer.Layer, k int) {
	t.Helper()
	near := func(l *layer.Layer) [][]int {
		spec := weights.Spec{KNN: k, Projected: l.CRS.Projected}
		pts, metric, err := spec.Locate(l.Geoms)
		if err != nil {
			t.Fatal(err)
		}
		out := make([][]int, len(pts))
		for i := range pts {
			order := make([]int, 0, len(pts)-1)
			for j := range pts {
				if j != i {
					order = append(order, j)
				}
			}
			d := func(j int) float64 { return weights.Distance(metric, pts[i], pts[j]) }
			sort.Slice(order, func(a, b int) bool { return d(order[a]) < d(order[b]) })
			if d(order[k-1]) > 0.98*d(order[k]) {
				out[i] = nil // a near tie at the k-th place: not compared
				continue
			}
			out[i] = append([]int(nil), order[:k]...)
			sort.Ints(out[i])
		}
		return out
	}
	a, b := near(ref), near(l)
	compared := 0
	for i := range a {
		if a[i] == nil || b[i] == nil {
			continue
		}
		compared++
		for j := range a[i] {
			if a[i][j] != b[i][j] {
				t.Errorf("area %s: nearest %v, GeoJSON %v", ref.IDs[i], b[i], a[i])
				break
			}
		}
	}
	if compared < len(a)*3/4 {
		t.Errorf("only %d of %d areas compared", compared, len(a))
	}
}
