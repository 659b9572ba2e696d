package main

import (
	"io"

	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/weights"
)

func runWeights(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var c sharedFlags
	var write string
	var list bool
	fs := newFlags("weights", stderr)
	c.registerInput(fs)
	c.weights.register(fs)
	c.weights.showAsBuilt(fs)
	c.weights.listAdvice = "--list-geometry-problems"
	fs.StringVar(&write, "write", "", "also write the graph (after --scaling) as an edge-list CSV here")
	fs.BoolVar(&list, "list-geometry-problems", false, "list every sliver ring and ring that meets itself in the summary (the JSON lists them always)")
	c.registerOutput(fs, "text", "json")
	fs.Lookup("output").Usage = "write the summary here instead of stdout"
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if c.input == "" {
		return usagef("--input is required (see areatest weights --help)")
	}
	err := c.checkTable()
	if err == nil {
		c.spec, c.scaling, _, err = c.weights.spec()
	}
	if err == nil {
		c.wantOutput("--write", write)
		err = c.checkOutput()
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
		if shown, err = shown.Scaled(c.scaling); err != nil {
			return err
		}
	}
	doc := &report.WeightsDocument{Version: Version, Input: c.lay.Source, Weights: weights.Summarise(shown, c.lay.IDs),
		GeometryProblems: c.weights.problems, ListProblems: list}
	nameFlags(doc.Weights.Warnings)
	doc.Settings = []string{"read from " + c.weights.file}
	if c.weights.file == "" {
		doc.Settings = []string{c.spec.Describe(c.lay.Geoms)}
	}
	if write != "" {
		c.fileOf("--write").SetRender(func(w io.Writer) error { return weights.WriteEdgeList(w, shown, c.lay.IDs, write) })
		doc.Written = write
	}
	// The summary's warnings are the report's: on stderr too when the
	// report is not text on stdout, as for every command.
	return c.emit(stdout, stderr, doc.Weights.Warnings, map[string]func(io.Writer) error{
		"json": func(w io.Writer) error { return report.JSON(w, doc) },
		"text": func(w io.Writer) error { return report.WeightsText(w, doc) },
		"html": c.page(doc, 0),
	})
}
