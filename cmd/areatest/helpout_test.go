package main

import (
	"slices"
	"strings"
	"testing"
)

// Help asked for is output: every command's -h and --help write the help
// (text and flags) to stdout, nothing to stderr, exit 0; a mistake in the
// flags still goes to stderr with exit 2 and leaves stdout empty.
func TestHelpOnStdout(t *testing.T) {
	names := make([]string, 0, len(commands))
	for name := range commands {
		names = append(names, name)
	}
	slices.Sort(names)
	for _, name := range names {
		for _, flag := range []string{"-h", "--help"} {
			t.Run(name+" "+flag, func(t *testing.T) {
				o := runCLI(t, "", name, flag)
				if o.code != 0 || o.stderr != "" {
					t.Fatalf("exit %d, stderr %q", o.code, o.stderr)
				}
				if !strings.HasPrefix(o.stdout, help(name)) || !strings.Contains(o.stdout, "Examples:") {
					t.Errorf("stdout is not the help of %s:\n%s", name, o.stdout)
				}
				if !strings.Contains(o.stdout, "\nFlags:\n") || !strings.Contains(o.stdout, "  --") {
					t.Errorf("stdout lists no flags:\n%s", o.stdout)
				}
			})
		}
		t.Run(name+" bad flag", func(t *testing.T) {
			o := runCLI(t, "", name, "--no-such-flag")
			if o.code != 2 || o.stdout != "" || !strings.Contains(o.stderr, "unknown flag: --no-such-flag") {
				t.Errorf("exit %d, stdout %q, stderr %q", o.code, o.stdout, o.stderr)
			}
		})
	}
}
