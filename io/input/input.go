// Package input opens a layer whatever its format — GeoJSON, a GeoPackage,
// a shapefile (plain, or zipped as statistics offices distribute them) —
// choosing the reader by the file's first bytes rather than by its name,
// and joins a table onto it by key when asked. It is the one place the
// commands read layers through; each format's rules live in its own
// package (io/geojson, io/gpkg, io/shapefile, io/table), and all of them
// give the same layer model (io/layer).
//
// Read is the entry point.
package input

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/gpkg"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/shapefile"
)

// Options adjust how a layer is read.
type Options struct {
	// IDColumn names the column of area ids ("" for the format's own).
	IDColumn string
	// SkipBadGeometry leaves out areas without polygon geometry, with
	// warnings, instead of failing.
	SkipBadGeometry bool
	// Layer picks one layer of a file that holds several (a GeoPackage's
	// feature tables, the shapefiles of a zip).
	Layer string
}

// Format is a kind of layer file.
type Format int

const (
	// Unknown is no format this package reads.
	Unknown Format = iota
	GeoJSON
	GeoPackage
	Shapefile
	Zip
)

// String names the format as messages do.
func (f Format) String() string {
	switch f {
	case GeoJSON:
		return "GeoJSON"
	case GeoPackage:
		return "GeoPackage"
	case Shapefile:
		return "shapefile"
	case Zip:
		return "zipped shapefile"
	}
	return "unknown"
}

// sniffLen is how many leading bytes Sniff looks at.
const sniffLen = 512

// Sniff tells the format from a file's first bytes: the SQLite header of a
// GeoPackage, the local-file signature of a zip, the file code 9994 of a
// .shp, or a JSON object (after white space and a byte-order mark).
func Sniff(head []byte) Format {
	switch {
	case bytes.HasPrefix(head, []byte("SQLite format 3\x00")):
		return GeoPackage
	case bytes.HasPrefix(head, []byte("PK\x03\x04")), bytes.HasPrefix(head, []byte("PK\x05\x06")):
		return Zip
	case len(head) >= 4 && head[0] == 0 && head[1] == 0 && head[2] == 0x27 && head[3] == 0x0a:
		return Shapefile
	}
	t := bytes.TrimLeft(bytes.TrimPrefix(head, []byte("\ufeff")), " \t\r\n")
	if len(t) > 0 && t[0] == '{' {
		return GeoJSON
	}
	return Unknown
}

// Error is a file Read cannot take: not a layer format, or a form of one
// that cannot come that way (a shapefile on standard input).
type Error struct {
	Source, Msg string
	Err         error
}

func (e *Error) Error() string { return e.Source + ": " + e.Msg }
func (e *Error) Unwrap() error { return e.Err }

// Read reads the layer at path, or from stdin when path is "-" (GeoJSON is
// streamed; the other formats need the whole file and are read into memory
// or a temporary file first). It returns the warnings of the reader, each
// one line naming the source.
func Read(path string, stdin io.Reader, opt Options) (*layer.Layer, []string, error) {
	if path == "-" {
		return readStdin(stdin, opt)
	}
	head, err := readHead(path)
	if err != nil {
		return nil, nil, err
	}
	switch f := Sniff(head); f {
	case GeoJSON:
		return geojson.ReadFile(path, geojson.Options{IDColumn: opt.IDColumn, SkipBadGeometry: opt.SkipBadGeometry})
	case Unknown:
		if err := shapefilePart(path); err != nil {
			return nil, nil, err
		}
		// GeoJSON's reader explains best what other text is (a CSV
		// table, JSON of another kind).
		return geojson.ReadFile(path, geojson.Options{IDColumn: opt.IDColumn, SkipBadGeometry: opt.SkipBadGeometry})
	default:
		return readOther(path, f, opt)
	}
}

// readHead reads the first bytes of the file at path.
func readHead(path string) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		var pe *os.PathError
		msg := err.Error()
		if errors.As(err, &pe) {
			msg = pe.Err.Error()
		}
		return nil, &Error{Source: path, Msg: "cannot be opened: " + msg, Err: err}
	}
	defer f.Close()
	if st, err := f.Stat(); err == nil && st.IsDir() {
		return nil, &Error{Source: path, Msg: "is a directory, not a layer file"}
	}
	head := make([]byte, sniffLen)
	n, err := io.ReadFull(f, head)
	if err != nil && !errors.Is(err, io.ErrUnexpectedEOF) && !errors.Is(err, io.EOF) {
		return nil, &Error{Source: path, Msg: "cannot be read: " + err.Error(), Err: err}
	}
	return head[:n], nil
}

// readStdin reads a layer from standard input: GeoJSON streamed as it
// comes, the other formats buffered.
func readStdin(stdin io.Reader, opt Options) (*layer.Layer, []string, error) {
	br := bufio.NewReaderSize(stdin, 64<<10)
	head, _ := br.Peek(sniffLen)
	switch f := Sniff(head); f {
	case GeoJSON, Unknown:
		// GeoJSON's reader explains what is wrong with other text best.
		return geojson.Read(br, "stdin", geojson.Options{IDColumn: opt.IDColumn, SkipBadGeometry: opt.SkipBadGeometry})
	default:
		return readStdinOther(br, f, opt)
	}
}

// shapefilePart explains a file given as the layer that is one of a
// shapefile's companions, or nil.
func shapefilePart(path string) error {
	switch ext := strings.ToLower(filepath.Ext(path)); ext {
	case ".dbf", ".shx", ".prj", ".cpg", ".sbn", ".sbx", ".qix":
		return &Error{Source: path, Msg: fmt.Sprintf("is part of a shapefile (its %s file); give the .shp file beside it, or the zip that holds them", ext)}
	}
	return nil
}

// Skippable reports an error about one area without polygon geometry (none,
// null, empty, or another type), which Options.SkipBadGeometry would have
// left out with a warning.
func Skippable(err error) bool {
	var je *geojson.Error
	var se *shapefile.Error
	var ge *gpkg.Error
	return errors.As(err, &je) && je.Skippable || errors.As(err, &se) && se.Skippable || errors.As(err, &ge) && ge.Skippable
}

// LooksLikeTable reports an error saying the input is a table of
// delimited text (a CSV) rather than a layer.
func LooksLikeTable(err error) bool {
	var je *geojson.Error
	return errors.As(err, &je) && je.Delimited
}
