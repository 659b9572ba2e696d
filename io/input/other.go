package input

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/areatest/areatest/io/gpkg"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/shapefile"
)

// maxStdin caps what is read from standard input into memory for a format
// that cannot be streamed (a zip): past it, the file is to be given by name.
const maxStdin = 2 << 30

// readOther reads the formats other than GeoJSON from a file.
func readOther(path string, f Format, opt Options) (*layer.Layer, []string, error) {
	switch f {
	case Zip, Shapefile:
		return shapefile.ReadFile(path, shapefile.Options{IDColumn: opt.IDColumn, SkipBadGeometry: opt.SkipBadGeometry, Layer: opt.Layer})
	case GeoPackage:
		return gpkg.ReadFile(path, gpkg.Options{IDColumn: opt.IDColumn, SkipBadGeometry: opt.SkipBadGeometry, Layer: opt.Layer})
	}
	return nil, nil, &Error{Source: path, Msg: "is a " + f.String() + ", which this version does not read"}
}

// readStdinOther reads the formats other than GeoJSON from standard input:
// a zip is read into memory; a bare .shp cannot come this way, its .shx and
// .dbf being other files.
func readStdinOther(br *bufio.Reader, f Format, opt Options) (*layer.Layer, []string, error) {
	switch f {
	case Shapefile:
		return nil, nil, &Error{Source: "stdin", Msg: "holds a bare .shp, whose .shx and .dbf cannot come through standard input; give the .shp by name, or pipe a zip that holds the shapefile"}
	case Zip:
		data, err := readAll(br)
		if err != nil {
			return nil, nil, err
		}
		return shapefile.Read(bytes.NewReader(data), int64(len(data)), "stdin", shapefile.Options{IDColumn: opt.IDColumn, SkipBadGeometry: opt.SkipBadGeometry, Layer: opt.Layer})
	case GeoPackage:
		return readStdinGeoPackage(br, opt)
	}
	return nil, nil, &Error{Source: "stdin", Msg: "holds a " + f.String() + ", which this version reads only from a file"}
}

// readAll reads standard input whole, up to maxStdin bytes.
func readAll(r io.Reader) ([]byte, error) {
	data, err := io.ReadAll(io.LimitReader(r, maxStdin+1))
	if err != nil {
		return nil, &Error{Source: "stdin", Msg: "cannot be read: " + err.Error(), Err: err}
	}
	if len(data) > maxStdin {
		return nil, &Error{Source: "stdin", Msg: fmt.Sprintf("holds more than %d GiB; give the file by name instead", maxStdin>>30)}
	}
	return data, nil
}

// readStdinGeoPackage copies standard input to a temporary file, which
// SQLite needs, reads it and removes it; messages name "stdin".
func readStdinGeoPackage(r io.Reader, opt Options) (*layer.Layer, []string, error) {
	tmp, err := os.CreateTemp("", "areatest-stdin-*.gpkg")
	if err != nil {
		return nil, nil, &Error{Source: "stdin", Msg: "holds a GeoPackage, which needs a temporary file: " + err.Error(), Err: err}
	}
	defer os.Remove(tmp.Name())
	_, err = io.Copy(tmp, io.LimitReader(r, maxStdin+1))
	if cerr := tmp.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return nil, nil, &Error{Source: "stdin", Msg: "cannot be copied to a temporary file: " + err.Error(), Err: err}
	}
	lay, warnings, err := gpkg.ReadFile(tmp.Name(), gpkg.Options{IDColumn: opt.IDColumn, SkipBadGeometry: opt.SkipBadGeometry, Layer: opt.Layer})
	for i, w := range warnings {
		warnings[i] = strings.Replace(w, tmp.Name(), "stdin", 1)
	}
	var ge *gpkg.Error
	if errors.As(err, &ge) {
		ge.Source = "stdin"
	}
	if lay != nil {
		lay.Source = "stdin"
	}
	return lay, warnings, err
}

// Choices returns the layers of a file of several when err is about which
// one to read (several, or an unknown one named), for a caller to say how
// to name one; nil otherwise.
func Choices(err error) []string {
	var se *shapefile.Error
	var ge *gpkg.Error
	switch {
	case errors.As(err, &se):
		return se.Layers
	case errors.As(err, &ge):
		return ge.Layers
	}
	return nil
}
