package crs

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	_ "github.com/areatest/areatest/tests/testkit"
)

// TestAgainstGDAL reads the definitions GDAL writes for ~110 EPSG codes in
// both editions of well-known text and in ESRI's form (testdata/wkt.tsv,
// made by testdata/make_wkt.sh with Debian's gdal-bin) and checks that each
// is placed as GDAL places it — geographic, or projected with GDAL's unit
// factor — and that Lookup agrees with the definitions for every code it
// knows.
func TestAgainstGDAL(t *testing.T) {
	f, err := os.Open("testdata/wkt.tsv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	sc.Buffer(nil, 1<<20)
	rows := 0
	for sc.Scan() {
		fields := strings.Split(sc.Text(), "\t")
		if len(fields) != 5 {
			t.Fatalf("bad row %q", sc.Text()[:40])
		}
		rows++
		code, _ := strconv.Atoi(fields[0])
		if code == 4978 { // WGS 84 geocentric: not a map
			for _, def := range fields[2:4] {
				if _, err := FromWKT(def); err == nil {
					t.Errorf("EPSG:4978 (geocentric) was accepted")
				}
			}
			continue
		}
		factor := 0.0
		if fields[1] != "" {
			factor, _ = strconv.ParseFloat(fields[1], 64)
		}
		for k, def := range fields[2:] {
			if def == "" { // GDAL has no ESRI form for some systems
				continue
			}
			c, err := FromWKT(def)
			if err != nil {
				t.Errorf("EPSG:%d form %d: %v", code, k, err)
				continue
			}
			if c.Projected != (factor > 0) || math.Abs(c.MetresPerUnit-factor) > 1e-12*factor {
				t.Errorf("EPSG:%d form %d: projected %v, %v m per unit; GDAL: %v", code, k, c.Projected, c.MetresPerUnit, factor)
			}
			if k < 2 && c.EPSG != code {
				t.Errorf("EPSG:%d form %d: code read as %d", code, k, c.EPSG)
			}
			if c.Name == "" {
				t.Errorf("EPSG:%d form %d: no name", code, k)
			}
		}
		if l, known := Lookup(code); known && (l.Projected != (factor > 0) || math.Abs(l.MetresPerUnit-factor) > 1e-12*factor) {
			t.Errorf("Lookup(%d) = %+v; GDAL's factor %v", code, l, factor)
		}
	}
	if rows < 100 {
		t.Fatalf("only %d rows", rows)
	}
}

func TestFromName(t *testing.T) {
	for _, tc := range []struct {
		name             string
		known, projected bool
		epsg             int
	}{
		{"urn:ogc:def:crs:OGC:1.3:CRS84", true, false, 0},
		{"EPSG:4326", true, false, 4326},
		{"urn:ogc:def:crs:EPSG::5070", true, true, 5070},
		{"http://www.opengis.net/def/crs/EPSG/0/32633", true, true, 32633},
		{"EPSG:99999", false, false, 99999},
		{"my local grid", false, false, 0},
	} {
		c, known := FromName(tc.name)
		if known != tc.known || c.Projected != tc.projected || c.EPSG != tc.epsg || c.Name != tc.name {
			t.Errorf("FromName(%q) = %+v, %v", tc.name, c, known)
		}
	}
}

func TestBadDefinitions(t *testing.T) {
	for _, def := range []string{"", "PROJCS", `PROJCS["x"`, `PROJCS["x"]]`, `VERT_CS["h"]`, strings.Repeat("A[", 100) + strings.Repeat("]", 100), `PROJCS["unclosed]`} {
		if _, err := FromWKT(def); err == nil {
			t.Errorf("FromWKT(%q) accepted", def)
		}
	}
	c, err := FromWKT(`PROJCS["grid",UNIT["furlong",201.168]]`)
	if err != nil || !c.Projected || c.Unit != "furlong" || c.MetresPerUnit != 201.168 || c.DistanceUnit() != "furlong" {
		t.Errorf("an unusual unit: %+v, %v", c, err)
	}
}
