package report

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/spatial/regress"
)

// ResidualColumnNames are the per-area columns of a fit, in the CSV table
// and added to a copy of the layer: the fitted value, the residual and the
// internally studentised residual. The prefix keeps them apart from the
// layer's own columns.
var ResidualColumnNames = []string{"ols_fitted", "ols_residual", "ols_standardised_residual"}

// residualValues spreads the fit's per-area values over the layer's rows:
// fitted, residuals and standardised residuals, NaN and missing on the
// areas left out.
func residualValues(r *regress.Result, areas int) (cols [3][]float64, missing []bool) {
	missing = make([]bool, areas)
	for c, v := range [3][]float64{r.Fit.Fitted, r.Fit.Residuals, r.Fit.Standardised} {
		cols[c] = make([]float64, areas)
		for i := range cols[c] {
			cols[c][i] = math.NaN()
		}
		for k, i := range r.Rows {
			cols[c][i] = v[k]
		}
	}
	for i := range missing {
		missing[i] = math.IsNaN(cols[0][i])
	}
	return cols, missing
}

// ResidualsCSV writes one row per area of the layer (ids): the id and
// ResidualColumnNames, empty for the areas left out.
func ResidualsCSV(w io.Writer, r *regress.Result, ids []string) error {
	cols, missing := residualValues(r, len(ids))
	cw := csv.NewWriter(w)
	cw.Write(append([]string{"id"}, ResidualColumnNames...))
	for i, id := range ids {
		row := []string{id, "", "", ""}
		if !missing[i] {
			for c := range cols {
				row[c+1] = strconv.FormatFloat(cols[c][i], 'g', 10, 64)
			}
		}
		cw.Write(row)
	}
	cw.Flush()
	return cw.Error()
}

// ResidualColumns returns the per-area values as layer columns
// (ResidualColumnNames), to be added to a copy of the layer.
func ResidualColumns(r *regress.Result, areas int) []*layer.Column {
	cols, missing := residualValues(r, areas)
	out := make([]*layer.Column, len(cols))
	for c := range cols {
		out[c] = &layer.Column{Name: ResidualColumnNames[c], Kind: layer.Number, Num: cols[c], Missing: missing}
	}
	return out
}

// ResidualPictures draws the maps of a fit on the layer it was computed
// on; each method renders one picture in format f.
type ResidualPictures struct {
	Layer  *layer.Layer
	Result *regress.Result
	// Classes is the class rule of the residual map.
	Classes figure.Classes
	// Local is the local Moran analysis of the residuals, for LocalMap.
	Local *local.Result
}

// Map draws the residuals of the areas in the model in five classes, the
// areas left out hatched.
func (p ResidualPictures) Map(w io.Writer, f figure.Format) error {
	r := p.Result
	cols, missing := residualValues(r, len(p.Layer.IDs))
	label := "residual of " + r.Input.Outcome
	opt := figure.MapOptions{Title: "What the model of " + r.Input.Outcome + " leaves",
		Subtitle: fmt.Sprintf("residuals of least squares on %s, %s classes; residual Moran's I %.3f, p %s (%s)",
			strings.Join(r.Input.Covariates, ", "), classNames[p.Classes], r.Moran.I, PValue(r.Moran.P), r.Moran.Alternative),
		LonLat: lonLat(p.Layer), IDs: p.Layer.IDs,
		Note: fmt.Sprintf("%s · areatest %s. A pattern in the residuals is association between areas, not a cause.", p.Layer.Source, r.Version)}
	return figure.Choropleth(w, f, p.Layer.Geoms, cols[1], missing, p.Classes, 5, label, opt)
}

// LocalMap draws the categories of the local Moran analysis of the
// residuals, as `areatest local` draws its map.
func (p ResidualPictures) LocalMap(w io.Writer, f figure.Format) error {
	if p.Local == nil {
		return fmt.Errorf("no local analysis of the residuals to draw")
	}
	return LocalPictures{Layer: p.Layer, Result: p.Local}.Map(w, f)
}
