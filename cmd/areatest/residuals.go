package main

import (
	"fmt"
	"io"
	"slices"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/io/report"
	"github.com/areatest/areatest/spatial/local"
	"github.com/areatest/areatest/spatial/regress"
	"github.com/areatest/areatest/spatial/shuffle"
)

// residualsFlags are the settings of `areatest residuals`.
type residualsFlags struct {
	sharedFlags
	outcome                         string
	covariates                      []string
	out, mapFile, localMap, classes string
	alpha                           float64
	classRule                       figure.Classes // set by check
}

func (c *residualsFlags) register(fs *pflag.FlagSet) {
	fs.StringVarP(&c.outcome, "outcome", "y", "", "numeric column to model")
	fs.StringSliceVar(&c.covariates, "covariates", nil, "columns that explain it, comma-separated; a text column becomes one indicator per level but the first")
	fs.Float64Var(&c.alpha, "alpha", 0.05, "level at which the reading calls a Lagrange multiplier test (and --local an area) significant")
	fs.StringVar(&c.out, "out", "", "per-area fitted values, residuals and standardised residuals: a .csv table, or a copy of the layer with them added: .gpkg or .geojson (lon/lat layers only)")
	fs.StringVar(&c.mapFile, "map", "", "map of the residuals in 5 classes (.svg or .png), see --classes")
	fs.StringVar(&c.classes, "classes", "quantile", "classes of --map: quantile or natural (natural breaks, Fisher 1958)")
	fs.StringVar(&c.localMap, "local", "", "map of the local Moran categories of the residuals (.svg or .png), tested as areatest local tests them")
	c.sharedFlags.register(fs, "text", "json")
	fs.Lookup("alternative").Usage = "direction of the residual Moran's I p-values (and of --local): two-sided, greater (more clustered than chance) or less"
	fs.Lookup("permutations").Usage = "with --local: conditional shuffles per area (at most " + fmt.Sprint(shuffle.MaxPermutations) + "); nothing else here is random"
}

// check checks the columns named and the files asked for, before any data
// is read.
func (c *residualsFlags) check() (err error) {
	switch {
	case c.input == "":
		return usagef("--input is required (see areatest residuals --help)")
	case c.outcome == "":
		return usagef("--outcome is required (see areatest residuals --help)")
	case len(c.covariates) == 0:
		return usagef("--covariates is required: the model needs at least one column to explain %s (see areatest residuals --help)", c.outcome)
	case !(c.alpha > 0 && c.alpha < 1):
		return usagef("--alpha must be between 0 and 1")
	}
	for k, name := range c.covariates {
		switch {
		case name == c.outcome:
			return usagef("--covariates names the outcome %s; a column cannot explain itself", name)
		case slices.Contains(c.covariates[:k], name):
			return usagef("--covariates names %s twice", name)
		}
	}
	if c.classRule, err = parseClasses(c.classes); err != nil {
		return err
	}
	if err := checkAreaTable("--out", c.out); err != nil {
		return err
	}
	c.wantOutput("--out", c.out)
	for _, p := range []struct{ flag, path string }{{"--map", c.mapFile}, {"--local", c.localMap}} {
		if err := c.wantPicture(p.flag, p.path); err != nil {
			return err
		}
	}
	return nil
}

func runResiduals(args []string, stdin io.Reader, stdout, stderr io.Writer) error {
	var c residualsFlags
	fs := newFlags("residuals", stderr)
	c.register(fs)
	if err := parseFlags(fs, args); err != nil {
		return err
	}
	if err := c.check(); err != nil {
		return err
	}
	if err := c.prepare("residuals", stdin, stderr, shuffle.ParseAlternative); err != nil {
		return err
	}
	if err := checkAreaTableCRS("--out", c.out, c.lay); err != nil {
		return err
	}
	in, err := c.columns()
	if err != nil {
		return err
	}
	res, err := regress.Analyse(in)
	if err != nil {
		return err
	}
	res.Version = Version
	if res.IslandsLeftOut > 0 {
		res.Warnings = slices.Insert(res.Warnings, len(res.Weights.Warnings), fmt.Sprintf(
			"%d area(s) with data have no neighbour among the others and are left out of the fit as well as the spatial tests, so that the residuals tested are those of the model reported (use --islands keep to keep them with a zero spatial lag).", res.IslandsLeftOut))
	}
	pics := report.ResidualPictures{Layer: c.lay, Result: res, Classes: c.classRule}
	if c.localMap != "" {
		if pics.Local, err = c.localResiduals(res); err != nil {
			return err
		}
	}
	c.write(pics)
	return c.emit(stdout, stderr, res.Warnings, map[string]func(io.Writer) error{
		"json": func(w io.Writer) error { return report.JSON(w, res) },
		"text": func(w io.Writer) error { return report.ResidualsText(w, res) },
		"html": c.page(res, 0, c.pagePictures(pics)...),
	})
}

// pagePictures are the pictures of the page of --report: the residuals on
// the map, and their local Moran categories when --local asked for them.
func (c *residualsFlags) pagePictures(pics report.ResidualPictures) []pagePicture {
	out := []pagePicture{{"The residuals on the map", "Each area's residual of the least-squares fit, in classes.", pics.Map}}
	if pics.Local != nil {
		out = append(out, pagePicture{"Local Moran categories of the residuals", "Where the residuals cluster, tested area by area.", pics.LocalMap})
	}
	return out
}

// columns gathers the model's columns from the layer: the outcome must be
// numbers; a covariate may be text, unless most of its values are numbers
// (then it is numbers with a few bad values, named in the error).
func (c *residualsFlags) columns() (regress.Input, error) {
	lay := c.lay
	in := regress.Input{File: lay.Source, IDs: lay.IDs, Graph: c.graph, Scaling: c.scaling, KeepIslands: c.keepIslands,
		Alternative: c.alt, Alpha: c.alpha}
	y, err := lay.NumericColumn(c.outcome, "the outcome")
	if err != nil {
		return in, err
	}
	in.Outcome = regress.Column{Name: y.Name, Values: y.Num, Missing: y.Missing}
	for _, name := range c.covariates {
		col, err := lay.Column(name)
		switch {
		case err != nil:
			return in, err
		case col.Kind == layer.Number:
			in.Covariates = append(in.Covariates, regress.Column{Name: name, Values: col.Num, Missing: col.Missing})
		case col.MostlyNumbers():
			return in, lay.NotNumeric(col, "a covariate")
		default:
			in.Covariates = append(in.Covariates, regress.Column{Name: name, Labels: col.Labels(), Missing: col.Missing})
		}
	}
	return in, nil
}

// localResiduals runs the local Moran analysis of the residuals on the
// same graph, scaling and islands policy, as `areatest local` runs it
// (Benjamini–Hochberg adjusted p-values at --alpha), for --local.
func (c *residualsFlags) localResiduals(res *regress.Result) (*local.Result, error) {
	n := len(c.lay.IDs)
	values, missing := make([]float64, n), make([]bool, n)
	for i := range missing {
		missing[i] = true
	}
	for k, i := range res.Rows {
		values[i], missing[i] = res.Fit.Residuals[k], false
	}
	in := local.Input{File: c.lay.Source, IDs: c.lay.IDs, Variable: "the residual of " + c.outcome, Values: values, Missing: missing,
		Graph: c.graph, Scaling: c.scaling, KeepIslands: c.keepIslands}
	opt := local.Options{Permutations: c.permutations, Seed: c.seed, Workers: c.workers, Alpha: c.alpha, Alternative: c.alt,
		Adjustment: shuffle.BenjaminiHochberg}
	lr, err := local.Analyse(local.Moran, in, opt)
	if err != nil {
		return nil, err
	}
	lr.Version = Version
	res.Draws = &regress.Draws{Seed: c.seed, Permutations: c.permutations, For: "the local Moran map of the residuals"}
	return lr, nil
}

// write gives the planned table and pictures their renderers and lists
// them in the result; emit writes them with the report.
func (c *residualsFlags) write(pics report.ResidualPictures) {
	res := pics.Result
	table := func(w io.Writer, _ figure.Format) error {
		return writeAreaTable(w, c.out, c.lay, func(w io.Writer) error { return report.ResidualsCSV(w, res, c.lay.IDs) },
			func() []*layer.Column { return report.ResidualColumns(res, len(c.lay.IDs)) })
	}
	draw := map[string]func(io.Writer, figure.Format) error{"--out": table, "--map": pics.Map, "--local": pics.LocalMap, "--report": nil}
	res.Written = append(res.Written, c.renderFiles(draw)...)
}
