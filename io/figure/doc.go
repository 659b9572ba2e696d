// Package figure draws per-area results as pictures: choropleth maps of a
// numeric variable, maps of categories (such as the kinds of local
// association), the Moran scatter plot and the histogram of a permutation
// distribution. It takes plain data — geometries, values, category
// indices — and knows nothing of statistics or files; the caller picks SVG
// or PNG, usually with FormatFromPath, and gives an io.Writer.
//
// # Where to start
//
// The entry points are Choropleth and CategoryMap (maps.go), which turn
// values or categories into a mapSpec for drawMap (mapdraw.go): it projects
// and flattens the layer (project.go, layer.go), measures the legend, lays
// the picture out and paints it through the canvas interface (canvas.go),
// whose backends are svg.go and raster.go. Classes and Breaks (classes.go)
// cut values into classes; palette.go holds the colours and text.go the
// font metrics and the title, subtitle and note that maps and charts
// share. MoranScatter and Histogram (charts.go) are the charts.
// GroupOutcomeMap (groupmap.go) draws two maps of one layer side by side
// through the same machinery (drawPair); MoranScatterPanels,
// HistogramPanels (panels.go) and Correlogram (correlogram.go) put one
// panel per variable in a grid (renderPanels).
//
// # How maps are drawn
//
// A map is laid out once, in pixels, and then drawn through a small canvas
// with two backends: one writes SVG as it goes (one <path> per area, filled
// by the even-odd rule so holes show, areas grouped by class so the style
// is written once per class, coordinates to a tenth of a pixel), the other
// paints the same shapes with golang.org/x/image/vector and the same font
// (Liberation Sans) and encodes a PNG. So the two formats show the same
// picture; a map of 85,000 areas takes about 0.15 s as SVG (about 9 MB)
// and 0.35 s as PNG on a 2-core machine.
//
// The map keeps the aspect of the layer (see MapOptions.LonLat for the
// projection of longitude/latitude layers). The legend goes to the right
// of the map, or under it in columns when that lets the map be larger. It
// lists every class or category with its number of areas, then "no data"
// with the number of areas without a value. Long titles and notes wrap:
// the title, the subtitle and the legend heading take at most three lines
// each and the note eight, the last line ending in "…" when text is left
// over; long legend labels, and charts' axis labels longer than their
// axis, are shortened with "…"; nothing is drawn outside the picture. Text
// is measured as it grows, one character at a time, so laying it out takes
// time linear in its length (see BenchmarkLongName).
//
// Outlines between areas follow the size areas are drawn at: grey lines
// when areas are large, fainter ones when they are small, none when they
// are only a few pixels across (each area is then outlined in its own
// colour, which closes the hairline seams anti-aliasing would leave).
// Areas without data are hatched grey on white with a grey outline — a
// pattern no palette colour resembles. A part of an area that has no
// other area within 2 pixels (an island) is outlined when areas are not,
// so that one in a pale class does not melt into the page; if it is also
// under 4 pixels across, a disc in its colour marks it, so islets stay
// visible at any scale.
//
// # Palettes
//
// Sequential returns the choropleth ramp (pale cream through sea green to
// deep indigo, evenly spaced in OKLab lightness); LocalCategories the
// colours for local association: dark orange and purple for the clusters,
// light orange and light purple for the outliers, warm pale grey for no
// significant pattern; Groups the eight colours of unordered groups
// (blue, orange, green, wine, yellow, pale sky, olive brown, violet),
// kept apart under the three common dichromacies.
//
// # Charts
//
// MoranScatter and Histogram are drawn with gonum.org/v1/plot, whose
// vgsvg and vgimg backends again give SVG and PNG from one drawing.
package figure
