package tests

import (
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"sync"
	"testing"

	sampledata "github.com/areatest/areatest/samples"
)

// N shard processes of the built command, run at once as a job array
// would, and the merge give the single run's JSON byte for byte.
func TestBuiltBinaryShards(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the command")
	}
	dir := t.TempDir()
	bin := filepath.Join(dir, "areatest")
	build := exec.Command("go", "build", "-o", bin, "../cmd/areatest")
	build.Env = append(os.Environ(), "CGO_ENABLED=0")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	if err := os.WriteFile(filepath.Join(dir, sampledata.RegionFile), sampledata.RegionGeoJSON, 0o644); err != nil {
		t.Fatal(err)
	}
	args := []string{"compare", "-i", sampledata.RegionFile, "-y", "rate", "-g", "policy", "--format", "json",
		"-n", "999", "--surrogates", "99", "--false-positive-check", "60", "--check-shuffles", "39"}
	run := func(args ...string) []byte {
		cmd := exec.Command(bin, args...)
		cmd.Dir = dir
		var out, errb bytes.Buffer
		cmd.Stdout, cmd.Stderr = &out, &errb
		if err := cmd.Run(); err != nil {
			t.Errorf("areatest %v: %v\n%s", args, err, errb.String())
		}
		return out.Bytes()
	}
	whole := run(args...)
	const n = 4
	var wg sync.WaitGroup
	var names []string
	for k := 1; k <= n; k++ {
		name := fmt.Sprintf("part%d.json", k)
		names = append(names, name)
		wg.Go(func() {
			run(append(args[:len(args):len(args)], "--shard", fmt.Sprintf("%d/%d", k, n), "-o", name, "--workers", "1")...)
		})
	}
	wg.Wait()
	merged := run(append([]string{"merge", "--format", "json"}, names...)...)
	if len(whole) == 0 || !bytes.Equal(merged, whole) {
		t.Errorf("merge of %d processes' parts differs from the single run:\n%s\nwant\n%s", n, merged, whole)
	}
}
