package input

import (
	"bufio"

	"github.com/areatest/areatest/io/layer"
)

// readOther reads the formats other than GeoJSON from a file.
func readOther(path string, f Format, head []byte, opt Options) (*layer.Layer, []string, error) {
	return nil, nil, &Error{Source: path, Msg: "is a " + f.String() + ", which this version does not read yet"}
}

// readStdinOther reads the formats other than GeoJSON from standard input.
func readStdinOther(br *bufio.Reader, f Format, opt Options) (*layer.Layer, []string, error) {
	return nil, nil, &Error{Source: "stdin", Msg: "holds a " + f.String() + ", which this version reads only from a file"}
}
