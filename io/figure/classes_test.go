package figure

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/areatest/areatest/internal/numtext"
)

func TestFormatFromPath(t *testing.T) {
	for path, want := range map[string]Format{"a.svg": SVG, "dir.x/MAP.PNG": PNG, "b.Svg": SVG} {
		got, err := FormatFromPath(path)
		if err != nil || got != want {
			t.Errorf("FormatFromPath(%q) = %v, %v; want %v", path, got, err, want)
		}
	}
	for path, msg := range map[string]string{"map.pdf": `".pdf"`, "map.svg.gz": `".gz"`, "map": "no file extension"} {
		_, err := FormatFromPath(path)
		if err == nil || !strings.Contains(err.Error(), msg) {
			t.Errorf("FormatFromPath(%q) error = %v; want one naming %s", path, err, msg)
		}
	}
	if SVG.String() != "svg" || PNG.String() != "png" {
		t.Errorf("format names %q, %q", SVG, PNG)
	}
}

func TestQuantileBreaks(t *testing.T) {
	var oneToTen []float64
	for v := 10; v >= 1; v-- {
		oneToTen = append(oneToTen, float64(v))
	}
	cases := []struct {
		vals []float64
		k    int
		want []float64
	}{
		// Ten values in five classes of two: ranks 2, 4, 6, 8, 10.
		{oneToTen, 5, []float64{2, 4, 6, 8, 10}},
		// Four classes of ten: ranks ⌈2.5⌉ = 3, 5, ⌈7.5⌉ = 8, 10.
		{oneToTen, 4, []float64{3, 5, 8, 10}},
		// Ties are not split: the first two breaks both fall on the 1s.
		{[]float64{1, 1, 1, 1, 2, 3}, 3, []float64{1, 3}},
		// NaN is missing and ignored.
		{[]float64{4, math.NaN(), 1, 3, 2}, 2, []float64{2, 4}},
		{[]float64{7, 7, 7}, 4, []float64{7}},
	}
	for _, c := range cases {
		got, err := Breaks(c.vals, Quantile, c.k)
		if err != nil || !slices.Equal(got, c.want) {
			t.Errorf("quantile breaks of %v, k=%d: %v, %v; want %v", c.vals, c.k, got, err, c.want)
		}
	}
	b := []float64{2, 4, 6, 8, 10}
	for v, want := range map[float64]int{1: 0, 2: 0, 2.5: 1, 10: 4, 11: 4} {
		if got := classOf(b, v); got != want {
			t.Errorf("classOf(%v) = %d, want %d", v, got, want)
		}
	}
}

func TestNaturalBreaksThreeClusters(t *testing.T) {
	vals := []float64{9.1, 1.0, 5.2, 1.1, 9.0, 5.0, 1.2, 9.2, 5.1, 1.15}
	got, err := Breaks(vals, NaturalBreaks, 3)
	if err != nil {
		t.Fatal(err)
	}
	if want := []float64{1.2, 5.2, 9.2}; !slices.Equal(got, want) {
		t.Errorf("natural breaks %v, want %v", got, want)
	}
	// Two classes: cut in the gap above 1.2 or in the one above 5.2? By
	// hand: 0.02 + 24.04 = 24.06 against 27.30 + 0.02 = 27.32, so above 1.2.
	got, _ = Breaks(vals, NaturalBreaks, 2)
	if want := []float64{1.2, 9.2}; !slices.Equal(got, want) {
		t.Errorf("two natural classes %v, want %v", got, want)
	}
}

// totalSS is the within-class sum of squares of the sorted values s cut at
// breaks (upper ends of classes).
func totalSS(s, breaks []float64) float64 {
	var total float64
	start := 0
	for _, b := range breaks {
		end := start
		for end < len(s) && s[end] <= b {
			end++
		}
		total += plainSS(s[start:end])
		start = end
	}
	return total
}

func plainSS(g []float64) float64 {
	if len(g) == 0 {
		return 0
	}
	var m float64
	for _, v := range g {
		m += v
	}
	m /= float64(len(g))
	var ss float64
	for _, v := range g {
		ss += (v - m) * (v - m)
	}
	return ss
}

// Fisher's criterion checked by brute force: for every n ≤ 12 and k = 3,
// no cut of the sorted values into three runs beats the natural breaks.
func TestNaturalBreaksAgainstBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for trial := range 600 {
		n := 3 + trial%10
		s := make([]float64, n)
		for i := range s {
			if trial%3 == 0 {
				s[i] = float64(rng.IntN(6)) // many ties
			} else {
				s[i] = math.Round(rng.NormFloat64()*1000) / 100
			}
		}
		slices.Sort(s)
		best := math.Inf(1)
		for i := 1; i < n; i++ {
			for j := i + 1; j < n; j++ {
				best = math.Min(best, plainSS(s[:i])+plainSS(s[i:j])+plainSS(s[j:]))
			}
		}
		breaks, err := Breaks(s, NaturalBreaks, 3)
		if err != nil {
			t.Fatal(err)
		}
		got := totalSS(s, breaks)
		if len(breaks) < 3 {
			// Fewer than three distinct values: each is its own class.
			if got > 1e-9 {
				t.Errorf("%v: %d classes with SS %v", s, len(breaks), got)
			}
			continue
		}
		if got > best+1e-9*(1+best) {
			t.Errorf("%v: natural breaks %v give SS %v, brute force %v", s, breaks, got, best)
		}
	}
}

// The divide-and-conquer programme against the plain O(k·n²) one.
func TestNaturalBreaksAgainstPlainProgramme(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	for trial := range 40 {
		n := 50 + rng.IntN(400)
		s := make([]float64, n)
		for i := range s {
			s[i] = math.Round(math.Exp(rng.NormFloat64())*20) / 4 // skewed, with ties
		}
		slices.Sort(s)
		xs, ws := distinctWeighted(s)
		cost := newSSCost(xs, ws)
		k := 2 + trial%8
		m := len(xs)
		d := make([]float64, m)
		for i := range d {
			d[i] = cost.ss(0, i)
		}
		for j := 1; j < k; j++ {
			nd := make([]float64, m)
			for i := range nd {
				nd[i] = math.Inf(1)
				for t := j; t <= i; t++ {
					nd[i] = math.Min(nd[i], d[t-1]+cost.ss(t, i))
				}
			}
			d = nd
		}
		breaks := naturalBreaks(s, k)
		if got, want := totalSS(s, breaks), d[m-1]; math.Abs(got-want) > 1e-7*(1+want) {
			t.Errorf("n=%d k=%d: SS %v, plain programme %v", n, k, got, want)
		}
	}
}

func TestNaturalBreaksManyValues(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 1))
	s := make([]float64, 85000)
	for i := range s {
		s[i] = rng.NormFloat64()
	}
	start := time.Now()
	b, err := Breaks(s, NaturalBreaks, 7)
	if err != nil {
		t.Fatal(err)
	}
	if len(b) != 7 || !slices.IsSorted(b) {
		t.Errorf("breaks %v", b)
	}
	// Symmetric data, odd k: the middle class straddles 0.
	if b[2] > 0 || b[3] < 0 {
		t.Errorf("breaks %v not centred", b)
	}
	t.Logf("85,000 distinct values in 7 classes: %v", time.Since(start))
}

func TestBreaksErrors(t *testing.T) {
	for _, c := range []struct {
		vals []float64
		k    int
		msg  string
	}{
		{[]float64{1, 2}, 1, "between 2 and 9"},
		{[]float64{1, 2}, 10, "between 2 and 9"},
		{[]float64{1, math.Inf(1)}, 3, "infinite"},
		{[]float64{math.NaN()}, 3, "no values"},
	} {
		_, err := Breaks(c.vals, NaturalBreaks, c.k)
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("Breaks(%v, %d): %v; want %q", c.vals, c.k, err, c.msg)
		}
	}
	if _, err := Breaks([]float64{1, 2}, Classes(9), 2); err == nil {
		t.Error("unknown classification accepted")
	}
}

func TestRangeLabels(t *testing.T) {
	cases := []struct {
		lo, hi []float64
		want   []string
	}{
		{[]float64{12.34, 45.7}, []float64{45.61, 80.2}, []string{"12.3 – 45.6", "45.7 – 80.2"}},
		{[]float64{1, 4}, []float64{3, 9}, []string{"1 – 3", "4 – 9"}},
		{[]float64{-3.5, 0.25}, []float64{0, 5}, []string{"−3.50 – 0.00", "0.25 – 5.00"}},
		{[]float64{10500, 20000}, []float64{19999, 31000}, []string{"10,500 – 19,999", "20,000 – 31,000"}},
		// Whole numbers would print 19,999.5 and 20,000 alike: one decimal.
		{[]float64{10500.5, 20000}, []float64{19999.5, 31000}, []string{"10,500.5 – 19,999.5", "20,000.0 – 31,000.0"}},
		{[]float64{0.0012, 0.0021}, []float64{0.0020, 0.0045}, []string{"0.00120 – 0.00200", "0.00210 – 0.00450"}},
		{[]float64{5}, []float64{5}, []string{"5"}},
	}
	for _, c := range cases {
		if got := rangeLabels(c.lo, c.hi); !slices.Equal(got, c.want) {
			t.Errorf("rangeLabels(%v, %v) = %q, want %q", c.lo, c.hi, got, c.want)
		}
	}
	if got := numtext.Count(9999); got != "9,999" {
		t.Errorf("numtext.Count(9999) = %q", got)
	}
	if got := formatNum(1990, 0); got != "1990" {
		t.Errorf("formatNum(1990, 0) = %q", got)
	}
}

func TestPalettes(t *testing.T) {
	// The five-class ramp is pinned: a change of colours should be a
	// decision, not an accident.
	cols, err := Sequential(5)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, c := range cols {
		got = append(got, hex(c))
	}
	if want := []string{"#fcf5cb", "#a9cb90", "#2da279", "#066680", "#2a2465"}; !slices.Equal(got, want) {
		t.Errorf("Sequential(5) = %v, want %v", got, want)
	}
	// Every ramp gets darker step by step (relative luminance).
	for k := 2; k <= MaxClasses; k++ {
		cols, _ := Sequential(k)
		for i := 1; i < k; i++ {
			if luminance(cols[i]) >= luminance(cols[i-1]) {
				t.Errorf("Sequential(%d): colour %d not darker than %d", k, i, i-1)
			}
		}
	}
	if _, err := Sequential(1); err == nil {
		t.Error("Sequential(1) accepted")
	}
	cats := LocalCategories()
	if len(cats) != 5 || !strings.HasPrefix(cats[HighHigh].Name, "high-high") || !strings.HasPrefix(cats[LowHigh].Name, "low-high") {
		t.Errorf("local categories %v", cats)
	}
	// Clusters darker than outliers of the same sign; the grey lightest.
	l := func(i int) float64 { return luminance(cats[i].Color) }
	if !(l(HighHigh) < l(HighLow) && l(LowLow) < l(LowHigh) && l(NotSignificant) > l(HighLow) && l(NotSignificant) > l(LowHigh)) {
		t.Errorf("category lightness out of order: %v %v %v %v %v", l(0), l(1), l(2), l(3), l(4))
	}
}

func luminance(c interface{ RGBA() (r, g, b, a uint32) }) float64 {
	r, g, b, _ := c.RGBA()
	lin := func(v uint32) float64 {
		x := float64(v) / 0xffff
		if x <= 0.04045 {
			return x / 12.92
		}
		return math.Pow((x+0.055)/1.055, 2.4)
	}
	return 0.2126*lin(r) + 0.7152*lin(g) + 0.0722*lin(b)
}
