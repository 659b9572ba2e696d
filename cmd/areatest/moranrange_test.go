package main

import (
	"bytes"
	"strings"
	"testing"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/spatial/clustering"
)

// On a grid past clustering.AutoRangeAreas autocorr leaves the range of
// Moran's I out and says how to ask for it; --moran-range computes it and
// the report says it was found by iteration, to what tolerance. The help
// states the same limit.
func TestAutocorrMoranRange(t *testing.T) {
	layer := gridData(t, 101) // 10,201 cells
	for _, c := range []struct {
		name      string
		extra     []string
		want      []string
		wantNever string
	}{
		{"text, unasked", nil, []string{"The range of Moran's I on these weights was not computed (10,201 areas, more than the 10,000 up to which", "ask for it with --moran-range)."}, "can range from"},
		{"text, asked", []string{"--moran-range"}, []string{"Moran's I can range from", "found by iteration, each end exact to within"}, "not computed"},
		{"json, unasked", []string{"--format", "json"}, []string{`"morans_i_range_skipped": "10,201 areas`}, `"morans_i_range":`},
		{"json, asked", []string{"--format", "json", "--moran-range"}, []string{`"morans_i_range": {`, `"method": "lanczos"`, `"tolerance": `}, "morans_i_range_skipped"},
	} {
		args := append([]string{"autocorr", "-i", "-", "--variables", "value", "-n", "9"}, c.extra...)
		var stdout, stderr bytes.Buffer
		if code := run(args, bytes.NewReader(layer.data), &stdout, &stderr); code != 0 {
			t.Fatalf("%s: exit %d: %s", c.name, code, stderr.String())
		}
		out := strings.Join(strings.Fields(stdout.String()), " ") // the text report wraps
		for _, w := range c.want {
			if !strings.Contains(out, w) {
				t.Errorf("%s: no %q in\n%s", c.name, w, stdout.String())
			}
		}
		if strings.Contains(out, c.wantNever) {
			t.Errorf("%s: %q in\n%s", c.name, c.wantNever, stdout.String())
		}
	}
	if h := strings.Join(strings.Fields(help("autocorr")), " "); !strings.Contains(h, "computed unasked up to "+numtext.Count(clustering.AutoRangeAreas)+" areas") {
		t.Errorf("the help does not state the limit of %d areas", clustering.AutoRangeAreas)
	}
}
