package main

import (
	"fmt"
	"os"

	"github.com/spf13/pflag"

	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/weights"
)

// weightFlags are the neighbour-graph settings every command shares.
type weightFlags struct {
	contiguity         string
	snap               float64
	knn                int
	symmetrise         bool
	band, idw          float64
	kernel             string
	bandwidth          float64
	adaptive           int
	points             string
	planar             bool
	order              int
	cumulative         bool
	transform, islands string
	file               string
	changed            func(string) bool
}

func (w *weightFlags) register(fs *pflag.FlagSet) {
	fs.StringVar(&w.contiguity, "contiguity", "queen", "neighbours share a corner (queen) or an edge (rook)")
	fs.Float64Var(&w.snap, "snap", 0, "boundary points closer than this (layer units) count as shared (default: a tiny value suited to the coordinates)")
	fs.IntVar(&w.knn, "knn", 0, "instead of contiguity: each area's K nearest areas")
	fs.BoolVar(&w.symmetrise, "symmetrise", false, "with --knn: link two areas when either is among the other's nearest")
	fs.Float64Var(&w.band, "band", 0, "instead of contiguity: areas within this distance (km on lon/lat layers); with --idw, its cut-off")
	fs.Float64Var(&w.idw, "idw", 0, "inverse-distance weights 1/d^POWER (optionally within --band)")
	fs.StringVar(&w.kernel, "kernel", "", "kernel weights: triangular, bisquare or gaussian, with --bandwidth or --adaptive")
	fs.Float64Var(&w.bandwidth, "bandwidth", 0, "fixed kernel bandwidth (km on lon/lat layers)")
	fs.IntVar(&w.adaptive, "adaptive", 0, "adaptive kernel bandwidth: the distance to each area's K-th nearest area")
	fs.StringVar(&w.points, "points", "centroid", "point of each area for distances: centroid, or inside (a point surely inside the polygon)")
	fs.BoolVar(&w.planar, "planar", false, "measure distances in the plane of the coordinates even on a lon/lat layer")
	fs.IntVar(&w.order, "order", 1, "neighbours of this order (neighbours of neighbours for 2, …)")
	fs.BoolVar(&w.cumulative, "cumulative", false, "with --order: all orders up to it")
	fs.StringVar(&w.transform, "transform", "row", "weights for the statistics: row (row-standardised), binary, or variance (equal sum of squares per row)")
	fs.StringVar(&w.islands, "islands", "drop", "areas without neighbours: drop (leave out of spatial statistics) or keep (with a zero spatial lag)")
	fs.StringVar(&w.file, "weights", "", "read the neighbour graph from an edge-list CSV (from,to,weight) instead of building it")
	w.changed = fs.Changed
}

// spec checks the flags and returns the graph recipe, the transform and the
// islands policy.
func (w *weightFlags) spec() (weights.Spec, weights.Transform, bool, error) {
	var s weights.Spec
	var err error
	if s.Rule, err = weights.ParseContiguity(w.contiguity); err != nil {
		return s, "", false, usagef("--contiguity: %v", err)
	}
	if s.Points, err = weights.ParsePointMode(w.points); err != nil {
		return s, "", false, usagef("--points: %v", err)
	}
	t, err := weights.ParseTransform(w.transform)
	if err != nil {
		return s, "", false, usagef("--transform: %v", err)
	}
	if w.islands != "drop" && w.islands != "keep" {
		return s, "", false, usagef("--islands must be drop or keep, not %q", w.islands)
	}
	rules := 0
	for _, name := range []string{"knn", "kernel", "weights"} {
		if w.changed(name) {
			rules++
		}
	}
	if w.changed("idw") || (w.changed("band") && !w.changed("idw")) {
		rules++
	}
	if rules > 1 {
		return s, "", false, usagef("choose one neighbour rule: --knn, --band, --idw, --kernel or --weights")
	}
	if w.changed("contiguity") && rules > 0 {
		return s, "", false, usagef("--contiguity cannot be combined with --knn, --band, --idw, --kernel or --weights")
	}
	switch {
	case w.snap < 0:
		return s, "", false, usagef("--snap must not be negative")
	case w.changed("knn") && w.knn < 1:
		return s, "", false, usagef("--knn must be at least 1")
	case w.changed("band") && !(w.band > 0):
		return s, "", false, usagef("--band must be a positive distance")
	case w.changed("idw") && !(w.idw > 0):
		return s, "", false, usagef("--idw must be a positive power")
	case w.symmetrise && !w.changed("knn"):
		return s, "", false, usagef("--symmetrise goes with --knn")
	case w.kernel != "" && (w.bandwidth > 0) == (w.adaptive > 0):
		return s, "", false, usagef("--kernel needs exactly one of --bandwidth or --adaptive")
	case w.kernel == "" && (w.changed("bandwidth") || w.changed("adaptive")):
		return s, "", false, usagef("--bandwidth and --adaptive go with --kernel")
	case w.order < 1:
		return s, "", false, usagef("--order must be at least 1")
	case w.cumulative && w.order < 2:
		return s, "", false, usagef("--cumulative goes with --order 2 or more")
	}
	if w.kernel != "" {
		if _, err := weights.ParseKernelKind(w.kernel); err != nil {
			return s, "", false, usagef("--kernel: %v", err)
		}
	}
	s.Snap, s.KNN, s.Symmetrise, s.Band, s.IDWPower = w.snap, w.knn, w.symmetrise, w.band, w.idw
	s.Kernel, s.Bandwidth, s.AdaptiveK, s.Planar = w.kernel, w.bandwidth, w.adaptive, w.planar
	s.Order, s.Cumulative = w.order, w.cumulative
	return s, t, w.islands == "keep", nil
}

// graph builds (or reads) the neighbour graph of the layer.
func (w *weightFlags) graph(lay *layer.Layer, s weights.Spec) (*weights.Graph, []string, error) {
	if w.file != "" {
		f, err := os.Open(w.file)
		if err != nil {
			return nil, nil, fmt.Errorf("%s: %v", w.file, err)
		}
		defer f.Close()
		g, err := weights.ReadEdgeList(f, w.file, lay.IDs)
		if err != nil {
			return nil, nil, err
		}
		if s.Order > 1 {
			g, err = g.HigherOrder(s.Order, s.Cumulative)
		}
		return g, nil, err
	}
	g, warnings, err := s.Build(lay.Geoms, lay.IDs)
	if err != nil {
		return nil, warnings, fmt.Errorf("%s: %v", lay.Source, err)
	}
	return g, warnings, nil
}
