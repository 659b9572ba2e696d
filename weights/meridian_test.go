package weights

import (
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

func lonLatRect(x0, y0, x1, y1 float64) orb.Ring {
	return orb.Ring{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}, {x0, y0}}
}

// Areas split at the 180° meridian meet their neighbours across it, on
// longitude/latitude layers only.
func TestContiguityAcrossTheAntimeridian(t *testing.T) {
	geoms := []orb.MultiPolygon{
		{{lonLatRect(178, 0, 180, 2)}},                                     // 0: east of the meridian
		{{lonLatRect(-180, 0, -178, 2)}},                                   // 1: shares 0's side on the meridian
		{{lonLatRect(-180, 2, -178, 4)}},                                   // 2: meets 0 at the corner (180, 2) only; 1 along a parallel
		{{lonLatRect(-180, 5, -178, 6)}},                                   // 3: across from nothing
		{{lonLatRect(179, 10, 180, 11)}, {lonLatRect(-180, 10, -179, 11)}}, // 4: one area on both sides
		{{lonLatRect(-180, 1, -179, 1.5)}},                                 // 5: its side lies within 0's
	}
	tests := []struct {
		name string
		opt  ContiguityOptions
		want map[int][]int32
	}{
		{"queen", ContiguityOptions{Rule: Queen}, map[int][]int32{0: {1, 2, 5}, 1: {0, 2, 5}, 2: {0, 1}, 3: nil, 4: nil, 5: {0, 1}}},
		{"rook", ContiguityOptions{Rule: Rook}, map[int][]int32{0: {1, 5}, 1: {0, 2, 5}, 2: {1}, 3: nil, 4: nil, 5: {0, 1}}},
		{"projected", ContiguityOptions{Rule: Queen, Projected: true}, map[int][]int32{0: nil, 1: {2, 5}, 2: {1}, 3: nil, 4: nil, 5: {1}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			g, _, err := BuildContiguity(geoms, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			for i, want := range tc.want {
				nb, _ := g.Row(i)
				if !slices.Equal(nb, want) && !(len(nb) == 0 && len(want) == 0) {
					t.Errorf("area %d: neighbours %v, want %v", i, nb, want)
				}
			}
		})
	}
}
