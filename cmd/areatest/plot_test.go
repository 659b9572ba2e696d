package main

import (
	"bytes"
	"encoding/json"
	"encoding/xml"
	"image/png"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"testing"
)

// panelDraws lists the data-draws of each panel of a --plot SVG, in order.
func panelDraws(t *testing.T, svg []byte) []int {
	t.Helper()
	var draws []int
	d := xml.NewDecoder(bytes.NewReader(svg))
	for {
		tok, err := d.Token()
		if err == io.EOF {
			return draws
		}
		if err != nil {
			t.Fatalf("SVG not well-formed: %v", err)
		}
		e, ok := tok.(xml.StartElement)
		if !ok || e.Name.Local != "g" {
			continue
		}
		var class, n string
		for _, a := range e.Attr {
			switch a.Name.Local {
			case "class":
				class = a.Value
			case "data-draws":
				n = a.Value
			}
		}
		if class == "panel" {
			v, err := strconv.Atoi(n)
			if err != nil {
				t.Fatalf("panel with draws %q", n)
			}
			draws = append(draws, v)
		}
	}
}

// compare --plot draws one panel per row of the report, with each row's
// draws; the report itself does not change; the picture is the same for
// any --workers and changes with --seed; SVG and PNG are both written.
func TestComparePlot(t *testing.T) {
	dir := t.TempDir()
	runCLI(t, "", "demo", "--write", dir)
	layer := filepath.Join(dir, "region.geojson")
	base := []string{"compare", "-i", layer, "-y", "rate", "-g", "policy", "--strata", "province", "-n", "499",
		"--surrogates", "99", "--false-positive-check", "40", "--check-shuffles", "39"}
	plain := runCLI(t, "", base...)
	doc := runCLI(t, "", append(base, "--format", "json")...)
	var res struct {
		Tests []struct{ Permutations int }
	}
	if err := json.Unmarshal([]byte(doc.stdout), &res); err != nil || plain.code != 0 {
		t.Fatalf("compare: %v %s", err, plain.stderr)
	}
	pictures := map[string][]byte{}
	for _, c := range []struct{ name, workers, seed string }{
		{"one.svg", "1", "1"}, {"three.svg", "3", "1"}, {"seed2.svg", "2", "2"}, {"nulls.png", "2", "1"},
	} {
		path := filepath.Join(dir, c.name)
		o := runCLI(t, "", append(base, "--plot", path, "--workers", c.workers, "--seed", c.seed)...)
		if o.code != 0 {
			t.Fatalf("--plot %s: exit %d: %s", c.name, o.code, o.stderr)
		}
		if c.seed == "1" && o.stdout != plain.stdout {
			t.Errorf("--plot %s changed the report", c.name)
		}
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		pictures[c.name] = b
	}
	draws := panelDraws(t, pictures["one.svg"])
	if len(draws) != len(res.Tests) || len(draws) != 3 {
		t.Fatalf("%d panels for %d rows", len(draws), len(res.Tests))
	}
	for k, n := range draws {
		if n != res.Tests[k].Permutations {
			t.Errorf("panel %d holds %d draws, its row %d", k, n, res.Tests[k].Permutations)
		}
	}
	if !bytes.Equal(pictures["one.svg"], pictures["three.svg"]) {
		t.Error("the picture differs between --workers 1 and 3")
	}
	if bytes.Equal(pictures["one.svg"], pictures["seed2.svg"]) {
		t.Error("another seed drew the same picture")
	}
	if _, err := png.Decode(bytes.NewReader(pictures["nulls.png"])); err != nil {
		t.Errorf("nulls.png: %v", err)
	}
}

// --plot is refused before anything is read when it cannot be written:
// standard output, an extension that is no picture, the file of --output,
// or the input itself (left as it was).
func TestComparePlotRefused(t *testing.T) {
	dir := t.TempDir()
	runCLI(t, "", "demo", "--write", dir)
	layer := filepath.Join(dir, "region.geojson")
	before, _ := os.ReadFile(layer)
	base := []string{"compare", "-i", layer, "-y", "rate", "-g", "policy", "-n", "19", "--surrogates", "0", "--false-positive-check", "0"}
	out := filepath.Join(dir, "same.svg")
	for _, c := range []struct {
		args []string
		code int
	}{
		{[]string{"--plot", "-"}, 2},
		{[]string{"--plot", filepath.Join(dir, "nulls.gif")}, 2},
		{[]string{"--plot", out, "-o", out}, 2},
		{[]string{"--plot", filepath.Join(dir, "none", "nulls.svg")}, 1},
	} {
		if o := runCLI(t, "", append(base, c.args...)...); o.code != c.code {
			t.Errorf("%v: exit %d, want %d: %s", c.args, o.code, c.code, o.stderr)
		}
	}
	if o := runCLI(t, "", append(base, "--plot", layer)...); o.code == 0 {
		t.Error("--plot over the input was accepted")
	}
	if after, _ := os.ReadFile(layer); !bytes.Equal(before, after) {
		t.Error("the input was changed")
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("a refused run wrote its picture")
	}
}

// Issue 13: compare with every default on the 3,000-area region, plus the
// picture of its null distributions; reports the SVG's size.
func BenchmarkComparePlot3000(b *testing.B) {
	path := filepath.Join(b.TempDir(), "nulls.svg")
	benchRun(b, []string{"-y", "rate", "-g", "policy", "--workers", "2", "--plot", path})
	if info, err := os.Stat(path); err == nil {
		b.ReportMetric(float64(info.Size()), "svg-bytes")
	}
}
