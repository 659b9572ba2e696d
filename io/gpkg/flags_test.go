package gpkg

// The test binary knows the -update flag of tests/testkit, so that
// `go test ./... -update` (which rewrites the golden files) runs in every
// package.
import _ "github.com/areatest/areatest/tests/testkit"
