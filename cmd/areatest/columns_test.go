package main

import (
	"encoding/json"
	"fmt"
	"os"
	"regexp"
	"strings"
	"testing"

	"github.com/areatest/areatest/samples"
)

// editedRegion writes, into the working directory (sampleDir's), the sample
// region with edit applied to the line of each feature (the file has one
// feature per line; i counts the features from 0, so feature i has id
// D00i+1).
func editedRegion(t *testing.T, name string, edit func(i int, line string) string) {
	t.Helper()
	lines := strings.Split(string(samples.RegionGeoJSON), "\n")
	i := 0
	for k, l := range lines {
		if strings.HasPrefix(l, `{"type":"Feature"`) {
			lines[k] = edit(i, l)
			i++
		}
	}
	if err := os.WriteFile(name, []byte(strings.Join(lines, "\n")), 0o644); err != nil {
		t.Fatal(err)
	}
}

var incomeValue = regexp.MustCompile(`"income":[^,}]*`)

// setIncome returns an edit that gives the features in values a new
// income (raw JSON).
func setIncome(values map[int]string) func(int, string) string {
	return func(i int, line string) string {
		if v, ok := values[i]; ok {
			return incomeValue.ReplaceAllString(line, `"income":`+v)
		}
		return line
	}
}

// addProperty returns an edit that gives every feature a property, its raw
// JSON value value(i).
func addProperty(name string, value func(i int) string) func(int, string) string {
	return func(i int, line string) string {
		return strings.Replace(line, `"properties":{`, `"properties":{"`+name+`":`+value(i)+`,`, 1)
	}
}

// failsWith checks a run that must stop with exit 1 and a one-line error
// holding every piece of want.
func failsWith(t *testing.T, r result, want ...string) {
	t.Helper()
	msg := strings.TrimSpace(r.stderr)
	if r.code != 1 || strings.Contains(msg, "\n") {
		t.Fatalf("exit %d, stderr %q; want exit 1 and one line", r.code, r.stderr)
	}
	for _, w := range want {
		if !strings.Contains(msg, w) {
			t.Errorf("error %q lacks %q", msg, w)
		}
	}
}

// Items 7 and 8: a column named as a number that holds a few values that
// are not numbers is an error naming those values, their areas and the
// decimal comma, whichever role names it; the first value of the column
// (a number) is not the one quoted.
func TestNumberColumnWithBadValues(t *testing.T) {
	sampleDir(t)
	editedRegion(t, "bad.geojson", setIncome(map[int]string{3: `"12,5"`, 7: `{"v":1}`}))
	want := []string{`bad.geojson: column "income" is not numeric`, "2 of its 200 values",
		`"12,5" in area "D004" (a decimal comma? numbers take a decimal point: 12.5)`, `{"v":1} in area "D008"`}
	for _, args := range [][]string{
		{"compare", "-i", "bad.geojson", "-y", "income", "-g", "policy"},
		{"compare", "-i", "bad.geojson", "-y", "rate", "-g", "policy", "--covariates", "income"},
		{"autocorr", "-i", "bad.geojson", "--variables", "income"},
		{"autocorr", "-i", "bad.geojson", "--variables", "rate", "--against", "income"},
		{"autocorr", "-i", "bad.geojson", "--events", "income", "--population", "population"},
		{"local", "-i", "bad.geojson", "--variable", "income"},
	} {
		t.Run(strings.Join(args, " "), func(t *testing.T) {
			failsWith(t, runIn("", append(args, "-n", "99")...), want...)
		})
	}
	// A text column: the first value that is not a number (D002's name) is
	// quoted, not the column's first value (D001's, made a number here).
	editedRegion(t, "names.geojson", func(i int, line string) string {
		if i == 0 {
			return strings.Replace(line, `"name":"Tralymor"`, `"name":7`, 1)
		}
		return line
	})
	r := runIn("", "compare", "-i", "names.geojson", "-y", "name", "-g", "policy")
	failsWith(t, r, `column "name" is not numeric (199 of its 200 values are not numbers: "Raenymor" in area "D002"`, "the outcome must be a number")
	if strings.Contains(r.stderr, `"7"`) {
		t.Errorf("quotes the first value, a number: %s", r.stderr)
	}
}

// Item 7: join counts run only on columns of categories. A text column
// that is mostly numbers, or one most of whose categories have one area
// (the names: one per area), is refused; urban and rural are categories.
// screen names the bad values of a mostly numeric column it skips.
func TestJoinCountsOnlyOnCategories(t *testing.T) {
	sampleDir(t)
	editedRegion(t, "bad.geojson", setIncome(map[int]string{3: `"12,5"`}))
	failsWith(t, runIn("", "autocorr", "-i", "bad.geojson", "--variables", "income", "-n", "99"),
		`column "income" is not numeric: it holds numbers except for 1 of its 200 values: "12,5" in area "D004"`, "join counts take only columns of categories")
	failsWith(t, runIn("", "autocorr", "-i", "bad.geojson", "--variables", "name", "-n", "99"),
		`column "name": 198 categories among 198 areas, 198 of them with a single area`)
	if r := runIn("", "autocorr", "-i", "bad.geojson", "--variables", "urban", "-n", "99"); r.code != 0 || !strings.Contains(r.stdout, "join counts") {
		t.Errorf("urban: exit %d, %s", r.code, r.stderr)
	}
	r := runIn("", "screen", "-i", "bad.geojson", "-n", "99", "--format", "json")
	skipped := screenSkipped(t, r)
	if want := `not numeric: it holds numbers except for 1 of its 200 values: "12,5" in area "D004" (a decimal comma? numbers take a decimal point: 12.5)`; skipped["income"] != want || skipped["name"] != "not numeric" {
		t.Errorf("skipped %q", skipped)
	}
}

// screenSkipped runs the checks of a successful JSON screen and returns
// the reasons of the columns it skipped.
func screenSkipped(t *testing.T, r result) map[string]string {
	t.Helper()
	if r.code != 0 {
		t.Fatalf("screen: exit %d, %s", r.code, r.stderr)
	}
	var doc struct {
		Skipped []struct{ Column, Reason string }
	}
	if err := json.Unmarshal([]byte(r.stdout), &doc); err != nil {
		t.Fatal(err)
	}
	reasons := map[string]string{}
	for _, s := range doc.Skipped {
		reasons[s.Column] = s.Reason
	}
	return reasons
}

// Item 9: of a property key repeated in a feature the last value wins, and
// an earlier text value does not make the column text: the run is the
// clean file's.
func TestRepeatedKeyLastValueSetsKind(t *testing.T) {
	sampleDir(t)
	editedRegion(t, "dup.geojson", func(i int, line string) string {
		if i == 0 {
			return strings.Replace(line, `"properties":{`, `"properties":{"income":"unknown",`, 1)
		}
		return line
	})
	args := []string{"--variables", "income", "-n", "99", "--format", "json"}
	clean := runIn("", append([]string{"autocorr", "-i", "region.geojson"}, args...)...)
	dup := runIn("", append([]string{"autocorr", "-i", "dup.geojson"}, args...)...)
	if dup.code != 0 || strings.ReplaceAll(dup.stdout, "dup.geojson", "region.geojson") != clean.stdout {
		t.Errorf("exit %d, %s; output differs from the clean file's", dup.code, dup.stderr)
	}
}

// Item 10: values too large to square name the file, the column and the
// area of the value furthest from the mean; 1e100 too, whose squares fit
// but whose squares' squares do not. screen skips such a column with that
// reason and screens the rest.
func TestValuesTooLargeToSquare(t *testing.T) {
	sampleDir(t)
	for _, exp := range []int{300, 100} {
		name := fmt.Sprintf("big%d.geojson", exp)
		// big is 1, 2, 3, 1, … times 10^exp: D003 is the first of those
		// furthest from the mean.
		editedRegion(t, name, addProperty("big", func(i int) string { return fmt.Sprintf("%de%d", 1+i%3, exp) }))
		named := fmt.Sprintf(`the values are too large to square (3e+%d in area "D003")`, exp)
		t.Run(name, func(t *testing.T) {
			failsWith(t, runIn("", "autocorr", "-i", name, "--variables", "big", "-n", "99"),
				name+`: column "big": `+named, "rescale the column")
			failsWith(t, runIn("", "autocorr", "-i", name, "--variables", "rate", "--against", "big", "-n", "99"),
				`column "big": `+named)
			// The value named is the one furthest from the mean of the areas
			// each analysis uses; which of the tied ones comes first may differ.
			tooLarge := name + `: column "big": the values are too large to square (`
			failsWith(t, runIn("", "local", "-i", name, "--variable", "big", "-n", "99"), tooLarge, "in area")
			failsWith(t, runIn("", "compare", "-i", name, "-y", "big", "-g", "policy", "-n", "99"), tooLarge, "in area")
			failsWith(t, runIn("", "compare", "-i", name, "-y", "rate", "-g", "policy", "--covariates", "big", "-n", "99"), tooLarge, "in area")
			skipped := screenSkipped(t, runIn("", "screen", "-i", name, "-n", "99", "--format", "json"))
			if !strings.HasPrefix(skipped["big"], named) || len(skipped) != 5 {
				t.Errorf("screen skipped %q", skipped)
			}
		})
	}
}

// Item 19 (part): a CSV file given as the input is called what it looks
// like, with its name, by every command that reads a layer.
func TestCSVGivenAsInput(t *testing.T) {
	sampleDir(t)
	if err := os.WriteFile("table.csv", []byte("GEOID,rate,policy\n01001,2.5,yes\n01003,3.1,no\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{
		{"compare", "-y", "rate", "-g", "policy"},
		{"autocorr", "--variables", "rate"},
		{"screen"},
		{"local", "--variable", "rate"},
		{"weights"},
	} {
		t.Run(args[0], func(t *testing.T) {
			failsWith(t, runIn("", append(args, "-i", "table.csv")...),
				`table.csv: not GeoJSON: the input looks like a table of delimited text (CSV), its first line "GEOID,rate,policy"`)
		})
	}
}
