package table

import (
	"bytes"
	"errors"
	"os"
	"strings"
	"testing"

	"github.com/areatest/areatest/tests/testkit"
)

func FuzzReadTable(f *testing.F) {
	if b, err := os.ReadFile(testkit.Testdata(f, "formats/states-attrs.csv")); err == nil {
		f.Add(b)
		f.Add(bytes.ReplaceAll(b, []byte(","), []byte(";")))
	}
	f.Add([]byte("GEOID;name;rate\r\n01001;\"Autauga; AL\";12,5\r\n1003;\"a\"\"b\nc\";NA\r\n"))
	f.Add([]byte("\ufeffid\tv\n1\t2\n,\n"))
	f.Add([]byte("id,v\n1,\"2\n"))
	f.Add([]byte("id,v\n1,5\" x\n"))
	f.Add([]byte("id,name\n1,Montr\xe9al\n"))
	f.Add([]byte("\"a,b\";c\n1;2\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		tab, _, err := Read(bytes.NewReader(data), "fuzz.csv")
		if err != nil {
			checkFuzzError(t, tab, err)
			return
		}
		if tab.Rows == 0 || len(tab.Header) < 2 || len(tab.Columns) != len(tab.Header) || len(tab.Lines) != tab.Rows {
			t.Fatalf("bad table %+v", tab)
		}
		for _, c := range tab.Columns {
			if len(c.Missing) != tab.Rows {
				t.Fatalf("column %q has %d values for %d rows", c.Name, len(c.Missing), tab.Rows)
			}
		}
		l := areas([]string{"1", "01", "a", "001"}, "x", "1", "2")
		for _, opt := range []JoinOptions{{}, {LayerKey: "code"}, {TableKey: tab.Header[len(tab.Header)-1]}} {
			got, rep, _, err := Join(l, tab, opt)
			if err != nil {
				var te *Error
				if !errors.As(err, &te) || strings.ContainsAny(err.Error(), "\r\n") {
					t.Fatalf("bad join error %v", err)
				}
				continue
			}
			if rep.Matched == 0 || got.Len() != l.Len() {
				t.Fatalf("join %+v: %+v", opt, rep)
			}
		}
	})
}

func checkFuzzError(t *testing.T, tab *Table, err error) {
	if tab != nil {
		t.Fatalf("table along with error %v", err)
	}
	var te *Error
	if !errors.As(err, &te) {
		t.Fatalf("error %T is not an *Error: %v", err, err)
	}
	if msg := err.Error(); strings.ContainsAny(msg, "\n\r") || !strings.HasPrefix(msg, "fuzz.csv: ") {
		t.Fatalf("bad message %q", msg)
	}
}
