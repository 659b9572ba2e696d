package shapefile

import (
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"

	"golang.org/x/text/encoding/charmap"
)

// textDecoder turns the bytes of a dBASE text field into UTF-8: as they
// are, when the table is UTF-8, or through the 256-entry table of a
// single-byte code page.
type textDecoder struct {
	name  string     // the code page, for messages ("windows-1252")
	table *[256]rune // nil for UTF-8
	// bad counts UTF-8 values with invalid bytes; first names the first.
	bad   int
	first string
}

func newDecoder(name string, cm *charmap.Charmap) *textDecoder {
	d := &textDecoder{name: name}
	if cm != nil {
		d.table = new([256]rune)
		for i := range d.table {
			d.table[i] = cm.DecodeByte(byte(i))
		}
	}
	return d
}

// decode converts b, the value of column col in record rec (0 and "" for a
// field name), which the warning about invalid UTF-8 names.
func (d *textDecoder) decode(b []byte, rec int, col string) string {
	ascii := true
	for _, c := range b {
		if c >= 0x80 {
			ascii = false
			break
		}
	}
	switch {
	case ascii:
		return string(b)
	case d.table != nil:
		var sb strings.Builder
		sb.Grow(2 * len(b))
		for _, c := range b {
			sb.WriteRune(d.table[c])
		}
		return sb.String()
	case utf8.Valid(b):
		return string(b)
	}
	if d.bad == 0 {
		d.first = "a field name"
		if rec > 0 {
			d.first = fmt.Sprintf("record %d, column %q", rec, col)
		}
	}
	d.bad++
	return strings.ToValidUTF8(string(b), "\uFFFD")
}

// single-byte code pages by number, as .cpg files and language driver
// bytes name them.
var codePages = map[int]*charmap.Charmap{
	437: charmap.CodePage437, 850: charmap.CodePage850, 852: charmap.CodePage852,
	855: charmap.CodePage855, 858: charmap.CodePage858, 860: charmap.CodePage860,
	862: charmap.CodePage862, 863: charmap.CodePage863, 865: charmap.CodePage865,
	866: charmap.CodePage866, 874: charmap.Windows874,
	1250: charmap.Windows1250, 1251: charmap.Windows1251, 1252: charmap.Windows1252,
	1253: charmap.Windows1253, 1254: charmap.Windows1254, 1255: charmap.Windows1255,
	1256: charmap.Windows1256, 1257: charmap.Windows1257, 1258: charmap.Windows1258,
}

// isoPages are ISO 8859 parts by number.
var isoPages = map[int]*charmap.Charmap{
	1: charmap.ISO8859_1, 2: charmap.ISO8859_2, 3: charmap.ISO8859_3, 4: charmap.ISO8859_4,
	5: charmap.ISO8859_5, 6: charmap.ISO8859_6, 7: charmap.ISO8859_7, 8: charmap.ISO8859_8,
	9: charmap.ISO8859_9, 10: charmap.ISO8859_10, 13: charmap.ISO8859_13, 14: charmap.ISO8859_14,
	15: charmap.ISO8859_15, 16: charmap.ISO8859_16,
}

// driverPages maps the dBASE language driver byte (offset 29 of the
// header) to a code page: the values ESRI and dBASE writers use.
var driverPages = map[byte]int{
	0x01: 437, 0x02: 850, 0x03: 1252, 0x57: 1252, 0x58: 1252, 0x59: 1252,
	0x64: 852, 0x65: 866, 0x66: 865, 0x7C: 874, 0x7D: 1255, 0x7E: 1256,
	0xC8: 1250, 0xC9: 1251, 0xCA: 1254, 0xCB: 1253, 0xCC: 1257,
	// East Asian double-byte code pages, which are not decoded.
	0x13: 932, 0x4D: 936, 0x4E: 949, 0x4F: 950, 0x78: 950, 0x79: 949, 0x7A: 936, 0x7B: 932,
}

// cpgDecoder reads a .cpg file's code page name. ok is false for a name it
// does not know, or an East Asian code page.
func cpgDecoder(text string) (d *textDecoder, ok bool) {
	raw := strings.TrimSpace(strings.TrimPrefix(text, "\ufeff"))
	u := strings.ToUpper(raw)
	u = strings.NewReplacer("-", "", "_", "", " ", "").Replace(u)
	switch u {
	case "UTF8", "65001":
		return newDecoder("UTF-8", nil), true
	case "LATIN1":
		u = "88591"
	}
	for _, p := range []string{"ISO", "CP", "WINDOWS", "IBM", "ANSI", "DOS", "OEM", "MS"} {
		if rest, found := strings.CutPrefix(u, p); found {
			if p == "ISO" && !strings.HasPrefix(rest, "8859") {
				return nil, false
			}
			u = rest
			break
		}
	}
	if rest, found := strings.CutPrefix(u, "8859"); found {
		n, err := strconv.Atoi(rest)
		if cm := isoPages[n]; err == nil && cm != nil {
			return newDecoder("ISO-8859-"+rest, cm), true
		}
		return nil, false
	}
	n, err := strconv.Atoi(u)
	if err != nil {
		return nil, false
	}
	return pageDecoder(n)
}

// pageDecoder makes the decoder of a numbered code page.
func pageDecoder(n int) (*textDecoder, bool) {
	cm := codePages[n]
	if cm == nil {
		return nil, false
	}
	name := "code page " + strconv.Itoa(n)
	if n >= 874 {
		name = "windows-" + strconv.Itoa(n)
	}
	return newDecoder(name, cm), true
}
