package report

import (
	"fmt"
	"io"
	"math"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/spatial/compare"
	"github.com/areatest/areatest/weights"
)

// ComparePictures draws the pictures of a comparison on the layer it ran
// on: the outcome and the group are read from the layer's columns the
// result names.
type ComparePictures struct {
	Layer  *layer.Layer
	Result *compare.Result
	// Classes is the class rule of the outcome's map.
	Classes figure.Classes
}

// compareCaution ends the note of every picture of a comparison.
const compareCaution = "An association between areas is not evidence that one causes the other."

func (p ComparePictures) note() string {
	return fmt.Sprintf("%s · seed %d · areatest %s. %s", p.Result.Input.File, p.Result.Seed, p.Result.Version, compareCaution)
}

// Map draws the groups and the outcome side by side, the areas left out
// of the comparison (Result.Excluded) hatched in both.
func (p ComparePictures) Map(w io.Writer, f figure.Format) error {
	r, lay := p.Result, p.Layer
	values, err := outcomeOf(lay, r)
	if err != nil {
		return err
	}
	groupCol, err := lay.Column(r.Input.Group)
	if err != nil {
		return err
	}
	group, err := groupIndices(lay.IDs, groupCol.Labels(), r)
	if err != nil {
		return err
	}
	opt := figure.MapOptions{Title: fmt.Sprintf("%s by %s", r.Input.Outcome, r.Input.Group),
		Subtitle: fmt.Sprintf("left: the groups of %s; right: %s in %s classes; %s of %s areas compared",
			r.Input.Group, r.Input.Outcome, classNames[p.Classes], numtext.Count(r.Input.Tested), numtext.Count(r.Input.Areas)),
		LonLat: lonLat(lay), Note: p.note(), IDs: lay.IDs}
	return figure.GroupOutcomeMap(w, f, figure.GroupsAndOutcome{Geoms: lay.Geoms, Group: group, Levels: levelsOf(r),
		GroupName: r.Input.Group, OutcomeName: r.Input.Outcome, Outcome: values, Classes: p.Classes, K: 5}, opt)
}

// groupIndices gives each area the index of its group among r.Groups, or
// −1 when r lists it among the areas left out.
func groupIndices(ids, labels []string, r *compare.Result) ([]int, error) {
	out := map[string]bool{}
	for _, e := range r.Excluded {
		for _, id := range e.IDs {
			out[id] = true
		}
	}
	index := map[string]int{}
	for g, gr := range r.Groups {
		index[gr.Level] = g
	}
	group := make([]int, len(ids))
	for i, id := range ids {
		g, ok := index[labels[i]]
		switch {
		case out[id]:
			group[i] = -1
		case !ok:
			return nil, fmt.Errorf("area %q: group %q is not among the compared groups (%s)", id, labels[i], strings.Join(levelsOf(r), ", "))
		default:
			group[i] = g
		}
	}
	return group, nil
}

func levelsOf(r *compare.Result) []string {
	var l []string
	for _, g := range r.Groups {
		l = append(l, g.Level)
	}
	return l
}

// lonLat says whether maps of lay are drawn as longitude/latitude: a layer
// that is not projected and whose coordinates read as degrees.
func lonLat(lay *layer.Layer) bool {
	return !lay.CRS.Projected && weights.DetectMetric(lay.Geoms) == weights.Geographic
}

// outcomeOf reads the compared outcome from the layer: its column, or, for
// a comparison of rates, each area's events over its population (NaN
// where either is missing).
func outcomeOf(lay *layer.Layer, r *compare.Result) ([]float64, error) {
	if r.Rates == nil {
		col, err := lay.NumericColumn(r.Input.Outcome, "the outcome")
		if err != nil {
			return nil, err
		}
		return col.Num, nil
	}
	ev, err := lay.NumericColumn(r.Rates.Events, "the event count")
	if err != nil {
		return nil, err
	}
	pop, err := lay.NumericColumn(r.Rates.Population, "the population")
	if err != nil {
		return nil, err
	}
	out := make([]float64, lay.Len())
	for i := range out {
		out[i] = ev.Num[i] / pop.Num[i]
		if ev.Missing[i] || pop.Missing[i] {
			out[i] = math.NaN()
		}
	}
	return out, nil
}
