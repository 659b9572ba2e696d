package table

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"

	"github.com/areatest/areatest/io/layer"
	"github.com/areatest/areatest/tests/testkit"
)

func mustRead(t *testing.T, doc string) (*Table, []string) {
	t.Helper()
	tab, warns, err := Read(strings.NewReader(doc), "rates.csv")
	if err != nil {
		t.Fatalf("Read: %v", err)
	}
	return tab, warns
}

func fixture(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile(testkit.Testdata(t, "formats/states-attrs.csv"))
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// The fixture in the forms spreadsheets save: every one reads to the same
// table.
func TestReadForms(t *testing.T) {
	doc := fixture(t)
	want, warns, err := Read(strings.NewReader(doc), "states-attrs.csv")
	if err != nil || len(warns) != 0 {
		t.Fatal(err, warns)
	}
	if want.Rows != 56 || want.Delimiter != ',' || !reflect.DeepEqual(want.Header, []string{"fips", "usps", "name", "centroid_lon", "centroid_lat"}) {
		t.Fatalf("got %d rows, header %q", want.Rows, want.Header)
	}
	kinds := []layer.Kind{layer.Number, layer.Text, layer.Text, layer.Number, layer.Number}
	for j, c := range want.Columns {
		if c.Kind != kinds[j] || c.MissingCount() != 0 || len(c.Missing) != 56 {
			t.Errorf("column %s: kind %v, %d missing", c.Name, c.Kind, c.MissingCount())
		}
	}
	if want.Lines[0] != 2 || want.Lines[55] != 57 {
		t.Errorf("lines %d..%d", want.Lines[0], want.Lines[55])
	}
	lf := strings.ReplaceAll(doc, "\r\n", "\n")
	forms := map[string]string{
		"LF":                  lf,
		"byte-order mark":     "\ufeff" + doc,
		"semicolons":          strings.ReplaceAll(lf, ",", ";"),
		"tabs":                strings.ReplaceAll(doc, ",", "\t"),
		"quoted everything":   quoteAllFields(lf),
		"blank lines":         "\n" + strings.Replace(lf, "\n", "\n\n", 3),
		"trailing empty rows": doc + ",,,,\r\n , ,,,\r\n",
	}
	for name, d := range forms {
		got, _, err := Read(strings.NewReader(d), "states-attrs.csv")
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if !reflect.DeepEqual(got.Header, want.Header) || !reflect.DeepEqual(got.Columns, want.Columns) {
			t.Errorf("%s: the table differs", name)
		}
	}
}

func quoteAllFields(doc string) string {
	var b strings.Builder
	for _, line := range strings.Split(strings.TrimSuffix(doc, "\n"), "\n") {
		fields := strings.Split(line, ",")
		for i, f := range fields {
			fields[i] = `"` + f + `"`
		}
		b.WriteString(strings.Join(fields, ",") + "\n")
	}
	return b.String()
}

func TestReadValues(t *testing.T) {
	doc := "GEOID;name;rate;note\r\n" +
		"01001;\"Autauga; AL\";12.5;NA\r\n" +
		"01003;\"Baldwin \"\"the big\"\"\nsecond line\";n/a;\r\n" +
		"01005;Barbour;7;ok\r\n"
	tab, _ := mustRead(t, doc)
	if tab.Delimiter != ';' || tab.Rows != 3 || !reflect.DeepEqual(tab.Lines, []int{2, 3, 5}) {
		t.Fatalf("delimiter %q, rows %d, lines %v", tab.Delimiter, tab.Rows, tab.Lines)
	}
	geoid, name, rate, note := tab.Columns[0], tab.Columns[1], tab.Columns[2], tab.Columns[3]
	if geoid.Kind != layer.Text || geoid.Str[0] != "01001" || !geoid.NotNumber[0] {
		t.Errorf("GEOID: %+v", geoid)
	}
	if name.Str[0] != "Autauga; AL" || name.Str[1] != "Baldwin \"the big\"\nsecond line" {
		t.Errorf("name: %q", name.Str)
	}
	if rate.Kind != layer.Number || rate.Num[0] != 12.5 || !rate.Missing[1] || rate.Num[2] != 7 {
		t.Errorf("rate: %+v", rate)
	}
	if note.Kind != layer.Text || !note.Missing[0] || !note.Missing[1] || note.Str[2] != "ok" {
		t.Errorf("note: %+v", note)
	}
	// Header names are trimmed; a semicolon inside quotes does not count.
	tab, _ = mustRead(t, "\" id \", rate ,\"a;b;c\"\n1,2,3\n")
	if tab.Delimiter != ',' || !reflect.DeepEqual(tab.Header, []string{"id", "rate", "a;b;c"}) {
		t.Errorf("delimiter %q, header %q", tab.Delimiter, tab.Header)
	}
	// The most frequent delimiter loses when the rows disagree with it.
	tab, _ = mustRead(t, "name,code,x;rate\nfoo;1\nbar;2\n")
	if tab.Delimiter != ';' || len(tab.Header) != 2 {
		t.Errorf("delimiter %q, header %q", tab.Delimiter, tab.Header)
	}
	// A column of numbers with one decimal comma among words is text, not
	// an error.
	tab, _ = mustRead(t, "id;v\na;12,5\nb;high\n")
	if tab.Columns[1].Kind != layer.Text {
		t.Errorf("v: %+v", tab.Columns[1])
	}
	_, warns := mustRead(t, "id,v\na,1\n,\n")
	if len(warns) != 1 || !strings.HasPrefix(warns[0], "rates.csv: 1 row(s) of empty fields were skipped") {
		t.Errorf("warnings %q", warns)
	}
}

func TestReadErrors(t *testing.T) {
	tests := []struct {
		name string
		doc  string
		want []string
	}{
		{"empty", "", []string{"rates.csv: is empty"}},
		{"blank", " \r\n\n", []string{"rates.csv: is empty"}},
		{"header only", "id,rate\r\n", []string{"rates.csv: has a header line but no rows"}},
		{"header and blank rows", "id,rate\r\n,\r\n", []string{"rates.csv: has a header line but no rows"}},
		{"one column", "id\n1\n2\n", []string{"rates.csv: has one column", `"id"`, "needs a key column and at least one more"}},
		{"one quoted column", "\"id,rate\"\n1\n", []string{"rates.csv: has one column", "needs a key column"}},
		{"empty header name", "id,,rate\n1,2,3\n", []string{"rates.csv: line 1: column 2 of the header has no name"}},
		{"duplicate header name", "id,rate, rate\n1,2,3\n", []string{"rates.csv: line 1: ", `names "rate" twice (columns 2 and 3)`}},
		{"short row", "id,rate,pop\n1,2,3\n2,3,4\n3,4,5\n4,5,6\n5,6,7\n6,7\n", []string{"rates.csv: line 7: has 2 field(s); the header has 3"}},
		{"long row", "id,rate\n1,2\n2,3,4\n", []string{"rates.csv: line 3: has 3 field(s); the header has 2", "must be quoted"}},
		{"row count after a quoted line break", "id;name\n1;\"a\nb\"\n2;x;y\n", []string{"rates.csv: line 4: has 3 field(s); the header has 2", "semicolons"}},
		{"bare quote", "id,name\n1,5\" tall\n", []string{"rates.csv: line 2: ", "double quote inside a field"}},
		{"unclosed quote", "id,name\n1,\"abc\n2,x\n", []string{"rates.csv: line ", "row that starts on line 2 is not closed"}},
		{"text after a closing quote", "id,name\n1,\"abc\"x\n", []string{"rates.csv: line 2: ", "closing quote is followed by more text"}},
		{"latin-1", "id,name\n1,Montr\xe9al\n", []string{"rates.csv: line 2: ", "not UTF-8", "0xE9", "save the file as UTF-8"}},
		{"utf-16", "\xff\xfei\x00d\x00", []string{"rates.csv: is UTF-16", "save the file as UTF-8"}},
		{"decimal comma", "id;rate;pop\n1;12,5;100\n2;3;NA\n3;4,25;7\n", []string{`rates.csv: line 2, column "rate": holds "12,5"`, "decimal comma", "write numbers with a decimal point (12.5)"}},
		{"decimal comma, first column wins", "id;a;b\n1;7;1,5\n2;0,5;3\n", []string{`line 3, column "a": holds "0,5"`}},
		{"quoted decimal comma", "id,rate\n1,\"-12,5\"\n", []string{`rates.csv: line 2, column "rate": holds "-12,5"`, "(-12.5)"}},
		{"thousands separator", "id;pop\n1;1,234\n", []string{`column "pop": holds "1,234"`, "(1.234)", "thousands separator", "(1234)"}},
	}
	for _, tc := range tests {
		tab, _, err := Read(strings.NewReader(tc.doc), "rates.csv")
		checkError(t, tc.name, err, tc.want)
		if tab != nil {
			t.Errorf("%s: a table along with the error", tc.name)
		}
	}
}

// checkError checks that err is one line, an *Error, holding every want.
func checkError(t *testing.T, name string, err error, want []string) {
	t.Helper()
	if err == nil {
		t.Errorf("%s: no error", name)
		return
	}
	var te *Error
	if !errors.As(err, &te) {
		t.Errorf("%s: %T is not an *Error", name, err)
	}
	msg := err.Error()
	if strings.ContainsAny(msg, "\r\n") {
		t.Errorf("%s: message of several lines: %q", name, msg)
	}
	for _, w := range want {
		if !strings.Contains(msg, w) {
			t.Errorf("%s: %q lacks %q", name, msg, w)
		}
	}
}

func TestReadFile(t *testing.T) {
	path := testkit.Testdata(t, "formats/states-attrs.csv")
	tab, _, err := ReadFile(path)
	if err != nil || tab.Source != path || tab.Rows != 56 {
		t.Fatalf("ReadFile: %v", err)
	}
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.csv")
	if err := os.WriteFile(bad, []byte("id,v\n1,2\n1,2,3\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, _, err = ReadFile(bad)
	checkError(t, "bad file", err, []string{bad + ": line 3: "})
	missing := filepath.Join(dir, "none.csv")
	_, _, err = ReadFile(missing)
	checkError(t, "missing", err, []string{missing + ": cannot be read: no such file"})
	if !errors.Is(err, os.ErrNotExist) {
		t.Errorf("missing: %v does not wrap os.ErrNotExist", err)
	}
	_, _, err = ReadFile(dir)
	checkError(t, "directory", err, []string{dir + ": cannot be read: is a directory"})
	_, _, err = ReadFile("-")
	checkError(t, "stdin", err, []string{"stdin: ", "standard input"})
	if entries, _ := os.ReadDir(dir); len(entries) != 1 {
		t.Errorf("files left behind: %v", entries)
	}
}
