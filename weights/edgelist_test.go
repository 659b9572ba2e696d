package weights

import (
	"bytes"
	"errors"
	"strings"
	"testing"
)

func TestEdgeListRoundTrip(t *testing.T) {
	g, _ := ContiguityGraph(lattice(3), Queen)
	rs := g.RowStandardised()
	ids := []string{"a", "b", "c", "d", "e", "f", "g", "h", "i"}
	var buf bytes.Buffer
	if err := WriteEdgeList(&buf, rs, ids, "edges.csv"); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(buf.String(), "from,to,weight\na,b,0.3333333333333333\n") {
		t.Fatalf("edge list starts %q", buf.String()[:40])
	}
	back, err := ReadEdgeList(&buf, "edges.csv", ids)
	if err != nil {
		t.Fatal(err)
	}
	sameGraph(t, back, rs)
	var bin bytes.Buffer
	if err := WriteEdgeList(&bin, g, ids, "edges.csv"); err != nil {
		t.Fatal(err)
	}
	if b, _ := ReadEdgeList(&bin, "edges.csv", ids); b.Scaling != "binary" {
		t.Fatalf("binary file read as %q", b.Scaling)
	}
}

// sameGraph fails unless got has the links and weights of want.
func sameGraph(t *testing.T, got, want *Graph) {
	t.Helper()
	if got.Len() != want.Len() || got.Links() != want.Links() {
		t.Fatalf("%d areas, %d links; want %d, %d", got.Len(), got.Links(), want.Len(), want.Links())
	}
	for i := range want.Offsets {
		if got.Offsets[i] != want.Offsets[i] {
			t.Fatalf("row %d starts at %d, want %d", i, got.Offsets[i], want.Offsets[i])
		}
	}
	for k := range want.Weights {
		if got.Weights[k] != want.Weights[k] || got.Neighbours[k] != want.Neighbours[k] {
			t.Fatalf("link %d is →%d (%v), want →%d (%v)", k, got.Neighbours[k], got.Weights[k], want.Neighbours[k], want.Weights[k])
		}
	}
}

// Every id the writer accepts reads back as itself, whatever CSV makes of
// it: surrounding spaces (which a hand-written field would lose), commas,
// quotes, line feeds, non-ASCII letters, ids that differ only in spaces.
func TestEdgeListIDsRoundTrip(t *testing.T) {
	ids := []string{" A01", "A01 ", "A01", "\tA02\t", "a,b", `say "hi"`, `"`, "Ærø–Å", "東京都", "two\nlines", "", `\.`, "x y", " ", "\ufeffbom"}
	var links []Link
	for i := range ids {
		for j := range ids {
			if i != j {
				links = append(links, Link{int32(i), int32(j), float64(1+i) / float64(1+j)})
			}
		}
	}
	g, err := FromEntries(len(ids), links, "test", "weighted")
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteEdgeList(&buf, g, ids, "edges.csv"); err != nil {
		t.Fatal(err)
	}
	back, err := ReadEdgeList(&buf, "edges.csv", ids)
	if err != nil {
		t.Fatal(err)
	}
	sameGraph(t, back, g)
}

// A hand-written file may put spaces around its fields: a field that is
// no id as written is matched with its spaces trimmed, when that fits one
// id only.
func TestEdgeListSpacesAroundFields(t *testing.T) {
	g, err := ReadEdgeList(strings.NewReader("from , to , weight\na , b , 2\n b,\" c\", 1 \n"), "edges.csv", []string{"a", "b", " c"})
	if err != nil {
		t.Fatal(err)
	}
	if weightOf(g, 0, 1) != 2 || weightOf(g, 1, 2) != 1 || g.Links() != 2 {
		t.Fatalf("links %v %v", g.Neighbours, g.Weights)
	}
}

// The writer refuses what the reader would refuse or change: a weight out
// of range, an id with a carriage return (CSV readers turn a quoted
// "\r\n" into "\n").
func TestEdgeListWriterRefuses(t *testing.T) {
	for _, c := range []struct {
		name   string
		ids    []string
		weight float64
		want   string
	}{
		{"weight too large", []string{"a", "b"}, 1e200, `out.csv: link "a"→"b": weight 1e+200 is too large`},
		{"weight too small", []string{"a", "b"}, 1e-200, `out.csv: link "a"→"b": weight 1e-200 is too small`},
		{"carriage return", []string{"a", "b\r\nc"}, 1, `out.csv: the id "b\r\nc" (area 2 of the layer) holds a carriage return`},
	} {
		g, err := FromEntries(2, []Link{{0, 1, c.weight}}, "test", "weighted")
		if err != nil {
			t.Fatal(err)
		}
		err = WriteEdgeList(&bytes.Buffer{}, g, c.ids, "out.csv")
		var el *EdgeListError
		if err == nil || !strings.HasPrefix(err.Error(), c.want) || !errors.As(err, &el) {
			t.Errorf("%s: error %v, want %q", c.name, err, c.want)
		}
	}
}

// Every problem names the file and, where there is one, the line and the
// link as written.
func TestEdgeListErrors(t *testing.T) {
	ids := []string{"a", "b", "c", " d", "d "}
	for _, c := range []struct{ name, text, want string }{
		{"empty", "", `edges.csv: the file is empty`},
		{"no header", "a,b,1\n", `edges.csv: line 1: the header must name`},
		{"bare quote in an id", "from,to,weight\na\"b,c,1\n", `edges.csv: line 2: column 2: bare " in non-quoted-field; a field holding a quote is written in quotes`},
		{"bare quote in the header", "fr\"om,to,weight\n", `edges.csv: line 1: column 3: bare "`},
		{"quote not closed", "from,to,weight\na,\"b,1\nc,a,1\n", `edges.csv: line 2: at line 3, column 7 of the record that starts here: extraneous or missing " in quoted-field`},
		{"unknown id", "from,to,weight\na,z,1\n", `edges.csv: line 2: link "a"→"z": area "z" is not an id of the layer`},
		{"self link", "from,to,weight\na,b,1\nc,c,1\n", `edges.csv: line 3: link "c"→"c": an area cannot be its own neighbour`},
		{"ambiguous once trimmed", "from,to,weight\na,\" d \",1\n", `edges.csv: line 2: link "a"→" d ": area " d " is not an id of the layer, and without its surrounding spaces it fits several`},
		{"negative", "from,to,weight\na,b,-1\n", `edges.csv: line 2: link "a"→"b": weight -1 is negative; weights must be 0 or from 1e-100 to 1e+100`},
		{"not a number", "from,to,weight\na,b,heavy\n", `edges.csv: line 2: link "a"→"b": weight "heavy" is not a decimal number`},
		{"hex float", "from,to,weight\na,b,0x1p0\n", `edges.csv: line 2: link "a"→"b": weight "0x1p0" is not a decimal number`},
		{"infinity", "from,to,weight\na,b,Inf\n", `weight "Inf" is not a decimal number`},
		{"nan", "from,to,weight\na,b,NaN\n", `weight "NaN" is not a decimal number`},
		{"two points", "from,to,weight\na,b,1.2.3\n", `weight "1.2.3" is not a decimal number`},
		{"finite but too large", "from,to,weight\na,b,1\nb,a,1e308\n", `edges.csv: line 3: link "b"→"a": weight 1e308 is too large; weights must be 0 or from 1e-100 to 1e+100, so that sums`},
		{"beyond float64", "from,to,weight\na,b,1e999\n", `weight 1e999 is too large`},
		{"too small", "from,to,weight\na,b,1e-101\n", `weight 1e-101 is too small`},
		{"below float64", "from,to,weight\na,b,0.5e-999\n", `weight 0.5e-999 is too small`},
		{"missing weight", "from,to,weight\na,b\n", `edges.csv: line 2: expected the columns from, to and weight, found 2 value(s): "a,b"`},
		{"empty weight", "from,to,weight\na,b,\n", `edges.csv: line 2: link "a"→"b": the weight is missing`},
		{"repeated", "from,to,weight\na,b,1\na,b,2\n", `edges.csv: line 3: link "a"→"b": this link was already given on line 2`},
		{"header only", "from,to,weight\n", `edges.csv: the edge list has a header but no links`},
		{"header and blank lines", "from,to,weight\n\n  \n", `edges.csv: the edge list has a header but no links`},
		{"every weight zero", "from,to,weight\na,b,0\nb,a,0.0\n", `edges.csv: all 2 links have weight 0, so no area has a neighbour`},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := ReadEdgeList(strings.NewReader(c.text), "edges.csv", ids)
			var el *EdgeListError
			if err == nil || !strings.Contains(err.Error(), c.want) || !errors.As(err, &el) || el.File != "edges.csv" {
				t.Fatalf("error %v, want %q", err, c.want)
			}
		})
	}
	// Columns in another order, a byte-order mark, blank lines, zero
	// weights among others and the limits of the range are fine.
	g, err := ReadEdgeList(strings.NewReader("\ufeffweight,to,from\n2,b,a\n\n0.5,a,b\n0,c,a\n1e100,a,c\n1E-100,b,c\n"), "edges.csv", ids)
	if err != nil || g.Links() != 4 || weightOf(g, 0, 1) != 2 || weightOf(g, 2, 0) != 1e100 || g.Degree(2) != 2 {
		t.Fatalf("reordered columns: %v", err)
	}
}

// FuzzReadEdgeList feeds the edge-list reader arbitrary files and the
// writer arbitrary ids. Reading never panics; every failure is an
// *EdgeListError naming the file; every graph read has links only between
// distinct areas, with weights in range. And a graph written with an
// arbitrary id among the layer's ids reads back unchanged, or the writer
// refuses the id. Not run in CI; run it by hand with
//
//	go test ./weights -run '^$' -fuzz FuzzReadEdgeList -fuzztime 60s
func FuzzReadEdgeList(f *testing.F) {
	for _, seed := range []struct{ text, id string }{
		{"from,to,weight\na,b,1\nb,a,0.5\n", "c"},
		{"\ufeffweight,to,from\n2,b,a\n\n0.5,a,b\n", " c "},
		{"from,to,weight\na\"b,c,1\n", `"`},
		{"from,to,weight\n\"a\",\" c \",1e100\n", "a,b"},
		{"from,to,weight\na,b,0x1p0\nb,a,1e308\n", "東京"},
		{"from,to,weight\n", "x\ny"},
	} {
		f.Add([]byte(seed.text), seed.id)
	}
	f.Fuzz(func(t *testing.T, data []byte, id string) {
		ids := []string{"a", "b", " c ", "a,b"}
		for _, have := range ids {
			if have == id {
				id += "!"
			}
		}
		ids = append(ids, id)
		g, err := ReadEdgeList(bytes.NewReader(data), "fuzz.csv", ids)
		var el *EdgeListError
		switch {
		case err != nil && (!errors.As(err, &el) || el.File != "fuzz.csv"):
			t.Fatalf("error %v is not an edge-list error naming the file", err)
		case err == nil:
			checkReadGraph(t, g, len(ids))
		}
		var links []Link
		for i := range ids {
			links = append(links, Link{int32(i), int32((i + 1) % len(ids)), 0.25 + float64(i)})
		}
		want, err := FromEntries(len(ids), links, "chain", "weighted")
		if err != nil {
			t.Fatal(err)
		}
		var buf bytes.Buffer
		if err := WriteEdgeList(&buf, want, ids, "fuzz.csv"); err != nil {
			if !strings.ContainsRune(id, '\r') {
				t.Fatalf("writer refused id %q: %v", id, err)
			}
			return
		}
		back, err := ReadEdgeList(&buf, "fuzz.csv", ids)
		if err != nil {
			t.Fatalf("id %q: written file does not read back: %v", id, err)
		}
		sameGraph(t, back, want)
	})
}

// checkReadGraph fails unless g is a proper graph on n areas with
// edge-list weights.
func checkReadGraph(t *testing.T, g *Graph, n int) {
	t.Helper()
	if g.Len() != n {
		t.Fatalf("%d areas, want %d", g.Len(), n)
	}
	for i := range n {
		nb, w := g.Row(i)
		for k, j := range nb {
			if int(j) == i || j < 0 || int(j) >= n || !(w[k] >= MinEdgeWeight && w[k] <= MaxEdgeWeight) {
				t.Fatalf("link %d→%d weight %v", i, j, w[k])
			}
		}
	}
}
