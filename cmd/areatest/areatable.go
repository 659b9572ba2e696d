package main

import (
	"io"

	"path/filepath"
	"strings"

	"github.com/areatest/areatest/io/figure"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/gpkg"
	"github.com/areatest/areatest/io/layer"
)

// The per-area table of a command (--out of local and residuals): a CSV
// table, or a copy of the layer with the result columns added, as a
// GeoPackage or GeoJSON, chosen by the extension.

// checkAreaTable refuses, as usage errors, a table that flag would write
// to standard output or to a file of another kind.
func checkAreaTable(flag, path string) error {
	switch ext := strings.ToLower(filepath.Ext(path)); {
	case path == "-":
		return usagef("%s writes a file, not standard output: give a name ending in .csv, .gpkg or .geojson", flag)
	case path != "" && ext != ".csv" && ext != ".geojson" && ext != ".json" && ext != ".gpkg":
		return usagef("%s must end in .csv, .gpkg or .geojson, not %q", flag, ext)
	}
	return nil
}

// checkAreaTableCRS refuses a GeoJSON copy of a layer in a projected
// coordinate system, once the layer is read.
func checkAreaTableCRS(flag, path string, lay *layer.Layer) error {
	if ext := strings.ToLower(filepath.Ext(path)); (ext == ".geojson" || ext == ".json") && lay.CRS.Projected {
		return usagef("%s %s: GeoJSON holds longitude/latitude by its standard (RFC 7946), and %s is in a projected coordinate system%s; write a .gpkg, which keeps it, or a .csv",
			flag, path, lay.Source, crsLabel(lay.CRS))
	}
	return nil
}

// writeAreaTable writes the table at path to w: by csv for a .csv name,
// else a copy of lay with the columns cols added.
func writeAreaTable(w io.Writer, path string, lay *layer.Layer, csv func(io.Writer) error, cols func() []*layer.Column) error {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".csv":
		return csv(w)
	case ".gpkg":
		return gpkg.Write(w, lay, cols(), "")
	}
	return geojson.Write(w, lay, cols())
}

// renderFiles gives each planned file whose flag draw names its renderer,
// called with the format of the file's extension (none for a table), and
// returns the paths of those files, in the order they were asked for, for
// the report's list of what it wrote. A flag named with a nil renderer
// (--report) is listed but rendered by emit, as --output is.
func (c *sharedFlags) renderFiles(draw map[string]func(io.Writer, figure.Format) error) []string {
	var written []string
	for _, f := range c.files {
		d, ok := draw[f.flag]
		if !ok {
			continue
		}
		if d != nil {
			format, _ := figure.FormatFromPath(f.path) // checked with the flags
			f.file.SetRender(func(w io.Writer) error { return d(w, format) })
		}
		written = append(written, f.path)
	}
	return written
}
