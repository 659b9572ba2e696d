package shapefile

import (
	"encoding/binary"
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/areatest/areatest/io/layer"
)

// Options adjust how records become areas. The zero value numbers the
// areas by record, fails on the first record without polygon geometry and
// expects a zip to hold one shapefile.
type Options struct {
	// IDColumn, when not empty, names the table column whose values become
	// the area ids. An exact match wins; otherwise a column whose name
	// differs only in case is taken, as dBASE names are usually upper case.
	// The column is kept as a column as well.
	IDColumn string
	// SkipBadGeometry leaves out records whose shape is null, has no parts
	// or is not a polygon, reporting them as warnings, instead of failing
	// on the first one.
	SkipBadGeometry bool
	// Layer picks one shapefile inside a zip that holds several: its base
	// name without ".shp" ("states"), or its path inside the zip without
	// ".shp" when two folders hold the same name.
	Layer string
}

// member is one file of a shapefile: its name in messages and its bytes.
type member struct {
	name string
	data []byte
	ok   bool // present
}

// fileSet is the files of one shapefile, found beside each other on disk
// or in a zip. base is the name messages use for the whole (the .shp).
type fileSet struct {
	shp, shx, dbf, prj, cpg member
	// where says where a missing file was looked for: "beside states.shp"
	// or "in states.zip".
	where string
}

// ReadFile reads a shapefile: path names either the .shp (its .shx, .dbf
// and, when present, .prj and .cpg are found beside it, their extensions in
// any case) or a zip holding the files. A path with another extension is
// read as whichever of the two its first bytes show. The layer's Source is
// path.
func ReadFile(path string, opt Options) (*layer.Layer, []string, error) {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".shp":
		return readLoose(path, opt)
	case ".zip":
		return readZipFile(path, opt)
	}
	var head [4]byte
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, openError(path, err)
	}
	n, _ := io.ReadFull(f, head[:])
	f.Close()
	switch {
	case Sniff(head[:n]):
		return readLoose(path, opt)
	case isZip(head[:n]):
		return readZipFile(path, opt)
	}
	return nil, nil, errorf(path, 0, "is neither a shapefile (.shp) nor a zip holding one")
}

// Read reads a zip holding a shapefile from r, which holds size bytes
// (an os.File, or a bytes.Reader over a buffered standard input). source
// names the input in the layer and in messages. On success it returns the
// layer and any warnings, each one line starting with the name of a file;
// on failure the error is an *Error and the layer is nil, while the
// warnings gathered so far are still returned.
//
// A bare .shp cannot be read this way: its table and index are separate
// files, so it is an error that says so.
func Read(r io.ReaderAt, size int64, source string, opt Options) (*layer.Layer, []string, error) {
	var head [4]byte
	n, _ := r.ReadAt(head[:], 0)
	switch {
	case isZip(head[:n]):
		fs, err := readZip(r, size, source, opt)
		if err != nil {
			return nil, nil, err
		}
		return read(fs, source, opt)
	case Sniff(head[:n]):
		return nil, nil, errorf(source, 0, "is a bare .shp; its table (.dbf) and index (.shx) are separate files, so give the path of the .shp beside them, or a zip holding all of them")
	}
	return nil, nil, errorf(source, 0, "is not a zip holding a shapefile")
}

// Sniff reports whether head, the first bytes of a file, start a .shp (or
// .shx): the big-endian file code 9994 and, when at least 32 bytes are
// given, the little-endian version 1000.
func Sniff(head []byte) bool {
	if len(head) < 4 || binary.BigEndian.Uint32(head) != fileCode {
		return false
	}
	return len(head) < 32 || binary.LittleEndian.Uint32(head[28:]) == version
}

// isZip recognises the local file header or, for an empty archive, the end
// record that a zip starts with.
func isZip(head []byte) bool {
	s := string(head)
	return s == "PK\x03\x04" || s == "PK\x05\x06"
}

// readZipFile opens a zip on disk for Read.
func readZipFile(path string, opt Options) (*layer.Layer, []string, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, openError(path, err)
	}
	defer f.Close()
	st, err := f.Stat()
	if err != nil {
		return nil, nil, openError(path, err)
	}
	return Read(f, st.Size(), path, opt)
}

// readLoose reads a .shp and the files beside it.
func readLoose(path string, opt Options) (*layer.Layer, []string, error) {
	dir, base := filepath.Split(path)
	stem := strings.TrimSuffix(base, filepath.Ext(base))
	if opt.Layer != "" && opt.Layer != stem {
		return nil, nil, errorf(path, 0, "holds the one layer %q, not %q", stem, opt.Layer)
	}
	fs := &fileSet{where: "beside " + base}
	siblings := findSiblings(dir, stem)
	for _, s := range []struct {
		m   *member
		ext string
	}{{&fs.shp, ".shp"}, {&fs.shx, ".shx"}, {&fs.dbf, ".dbf"}, {&fs.prj, ".prj"}, {&fs.cpg, ".cpg"}} {
		name := siblings[s.ext]
		if s.ext == ".shp" {
			name = path
		}
		if name == "" {
			s.m.name = filepath.Join(dir, stem+s.ext)
			continue
		}
		data, err := os.ReadFile(name)
		if err != nil {
			return nil, nil, openError(name, err)
		}
		*s.m = member{name: name, data: data, ok: true}
	}
	return read(fs, path, opt)
}

// findSiblings maps each shapefile extension (lower case) to the file in
// dir named stem plus that extension in any case, preferring the lower and
// then the upper case spelling when several exist.
func findSiblings(dir, stem string) map[string]string {
	found := make(map[string]string)
	entries, err := os.ReadDir(dirOrDot(dir))
	if err != nil {
		return found
	}
	for _, e := range entries {
		name := e.Name()
		if e.IsDir() || len(name) <= len(stem) || name[:len(stem)] != stem {
			continue
		}
		ext := name[len(stem):]
		key := strings.ToLower(ext)
		if prev, seen := found[key]; seen && caseRank(prev[len(prev)-len(ext):]) <= caseRank(ext) {
			continue
		}
		found[key] = filepath.Join(dir, name)
	}
	return found
}

// caseRank orders the spellings of an extension: lower case, upper case,
// then mixed.
func caseRank(ext string) int {
	switch ext {
	case strings.ToLower(ext):
		return 0
	case strings.ToUpper(ext):
		return 1
	}
	return 2
}

func dirOrDot(dir string) string {
	if dir == "" {
		return "."
	}
	return dir
}

// openError reports a file that cannot be opened or read.
func openError(path string, err error) *Error {
	msg := err.Error()
	var pe *os.PathError
	if errors.As(err, &pe) {
		msg = pe.Err.Error()
	}
	return &Error{Source: path, Msg: "cannot be read: " + msg, Err: err}
}
