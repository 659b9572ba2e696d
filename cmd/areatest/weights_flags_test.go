package main

import (
	"io"
	"strings"
	"testing"

	"github.com/spf13/pflag"
)

// --scaling and its former name --transform give the same reports; both
// together are a usage error; option names are read in any case.
func TestScalingFlag(t *testing.T) {
	sampleDir(t)
	base := []string{"weights", "-i", "region.geojson", "--format", "json"}
	same := []struct{ a, b []string }{
		{[]string{"--scaling", "row"}, []string{"--transform", "row"}},
		{[]string{"--scaling", "none"}, []string{"--transform", "binary"}},
		{[]string{"--scaling", "stabilised"}, []string{"--transform", "variance"}},
		{[]string{"--scaling", "Stabilised"}, []string{"--transform", "variance-stabilising"}},
		{[]string{"--knn", "4", "--scaling", "NONE"}, []string{"--knn", "4", "--transform", "binary"}},
		{[]string{"--contiguity", "Rook"}, []string{"--contiguity", "rook"}},
		{[]string{"--points", "INSIDE", "--band", "20"}, []string{"--points", "inside", "--band", "20"}},
		{[]string{"--islands", "Keep"}, []string{"--islands", "keep"}},
	}
	for _, c := range same {
		a, b := runIn("", append(base, c.a...)...), runIn("", append(base, c.b...)...)
		note := "" // the former spelling is noted on stderr
		if strings.Contains(strings.Join(c.b, " "), "--transform") {
			note = "Flag --transform has been deprecated, it is now --scaling (row, none or stabilised; binary is none for contiguity weights) and goes away in a later release\n"
		}
		if a.code != 0 || b.code != 0 || a.stdout != b.stdout || note+a.stderr != b.stderr {
			t.Errorf("%v (exit %d, %s) and %v (exit %d, %s) differ", c.a, a.code, a.stderr, c.b, b.code, b.stderr)
		}
	}
	if r := runIn("", append(base, "--scaling", "none")...); !strings.Contains(r.stdout, `"transform": "binary"`) {
		t.Errorf("--scaling none: %s", r.stdout)
	}
	// On kernel weights "none" keeps them; the former "binary" set them to one.
	kernel := append(base, "--kernel", "bisquare", "--adaptive", "6")
	kept, ones := runIn("", append(kernel, "--scaling", "none")...), runIn("", append(kernel, "--transform", "binary")...)
	if kept.code != 0 || ones.code != 0 || kept.stdout == ones.stdout || !strings.Contains(ones.stdout, `"transform": "binary"`) || strings.Contains(kept.stdout, `"transform": "binary"`) {
		t.Errorf("kernel weights: --scaling none %s / --transform binary %s", kept.stdout, ones.stdout)
	}
	for _, c := range []struct {
		args []string
		want string
	}{
		{[]string{"--scaling", "row", "--transform", "row"}, "--transform is the former name of --scaling; give only --scaling"},
		{[]string{"--scaling", "variance"}, `--scaling: scaling must be row, none or stabilised, not "variance"`},
		{[]string{"--transform", "cube"}, `--transform: transform must be row, binary or variance, not "cube"`},
		{[]string{"--contiguity", "bishop"}, `--contiguity: contiguity must be queen or rook, not "bishop"`},
		{[]string{"--islands", "maybe"}, `--islands must be drop or keep, not "maybe"`},
	} {
		r := runIn("", append(base, c.args...)...)
		if r.code != 2 || !strings.Contains(r.stderr, c.want) {
			t.Errorf("%v: exit %d, stderr %q; want 2 and %q", c.args, r.code, r.stderr, c.want)
		}
	}
}

// --help offers --scaling and no longer shows --transform.
func TestScalingInHelp(t *testing.T) {
	r := runIn("", "weights", "--help")
	if !strings.Contains(r.stdout, "--scaling") || strings.Contains(r.stdout, "--transform") {
		t.Errorf("help: %s", r.stdout)
	}
}

// scalingGiven is true for either spelling, so the commands that pick
// their own default scaling treat both alike.
func TestScalingGiven(t *testing.T) {
	for _, c := range []struct {
		args []string
		want bool
	}{{nil, false}, {[]string{"--scaling", "none"}, true}, {[]string{"--transform", "binary"}, true}, {[]string{"--knn", "3"}, false}} {
		var w weightFlags
		fs := pflag.NewFlagSet("test", pflag.ContinueOnError)
		fs.SetOutput(io.Discard) // the note on the former spelling
		w.register(fs)
		if err := fs.Parse(c.args); err != nil {
			t.Fatal(err)
		}
		if got := w.scalingGiven(); got != c.want {
			t.Errorf("%v: scalingGiven %v, want %v", c.args, got, c.want)
		}
	}
}
