package figure

import (
	"fmt"
	"image/color"
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

// wrap breaks s into lines no wider than w pixels, at spaces; a single
// word wider than w gets a line of its own. Explicit newlines are kept.
func (f *fontFaces) wrap(s string, bold bool, size, w float64) []string {
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
	// A word longer than the whole width is cut rather than let run off
	// the picture.
	for i, l := range lines {
		lines[i] = f.ellipsize(l, bold, size, w)
	}
	return lines
}

// ellipsize shortens s with a trailing "…" until it fits in w pixels.
func (f *fontFaces) ellipsize(s string, bold bool, size, w float64) string {
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
		t.title = ff.wrap(title, true, titleSize, tw)
	}
	if subtitle != "" {
		t.sub = ff.wrap(subtitle, false, subSize, tw)
	}
	if note != "" {
		t.note = ff.wrap(note, false, noteSize, tw)
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
