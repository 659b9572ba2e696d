package main

import (
	"fmt"
	"os"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/internal/choice"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/weights"
)

// weightFlags are the neighbour-graph settings every command shares. The
// rule's numbers go straight into s; the names are parsed by spec.
type weightFlags struct {
	s                        weights.Spec
	contiguity, points, file string
	// transform is the former name of scaling, read for one more release,
	// hidden from --help and noted on stderr when used.
	scaling, transform, islands string
	order                       int
	changed                     func(string) bool
	// problems are the geometry problems of the last graph built, in full;
	// graph returns only their summary, and the weights command lists them.
	problems []weights.GeometryProblem
	// listAdvice says where the full list of problems is, after the summary.
	listAdvice string
	// The distance flags, converted to the layer's units by resolve.
	snap, band, bandwidth *distanceFlag
}

func (w *weightFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&w.contiguity, "contiguity", "queen", "neighbours share a corner (queen) or an edge (rook)")
	w.snap = distanceVar(fs, &w.s.Snap, "snap", "boundary points closer than this count as shared (default: a tiny value suited to the coordinates); a bare number is in the coordinates' units (degrees on lon/lat layers)")
	w.snap.degrees = true
	fs.IntVar(&w.s.KNN, "knn", 0, "instead of contiguity: each area's K nearest areas")
	fs.BoolVar(&w.s.Symmetrise, "symmetrise", false, "with --knn: link two areas when either is among the other's nearest")
	w.band = distanceVar(fs, &w.s.Band, "band", "instead of contiguity: areas within this distance; with --idw, its cut-off"+distanceHelp)
	fs.Float64Var(&w.s.IDWPower, "idw", 0, "inverse-distance weights 1/d^POWER (optionally within --band)")
	fs.StringVar(&w.s.Kernel, "kernel", "", "kernel weights: triangular, bisquare or gaussian, with --bandwidth or --adaptive")
	w.bandwidth = distanceVar(fs, &w.s.Bandwidth, "bandwidth", "fixed kernel bandwidth"+distanceHelp)
	fs.IntVar(&w.s.AdaptiveK, "adaptive", 0, "adaptive kernel bandwidth: the distance to each area's K-th nearest area")
	fs.StringVar(&w.points, "points", "centroid", "point of each area for distances: centroid, or inside (a point surely inside the polygon)")
	fs.BoolVar(&w.s.Planar, "planar", false, "measure distances in the plane of the coordinates even on a lon/lat layer")
	fs.IntVar(&w.order, "order", 1, "neighbours of this order (neighbours of neighbours for 2, …)")
	fs.BoolVar(&w.s.Cumulative, "cumulative", false, "with --order: all orders up to it")
	fs.StringVar(&w.scaling, "scaling", "row", "weights for the statistics: "+scalingChoices)
	fs.StringVar(&w.transform, "transform", "row", "former name of --scaling: row, binary or variance")
	// Hidden from --help, with a note on stderr when used; cannot fail: the
	// flag was just defined.
	_ = fs.MarkDeprecated("transform", "it is now --scaling (row, none or stabilised; binary is none for contiguity weights) and goes away in a later release")
	fs.StringVar(&w.islands, "islands", "drop", "areas without neighbours: drop (leave out of spatial statistics) or keep (with a zero spatial lag)")
	fs.StringVar(&w.file, "weights", "", "read the neighbour graph from an edge-list CSV (from,to,weight) instead of building it")
	w.changed = fs.Changed
}

// scalingChoices describes the values of --scaling, for its help.
const scalingChoices = "row (each area's weights sum to one), none (as built: one per link for contiguity, nearest neighbours and bands; kernel and distance weights kept), or stabilised (equal sum of squares per row)"

// showAsBuilt words the help of --scaling for the weights command, which
// shows and writes the weights as built unless --scaling is given, where
// the statistics default to row-standardised weights.
func (w *weightFlags) showAsBuilt(fs *pflag.FlagSet) {
	f := fs.Lookup("scaling")
	f.Usage = "scale the weights shown and written: " + scalingChoices + " (default: the weights as built, as none)"
	f.DefValue = "" // the flag's value is not the default here; the usage says what is
}

// scalingGiven reports whether the weights' scaling was chosen on the
// command line, as --scaling or by its former name --transform.
func (w *weightFlags) scalingGiven() bool { return w.changed("scaling") || w.changed("transform") }

// scalingOf reads --scaling, or else --transform, whose default is the
// default scaling.
func (w *weightFlags) scalingOf() (weights.Scaling, error) {
	if w.changed("scaling") && w.changed("transform") {
		return "", usagef("--transform is the former name of --scaling; give only --scaling")
	}
	flag, parse, value := "--transform", weights.ParseTransform, w.transform
	if w.changed("scaling") {
		flag, parse, value = "--scaling", weights.ParseScaling, w.scaling
	}
	t, err := parse(value)
	if err != nil {
		return "", usagef("%s: %v", flag, err)
	}
	return t, nil
}

// spec checks the flags and returns the graph recipe, the transform and the
// islands policy.
func (w *weightFlags) spec() (weights.Spec, weights.Scaling, bool, error) {
	s := w.s
	s.Order = w.order
	var err error
	if s.Rule, err = weights.ParseContiguity(w.contiguity); err != nil {
		return s, "", false, usagef("--contiguity: %v", err)
	}
	if s.Points, err = weights.ParsePointMode(w.points); err != nil {
		return s, "", false, usagef("--points: %v", err)
	}
	t, err := w.scalingOf()
	if err != nil {
		return s, "", false, err
	}
	keep, err := choice.Parse("--islands", w.islands, choice.Name[bool]{Name: "drop"}, choice.Name[bool]{Name: "keep", Value: true})
	if err != nil {
		return s, "", false, usagef("%v", err)
	}
	return s, t, keep, w.check(s)
}

// check rejects rule flags that do not go together and values out of
// range, the first problem in a fixed order.
func (w *weightFlags) check(s weights.Spec) error {
	rules := 0
	for _, given := range []bool{w.changed("knn"), w.changed("kernel"), w.changed("weights"), w.changed("idw") || w.changed("band")} {
		if given {
			rules++
		}
	}
	for _, c := range []struct {
		bad bool
		msg string
	}{
		{rules > 1, "choose one neighbour rule: --knn, --band, --idw, --kernel or --weights"},
		{w.changed("contiguity") && rules > 0, "--contiguity cannot be combined with --knn, --band, --idw, --kernel or --weights"},
		{s.Snap < 0, "--snap must not be negative"},
		{w.changed("knn") && s.KNN < 1, "--knn must be at least 1"},
		{w.changed("band") && !(s.Band > 0), "--band must be a positive distance"},
		{w.changed("idw") && !(s.IDWPower > 0), "--idw must be a positive power"},
		{s.Symmetrise && !w.changed("knn"), "--symmetrise goes with --knn"},
		{s.Kernel != "" && (s.Bandwidth > 0) == (s.AdaptiveK > 0), "--kernel needs exactly one of --bandwidth or --adaptive"},
		{s.Kernel == "" && (w.changed("bandwidth") || w.changed("adaptive")), "--bandwidth and --adaptive go with --kernel"},
		{s.Order < 1, "--order must be at least 1"},
		{s.Cumulative && s.Order < 2, "--cumulative goes with --order 2 or more"},
	} {
		if c.bad {
			return usagef("%s", c.msg)
		}
	}
	if _, err := weights.ParseKernelKind(s.Kernel); s.Kernel != "" && err != nil {
		return usagef("--kernel: %v", err)
	}
	return nil
}

// resolve fits the spec to the layer's coordinate system: projected
// layers measure distances in the plane, in their unit, and distances
// given with a unit are converted to the layer's.
func (w *weightFlags) resolve(s *weights.Spec, crs layer.CRS) error {
	s.Projected = crs.Projected
	if crs.Projected && crs.MetresPerUnit > 0 {
		s.Unit = crs.DistanceUnit()
	}
	for _, d := range []struct {
		f    *distanceFlag
		into *float64
	}{{w.snap, &s.Snap}, {w.band, &s.Band}, {w.bandwidth, &s.Bandwidth}} {
		if err := d.f.resolve(crs, d.into); err != nil {
			return err
		}
	}
	return nil
}

// graph builds (or reads) the neighbour graph of the layer. The warnings
// are the geometry problems summed up, one line per kind naming the layer,
// the last one saying where the full list is; w.problems keeps the list.
func (w *weightFlags) graph(lay *layer.Layer, s weights.Spec) (*weights.Graph, []string, error) {
	if w.file == "" {
		g, problems, err := s.Build(lay.Geoms, lay.IDs)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %w", lay.Source, err)
		}
		w.problems = problems
		lines := weights.GeometrySummary(problems)
		for k, l := range lines {
			lines[k] = lay.Source + ": " + l
		}
		if len(lines) > 0 {
			advice := w.listAdvice
			if advice == "" {
				advice = "areatest weights --list-geometry-problems, with the same input and neighbour rule,"
			}
			lines[len(lines)-1] += fmt.Sprintf(" (%s lists every one, ring by ring)", advice)
		}
		return g, lines, nil
	}
	f, err := os.Open(w.file)
	if err != nil {
		return nil, nil, fmt.Errorf("%s: %w", w.file, err)
	}
	defer f.Close()
	g, err := s.ReadEdgeList(f, w.file, lay.IDs)
	return g, nil, err
}
