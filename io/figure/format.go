package figure

import (
	"fmt"
	"path/filepath"
	"strings"
)

// Format is the kind of file a drawing function writes.
type Format int

const (
	// SVG is scalable vector graphics: text stays text and every area stays
	// a separate path, so the file can be restyled or inspected.
	SVG Format = iota
	// PNG is a raster image at the requested size in pixels.
	PNG
)

// String returns "svg" or "png".
func (f Format) String() string {
	switch f {
	case SVG:
		return "svg"
	case PNG:
		return "png"
	}
	return fmt.Sprintf("Format(%d)", int(f))
}

func (f Format) check() error {
	if f != SVG && f != PNG {
		return fmt.Errorf("plot: unknown format %d (want SVG or PNG)", int(f))
	}
	return nil
}

// FormatFromPath chooses the format from the extension of path, in any
// case: ".svg" or ".png". Any other extension, or none, is an error that
// names it, so a typing slip does not silently produce the wrong kind of file.
func FormatFromPath(path string) (Format, error) {
	ext := filepath.Ext(path)
	switch strings.ToLower(ext) {
	case ".svg":
		return SVG, nil
	case ".png":
		return PNG, nil
	case "":
		return 0, fmt.Errorf("%s: no file extension; use .svg or .png", path)
	}
	return 0, fmt.Errorf("%s: unknown picture extension %q; use .svg or .png", path, ext)
}
