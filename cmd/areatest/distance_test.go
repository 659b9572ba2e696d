package main

import (
	"strings"
	"testing"
)

// Distances take a unit: on the lon/lat sample region a band of 20 (km)
// is the band of 20km, 20000m and 12.4274238447mi (20 km in international
// miles, 1 mi = 1.609344 km by definition), and a lag width likewise; a
// snap given in metres is converted to degrees. Bad units are usage
// errors that list the units.
func TestDistanceUnits(t *testing.T) {
	sampleDir(t)
	base := []string{"weights", "-i", "region.geojson", "--format", "json"}
	ref := runIn("", append(base, "--band", "20")...)
	if ref.code != 0 || links(ref.stdout) == "" {
		t.Fatalf("--band 20: %s %s", ref.stderr, ref.stdout)
	}
	for _, band := range []string{"20km", "20000m", "20 KM", "12.427423844746679mi"} {
		r := runIn("", append(base, "--band", band)...)
		// The report names the band as the converted number, so the
		// graphs agree in their links; compare the neighbour counts.
		if r.code != 0 || links(r.stdout) != links(ref.stdout) {
			t.Errorf("--band %s: exit %d, %s; links %q vs %q", band, r.code, r.stderr, links(r.stdout), links(ref.stdout))
		}
	}
	lag := []string{"autocorr", "-i", "region.geojson", "--variables", "rate", "--lags", "2", "-n", "99", "--format", "json"}
	a, b := runIn("", append(lag, "--lag-width", "30")...), runIn("", append(lag, "--lag-width", "30000m")...)
	if a.code != 0 || a.stdout != b.stdout {
		t.Errorf("--lag-width 30 and 30000m differ: %s %s", a.stderr, b.stderr)
	}
	s1, s2 := runIn("", append(base, "--snap", "0.0001")...), runIn("", append(base, "--snap", "11.1195m")...)
	if s1.code != 0 || s2.code != 0 || links(s1.stdout) != links(s2.stdout) {
		t.Errorf("--snap 0.0001 (degrees) and 11.1195m: %s %s", s1.stderr, s2.stderr)
	}
	for _, bad := range []string{"20furlongs", "km", "12,5km"} {
		r := runIn("", append(base, "--band", bad)...)
		if r.code != 2 || !strings.Contains(r.stderr, "--band") {
			t.Errorf("--band %s: exit %d, %s", bad, r.code, r.stderr)
		}
	}
}

// links picks the number of links out of a weights JSON report.
func links(doc string) string {
	i := strings.Index(doc, `"links"`)
	if i < 0 {
		return ""
	}
	j := strings.IndexAny(doc[i:], ",\n}")
	return doc[i : i+j]
}
