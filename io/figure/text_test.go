package figure

import (
	"bytes"
	"fmt"
	"io"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/paulmach/orb"
)

// plainWrap and plainEllipsize are the straightforward layout: measure the
// whole candidate line, or the whole candidate prefix, from its start each
// time. They are quadratic in the length of the text and serve only as the
// reference the incremental layout must match, line for line.
func plainWrap(f *fontFaces, s string, bold bool, size, w float64) []string {
	var lines []string
	for _, para := range strings.Split(s, "\n") {
		words := strings.Fields(para)
		if len(words) == 0 {
			lines = append(lines, "")
			continue
		}
		line := words[0]
		for _, word := range words[1:] {
			if f.width(bold, size, line+" "+word) <= w {
				line += " " + word
				continue
			}
			lines = append(lines, line)
			line = word
		}
		lines = append(lines, line)
	}
	for i, l := range lines {
		lines[i] = plainEllipsize(f, l, bold, size, w)
	}
	return lines
}

func plainEllipsize(f *fontFaces, s string, bold bool, size, w float64) string {
	if f.width(bold, size, s) <= w {
		return s
	}
	r := []rune(s)
	for len(r) > 0 {
		r = r[:len(r)-1]
		if t := strings.TrimRight(string(r), " ") + "…"; f.width(bold, size, t) <= w {
			return t
		}
	}
	return "…"
}

// The incremental layout gives exactly the lines of the plain one on text
// that needs no more lines than allowed: words with kerning pairs ("AV",
// "To"), runs of spaces, words longer than the line, letters outside the
// font, explicit newlines, at several widths and sizes.
func TestTextLayoutMatchesPlainLayout(t *testing.T) {
	ff, err := loadFonts()
	if err != nil {
		t.Fatal(err)
	}
	pieces := []string{"AV", "To", "Wa", "rate", "per 100,000", "  ", " ", "\n", "Ärzte", "字", "ŋ", "—", "x",
		strings.Repeat("long", 30), "…", "LTA", "yT."}
	rng := rand.New(rand.NewPCG(10, 22))
	for trial := range 200 {
		var b strings.Builder
		for range rng.IntN(40) {
			b.WriteString(pieces[rng.IntN(len(pieces))])
			if rng.IntN(2) == 0 {
				b.WriteByte(' ')
			}
		}
		s := b.String()
		bold := trial%2 == 0
		size := []float64{12, 14, 22}[trial%3]
		w := []float64{0, 5, 40, 120, 300, 900}[trial%6]
		want := plainWrap(ff, s, bold, size, w)
		if got := ff.wrap(s, bold, size, w, len(want)); !slices.Equal(got, want) {
			t.Fatalf("wrap(%q, %v, %v, %v):\n got %q\nwant %q", s, bold, size, w, got, want)
		}
		for _, l := range strings.Split(s, "\n") {
			if got, want := ff.ellipsize(l, bold, size, w), plainEllipsize(ff, l, bold, size, w); got != want {
				t.Fatalf("ellipsize(%q, %v, %v, %v) = %q, want %q", l, bold, size, w, got, want)
			}
		}
	}
}

// Text that needs more lines than allowed stops at the last allowed line,
// which ends in "…"; every line fits. Cases counted by hand from the text:
// "a b c d e" in a width of one word has five lines of one word.
func TestWrapStopsAtMaxLines(t *testing.T) {
	ff, err := loadFonts()
	if err != nil {
		t.Fatal(err)
	}
	w := ff.width(false, 14, "e") + 1 // one letter a line
	for _, c := range []struct {
		s        string
		maxLines int
		want     []string
	}{
		{"a b c d e", 5, []string{"a", "b", "c", "d", "e"}},
		{"a b c d e", 9, []string{"a", "b", "c", "d", "e"}},
		{"a b c d e", 3, []string{"a", "b", "…"}},
		{"a\nb\nc", 2, []string{"a", "…"}},
		{"a\nb\n\n", 2, []string{"a", "b"}}, // only blank lines are left out
		{"a b", 1, []string{"…"}},
	} {
		if got := ff.wrap(c.s, false, 14, w, c.maxLines); !slices.Equal(got, c.want) {
			t.Errorf("wrap(%q, %d lines) = %q, want %q", c.s, c.maxLines, got, c.want)
		}
	}
	title := strings.Repeat("a rather long variable name ", 400)
	lines := ff.wrap(title, true, titleSize, 600, maxTitleLines)
	if len(lines) != maxTitleLines || !strings.HasSuffix(lines[len(lines)-1], "…") {
		t.Errorf("a long title wraps to %q", lines)
	}
	for _, l := range lines {
		if ff.width(true, titleSize, l) > 600 {
			t.Errorf("line %q is wider than 600 pixels", l)
		}
	}
}

// longNames are variable names of n characters: one word, many words, and
// letters the font lacks.
func longNames(n int) map[string]string {
	return map[string]string{
		"one word":        strings.Repeat("x", n),
		"many words":      strings.Repeat("rate ", n/5),
		"not in the font": strings.Repeat("字", n),
	}
}

// A name of 10,000 characters draws, as a map of either kind in either
// format and as both charts, with every map text inside the picture.
func TestLongNamesDraw(t *testing.T) {
	ff, err := loadFonts()
	if err != nil {
		t.Fatal(err)
	}
	g := []orb.MultiPolygon{square(0, 0, 1), square(1, 0, 1), square(2, 0, 1)}
	for kind, name := range longNames(10000) {
		if utf8.RuneCountInString(name) < 9995 {
			t.Fatalf("%s: %d characters", kind, utf8.RuneCountInString(name))
		}
		opt := MapOptions{Title: "Where " + name + " clusters", Subtitle: "local Moran of " + name, Note: name, LegendTitle: name}
		for _, f := range []Format{SVG, PNG} {
			var choro, cats bytes.Buffer
			if err := Choropleth(&choro, f, g, []float64{1, 2, 3}, nil, Quantile, 3, name, opt); err != nil {
				t.Errorf("%s, %v: choropleth: %v", kind, f, err)
			}
			if err := CategoryMap(&cats, f, g, []int{0, 1, -1}, LocalCategories(), opt); err != nil {
				t.Errorf("%s, %v: category map: %v", kind, f, err)
			}
			if f == SVG {
				checkTextInside(t, choro.Bytes(), ff)
				checkTextInside(t, cats.Bytes(), ff)
			}
			copt := ChartOptions{Title: opt.Title, XLabel: name + " (standardised)", YLabel: name, Note: name}
			var sc bytes.Buffer
			if err := MoranScatter(&sc, f, []float64{-1, 0, 1}, []float64{0, 1, -1}, nil, nil, 0.2, copt); err != nil {
				t.Errorf("%s, %v: scatter: %v", kind, f, err)
			}
			if f == SVG && strings.Count(sc.String(), "…") < 4 {
				t.Errorf("%s: the scatter's title, note and axis labels are not all cut", kind)
			}
			if err := Histogram(io.Discard, f, []float64{1, 2, 2, 3}, 2.5, copt); err != nil {
				t.Errorf("%s, %v: histogram: %v", kind, f, err)
			}
		}
	}
}

// BenchmarkLongName draws a choropleth whose variable name, in the title,
// the subtitle and the legend heading, is 100, 1,000 and 10,000 characters
// long, as one word and as many. The time grows linearly with the length:
// on the 2-core development machine a one-word name takes about 0.5 ms at
// 100 characters, 2 ms at 1,000 and 12 ms at 10,000 (many words: under
// 1 ms, since text past the last allowed line is not laid out); before
// text was measured incrementally a one-word name of 5,000 characters took
// 3 s.
func BenchmarkLongName(b *testing.B) {
	g := []orb.MultiPolygon{square(0, 0, 1), square(1, 0, 1), square(2, 0, 1)}
	for _, n := range []int{100, 1000, 10000} {
		names := longNames(n)
		for _, kind := range []string{"one word", "many words"} {
			name := names[kind]
			opt := MapOptions{Title: "Where " + name + " clusters", Subtitle: "local Moran of " + name}
			b.Run(fmt.Sprintf("%d/%s", n, strings.ReplaceAll(kind, " ", "-")), func(b *testing.B) {
				for b.Loop() {
					if err := Choropleth(io.Discard, SVG, g, []float64{1, 2, 3}, nil, Quantile, 3, name, opt); err != nil {
						b.Fatal(err)
					}
				}
			})
		}
	}
}

// FuzzTextLayout checks that the incremental layout gives the lines of
// the plain one on any text, valid UTF-8 or not, and that every line of a
// capped wrap fits. Not run in CI; run it with
//
//	go test ./io/figure -run XXX -fuzz FuzzTextLayout -fuzztime 60s -fuzzminimizetime 5s
func FuzzTextLayout(f *testing.F) {
	ff, err := loadFonts()
	if err != nil {
		f.Fatal(err)
	}
	f.Add("Where rate per 100,000 clusters", 200.0, uint8(3))
	f.Add("AV To\nWa  字 \xff\xfe long", 40.0, uint8(1))
	f.Add("", 0.0, uint8(2))
	f.Fuzz(func(t *testing.T, s string, w float64, maxLines uint8) {
		if len(s) > 300 {
			return // the plain layout is quadratic
		}
		want := plainWrap(ff, s, false, 14, w)
		if got := ff.wrap(s, false, 14, w, len(want)); !slices.Equal(got, want) {
			t.Fatalf("wrap(%q, %v):\n got %q\nwant %q", s, w, got, want)
		}
		n := int(maxLines%8) + 1
		lines := ff.wrap(s, false, 14, w, n)
		if len(lines) > n {
			t.Fatalf("wrap(%q, %v, %d) gave %d lines", s, w, n, len(lines))
		}
		for _, l := range lines {
			if l != "…" && ff.width(false, 14, l) > w {
				t.Fatalf("line %q of wrap(%q, %v, %d) is wider than %v", l, s, w, n, w)
			}
		}
	})
}
