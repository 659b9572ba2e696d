package main

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/areatest/areatest/tests/testkit"
)

// readmeExample is one block of output shown in README.md: the command
// lines that make it and the text they print.
type readmeExample struct {
	line     int // of the opening fence in README.md
	commands [][]string
	output   string
	// withStderr is set by a last command ending in "2>&1": its standard
	// error (the warnings and notes, written first) is shown before its
	// standard output.
	withStderr bool
}

// readmeExamples finds the worked example (the block after "byte for
// byte:", printed by `areatest demo`) and every fenced block that starts
// with "$ areatest …" (commands joined by &&, the last one's output below).
func readmeExamples(t *testing.T, readme string) []readmeExample {
	t.Helper()
	lines := strings.Split(readme, "\n")
	var out []readmeExample
	for i := 0; i < len(lines); i++ {
		if !strings.HasPrefix(lines[i], "```") || i+1 >= len(lines) {
			continue
		}
		end := i + 1
		for end < len(lines) && !strings.HasPrefix(lines[end], "```") {
			end++
		}
		body := lines[i+1 : end]
		ex := readmeExample{line: i + 1}
		switch {
		case strings.HasPrefix(body[0], "$ areatest "):
			first := strings.TrimPrefix(body[0], "$ ")
			if strings.HasSuffix(first, " 2>&1") {
				first, ex.withStderr = strings.TrimSuffix(first, " 2>&1"), true
			}
			for _, cmd := range strings.Split(first, "&&") {
				fields := strings.Fields(cmd)
				if len(fields) == 0 || fields[0] != "areatest" {
					t.Fatalf("README.md:%d: %q is not an areatest command", i+2, cmd)
				}
				ex.commands = append(ex.commands, fields[1:])
			}
			ex.output = strings.Join(body[1:], "\n") + "\n"
			out = append(out, ex)
		case lines[i] == "```" && strings.HasSuffix(previousText(lines, i), "byte for byte:"):
			ex.commands = [][]string{{"demo"}}
			ex.output = strings.Join(body, "\n") + "\n"
			out = append(out, ex)
		}
		i = end
	}
	return out
}

// Every output shown in the README is what this build prints, byte for
// byte, so the README cannot drift from the tool. Each example runs in a
// directory holding the sample region, as a reader who ran
// `areatest demo --write .` would, and the files of readmeData.
func TestReadmeExamples(t *testing.T) {
	b, err := os.ReadFile(filepath.Join("..", "..", "README.md"))
	if err != nil {
		t.Fatal(err)
	}
	examples := readmeExamples(t, string(b))
	if len(examples) < 5 {
		t.Fatalf("found %d examples in README.md; the worked example and the command examples should all be there", len(examples))
	}
	for _, ex := range examples {
		t.Run(strings.Join(ex.commands[len(ex.commands)-1][:1], " ")+"@"+strconv.Itoa(ex.line), func(t *testing.T) {
			data := map[string][]byte{}
			for _, f := range readmeData { // found from the package directory, before sampleDir moves
				b, err := os.ReadFile(testkit.Testdata(t, f))
				if err != nil {
					t.Fatal(err)
				}
				data[filepath.Base(f)] = b
			}
			dir := sampleDir(t)
			for name, b := range data {
				if err := os.WriteFile(filepath.Join(dir, name), b, 0o644); err != nil {
					t.Fatal(err)
				}
			}
			var r result
			for _, args := range ex.commands {
				if r = runIn("", args...); r.code != 0 {
					t.Fatalf("README.md:%d: areatest %s: exit %d: %s", ex.line, strings.Join(args, " "), r.code, r.stderr)
				}
			}
			got := r.stdout
			if ex.withStderr {
				got = r.stderr + r.stdout
			}
			if got != ex.output {
				t.Errorf("README.md:%d: the output shown differs from what areatest prints: %s", ex.line, testkit.FirstDifference(ex.output, got))
			}
		})
	}
}

// readmeData are the test files the README's input examples use, copied
// beside the sample region (tests/testdata; see its README for their
// sources).
var readmeData = []string{"formats/states.shp.zip", "formats/states-attrs.csv"}

// previousText is the last non-blank line before line i.
func previousText(lines []string, i int) string {
	for i--; i >= 0; i-- {
		if s := strings.TrimSpace(lines[i]); s != "" {
			return s
		}
	}
	return ""
}
