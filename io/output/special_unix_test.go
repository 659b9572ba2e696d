//go:build unix

package output

import (
	"io"
	"os"
	"path/filepath"
	"syscall"
	"testing"
)

// A symbolic link is written through (the link stays, its target gets the
// bytes, even a target that does not exist yet); a FIFO and a device are
// written straight and stay what they are.
func TestCommitThroughLinksAndSpecialFiles(t *testing.T) {
	dir := t.TempDir()
	p := func(name string) string { return filepath.Join(dir, name) }
	mustWrite(t, p("target.txt"), "old")
	os.Symlink("target.txt", p("link.txt"))
	os.Symlink("later.txt", p("dangling.txt"))
	if err := syscall.Mkfifo(p("fifo"), 0o644); err != nil {
		t.Skip("no FIFOs here:", err)
	}
	got := make(chan string)
	go func() {
		b, _ := os.ReadFile(p("fifo")) // waits for the writer
		got <- string(b)
	}()
	plan := NewPlan()
	paths := []string{p("link.txt"), p("dangling.txt"), p("fifo")}
	if _, err := os.Stat(os.DevNull); err == nil {
		paths = append(paths, os.DevNull)
	}
	for _, path := range paths {
		f, err := plan.Add(path)
		if err != nil {
			t.Fatal(err)
		}
		f.SetRender(text("to " + filepath.Base(path)))
	}
	if err := plan.Commit(io.Discard); err != nil {
		t.Fatal(err)
	}
	if s := <-got; s != "to fifo" {
		t.Errorf("the FIFO's reader got %q", s)
	}
	if mustRead(t, p("target.txt")) != "to link.txt" || mustRead(t, p("later.txt")) != "to dangling.txt" {
		t.Error("a link was not written through")
	}
	for name, mode := range map[string]os.FileMode{"link.txt": os.ModeSymlink, "dangling.txt": os.ModeSymlink, "fifo": os.ModeNamedPipe} {
		if st, err := os.Lstat(p(name)); err != nil || st.Mode().Type() != mode {
			t.Errorf("%s is no longer a %v", name, mode)
		}
	}
	if st, err := os.Stat(os.DevNull); err == nil && st.Mode()&os.ModeDevice == 0 {
		t.Errorf("%s became a regular file", os.DevNull)
	}
	noTemps(t, dir)
}
