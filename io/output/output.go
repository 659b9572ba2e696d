package output

import (
	"bytes"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// Write renders into memory and sends the bytes to stdout for "-" or "",
// and otherwise to path, through a temporary file in the same directory
// that is renamed into place. It refuses to write over any of inputs ("" and
// "-" among them are ignored).
func Write(path string, stdout io.Writer, inputs []string, render func(io.Writer) error) error {
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
	if err := replace(path, buf.Bytes()); err != nil {
		return fmt.Errorf("%s: cannot write: %w", path, err)
	}
	return nil
}

// replace puts data at path through a temporary file and a rename.
func replace(path string, data []byte) error {
	tmp, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return err
	}
	defer os.Remove(tmp.Name()) // no-op once renamed
	if _, err := tmp.Write(data); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Close(); err != nil {
		return err
	}
	if err := os.Chmod(tmp.Name(), 0o644); err != nil {
		return err
	}
	return os.Rename(tmp.Name(), path)
}
