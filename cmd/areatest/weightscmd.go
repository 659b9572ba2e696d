package main

import (
	"io"

	"github.com/areatest/areatest/internal/choice"
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
  areatest weights -i tracts.geojson --kernel bisquare --adaptive 10 --scaling row --write kernel.csv
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
	fs.StringVar(&write, "write", "", "also write the graph (after --scaling) as an edge-list CSV here")
	fs.StringVar(&format, "format", "text", "text or json")
	fs.StringVarP(&output, "output", "o", "-", "write the summary here instead of stdout")
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if input == "" {
		return usagef("--input is required (see areatest weights --help)")
	}
	asJSON, err := choice.Parse("--format", format, choice.Name[bool]{Name: "text"}, choice.Name[bool]{Name: "json", Value: true})
	if err != nil {
		return usagef("%v", err)
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
	// The summary and the edge list show the weights as built, or scaled
	// when a scaling is given.
	shown := g
	if w.scalingGiven() {
		if shown, err = g.Transformed(transform); err != nil {
			return err
		}
	}
	doc := &report.WeightsDocument{Version: Version, Input: lay.Source, Weights: weights.Summarise(shown, lay.IDs)}
	doc.Settings = []string{"read from " + w.file}
	if w.file == "" {
		doc.Settings = []string{spec.Describe(lay.Geoms)}
	}
	if write != "" {
		if err := writeOutput(write, stdout, []string{input}, func(out io.Writer) error {
			return weights.WriteEdgeList(out, shown, lay.IDs)
		}); err != nil {
			return err
		}
		doc.Written = write
	}
	return writeOutput(output, stdout, []string{input, write}, func(out io.Writer) error {
		if asJSON {
			return report.JSON(out, doc)
		}
		return report.WeightsText(out, doc)
	})
}
