package main

import (
	"encoding/csv"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/input"
	"github.com/areatest/areatest/spatial/rates"
)

// local --events/--population analyses the empirical-Bayes scores of the
// rate (rates.EBStandardise of the areas with both counts) and --out
// carries the rate --smooth maps (rates.GlobalEB here) and the unstable
// flag; the text report counts the unstable rates.
func TestLocalRates(t *testing.T) {
	sampleDir(t)
	r := runIn("", "local", "-i", "region.geojson", "--events", "cases", "--population", "population", "--smooth", "global", "-n", "99", "--out", "l.csv")
	if r.code != 0 {
		t.Fatalf("exit %d: %s", r.code, r.stderr)
	}
	if !strings.Contains(r.stdout, "fewer than 20 events") {
		t.Errorf("no unstable-rate line:\n%s", r.stdout)
	}
	lay, _, err := input.Read("region.geojson", nil, input.Options{})
	if err != nil {
		t.Fatal(err)
	}
	ev, _ := lay.NumericColumn("cases", "")
	pop, _ := lay.NumericColumn("population", "")
	var e, p []float64
	var at []int
	for i := range lay.IDs {
		if !ev.Missing[i] && !pop.Missing[i] {
			e, p, at = append(e, ev.Num[i]), append(p, pop.Num[i]), append(at, i)
		}
	}
	eb, _ := rates.EBStandardise(e, p)
	global, _ := rates.GlobalEB(e, p)
	f, err := os.Open("l.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	byID := map[string][]string{}
	for _, row := range rows[1:] {
		byID[row[0]] = row
	}
	for k, i := range at {
		row := byID[lay.IDs[i]]
		value, _ := strconv.ParseFloat(row[1], 64)
		rate, _ := strconv.ParseFloat(row[12], 64)
		if math.Abs(value-eb.Scores[k]) > 1e-8*math.Max(1, math.Abs(eb.Scores[k])) || math.Abs(rate-global[k]*100000) > 1e-9*rate {
			t.Fatalf("area %s: value %v rate %v; scores %v, smoothed %v", lay.IDs[i], value, rate, eb.Scores[k], global[k]*100000)
		}
		if want := strconv.FormatBool(e[k] < 20); row[13] != want {
			t.Fatalf("area %s: unstable %q, events %v", lay.IDs[i], row[13], e[k])
		}
	}
	for _, bad := range [][]string{
		{"--events", "cases"},
		{"--events", "cases", "--population", "population", "--variable", "rate"},
		{"--variable", "rate", "--smooth", "global"},
		{"--events", "cases", "--population", "population", "--smooth", "both"},
	} {
		if r := runIn("", append([]string{"local", "-i", "region.geojson"}, bad...)...); r.code != 2 {
			t.Errorf("%v: exit %d, %s", bad, r.code, r.stderr)
		}
	}
}
