package table

import (
	"bufio"
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/paulmach/orb"

	"github.com/areatest/areatest/io/layer"
)

// grid is a layer of n unit squares in rows of 500, with 5-digit ids.
func grid(n int) *layer.Layer {
	l := &layer.Layer{Source: "grid", IDs: make([]string, n), Geoms: make([]orb.MultiPolygon, n)}
	for i := range n {
		x, y := float64(i%500), float64(i/500)
		l.IDs[i] = fmt.Sprintf("%06d", i)
		l.Geoms[i] = orb.MultiPolygon{{{{x, y}, {x + 1, y}, {x + 1, y + 1}, {x, y + 1}, {x, y}}}}
	}
	return l
}

// writeGrid writes a table of n rows keyed as grid's ids but saved as
// numbers (the zeros lost), with a few columns of the usual kinds.
func writeGrid(tb testing.TB, n int) string {
	path := filepath.Join(tb.TempDir(), "grid.csv")
	f, err := os.Create(path)
	if err != nil {
		tb.Fatal(err)
	}
	w := bufio.NewWriter(f)
	fmt.Fprintln(w, "key,name,cases,rate,group")
	for i := range n {
		fmt.Fprintf(w, "%d,\"Area %d, north\",%d,%.4f,%c\n", i, i, i%977, float64(i%1000)/7, 'a'+rune(i%5))
	}
	if err := w.Flush(); err != nil {
		tb.Fatal(err)
	}
	f.Close()
	return path
}

func BenchmarkReadJoin(b *testing.B) {
	const n = 250_000
	l := grid(n)
	path := writeGrid(b, n)
	b.ReportAllocs()
	for b.Loop() {
		tab, _, err := ReadFile(path)
		if err != nil {
			b.Fatal(err)
		}
		_, rep, _, err := Join(l, tab, JoinOptions{})
		if err != nil || rep.Matched != n || rep.Padded != 100_000 {
			b.Fatal(err, rep)
		}
	}
}
