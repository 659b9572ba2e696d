package output

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestOneFilePlan(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "layer.geojson")
	if err := os.WriteFile(in, []byte("input"), 0o644); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(dir, "link.geojson")
	if err := os.Symlink(in, link); err != nil {
		t.Fatal(err)
	}
	text := func(s string) func(io.Writer) error {
		return func(w io.Writer) error { _, err := io.WriteString(w, s); return err }
	}
	var stdout strings.Builder
	for _, c := range []struct {
		name, path string
		render     func(io.Writer) error
		wantErr    string
	}{
		{"stdout", "-", text("to stdout"), ""},
		{"new file", filepath.Join(dir, "out.txt"), text("report"), ""},
		{"replaces an output", filepath.Join(dir, "out.txt"), text("report 2"), ""},
		{"refuses the input", in, text("x"), "refusing to overwrite the input"},
		{"refuses the input through a link", link, text("x"), "refusing to overwrite the input"},
		{"missing folder", filepath.Join(dir, "no", "out.txt"), text("x"), "cannot write"},
		{"render fails", filepath.Join(dir, "failed.txt"), func(io.Writer) error { return errors.New("boom") }, "boom"},
	} {
		t.Run(c.name, func(t *testing.T) {
			err := writeOne(c.path, &stdout, []string{"-", in}, c.render)
			if (err == nil) != (c.wantErr == "") || (err != nil && !strings.Contains(err.Error(), c.wantErr)) {
				t.Fatalf("error %v, want %q", err, c.wantErr)
			}
		})
	}
	if stdout.String() != "to stdout" {
		t.Errorf("stdout %q", stdout.String())
	}
	if b, _ := os.ReadFile(filepath.Join(dir, "out.txt")); string(b) != "report 2" {
		t.Errorf("out.txt holds %q", b)
	}
	if b, _ := os.ReadFile(in); string(b) != "input" {
		t.Errorf("the input was changed: %q", b)
	}
	if _, err := os.Stat(filepath.Join(dir, "failed.txt")); err == nil {
		t.Error("a failed render left a file")
	}
	if left, _ := filepath.Glob(filepath.Join(dir, ".*.tmp-*")); len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

// writeOne is a plan of one file, added, rendered and committed.
func writeOne(path string, stdout io.Writer, inputs []string, render func(io.Writer) error) error {
	p := NewPlan(inputs...)
	f, err := p.Add(path)
	if err != nil {
		return err
	}
	f.SetRender(render)
	return p.Commit(stdout)
}
