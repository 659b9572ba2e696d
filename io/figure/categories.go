package figure

import "github.com/areatest/areatest/spatial/local"

// noNeighboursColour is for areas without a neighbour: a neutral grey,
// darker than the warm pale grey of "no significant pattern".
var noNeighboursColour = rgb(0xbd, 0xbd, 0xbd)

// LocalLegend returns the legend of a category map of a local statistic,
// entry k for category k of local.Categories(kind) (local.CategoryIndex).
// Every statistic's patterns take the hues of LocalCategories in their
// order, in the same sense (orange high, purple low, dark for resemblance,
// light for contrast); areas without a neighbour are a plain grey.
func LocalLegend(kind local.Kind) []Category {
	pal := LocalCategories()
	names := local.Categories(kind)
	legend := make([]Category, len(names))
	for k, name := range names {
		legend[k].Name = local.Legend(name)
		switch name {
		case local.NotSignificant:
			legend[k].Color = pal[NotSignificant].Color
		case local.NoNeighbours:
			legend[k].Color = noNeighboursColour
		default: // the patterns, at most four
			legend[k].Color = pal[k].Color
		}
	}
	return legend
}
