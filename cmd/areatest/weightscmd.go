package main

import (
	"io"

	"github.com/areatest/areatest/io/output"
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
	var c sharedFlags
	var write string
	fs := newFlags("weights", weightsUsage, stderr)
	c.registerInput(fs)
	c.weights.register(fs)
	fs.StringVar(&write, "write", "", "also write the graph (after --scaling) as an edge-list CSV here")
	c.registerOutput(fs, "text", "json")
	fs.Lookup("output").Usage = "write the summary here instead of stdout"
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if c.input == "" {
		return usagef("--input is required (see areatest weights --help)")
	}
	err := c.checkOutput()
	if err == nil {
		c.spec, c.transform, _, err = c.weights.spec()
	}
	if err == nil {
		err = c.open(stdin, stderr)
	}
	if err == nil {
		err = c.build(stderr)
	}
	if err != nil {
		return err
	}
	// The summary and the edge list show the weights as built, or scaled
	// when a scaling is given.
	shown := c.graph
	if c.weights.scalingGiven() {
		if shown, err = shown.Transformed(c.transform); err != nil {
			return err
		}
	}
	doc := &report.WeightsDocument{Version: Version, Input: c.lay.Source, Weights: weights.Summarise(shown, c.lay.IDs)}
	doc.Settings = []string{"read from " + c.weights.file}
	if c.weights.file == "" {
		doc.Settings = []string{c.spec.Describe(c.lay.Geoms)}
	}
	if write != "" {
		if err := output.Write(write, stdout, c.inputs(), func(w io.Writer) error { return weights.WriteEdgeList(w, shown, c.lay.IDs) }); err != nil {
			return err
		}
		doc.Written = write
	}
	return output.Write(c.output, stdout, append(c.inputs(), write), func(w io.Writer) error {
		if c.format == "json" {
			return report.JSON(w, doc)
		}
		return report.WeightsText(w, doc)
	})
}
