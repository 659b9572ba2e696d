package input

import (
	"bufio"
	"bytes"
	"errors"
	"fmt"
	"io"

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
	}
	return nil, nil, &Error{Source: path, Msg: "is a " + f.String() + ", which this version does not read yet"}
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

// Choices returns the layers of a file of several when err is about which
// one to read (several, or an unknown one named), for a caller to say how
// to name one; nil otherwise.
func Choices(err error) []string {
	var se *shapefile.Error
	if errors.As(err, &se) {
		return se.Layers
	}
	return nil
}
