package contig

import (
	"math"

	"github.com/paulmach/orb"
)

// RookMinShared is the shortest stretch, in multiples of the snap distance,
// that two boundaries must run together for the areas to be rook neighbours
// (see weights.RookMinShared).
const RookMinShared = 3

// Options says how Find decides that two areas touch. They are checked by
// the caller: Snap finite and not negative, IDs nil or one per area, fewer
// than 2³¹ areas.
type Options struct {
	// Rook asks for a shared stretch of boundary; otherwise one point is
	// enough (queen).
	Rook bool
	// Snap is the distance below which two boundary points count as the
	// same point; 0 means DefaultSnap.
	Snap float64
	// IDs, when not nil, names the areas in errors and warnings.
	IDs []string
}

// Find returns the neighbour pairs of the areas geoms as (lower, higher)
// area index, sorted and without repeats, and every problem with sliver
// rings and rings that meet themselves: the slivers, then the areas with no
// ring of positive area, then the rings that meet themselves, each kind in
// area order. Errors name the first area in order whose geometry makes
// contiguity meaningless.
func Find(geoms []orb.MultiPolygon, opt Options) ([][2]int32, []Problem, error) {
	names := namer{ids: opt.IDs}
	b, err := check(geoms, names)
	if err != nil {
		return nil, nil, err
	}
	snap := opt.Snap
	if snap == 0 && b.ok() {
		if med := medianSegment(geoms); med > 0 {
			snap = snapFrom(b, med)
		}
	}
	lay, err := flatten(geoms, snap)
	if err != nil {
		return nil, nil, err
	}
	found, err := lay.search(opt.Rook, snap)
	if err != nil {
		return nil, nil, err
	}
	crossed := lay.crossed(found.crossings)
	pairs := found.links(crossed)
	problems := lay.sliverProblems(crossed, snap, names)
	problems = append(problems, lay.crossingProblems(found.crossings, crossed, names)...)
	return pairs, problems, nil
}

// Factors of DefaultSnap: the coordinate scale factor, and the cap relative
// to the typical boundary segment.
const (
	snapScale   = 2e-9
	snapSegment = 1e-2
)

// DefaultSnap is the snap distance Find uses when Options.Snap is 0; its
// rule and the reasons for it are documented at weights.DefaultSnap.
func DefaultSnap(geoms []orb.MultiPolygon) float64 {
	var b bounds
	b.reset()
	for _, mp := range geoms {
		for _, poly := range mp {
			for _, ring := range poly {
				for _, p := range ring {
					b.add(p[0], p[1])
				}
			}
		}
	}
	med := medianSegment(geoms)
	if !b.ok() || med == 0 {
		return 0
	}
	return snapFrom(b, med)
}

// snapFrom is DefaultSnap from the bounds and median segment length.
func snapFrom(b bounds, medianSegment float64) float64 {
	diag := math.Hypot(b.maxx-b.minx, b.maxy-b.miny)
	scale := max(diag, math.Abs(b.minx), math.Abs(b.maxx), math.Abs(b.miny), math.Abs(b.maxy))
	return min(snapScale*scale, snapSegment*medianSegment)
}
