package main

import (
	"fmt"
	"regexp"
	"strings"
	"testing"
)

// A contrast level that is not in the data lists every level of the group
// column among the areas with data, the contrast's own levels included.
func TestContrastListsTheRealLevels(t *testing.T) {
	for _, contrast := range []string{"no,maybe", "foo,bar", "maybe,no"} {
		o := runCLI(t, "", "demo", "--contrast", contrast, "-n", "9")
		if o.code != 1 || !strings.Contains(o.stderr, `(levels: "no", "yes")`) {
			t.Errorf("--contrast %s: exit %d, stderr %q", contrast, o.code, o.stderr)
		}
	}
}

var propertiesMember = regexp.MustCompile(`"properties":\{[^}]*\}`)

// screen on a layer with no numeric column names each column it skipped
// and why, in its one-line error.
func TestScreenNamesSkippedColumns(t *testing.T) {
	sampleDir(t)
	editedRegion(t, "words.geojson", func(i int, line string) string {
		code := fmt.Sprintf("%q", fmt.Sprint(i%7))
		if i == 4 {
			code = `"about 3"`
		}
		return propertiesMember.ReplaceAllString(line, fmt.Sprintf(`"properties":{"name":"a%d","kind":"k%d","depth":%s}`, i, i%3, code))
	})
	failsWith(t, runIn("", "screen", "-i", "words.geojson", "-n", "9"),
		"words.geojson: no numeric column could be screened; 3 skipped:",
		`"name" (not numeric)`, `"kind" (not numeric)`, `"depth" (not numeric: it holds numbers except for 1 of`, `"about 3" in area "D005"`)
}
