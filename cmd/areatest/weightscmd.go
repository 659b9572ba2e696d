package main

import (
	"fmt"
	"io"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/geojson"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/weights"
)

const weightsUsage = `areatest weights: build, inspect and export the neighbour graph of a layer.

Prints a summary a reader can check at a glance: how many neighbours areas
have, which have none, whether the graph falls apart into separate groups.
With --write it also saves the graph as a plain CSV edge list
(from,to,weight, areas named by id) that --weights reads back on any command.

Usage:
  areatest weights --input FILE [rule flags] [flags]

Examples:
  areatest weights --input counties.geojson
  areatest weights -i counties.geojson --contiguity rook --snap 0.00001
  areatest weights -i tracts.geojson --knn 6 --symmetrise --format json
  areatest weights -i tracts.geojson --band 25 --write band25.csv
  areatest weights -i tracts.geojson --kernel bisquare --adaptive 10 --transform row --write kernel.csv
  areatest compare -i counties.geojson -y rate -g policy --weights band25.csv
`

func runWeights(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var w weightFlags
	var input, id, format, output, write string
	var skip bool
	fs := newFlags("weights", weightsUsage, stderr)
	fs.StringVarP(&input, "input", "i", "", "GeoJSON FeatureCollection of polygons (- for stdin)")
	fs.StringVar(&id, "id", "", "column holding area ids (default: the feature id)")
	fs.BoolVar(&skip, "skip-bad-geometry", false, "leave out features with no or non-polygon geometry, with a warning")
	w.register(fs)
	fs.StringVar(&write, "write", "", "also write the graph (after --transform) as an edge-list CSV here")
	fs.StringVar(&format, "format", "text", "text or json")
	fs.StringVarP(&output, "output", "o", "-", "write the summary here instead of stdout")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if input == "" {
		return usagef("--input is required (see areatest weights --help)")
	}
	if format != "text" && format != "json" {
		return usagef("--format must be text or json, not %q", format)
	}
	spec, transform, _, err := w.spec()
	if err != nil {
		return err
	}
	lay, warnings, err := readLayer(input, stdin, geojson.Options{IDColumn: id, SkipBadGeometry: skip})
	if err != nil {
		return err
	}
	for _, m := range warnings {
		warn(stderr, m)
	}
	g, warnings, err := w.graph(lay, spec)
	if err != nil {
		return err
	}
	for _, m := range warnings {
		warn(stderr, m)
	}
	// The summary and the edge list show the weights as built, or after
	// --transform when it is given.
	shown := g
	if w.changed("transform") {
		if shown, err = g.Transformed(transform); err != nil {
			return err
		}
	}
	doc := &report.WeightsDocument{Version: Version, Input: lay.Source, Weights: weights.Summarise(shown, lay.IDs)}
	doc.Settings = settings(&w, spec, lay.Geoms)
	if write != "" {
		if err := writeOutput(write, stdout, []string{input}, func(out io.Writer) error {
			return weights.WriteEdgeList(out, shown, lay.IDs)
		}); err != nil {
			return err
		}
		doc.Written = write
	}
	return writeOutput(output, stdout, []string{input, write}, func(out io.Writer) error {
		if format == "json" {
			return report.JSON(out, doc)
		}
		return report.WeightsText(out, doc)
	})
}

// settings describes the parameters of the rule in words.
func settings(w *weightFlags, s weights.Spec, geoms []orb.MultiPolygon) []string {
	var out []string
	if w.file != "" {
		return []string{"read from " + w.file}
	}
	if !s.PointBased() {
		snap, note := s.Snap, ""
		if snap == 0 {
			snap, note = weights.DefaultSnap(geoms), ", the default for these coordinates"
		}
		out = append(out, fmt.Sprintf("boundary points within %.3g %s count as shared%s", snap, unitsOf(geoms), note))
	} else {
		metric := "great-circle distances in km"
		if s.Planar || weights.DetectMetric(geoms) == weights.Planar {
			metric = "planar distances in layer units"
		}
		out = append(out, metric+" between "+w.points+" points of the areas")
	}
	return out
}

func unitsOf(geoms []orb.MultiPolygon) string {
	if weights.DetectMetric(geoms) == weights.Geographic {
		return "degrees"
	}
	return "layer units"
}
