package main

import (
	"io"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/io/figure"
)

// wantPicture asks for the picture file that flag names ("" asks for
// none), refusing standard output and an extension that is neither .svg
// nor .png as usage errors.
func (c *sharedFlags) wantPicture(flag, path string) error {
	switch _, err := figure.FormatFromPath(path); {
	case path == "":
		return nil
	case path == "-":
		return usagef("%s draws into a file, not standard output: give a name ending in .svg or .png", flag)
	case err != nil:
		return usagef("%s: %v", flag, err)
	}
	c.wantOutput(flag, path)
	return nil
}

// drawPicture gives the planned file of flag, if any, its renderer: draw
// in the format of the file's extension.
func (c *sharedFlags) drawPicture(flag string, draw func(io.Writer, figure.Format) error) {
	c.renderFiles(map[string]func(io.Writer, figure.Format) error{flag: draw})
}

// parseClasses reads the class rule of a choropleth: quantile or natural.
func parseClasses(s string) (figure.Classes, error) {
	rule, err := choice.Parse("--classes", s,
		choice.Name[figure.Classes]{Name: "quantile", Value: figure.Quantile}, choice.Name[figure.Classes]{Name: "natural", Value: figure.NaturalBreaks})
	if err != nil {
		return 0, usagef("%v", err)
	}
	return rule, nil
}
