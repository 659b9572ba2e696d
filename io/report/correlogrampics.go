package report

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/spatial/autocorr"
)

// Correlogram draws the correlogram of each variable: Moran's I at each
// neighbour order or distance class, with the interval that holds 95% of
// the permutation null under a normal approximation — its mean ± 1.96
// standard deviations over the shuffles (shuffle.Result.NullMean and
// NullSD) — and the expected value −1/(n − 1).
func (p AutocorrPictures) Correlogram(w io.Writer, f figure.Format) error {
	r := p.Result
	var panels []figure.CorrelogramPanel
	axis := ""
	for _, v := range r.Variables {
		if len(v.Correlogram) == 0 {
			continue
		}
		labels, label := lagLabels(v.CorrelogramClasses)
		axis = label
		pn := figure.CorrelogramPanel{Title: v.Name}
		for k, l := range v.Correlogram {
			pn.Lags = append(pn.Lags, lagPoint(labels[k], l))
		}
		panels = append(panels, pn)
	}
	if len(panels) == 0 {
		return errors.New("the result has no correlogram (it needs --lags and a numeric variable)")
	}
	opt := figure.ChartOptions{Title: "Correlogram of " + p.names(),
		Subtitle: fmt.Sprintf("Moran's I at each lag (%s); band: null mean ± 1.96 sd over the shuffles", r.Weights.Scaling),
		XLabel:   axis, YLabel: "Moran's I", Note: p.note()}
	return figure.Correlogram(w, f, panels, opt)
}

func lagPoint(label string, l autocorr.Lag) figure.LagPoint {
	m, sd := l.Permutation.NullMean, l.Permutation.NullSD
	return figure.LagPoint{Label: label, Value: l.MoransI, Low: m - 1.96*sd, High: m + 1.96*sd, Expected: l.Expected}
}

// lagLabels turns the names of a correlogram's classes ("order 2",
// "distance class 0–25 km") into axis labels ("2", "0–25") and names the
// axis ("neighbour order", "distance class (km)"). Names of another form
// are kept as they are, on an axis called "lag".
func lagLabels(names []string) (labels []string, axis string) {
	trim := func(prefix string) ([]string, bool) {
		out := make([]string, len(names))
		for k, n := range names {
			rest, ok := strings.CutPrefix(n, prefix)
			if !ok {
				return nil, false
			}
			out[k] = rest
		}
		return out, true
	}
	if l, ok := trim("order "); ok {
		return l, "neighbour order"
	}
	l, ok := trim("distance class ")
	if !ok {
		return names, "lag"
	}
	// A common unit after the last space goes to the axis' name.
	unit := ""
	for k, s := range l {
		i := strings.LastIndexByte(s, ' ')
		if i < 0 || (k > 0 && s[i+1:] != unit) {
			return l, "distance class"
		}
		unit = s[i+1:]
	}
	for k, s := range l {
		l[k] = strings.TrimSuffix(s, " "+unit)
	}
	return l, "distance class (" + unit + ")"
}
