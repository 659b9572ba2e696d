package testkit

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
)

// Testdata returns the path of a file under the project's tests/testdata
// folder, name written with slashes ("scipy/refs.json"). It works from any
// package's test directory: go test runs a test binary in its package's
// folder, and the project root is the nearest folder above it holding
// go.mod.
func Testdata(tb testing.TB, name string) string {
	tb.Helper()
	dir, err := os.Getwd()
	if err != nil {
		tb.Fatal(err)
	}
	for {
		if _, err := os.Stat(filepath.Join(dir, "go.mod")); err == nil {
			return filepath.Join(dir, "tests", "testdata", filepath.FromSlash(name))
		}
		up := filepath.Dir(dir)
		if up == dir {
			tb.Fatalf("no go.mod above the test directory, so no tests/testdata for %s", name)
		}
		dir = up
	}
}

// LoadJSON decodes the JSON file name under tests/testdata (see Testdata)
// into v, a pointer to the struct that mirrors it: the reference values
// stored by the scripts under tests/testdata/scipy.
func LoadJSON(tb testing.TB, name string, v any) {
	tb.Helper()
	b, err := os.ReadFile(Testdata(tb, name))
	if err != nil {
		tb.Fatal(err)
	}
	if err := json.Unmarshal(b, v); err != nil {
		tb.Fatalf("%s: %v", name, err)
	}
}
