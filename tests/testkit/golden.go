package testkit

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Update is the -update flag of every test binary that imports this
// package: `go test ./... -update` rewrites the golden files instead of
// comparing with them. Every package with tests imports testkit, so the
// flag is known to all of them.
var Update = flag.Bool("update", false, "rewrite golden files with the output of this build")

// Golden compares got with the file at path, or with -update writes got
// there. A difference is reported with the first line that differs.
func Golden(t testing.TB, path string, got []byte) {
	t.Helper()
	if *Update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test with -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s: output differs from the golden file (-update rewrites it): %s", path, FirstDifference(string(want), string(got)))
	}
}

// FirstDifference describes the first line where two texts differ.
func FirstDifference(want, got string) string {
	w, g := strings.Split(want, "\n"), strings.Split(got, "\n")
	for i := 0; i < max(len(w), len(g)); i++ {
		var a, b string
		if i < len(w) {
			a = w[i]
		}
		if i < len(g) {
			b = g[i]
		}
		if a != b || i >= len(w) || i >= len(g) {
			return fmt.Sprintf("line %d: want %q, got %q", i+1, a, b)
		}
	}
	return "same lines, different bytes"
}
