package compare

import (
	"errors"
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
)

// Counts above their maxima are refused before any work, with a
// *shuffle.CountError naming the maximum.
func TestRunRefusesCountsAboveTheMaxima(t *testing.T) {
	y := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	g := []string{"a", "a", "a", "a", "b", "b", "b", "b"}
	cases := []struct {
		name string
		set  func(*Options)
		max  int
	}{
		{"permutations", func(o *Options) { o.Permutations = 1e12 }, shuffle.MaxPermutations},
		{"surrogates", func(o *Options) { o.Surrogates = MaxSurrogates + 1 }, MaxSurrogates},
		{"false-positive checks", func(o *Options) { o.FalsePositives = MaxFalsePositiveChecks + 1 }, MaxFalsePositiveChecks},
		{"check shuffles", func(o *Options) { o.FalsePositives, o.FalsePositiveShuffles = 10, MaxCheckShuffles+1 }, MaxCheckShuffles},
	}
	for _, c := range cases {
		o := opts()
		c.set(&o)
		_, err := Run(input(y, g), o)
		var ce *shuffle.CountError
		if !errors.As(err, &ce) || ce.Max != c.max {
			t.Errorf("%s: %v, want a *shuffle.CountError with maximum %d", c.name, err, c.max)
		}
	}
}

// A check whose shuffles cannot give p ≤ alpha is refused with the fewest
// shuffles that can. With B shuffles the smallest Monte Carlo p-value is
// 1/(1 + B), doubled two-sided (Phipson & Smyth 2010's (1 + b)/(1 + B) at
// b = 0): at alpha 0.05 one side needs 19, two sides 39; at 0.01, 99 and
// 199 (worked by hand).
func TestCheckShufflesThatCannotReject(t *testing.T) {
	cases := []struct {
		B     int
		alpha float64
		alt   shuffle.Alternative
		need  int // 0: accepted
	}{
		{5, 0.05, shuffle.TwoSided, 39},
		{38, 0.05, shuffle.TwoSided, 39},
		{39, 0.05, shuffle.TwoSided, 0},
		{18, 0.05, shuffle.Greater, 19},
		{19, 0.05, shuffle.Greater, 0},
		{5, 0.05, shuffle.Less, 19},
		{198, 0.01, shuffle.TwoSided, 199},
		{99, 0.01, shuffle.Less, 0},
		{1, 1e-6, shuffle.Greater, 999_999},
		{1, 1e-300, shuffle.Greater, 1 << 50},
	}
	for _, c := range cases {
		err := checkShuffles(c.B, c.alpha, c.alt)
		var ce *CheckShufflesError
		switch {
		case c.need == 0 && err != nil:
			t.Errorf("B %d at %g %v: %v", c.B, c.alpha, c.alt, err)
		case c.need > 0 && (!errors.As(err, &ce) || ce.Need != c.need || ce.Shuffles != c.B):
			t.Errorf("B %d at %g %v: %v, want need %d", c.B, c.alpha, c.alt, err, c.need)
		}
	}
}

// The false-positive check runs its own Monte Carlo count on every
// surrogate, even where the arrangements are few enough to enumerate (22
// areas split 11/11 have C(22, 11) = 705,432, under the shuffles' exact
// limit): replaying each surrogate's free shuffle by hand, with B random
// shuffles and never enumeration, gives the same rejections, and the result
// reports B.
func TestFalsePositiveCheckIsMonteCarlo(t *testing.T) {
	const n, S, B = 22, 30, 49
	g := path(n)
	basis, err := surrogate.NewBasis(g.RowStandardised(), surrogate.Options{})
	if err != nil {
		t.Fatal(err)
	}
	y := make([]float64, n)
	lab := make([]int32, n)
	for i := range y {
		y[i] = float64(i) + math.Sin(float64(i))
		lab[i] = int32(i * 2 / n) // the first 11 in group 0
	}
	o, err := basis.Prepare(y)
	if err != nil {
		t.Fatal(err)
	}
	opt := FPROptions{Surrogates: S, Permutations: B, Seed: 3, Purpose: 5, Workers: 2}
	got, err := FalsePositives(o, groups.DiffMedians, lab, 2, opt)
	if err != nil {
		t.Fatal(err)
	}
	want := 0
	draw := o.NewDraw()
	sur := make([]float64, n)
	for d := 0; d < S; d++ {
		if d%FPRBlock == 0 {
			// Block b's surrogates come from the stream (seed, purpose, b).
			rng := shuffle.NewStream(opt.Seed, opt.Purpose, d/FPRBlock)
			for e := d; e < min(d+FPRBlock, S); e++ {
				draw(&rng, sur)
				data, err := groups.Prepare(sur, lab, 2)
				if err != nil {
					t.Fatal(err)
				}
				res, err := shuffle.Run(shuffle.Plan{Labels: data.Labels, Permutations: B, ExactLimit: -1, Seed: opt.Seed,
					Purpose: innerPurpose(opt.Purpose, e), Workers: 1, Scale: data.Y[n-1] - data.Y[0]}, data.Factory(groups.DiffMedians))
				if err != nil {
					t.Fatal(err)
				}
				if res.Exact || res.Permutations != B {
					t.Fatalf("replay %d: %+v", e, res)
				}
				if res.PValue <= 0.05 {
					want++
				}
			}
		}
	}
	// Each check's p-value is a Monte Carlo one, 2(1 + b)/(1 + B) two-sided:
	// a multiple of 1/50 here, which no count over 705,432 enumerated
	// arrangements gives but by chance.
	data, err := groups.Prepare(y, lab, 2)
	if err != nil {
		t.Fatal(err)
	}
	rng := shuffle.NewStream(1, 2, 0)
	for e := 0; e < 5; e++ {
		draw(&rng, sur)
		if err := data.Reprepare(sur); err != nil {
			t.Fatal(err)
		}
		p, err := shuffleSorted(data, nil, nil, groups.DiffMedians, shuffle.TwoSided, B, 1, innerPurpose(2, e))
		if err != nil {
			t.Fatal(err)
		}
		if k := p * (1 + B); math.Abs(k-math.Round(k)) > 1e-9 {
			t.Errorf("surrogate %d: p = %v is not a Monte Carlo p-value of %d shuffles", e, p, B)
		}
	}
	if got.Permutations != B || got.Surrogates != S || got.Rejected != want {
		t.Fatalf("check %+v, replay rejected %d of %d with %d shuffles", got, want, S, B)
	}
	if _, err := FalsePositives(o, groups.DiffMedians, lab, 2, FPROptions{Surrogates: S, Permutations: 5}); !errors.As(err, new(*CheckShufflesError)) {
		t.Errorf("5 shuffles per check accepted: %v", err)
	}
}
