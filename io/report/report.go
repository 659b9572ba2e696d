package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/areatest/areatest/internal/numtext"
)

// JSON writes v as one indented JSON document followed by a newline.
func JSON(w io.Writer, v any) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}

// AddMembers adds members to the end of doc, a JSON object as JSON writes
// it (indented by two spaces, ending in "}\n"), in the order of names, so
// that a command can record facts about its input (the coordinate system,
// a join) beside any result without each result type carrying them.
func AddMembers(doc []byte, names []string, values map[string]any) ([]byte, error) {
	end := bytes.LastIndexByte(doc, '}')
	if end < 0 || len(names) == 0 {
		return doc, nil
	}
	var b bytes.Buffer
	b.Write(bytes.TrimRight(doc[:end], " \n"))
	for _, name := range names {
		v, err := json.MarshalIndent(values[name], "  ", "  ")
		if err != nil {
			return nil, err
		}
		key, _ := json.Marshal(name)
		fmt.Fprintf(&b, ",\n  %s: %s", key, v)
	}
	b.WriteString("\n}\n")
	return b.Bytes(), nil
}

// Wrap breaks text into lines of at most width characters, each starting with
// indent (the first with first instead).
func Wrap(text string, width int, first, indent string) string {
	var b strings.Builder
	line := first
	empty := true
	for _, word := range strings.Fields(text) {
		if !empty && len([]rune(line))+1+len([]rune(word)) > width {
			b.WriteString(line)
			b.WriteByte('\n')
			line = indent
			empty = true
		}
		if !empty {
			line += " "
		}
		line += word
		empty = false
	}
	b.WriteString(line)
	b.WriteByte('\n')
	return b.String()
}

// PValue formats a p-value for reading: four decimals, or two significant
// digits in scientific form below 0.0001.
func PValue(p float64) string {
	switch {
	case math.IsNaN(p):
		return "–"
	case p == 0:
		// Only a normal approximation far in its tail gives exactly 0.
		return "<1e-15"
	case p < 0.0001:
		return strconv.FormatFloat(p, 'e', 1, 64)
	}
	return strconv.FormatFloat(p, 'f', 4, 64)
}

// Number formats a statistic with about four significant digits, without
// exponent for ordinary magnitudes.
func Number(v float64) string {
	a := math.Abs(v)
	switch {
	case math.IsNaN(v) || math.IsInf(v, 0):
		return fmt.Sprint(v)
	case v == 0:
		return "0"
	case a >= 1e7 || a < 1e-4:
		return strconv.FormatFloat(v, 'e', 3, 64)
	}
	decimals := 3 - int(math.Floor(math.Log10(a)))
	if decimals < 0 {
		decimals = 0
	}
	s := strconv.FormatFloat(v, 'f', decimals, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	return s
}

// The helpers below only lay out and format values they are given; the
// numbers in a report are computed by the packages that own the results.

// plural writes a count with the singular or plural noun.
func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return numtext.Count(n) + " " + many
}
