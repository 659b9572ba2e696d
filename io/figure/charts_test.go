package figure

import (
	"bytes"
	"io"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
)

func scatterData(n int) (z, lag []float64, cats []int) {
	rng := rand.New(rand.NewPCG(5, 8))
	for i := range n {
		v := rng.NormFloat64()
		z = append(z, v)
		lag = append(lag, 0.5*v+0.5*rng.NormFloat64())
		cats = append(cats, i%6-1) // −1 … 4
	}
	return z, lag, cats
}

func TestChartsSizesAndXML(t *testing.T) {
	z, lag, cats := scatterData(300)
	z[3] = math.NaN() // left out
	opt := ChartOptions{Title: "Scatter", Subtitle: "sub", Note: "note", Width: 700, Height: 760}
	draws := map[string]func(io.Writer, Format) error{
		"scatter": func(w io.Writer, f Format) error {
			return MoranScatter(w, f, z, lag, cats, LocalCategories(), 0.5312, opt)
		},
		"scatter without categories": func(w io.Writer, f Format) error {
			return MoranScatter(w, f, z, lag, nil, nil, -0.004, opt)
		},
		"histogram": func(w io.Writer, f Format) error {
			return Histogram(w, f, z, 2.5, opt)
		},
	}
	for name, draw := range draws {
		var buf bytes.Buffer
		if err := draw(&buf, PNG); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if b := decodePNG(t, buf.Bytes()).Bounds(); b.Dx() != 700 || b.Dy() != 760 {
			t.Errorf("%s: PNG %v, want 700×760", name, b)
		}
		buf.Reset()
		if err := draw(&buf, SVG); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		doc := readSVG(t, buf.Bytes())
		s := buf.String()
		if !strings.Contains(s, `width="525pt" height="570pt"`) {
			t.Errorf("%s: SVG is not 700×760 px (525×570 pt): %.300s", name, s)
		}
		if !strings.Contains(s, "Arial") {
			t.Errorf("%s: no fallback fonts in the SVG", name)
		}
		want := map[string][]string{
			"scatter":                    {"slope = Moran's I = 0.53", "high, neighbours high", "no category (50)", "value (standardised)"},
			"scatter without categories": {"slope = Moran's I = −0.004"},
			"histogram":                  {"observed 2.50", "299 shuffles", "shuffles"},
		}[name]
		for _, w := range want {
			if !hasText(doc, w) {
				t.Errorf("%s: no text %q", name, w)
			}
		}
	}
}

func TestChartErrors(t *testing.T) {
	z, lag, cats := scatterData(10)
	for _, c := range []struct {
		err error
		msg string
	}{
		{MoranScatter(io.Discard, SVG, z, lag[:9], nil, nil, 0.1, ChartOptions{}), "9 spatial lags for 10 values"},
		{MoranScatter(io.Discard, SVG, z, lag, cats[:3], LocalCategories(), 0.1, ChartOptions{}), "3 categories"},
		{MoranScatter(io.Discard, SVG, z, lag, cats, LocalCategories()[:2], 0.1, ChartOptions{}), "has category"},
		{MoranScatter(io.Discard, SVG, z, lag, nil, nil, math.NaN(), ChartOptions{}), "slope"},
		{MoranScatter(io.Discard, SVG, []float64{math.NaN()}, []float64{1}, nil, nil, 0.1, ChartOptions{}), "no point"},
		{MoranScatter(io.Discard, PNG, z, lag, nil, nil, 0.1, ChartOptions{Width: 150, Height: 150, Title: "t"}), "too little room"},
		{Histogram(io.Discard, SVG, []float64{math.NaN()}, 1, ChartOptions{}), "no shuffled values"},
		{Histogram(io.Discard, SVG, z, math.Inf(1), ChartOptions{}), "observed"},
		{Histogram(io.Discard, Format(3), z, 1, ChartOptions{}), "unknown format"},
		{Histogram(io.Discard, SVG, z, 1, ChartOptions{Width: -1}), "out of range"},
	} {
		if c.err == nil || !strings.Contains(c.err.Error(), c.msg) {
			t.Errorf("error %v; want one with %q", c.err, c.msg)
		}
	}
}

func TestHistogramBins(t *testing.T) {
	s := make([]float64, 1000)
	for i := range s {
		s[i] = float64(i)
	}
	bins := histBins(s)
	// Freedman–Diaconis: IQR 499.5, width 2·499.5/10 = 99.9, 10 bins.
	if len(bins) != 10 {
		t.Errorf("%d bins, want 10", len(bins))
	}
	var total float64
	for _, b := range bins {
		total += b.Weight
	}
	if total != 1000 || bins[0].Min != 0 || bins[len(bins)-1].Max != 999 {
		t.Errorf("bins cover %v..%v with %v values", bins[0].Min, bins[len(bins)-1].Max, total)
	}
	if b := histBins([]float64{3, 3, 3}); len(b) != 1 || b[0].Weight != 3 || !(b[0].Min < 3 && b[0].Max > 3) {
		t.Errorf("constant null: %v", b)
	}
}

func TestNiceTicks(t *testing.T) {
	var labels []string
	for _, tk := range (niceTicks{}).Ticks(-3.8, 3.8) {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	if want := []string{"−3", "−2", "−1", "0", "1", "2", "3"}; !slices.Equal(labels, want) {
		t.Errorf("ticks %q, want %q", labels, want)
	}
	labels = nil
	for _, tk := range (niceTicks{}).Ticks(0, 0.9) {
		if tk.Label != "" {
			labels = append(labels, tk.Label)
		}
	}
	if want := []string{"0.0", "0.2", "0.4", "0.6", "0.8"}; !slices.Equal(labels, want) {
		t.Errorf("ticks %q, want %q", labels, want)
	}
	if got := formatStat(0.5312); got != "0.53" {
		t.Errorf("formatStat(0.5312) = %q", got)
	}
	if got := formatStat(-0.0041); got != "−0.0041" {
		t.Errorf("formatStat(-0.0041) = %q", got)
	}
}

func BenchmarkMoranScatter85000(b *testing.B) {
	z, lag, cats := scatterData(85000)
	for b.Loop() {
		for _, f := range []Format{SVG, PNG} {
			if err := MoranScatter(io.Discard, f, z, lag, cats, LocalCategories(), 0.5, ChartOptions{}); err != nil {
				b.Fatal(err)
			}
		}
	}
}
