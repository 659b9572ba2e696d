package output

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func text(s string) func(io.Writer) error {
	return func(w io.Writer) error { _, err := io.WriteString(w, s); return err }
}

func mustWrite(t *testing.T, path, content string) {
	t.Helper()
	if err := os.WriteFile(path, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
}

func mustRead(t *testing.T, path string) string {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// noTemps fails when a temporary file is left in dir.
func noTemps(t *testing.T, dir string) {
	t.Helper()
	if left, _ := filepath.Glob(filepath.Join(dir, ".*.tmp-*")); len(left) > 0 {
		t.Errorf("temporary files left: %v", left)
	}
}

// Each kind of target that cannot take an output is refused by Add, with
// its Problem, before anything is written; the second of two paths that
// are one file (however spelled or linked) is Repeated.
func TestAddRefuses(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "layer.geojson")
	mustWrite(t, in, "input")
	mustWrite(t, filepath.Join(dir, "plain"), "a file, not a directory")
	mustWrite(t, filepath.Join(dir, "old.txt"), "old")
	for _, l := range []struct{ name, to string }{{"in-link", in}, {"new-link", "new.txt"}, {"loop", "loop"}} {
		if err := os.Symlink(l.to, filepath.Join(dir, l.name)); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.Link(filepath.Join(dir, "old.txt"), filepath.Join(dir, "hard.txt")); err != nil {
		t.Fatal(err)
	}
	p := func(name string) string { return filepath.Join(dir, name) }
	for _, c := range []struct {
		name    string
		first   string // an output added before, "" for none
		path    string
		problem Problem
		want    string
	}{
		{"a directory", "", dir, IsDirectory, "is a directory"},
		{"missing directory", "", p("no/out.txt"), NoDirectory, "the folder " + p("no") + " does not exist"},
		{"directory is a file", "", p("plain/out.txt"), NoDirectory, "is not a folder"},
		{"the input", "", in, IsInput, "refusing to overwrite the input"},
		{"the input through a link", "", p("in-link"), IsInput, "refusing to overwrite the input"},
		{"a link loop", "", p("loop"), NotWritable, "too many levels"},
		{"same new path", p("new.txt"), p("new.txt"), Repeated, "same file as"},
		{"same new path spelled otherwise", p("new.txt"), dir + "/./sub/../new.txt", Repeated, "same file as"},
		{"a link to the same new file", p("new.txt"), p("new-link"), Repeated, "same file as"},
		{"a hard link to the same file", p("old.txt"), p("hard.txt"), Repeated, "same file as"},
		{"standard output twice", "-", "", Repeated, "same file as"},
	} {
		t.Run(c.name, func(t *testing.T) {
			plan := NewPlan("-", in)
			if c.first != "" {
				if _, err := plan.Add(c.first); err != nil {
					t.Fatal(err)
				}
			}
			_, err := plan.Add(c.path)
			var te *TargetError
			if !errors.As(err, &te) || te.Problem != c.problem || !strings.Contains(err.Error(), c.want) {
				t.Fatalf("error %v, want problem %d with %q", err, c.problem, c.want)
			}
			if c.problem == Repeated && (te.Earlier != 0 || te.EarlierPath != c.first) {
				t.Errorf("earlier %d %q, want 0 %q", te.Earlier, te.EarlierPath, c.first)
			}
		})
	}
	if _, err := os.Stat(p("new.txt")); err == nil {
		t.Error("a refused plan wrote a file")
	}
	if mustRead(t, in) != "input" {
		t.Error("the input was changed")
	}
	noTemps(t, dir)
}

// A read-only file and a directory without write permission are refused
// up front (as root every file is writable, so the test needs a user).
func TestAddRefusesReadOnly(t *testing.T) {
	if os.Geteuid() == 0 {
		t.Skip("root may write anywhere")
	}
	dir := t.TempDir()
	ro := filepath.Join(dir, "ro.txt")
	mustWrite(t, ro, "keep")
	os.Chmod(ro, 0o444)
	locked := filepath.Join(dir, "locked")
	os.Mkdir(locked, 0o555)
	for _, path := range []string{ro, filepath.Join(locked, "out.txt")} {
		var te *TargetError
		if _, err := NewPlan().Add(path); !errors.As(err, &te) || te.Problem != NotWritable {
			t.Errorf("%s: error %v, want NotWritable", path, err)
		}
	}
}

// Commit writes every file; a render that fails leaves no new file and
// every existing one as it was; a failure after the renames (here, standard
// output) removes the files the commit created but keeps the others.
func TestCommit(t *testing.T) {
	dir := t.TempDir()
	p := func(name string) string { return filepath.Join(dir, name) }
	mustWrite(t, p("old.txt"), "old")
	os.Chmod(p("old.txt"), 0o600)
	plan := func(renders ...func(io.Writer) error) *Plan {
		pl := NewPlan()
		for i, path := range []string{p("a.txt"), p("old.txt"), "-"}[:len(renders)] {
			f, err := pl.Add(path)
			if err != nil {
				t.Fatal(err)
			}
			if i < len(renders) {
				f.SetRender(renders[i])
			}
		}
		return pl
	}
	boom := func(io.Writer) error { return errors.New("boom") }
	if err := plan(text("a"), boom).Commit(io.Discard); err == nil || err.Error() != "boom" {
		t.Fatalf("render failure: %v", err)
	}
	if _, err := os.Stat(p("a.txt")); err == nil || mustRead(t, p("old.txt")) != "old" {
		t.Fatal("a failed render wrote something")
	}
	if err := plan(text("a"), text("new"), text("report")).Commit(failing{}); err == nil {
		t.Fatal("a failing standard output was not reported")
	}
	if _, err := os.Stat(p("a.txt")); err == nil {
		t.Error("a file created by a failed commit remains")
	}
	var out strings.Builder
	if err := plan(text("a"), text("new 2"), text("report")).Commit(&out); err != nil {
		t.Fatal(err)
	}
	if mustRead(t, p("a.txt")) != "a" || mustRead(t, p("old.txt")) != "new 2" || out.String() != "report" {
		t.Error("commit did not write every file")
	}
	// A replaced file keeps its permissions; a new one is rw-r--r--.
	for name, want := range map[string]os.FileMode{"old.txt": 0o600, "a.txt": 0o644} {
		if st, _ := os.Stat(p(name)); st.Mode().Perm() != want {
			t.Errorf("%s has mode %v, want %v", name, st.Mode().Perm(), want)
		}
	}
	if err := NewPlan().Commit(io.Discard); err != nil {
		t.Errorf("an empty plan: %v", err)
	}
	pl := NewPlan()
	pl.Add(p("unset.txt"))
	if err := pl.Commit(io.Discard); err == nil {
		t.Error("an output without content was committed")
	}
	noTemps(t, dir)
}

type failing struct{}

func (failing) Write([]byte) (int, error) { return 0, errors.New("closed") }
