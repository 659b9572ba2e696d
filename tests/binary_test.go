package tests

import (
	"bytes"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
)

// The command-line cases run in process in cmd/areatest; this one test
// builds the real binary and checks what only a separate process shows:
// main's exit statuses and the streams of an actual pipe.
func TestBuiltBinary(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the command")
	}
	bin := filepath.Join(t.TempDir(), "areatest")
	build := exec.Command("go", "build", "-o", bin, "../cmd/areatest")
	build.Env = append(os.Environ(), "CGO_ENABLED=0")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	var feats []string
	for i, yg := range []string{`"y":1,"g":"a"`, `"y":2,"g":"a"`, `"y":5,"g":"b"`, `"y":7,"g":"b"`} {
		feats = append(feats, fmt.Sprintf(`{"type":"Feature","properties":{%s},"geometry":{"type":"Polygon","coordinates":[[[%d,0],[%d,0],[%d,1],[%d,1],[%d,0]]]}}`,
			yg, i, i+1, i+1, i, i))
	}
	layer := `{"type":"FeatureCollection","features":[` + strings.Join(feats, ",") + `]}`
	for _, c := range []struct {
		name  string
		stdin string
		args  []string
		code  int
		want  string // in stdout for 0, in stderr otherwise
	}{
		{"version", "", []string{"--version"}, 0, "areatest "},
		{"usage", "", []string{"compare", "--no-such-flag"}, 2, "--no-such-flag"},
		{"data error", "not json", []string{"compare", "-i", "-", "-y", "y", "-g", "g"}, 1, "stdin"},
		{"stdin to stdout", layer, []string{"compare", "-i", "-", "-y", "y", "-g", "g", "-n", "99"}, 0, "Keep in mind"},
	} {
		t.Run(c.name, func(t *testing.T) {
			cmd := exec.Command(bin, c.args...)
			cmd.Stdin = strings.NewReader(c.stdin)
			var out, errb bytes.Buffer
			cmd.Stdout, cmd.Stderr = &out, &errb
			err := cmd.Run()
			code := 0
			if ee, ok := err.(*exec.ExitError); ok {
				code = ee.ExitCode()
			} else if err != nil {
				t.Fatal(err)
			}
			where := out.String()
			if c.code != 0 {
				where = errb.String()
			}
			if code != c.code || !strings.Contains(where, c.want) {
				t.Errorf("exit %d (want %d), stdout %q, stderr %q; want %q", code, c.code, out.String(), errb.String(), c.want)
			}
		})
	}
}
