package output

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// Commit writes every file of the plan, as one transaction as far as the
// system allows. First every output is rendered into memory: a render error
// stops the run with nothing written. Then every regular (or new) file is
// written to a temporary file beside its target, and the temporaries are
// renamed into place; then standard output and the files written straight
// (devices, FIFOs) get their bytes. If any step fails, the temporaries are
// removed and so are the files this commit created; a file that existed
// before keeps its new contents (a rename cannot be undone), and bytes
// already sent to standard output or a device stay sent.
//
// A replaced file keeps its permissions; a new one gets rw-r--r--.
func (p *Plan) Commit(stdout io.Writer) error {
	data := make([][]byte, len(p.files))
	for i, f := range p.files {
		if f.render == nil {
			return fmt.Errorf("%s: no content was given for this output", f.Path)
		}
		var buf bytes.Buffer
		if err := f.render(&buf); err != nil {
			return err
		}
		data[i] = buf.Bytes()
	}
	return p.place(stdout, data)
}

// place puts data[i] where file i goes, undoing what it can on failure.
func (p *Plan) place(stdout io.Writer, data [][]byte) (err error) {
	temps := make([]string, len(p.files))
	var created []string
	defer func() {
		for _, t := range temps {
			if t != "" {
				os.Remove(t)
			}
		}
		if err != nil {
			for _, c := range created {
				os.Remove(c)
			}
		}
	}()
	for i, f := range p.files {
		if f.stdout || f.straight {
			continue
		}
		if temps[i], err = stage(f, data[i]); err != nil {
			return fmt.Errorf("%s: cannot write: %w", f.Path, err)
		}
	}
	for i, f := range p.files {
		if temps[i] == "" {
			continue
		}
		_, statErr := os.Lstat(f.target)
		if err = os.Rename(temps[i], f.target); err != nil {
			return fmt.Errorf("%s: cannot write: %w", f.Path, inFolder(filepath.Dir(f.target), err))
		}
		temps[i] = ""
		if errors.Is(statErr, fs.ErrNotExist) {
			created = append(created, f.target)
		}
	}
	for i, f := range p.files {
		if err = f.writeStraight(stdout, data[i]); err != nil {
			return err
		}
	}
	return nil
}

// stage writes data to a new temporary file beside f's target, with the
// permissions the target will have, and returns its name.
func stage(f *File, data []byte) (string, error) {
	tmp, err := createTemp(f.target)
	if err != nil {
		return "", err
	}
	perm := os.FileMode(0o644)
	if f.info != nil {
		perm = f.info.Mode().Perm()
	}
	_, err = tmp.Write(data)
	if cerr := tmp.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = os.Chmod(tmp.Name(), perm)
	}
	if err != nil {
		os.Remove(tmp.Name())
		return "", inFolder(filepath.Dir(f.target), err)
	}
	return tmp.Name(), nil
}

// writeStraight sends data to standard output or straight into a file
// that is not a regular one; other files are placed by rename.
func (f *File) writeStraight(stdout io.Writer, data []byte) error {
	switch {
	case f.stdout:
		_, err := stdout.Write(data)
		return err
	case !f.straight:
		return nil
	}
	w, err := os.OpenFile(f.target, os.O_WRONLY, 0)
	if err == nil {
		_, err = w.Write(data)
		if cerr := w.Close(); err == nil {
			err = cerr
		}
	}
	if err != nil {
		return fmt.Errorf("%s: cannot write: %w", f.Path, err)
	}
	return nil
}
