package main

import (
	"fmt"
	"io"
	"os"
	"strings"
	"sync"
	"time"

	"golang.org/x/term"
)

// progress draws a one-line bar on stderr while long runs work. It draws
// only on a terminal, and only once a run has lasted a second, so pipes,
// files and quick runs see nothing.
type progress struct {
	mu     sync.Mutex
	w      io.Writer
	label  string
	start  time.Time
	last   time.Time
	drawn  bool
	active bool
}

func newProgress(w io.Writer) *progress {
	f, ok := w.(*os.File)
	return &progress{w: w, active: ok && term.IsTerminal(int(f.Fd()))}
}

// stage starts a new labelled stage and returns its callback.
func (p *progress) stage(label string) func(done, total int) {
	if p == nil || !p.active {
		return nil
	}
	p.mu.Lock()
	p.label, p.start = label, time.Now()
	p.mu.Unlock()
	return p.update
}

func (p *progress) update(done, total int) {
	p.mu.Lock()
	defer p.mu.Unlock()
	now := time.Now()
	if now.Sub(p.start) < time.Second || (now.Sub(p.last) < 100*time.Millisecond && done < total) {
		return
	}
	p.last = now
	const width = 30
	filled := width * done / max(total, 1)
	fmt.Fprintf(p.w, "\r%-28s [%s%s] %3d%%", p.label, strings.Repeat("#", filled), strings.Repeat(".", width-filled), 100*done/max(total, 1))
	p.drawn = true
}

// finish clears the bar line.
func (p *progress) finish() {
	if p == nil || !p.drawn {
		return
	}
	fmt.Fprintf(p.w, "\r%s\r", strings.Repeat(" ", 70))
}
