package figure

import (
	"fmt"
	"image/color"
	"slices"
	"strings"
	"sync"

	"codeberg.org/go-fonts/liberation/liberationsansbold"
	"codeberg.org/go-fonts/liberation/liberationsansregular"
	"golang.org/x/image/font"
	"golang.org/x/image/font/basicfont"
	"golang.org/x/image/font/opentype"
	"golang.org/x/image/math/fixed"
)

// Maps lay out their text with the metrics of Liberation Sans, which is
// metric-compatible with Arial and Helvetica: an SVG viewer that lacks the
// font substitutes one of those (fontFamily lists them) and every label
// still fits its box. PNGs draw the same font, so both formats agree.
const fontFamily = `'Liberation Sans', Arial, Helvetica, sans-serif`

// fontFaces measures and draws text for one drawing. The parsed fonts are
// shared (sfnt fonts are safe for concurrent use) but faces are not, so
// every drawing gets its own cache of faces.
type fontFaces struct {
	regular, bold *opentype.Font
	faces         map[faceKey]font.Face
}

type faceKey struct {
	bold bool
	size float64
}

var (
	fontsOnce         sync.Once
	fontReg, fontBold *opentype.Font
	fontsErr          error
)

func loadFonts() (*fontFaces, error) {
	fontsOnce.Do(func() {
		fontReg, fontsErr = opentype.Parse(liberationsansregular.TTF)
		if fontsErr == nil {
			fontBold, fontsErr = opentype.Parse(liberationsansbold.TTF)
		}
		if fontsErr != nil {
			fontsErr = fmt.Errorf("plot: reading the embedded font: %w", fontsErr)
		}
	})
	if fontsErr != nil {
		return nil, fontsErr
	}
	return &fontFaces{regular: fontReg, bold: fontBold, faces: map[faceKey]font.Face{}}, nil
}

// face returns a face of the given pixel size.
func (f *fontFaces) face(bold bool, size float64) font.Face {
	k := faceKey{bold, size}
	if fc, ok := f.faces[k]; ok {
		return fc
	}
	src := f.regular
	if bold {
		src = f.bold
	}
	// 72 dpi makes the size in points equal the size in pixels.
	fc, err := opentype.NewFace(src, &opentype.FaceOptions{Size: size, DPI: 72, Hinting: font.HintingNone})
	if err != nil {
		// Only an invalid size fails, and sizes here are constants; should
		// one ever fail, a fixed bitmap face keeps the picture coming.
		fc = basicfont.Face7x13
	}
	f.faces[k] = fc
	return fc
}

// width returns the advance width of s in pixels.
func (f *fontFaces) width(bold bool, size float64, s string) float64 {
	return fixedToFloat(font.MeasureString(f.face(bold, size), s))
}

func fixedToFloat(v fixed.Int26_6) float64 { return float64(v) / 64 }

// measure adds up the width of a text as it grows, rune by rune, with the
// kerning between neighbours: the sum font.MeasureString makes, so a line
// or a prefix is measured in the time of what is added to it, never again
// from its start. That keeps wrapping and shortening linear in the length
// of the text. The zero value is not ready: start one with newMeasure.
type measure struct {
	face font.Face
	adv  fixed.Int26_6
	prev rune // the last rune added; −1 before the first
}

func (f *fontFaces) newMeasure(bold bool, size float64) measure {
	return measure{face: f.face(bold, size), prev: -1}
}

func (m *measure) addRune(c rune) {
	if m.prev >= 0 {
		m.adv += m.face.Kern(m.prev, c)
	}
	a, _ := m.face.GlyphAdvance(c)
	m.adv += a
	m.prev = c
}

func (m *measure) add(s string) {
	for _, c := range s {
		m.addRune(c)
	}
}

// fits says whether the text measured so far is at most w pixels wide.
func (m measure) fits(w float64) bool { return fixedToFloat(m.adv) <= w }

// Most lines each kind of wrapped text may take; text beyond them is cut
// with "…" at the end of the last line, so that a title or a variable name
// of any length leaves room for the map.
const (
	maxTitleLines   = 3
	maxHeadingLines = 3 // the legend's heading
	maxNoteLines    = 8
)

// wrap breaks s into at most maxLines lines no wider than w pixels, at
// spaces; a single word wider than w gets a line of its own, cut with
// "…". Explicit newlines are kept. When the text needs more lines, the
// last one ends with "…". The time taken grows with the length of the
// text kept, not with its square.
func (f *fontFaces) wrap(s string, bold bool, size, w float64, maxLines int) []string {
	var lines []string
	var line strings.Builder
	paras := strings.Split(s, "\n")
	for pi, para := range paras {
		words := strings.Fields(para)
		line.Reset()
		m := f.newMeasure(bold, size)
		for k, word := range words {
			next := m
			if k > 0 {
				next.addRune(' ')
			}
			if next.add(word); k == 0 || next.fits(w) {
				if k > 0 {
					line.WriteByte(' ')
				}
				line.WriteString(word)
				m = next
				continue
			}
			if len(lines) == maxLines-1 {
				// Out of lines: this one ends in "…".
				return append(lines, f.cut(line.String()+" "+word, bold, size, w, true))
			}
			lines = append(lines, f.cut(line.String(), bold, size, w, false))
			line.Reset()
			line.WriteString(word)
			m = f.newMeasure(bold, size)
			m.add(word)
		}
		if len(lines) == maxLines-1 {
			more := slices.ContainsFunc(paras[pi+1:], func(p string) bool { return strings.TrimSpace(p) != "" })
			return append(lines, f.cut(line.String(), bold, size, w, more))
		}
		lines = append(lines, f.cut(line.String(), bold, size, w, false))
	}
	return lines
}

// ellipsize shortens s with a trailing "…" until it fits in w pixels.
func (f *fontFaces) ellipsize(s string, bold bool, size, w float64) string {
	return f.cut(s, bold, size, w, false)
}

// cut returns s when it fits in w pixels, and otherwise its longest
// prefix that fits with "…" after it (trailing spaces dropped before the
// "…"), or "…" alone. more says the text goes on after s, so the "…" is
// due even when s would fit. It measures each prefix by adding one rune to
// the last (see measure), so its time is linear in the length of s.
func (f *fontFaces) cut(s string, bold bool, size, w float64, more bool) string {
	if !more {
		m := f.newMeasure(bold, size)
		if m.add(s); m.fits(w) {
			return s
		}
	}
	r := []rune(s)
	n := len(r) // prefixes r[:0] … r[:n−1]; r[:n] too when more
	if more {
		n++
	}
	grow := f.newMeasure(bold, size) // r[:i]
	kept, keptLen := grow, 0         // r[:i] less its trailing spaces
	best := 0
	for i := range n {
		withDots := kept
		if withDots.addRune('…'); withDots.fits(w) {
			best = keptLen
		}
		if i == len(r) {
			break
		}
		grow.addRune(r[i])
		if r[i] != ' ' {
			kept, keptLen = grow, i+1
		}
	}
	return string(r[:best]) + "…"
}

// frameText is the text around a picture, wrapped to its width: the title
// and subtitle above, the note at the foot. Maps and charts both set it
// through here, so their titles and notes look alike.
type frameText struct{ title, sub, note []string }

// Line heights of the frame text, in pixels.
const (
	titleLineH = 27.0
	subLineH   = 19.0
	noteLineH  = 15.0
)

func wrapFrameText(ff *fontFaces, title, subtitle, note string, width float64) frameText {
	tw := width - 2*margin
	var t frameText
	if title != "" {
		t.title = ff.wrap(title, true, titleSize, tw, maxTitleLines)
	}
	if subtitle != "" {
		t.sub = ff.wrap(subtitle, false, subSize, tw, maxTitleLines)
	}
	if note != "" {
		t.note = ff.wrap(note, false, noteSize, tw, maxNoteLines)
	}
	return t
}

// headH is the height of the title and subtitle lines; noteH that of the
// note. The pictures add their own space between text and drawing.
func (t frameText) headH() float64 {
	return float64(len(t.title))*titleLineH + float64(len(t.sub))*subLineH
}

func (t frameText) noteH() float64 { return float64(len(t.note)) * noteLineH }

// textLine is one line of frame text in place: y is its baseline, in
// pixels from the top of the picture, and x the left margin.
type textLine struct {
	y    float64
	s    string
	size float64
	bold bool
	c    color.RGBA
}

// head places the title and the subtitle from the top margin down.
func (t frameText) head() []textLine {
	var lines []textLine
	y := margin
	for _, s := range t.title {
		lines = append(lines, textLine{y: y + 21, s: s, size: titleSize, bold: true, c: inkTitle})
		y += titleLineH
	}
	for _, s := range t.sub {
		lines = append(lines, textLine{y: y + 15, s: s, size: subSize, c: inkText})
		y += subLineH
	}
	return lines
}

// foot places the note so that it ends at the bottom margin of a picture
// h pixels high.
func (t frameText) foot(h float64) []textLine {
	var lines []textLine
	y := h - margin - t.noteH()
	for _, s := range t.note {
		lines = append(lines, textLine{y: y + 11, s: s, size: noteSize, c: inkMuted})
		y += noteLineH
	}
	return lines
}
