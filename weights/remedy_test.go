package weights

import (
	"strings"
	"testing"
)

// The islands warning gives the remedy of the rule in use, and no flag.
func TestIslandAdviceFitsTheRule(t *testing.T) {
	ids := []string{"a", "b", "c", "d", "e"}
	tests := []struct {
		kind      string
		want, not []string
	}{
		{"queen contiguity", []string{RemedySnap, RemedyNearest, RemedyKeep}, []string{RemedyBand, RemedyBandwidth}},
		{"rook contiguity, order 2", []string{RemedySnap, RemedyKeep}, []string{RemedyBand}},
		{"4 nearest neighbours", []string{"gives every area neighbours", RemedyKeep}, []string{RemedySnap, RemedyBand}},
		{"distance band 25 km", []string{RemedyBand, RemedyNearest, RemedyKeep}, []string{RemedySnap, RemedyBandwidth}},
		{"triangular kernel (bandwidth 10 km)", []string{RemedyBandwidth, RemedyAdaptive, RemedyKeep}, []string{RemedySnap, RemedyBand + ","}},
		{"edge list w.csv", []string{RemedyEdgeList, RemedyKeep}, []string{RemedySnap}},
	}
	for _, tc := range tests {
		t.Run(tc.kind, func(t *testing.T) {
			g, err := FromLinks(5, [][2]int32{{0, 1}}, tc.kind) // 3 of 5 are islands
			if err != nil {
				t.Fatal(err)
			}
			s := Summarise(g, ids)
			if len(s.Warnings) == 0 {
				t.Fatal("no warning")
			}
			w := s.Warnings[0]
			for _, p := range tc.want {
				if !strings.Contains(w, p) {
					t.Errorf("warning lacks %q: %s", p, w)
				}
			}
			for _, p := range append(tc.not, "--") {
				if strings.Contains(w, p) {
					t.Errorf("warning has %q: %s", p, w)
				}
			}
		})
	}
	// With every area an island, keeping them leaves nothing: not offered.
	g, _ := FromLinks(5, nil, "queen contiguity")
	if w := Summarise(g, ids).Warnings[0]; strings.Contains(w, RemedyKeep) || !strings.Contains(w, RemedySnap) {
		t.Errorf("all islands: %s", w)
	}
}
