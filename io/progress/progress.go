package progress

import (
	"fmt"
	"io"
	"os"
	"strings"
	"sync"
	"time"

	"golang.org/x/term"
)

// Bar is the progress line of one run, on one writer (stderr).
type Bar struct {
	mu     sync.Mutex
	w      io.Writer
	label  string
	start  time.Time
	last   time.Time
	drawn  bool
	active bool
}

// New returns the bar for w; it draws only if w is a terminal.
func New(w io.Writer) *Bar {
	f, ok := w.(*os.File)
	return &Bar{w: w, active: ok && term.IsTerminal(int(f.Fd()))}
}

// Stage starts a new labelled stage and returns its callback (done of
// total steps), or nil when the bar does not draw.
func (p *Bar) Stage(label string) func(done, total int) {
	if p == nil || !p.active {
		return nil
	}
	p.mu.Lock()
	p.label, p.start = label, time.Now()
	p.mu.Unlock()
	return p.update
}

func (p *Bar) update(done, total int) {
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

// Finish clears the bar line.
func (p *Bar) Finish() {
	if p == nil || !p.drawn {
		return
	}
	fmt.Fprintf(p.w, "\r%s\r", strings.Repeat(" ", 70))
}
