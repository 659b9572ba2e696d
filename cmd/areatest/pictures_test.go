package main

import (
	"bytes"
	"encoding/json"
	"os"
	"strings"
	"testing"
)

// compare --map on a contrast of two provinces: each of the 200 areas is
// drawn once in each map, those outside the contrast (and the one without
// a policy) hatched in both, as many as the JSON document excludes; the
// file is the same for any number of workers.
func TestCompareMap(t *testing.T) {
	sampleDir(t)
	var maps [][]byte
	for _, workers := range []string{"1", "3"} {
		args := []string{"compare", "-i", "region.geojson", "-y", "income", "-g", "province", "--contrast", "Heikell,Trulyrre",
			"-n", "99", "--surrogates", "0", "--false-positive-check", "0", "--format", "json", "--workers", workers, "--map", "m" + workers + ".svg"}
		r := runIn("", args...)
		if r.code != 0 {
			t.Fatalf("exit %d: %s", r.code, r.stderr)
		}
		var doc struct {
			Excluded []struct {
				Areas int `json:"areas"`
			} `json:"excluded"`
			Groups []struct {
				Level string `json:"level"`
				Areas int    `json:"areas"`
			} `json:"groups"`
		}
		if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
			t.Fatal(err)
		}
		excluded := 0
		for _, e := range doc.Excluded {
			excluded += e.Areas
		}
		svg, err := os.ReadFile("m" + workers + ".svg")
		if err != nil {
			t.Fatal(err)
		}
		s := string(svg)
		if n := strings.Count(s, "</title></path>"); n != 400 {
			t.Errorf("%d areas drawn, want 200 in each map", n)
		}
		if n := strings.Count(s, ": left out</title>"); n != 2*excluded || excluded < 100 {
			t.Errorf("%d areas hatched, want the %d left out in each map", n, excluded)
		}
		for _, g := range doc.Groups {
			if !strings.Contains(s, ">"+g.Level+"</text>") {
				t.Errorf("no legend entry for %s", g.Level)
			}
		}
		maps = append(maps, svg)
	}
	if !bytes.Equal(maps[0], maps[1]) {
		t.Error("the map differs with 3 workers")
	}
}

// The autocorr pictures: written (PNG and SVG), the same for any number
// of workers.
func TestAutocorrPictures(t *testing.T) {
	sampleDir(t)
	var got [][]byte
	for _, workers := range []string{"1", "3"} {
		r := runIn("", "autocorr", "-i", "region.geojson", "--variables", "income,rate", "--lags", "3", "-n", "199", "--workers", workers,
			"--scatter", "s"+workers+".png", "--histogram", "h"+workers+".svg", "--correlogram", "c"+workers+".svg")
		if r.code != 0 {
			t.Fatalf("exit %d: %s", r.code, r.stderr)
		}
		var all []byte
		for _, f := range []string{"s", "h", "c"} {
			ext := ".svg"
			if f == "s" {
				ext = ".png"
			}
			data, err := os.ReadFile(f + workers + ext)
			if err != nil || len(data) < 1000 {
				t.Fatalf("%s: %v, %d bytes", f+workers+ext, err, len(data))
			}
			all = append(all, data...)
		}
		got = append(got, all)
	}
	if !bytes.Equal(got[0], got[1]) {
		t.Error("the pictures differ with 3 workers")
	}
}

func TestPictureFlagErrors(t *testing.T) {
	sampleDir(t)
	for _, c := range []struct {
		args []string
		code int
		msg  string
	}{
		{[]string{"autocorr", "-i", "region.geojson", "--variables", "income", "--correlogram", "c.svg"}, 2, "give --lags"},
		{[]string{"autocorr", "-i", "region.geojson", "--variables", "income", "--scatter", "s.txt"}, 2, "use .svg or .png"},
		{[]string{"autocorr", "-i", "region.geojson", "--variables", "income", "--histogram", "-"}, 2, "not standard output"},
		{[]string{"autocorr", "-i", "region.geojson", "--variables", "urban", "--scatter", "s.svg", "-n", "99"}, 1, "draw numeric --variables"},
		{[]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy", "--map", "m.pdf"}, 2, "use .svg or .png"},
		{[]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy", "--map", "m.svg", "--classes", "equal"}, 2, "--classes"},
		{[]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy", "--map", "region.geojson"}, 2, "unknown picture extension"},
	} {
		r := runIn("", c.args...)
		if r.code != c.code || !strings.Contains(r.stderr, c.msg) {
			t.Errorf("%v: exit %d, %q; want %d with %q", c.args, r.code, r.stderr, c.code, c.msg)
		}
		for _, f := range []string{"c.svg", "s.svg", "m.svg"} {
			if _, err := os.Stat(f); err == nil {
				t.Errorf("%v wrote %s", c.args, f)
			}
		}
	}
}
