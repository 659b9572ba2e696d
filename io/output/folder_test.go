package output

import (
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// When the folder of an output goes away between the plan and the commit,
// or cannot take new files, the error names the folder and says what is
// wrong there; it never names the hidden temporary file.
func TestFolderErrorsNameTheFolder(t *testing.T) {
	tests := []struct {
		name  string
		spoil func(dir string) // after Add, before Commit
		want  string
		is    error
	}{
		{"folder removed", func(dir string) { os.RemoveAll(dir) }, "the folder %s does not exist", fs.ErrNotExist},
		{"folder read-only", func(dir string) { os.Chmod(dir, 0o555) }, "no permission to create files in the folder %s", fs.ErrPermission},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if tc.is == fs.ErrPermission && os.Geteuid() == 0 {
				t.Skip("permissions do not bind the superuser")
			}
			dir := filepath.Join(t.TempDir(), "out")
			if err := os.Mkdir(dir, 0o755); err != nil {
				t.Fatal(err)
			}
			defer os.Chmod(dir, 0o755)
			plan := NewPlan()
			f, err := plan.Add(filepath.Join(dir, "a.txt"))
			if err != nil {
				t.Fatal(err)
			}
			f.SetRender(func(w io.Writer) error { _, err := io.WriteString(w, "x"); return err })
			tc.spoil(dir)
			err = plan.Commit(io.Discard)
			if err == nil {
				t.Fatal("no error")
			}
			msg := err.Error()
			if want := strings.ReplaceAll(tc.want, "%s", dir); !strings.Contains(msg, want) || strings.Contains(msg, ".tmp-") {
				t.Errorf("error %q, want %q and no temporary file", msg, want)
			}
			if !errors.Is(err, tc.is) {
				t.Errorf("error %v is not %v", err, tc.is)
			}
		})
	}
}

// inFolder keeps the system's error and drops the temporary file's name.
func TestInFolder(t *testing.T) {
	_, err := os.CreateTemp(filepath.Join(t.TempDir(), "gone"), ".x.tmp-*")
	got := inFolder("/somewhere", err)
	if !errors.Is(got, fs.ErrNotExist) || strings.Contains(got.Error(), ".tmp-") || !strings.Contains(got.Error(), "the folder /somewhere does not exist") {
		t.Errorf("%v", got)
	}
}
