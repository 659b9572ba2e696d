package output

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
)

// Plan is the set of files one run writes: checked one by one as they are
// added, when the run starts, and written together by Commit when it ends.
type Plan struct {
	inputs []string
	files  []*File
}

// File is one output of a plan: where it goes and, once the result is
// known, how to render it.
type File struct {
	// Path is the path as the user gave it.
	Path string
	// target is where the bytes go: Path with any symbolic links in its
	// last element followed, so that a link is written through, not
	// replaced.
	target string
	// info is the target as it was when the plan was made, nil for a file
	// that does not exist yet.
	info os.FileInfo
	// id is the absolute path of the target with the links of its
	// directory resolved: two new files with the same id are one.
	id       string
	stdout   bool
	straight bool // not a regular file: written in place, not renamed over
	render   func(io.Writer) error
}

// Problem is why a path cannot take an output.
type Problem int

const (
	// IsDirectory: the path names a directory.
	IsDirectory Problem = iota + 1
	// IsInput: the path is one of the run's inputs (through a link too).
	IsInput
	// NoDirectory: the directory the file would go in does not exist or is
	// not a directory.
	NoDirectory
	// NotWritable: the file or its directory cannot be written (the
	// system's reason in Err).
	NotWritable
	// Repeated: another output of the same run goes to the same file.
	Repeated
)

// TargetError is a path that cannot take an output, found when the output
// is added to a plan, before anything is written.
type TargetError struct {
	Path    string
	Problem Problem
	// Dir is the directory of the file, for NoDirectory.
	Dir string
	// Earlier is, for Repeated, the position in the plan of the output
	// that already goes to this file, and EarlierPath its path as given.
	Earlier     int
	EarlierPath string
	// Err is the system's error, where there is one.
	Err error
}

func (e *TargetError) Error() string {
	switch e.Problem {
	case IsDirectory:
		return fmt.Sprintf("%s is a directory; give a file name", e.Path)
	case IsInput:
		return fmt.Sprintf("%s: refusing to overwrite the input file", e.Path)
	case NoDirectory:
		if errors.Is(e.Err, fs.ErrNotExist) {
			return fmt.Sprintf("%s: cannot write there: the folder %s does not exist", e.Path, e.Dir)
		}
		return fmt.Sprintf("%s: cannot write there: %s is not a folder", e.Path, e.Dir)
	case Repeated:
		return fmt.Sprintf("%s is the same file as %s, another output of this run", e.Path, e.EarlierPath)
	}
	return fmt.Sprintf("%s: cannot write: %v", e.Path, e.Err)
}

func (e *TargetError) Unwrap() error { return e.Err }

// NewPlan starts the plan of a run that reads inputs: no output may be one
// of them ("" and "-", standard input, are ignored). An input that does not
// exist (yet) is no file an output could replace.
func NewPlan(inputs ...string) *Plan { return &Plan{inputs: inputs} }

// Add checks that path can take an output of this run and adds it to the
// plan, or returns a *TargetError saying why not. "-" or "" is standard
// output, which takes at most one output.
func (p *Plan) Add(path string) (*File, error) {
	f := &File{Path: path, stdout: path == "" || path == "-"}
	if !f.stdout {
		if err := f.locate(); err != nil {
			return nil, err
		}
		if err := f.notInput(p.inputs); err != nil {
			return nil, err
		}
		if err := f.writable(); err != nil {
			return nil, err
		}
	}
	for i, g := range p.files {
		if f.sameAs(g) {
			return nil, &TargetError{Path: path, Problem: Repeated, Earlier: i, EarlierPath: g.Path}
		}
	}
	p.files = append(p.files, f)
	return f, nil
}

// Stdout reports whether the output goes to standard output.
func (f *File) Stdout() bool { return f.stdout }

// SetRender sets how the file is rendered when the plan is committed.
func (f *File) SetRender(render func(io.Writer) error) { f.render = render }

// locate finds the target of f.Path and what is there now, and checks that
// it is not a directory and that its directory exists.
func (f *File) locate() error {
	target, err := followLinks(f.Path)
	if err != nil {
		return &TargetError{Path: f.Path, Problem: NotWritable, Err: err}
	}
	f.target = target
	info, statErr := os.Stat(target)
	switch {
	case statErr == nil && info.IsDir():
		return &TargetError{Path: f.Path, Problem: IsDirectory}
	case statErr == nil:
		f.info, f.straight = info, !info.Mode().IsRegular()
	}
	dir := filepath.Dir(target)
	if info, err := os.Stat(dir); err != nil || !info.IsDir() {
		if err == nil {
			err = errors.New("not a directory")
		}
		return &TargetError{Path: f.Path, Problem: NoDirectory, Dir: dir, Err: err}
	}
	if statErr != nil && !errors.Is(statErr, fs.ErrNotExist) {
		return &TargetError{Path: f.Path, Problem: NotWritable, Err: statErr}
	}
	real, err := filepath.EvalSymlinks(dir)
	if err == nil {
		real, err = filepath.Abs(real)
	}
	if err != nil {
		return &TargetError{Path: f.Path, Problem: NotWritable, Err: err}
	}
	f.id = filepath.Join(real, filepath.Base(target))
	return nil
}

// followLinks follows the symbolic links of the last element of path, to
// the file they name, which need not exist.
func followLinks(path string) (string, error) {
	for range 255 {
		info, err := os.Lstat(path)
		if err != nil || info.Mode()&os.ModeSymlink == 0 {
			return path, nil // not a link, or nothing there: path is the target
		}
		link, err := os.Readlink(path)
		if err != nil {
			return "", err
		}
		if !filepath.IsAbs(link) {
			link = filepath.Join(filepath.Dir(path), link)
		}
		path = link
	}
	return "", errors.New("too many levels of symbolic links")
}

// notInput refuses a target that is one of the inputs.
func (f *File) notInput(inputs []string) error {
	if f.info == nil {
		return nil // a file that does not exist is no input
	}
	for _, in := range inputs {
		if in == "" || in == "-" {
			continue
		}
		if st, err := os.Stat(in); err == nil && os.SameFile(st, f.info) {
			return &TargetError{Path: f.Path, Problem: IsInput}
		}
	}
	return nil
}

// writable checks that the bytes can go to the target as Commit will put
// them there: a temporary file can be made in its directory, and an
// existing file can be opened for writing (a read-only file is left
// alone, although a rename could replace it). A FIFO is not opened: that
// would wait for its reader.
func (f *File) writable() error {
	fail := func(err error) error { return &TargetError{Path: f.Path, Problem: NotWritable, Err: err} }
	if f.info != nil && f.info.Mode()&os.ModeNamedPipe == 0 {
		w, err := os.OpenFile(f.target, os.O_WRONLY, 0)
		if err != nil {
			return fail(err)
		}
		w.Close()
	}
	if f.straight {
		return nil
	}
	tmp, err := createTemp(f.target)
	if err != nil {
		return fail(err)
	}
	tmp.Close()
	return os.Remove(tmp.Name())
}

// createTemp makes a new temporary file beside target. Its errors name
// target's folder and what went wrong there, never the temporary file:
// that name means nothing to the reader (it is hidden, random and gone).
func createTemp(target string) (*os.File, error) {
	tmp, err := os.CreateTemp(filepath.Dir(target), tempPattern(target))
	if err != nil {
		return nil, inFolder(filepath.Dir(target), err)
	}
	return tmp, nil
}

// inFolder rewords an error met on a temporary file (creating, writing or
// renaming it) in dir so that it names dir. The system's own error stays
// wrapped for errors.Is.
func inFolder(dir string, err error) error {
	var pe *fs.PathError
	var le *os.LinkError
	switch {
	case errors.As(err, &pe):
		err = pe.Err
	case errors.As(err, &le):
		err = le.Err
	}
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return &folderError{fmt.Sprintf("the folder %s does not exist", dir), err}
	case errors.Is(err, fs.ErrPermission):
		return &folderError{fmt.Sprintf("no permission to create files in the folder %s", dir), err}
	}
	return &folderError{fmt.Sprintf("in the folder %s: %v", dir, err), err}
}

// folderError is a problem with an output's folder, in words, with the
// system's error kept for errors.Is but not repeated in the text.
type folderError struct {
	msg string
	err error
}

func (e *folderError) Error() string { return e.msg }
func (e *folderError) Unwrap() error { return e.err }

// tempPattern names the temporary files beside target.
func tempPattern(target string) string { return "." + filepath.Base(target) + ".tmp-*" }

// sameAs reports whether f and g are the same file: both standard output,
// the same existing file (however reached), or the same new one.
func (f *File) sameAs(g *File) bool {
	switch {
	case f.stdout || g.stdout:
		return f.stdout && g.stdout
	case f.info != nil && g.info != nil:
		return os.SameFile(f.info, g.info)
	}
	return f.info == nil && g.info == nil && f.id == g.id
}
