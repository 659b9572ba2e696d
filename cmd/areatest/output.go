package main

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// writeOutput sends rendered output to stdout for "-" or "", and otherwise
// to path through a temporary file in the same directory that is renamed
// into place, so a failed run never leaves half a file. It refuses to write
// over any of the inputs.
func writeOutput(path string, stdout io.Writer, inputs []string, render func(io.Writer) error) error {
	var buf bytes.Buffer
	if err := render(&buf); err != nil {
		return err
	}
	if path == "" || path == "-" {
		_, err := stdout.Write(buf.Bytes())
		return err
	}
	if out, err := os.Stat(path); err == nil {
		for _, in := range inputs {
			if in == "" || in == "-" {
				continue
			}
			if st, err := os.Stat(in); err == nil && os.SameFile(st, out) {
				return fmt.Errorf("%s: refusing to overwrite the input file", path)
			}
		}
	}
	dir := filepath.Dir(path)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, err)
	}
	defer os.Remove(tmp.Name()) // no-op once renamed
	if _, err := tmp.Write(buf.Bytes()); err != nil {
		tmp.Close()
		return fmt.Errorf("%s: cannot write: %v", path, err)
	}
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, err)
	}
	if err := os.Chmod(tmp.Name(), 0o644); err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, err)
	}
	if err := os.Rename(tmp.Name(), path); err != nil {
		return fmt.Errorf("%s: cannot write: %v", path, err)
	}
	return nil
}
