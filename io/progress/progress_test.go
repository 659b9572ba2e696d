package progress

import (
	"strings"
	"testing"
	"time"
)

// Off a terminal the bar never draws: pipes and files see nothing.
func TestQuietOffTerminal(t *testing.T) {
	var b strings.Builder
	p := New(&b)
	if cb := p.Stage("shuffles"); cb != nil {
		t.Fatal("a bar on a non-terminal writer returned a callback")
	}
	p.Finish()
	if b.Len() != 0 {
		t.Fatalf("wrote %q", b.String())
	}
}

// On a terminal it draws once a stage has lasted a second, and Finish
// clears the line.
func TestDrawsAfterASecond(t *testing.T) {
	var b strings.Builder
	p := &Bar{w: &b, active: true}
	update := p.Stage("shuffles")
	update(1, 2)
	if b.Len() != 0 {
		t.Fatalf("drew before a second: %q", b.String())
	}
	p.start = time.Now().Add(-2 * time.Second)
	update(1, 2)
	if got := b.String(); !strings.Contains(got, "shuffles") || !strings.Contains(got, " 50%") || !strings.Contains(got, "[###############...............]") {
		t.Fatalf("bar %q", got)
	}
	p.Finish()
	if !strings.HasSuffix(b.String(), "\r"+strings.Repeat(" ", 70)+"\r") {
		t.Fatalf("not cleared: %q", b.String())
	}
}
