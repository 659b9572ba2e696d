package autocorr

import (
	"errors"
	"fmt"

	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/weights"
)

// Join counts (Moran 1948; Cliff & Ord 1981, ch. 1) work on joins, not
// weights: two areas are joined when either lists the other as a neighbour,
// whatever the weight, and each join counts once — the binary symmetric
// weights of the classical definition, BB = ½ Σ_ij w_ij x_i x_j with
// w_ij ∈ {0, 1}. Row-standardised weights would turn a count of joins into
// a sum of fractions with no plain meaning, so weights are ignored here.

// JoinStat is one join count with its moments under sampling without
// replacement (the observed category sizes are fixed and every arrangement
// of the categories over the areas is equally likely: the non-free sampling
// of Cliff & Ord 1981) and its permutation test.
type JoinStat struct {
	Joins    int     `json:"joins"`
	Expected float64 `json:"expected"`
	Variance float64 `json:"variance"`
	// Z is (joins − expected)/sd; 0 when the count cannot vary.
	Z           float64        `json:"z"`
	Permutation shuffle.Result `json:"permutation"`
}

// SameCategory is the count of joins between two areas of one category:
// for a 0/1 variable, category 1 gives the BB count and category 0 the WW
// count.
type SameCategory struct {
	Category int32 `json:"category"`
	Areas    int   `json:"areas"`
	JoinStat
}

// JoinTest holds the join counts of a categorical variable.
type JoinTest struct {
	Areas int `json:"areas"`
	// Joins is the number of joined pairs of areas.
	Joins int `json:"joins"`
	// Same has one entry per category present, in order of category code.
	Same []SameCategory `json:"same"`
	// Different counts joins between areas of different categories (the BW
	// count of a 0/1 variable). Few of them means clustering.
	Different JoinStat `json:"different"`
}

// joinGraph is the list of joins of g with the number of joins at each area.
type joinGraph struct {
	a, b   []int32
	degree []int
}

func joinsOf(g *weights.Graph) joinGraph {
	a, b, _ := symmetricPairs(g)
	deg := make([]int, g.Len())
	for k := range a {
		deg[a[k]]++
		deg[b[k]]++
	}
	return joinGraph{a: a, b: b, degree: deg}
}

// fallingRatio returns m(m−1)…(m−r+1) / (n(n−1)…(n−r+1)): the chance that r
// given areas all fall in a category of m areas out of n.
func fallingRatio(m, n, r int) float64 {
	p := 1.0
	for t := 0; t < r; t++ {
		p *= float64(m-t) / float64(n-t)
	}
	return p
}

// JoinCounts returns the join counts of the categorical variable cat
// (non-negative codes, one per area) on the joins of g, with their moments
// under sampling without replacement; the Permutation fields are left
// empty. It needs at least four areas and two categories (one category is
// ErrConstant).
//
// With J joins, T = Σ_i d_i(d_i − 1) ordered pairs of joins that share an
// area (d_i the joins at area i) and p_r(c) = n_c^(r)/n^(r) in falling
// factorials, counting the pairs of joins that coincide, share an area or
// are disjoint gives (Cliff & Ord 1981, ch. 1, non-free sampling):
//
//	E[J_cc]       = J p_2(c)
//	E[J_cc²]      = J p_2(c) + T p_3(c) + (J² − J − T) p_4(c)
//	E[J_cc J_dd]  = (J² − J − T) n_c^(2) n_d^(2) / n^(4),  c ≠ d
//
// (two joins that share an area cannot be of two different categories).
// The different-category count is J − Σ_c J_cc, so its variance is the sum
// of all these variances and covariances.
func JoinCounts(cat []int32, g *weights.Graph) (JoinTest, error) {
	n := len(cat)
	if n != g.Len() {
		return JoinTest{}, fmt.Errorf("%d categories for a graph of %d areas", n, g.Len())
	}
	if n < 4 {
		return JoinTest{}, errors.New("join counts need at least four areas")
	}
	k := int32(0)
	for i, c := range cat {
		if c < 0 {
			return JoinTest{}, fmt.Errorf("area %d has category code %d; codes must be zero or more", i, c)
		}
		k = max(k, c+1)
	}
	size := make([]int, k)
	for _, c := range cat {
		size[c]++
	}
	present := 0
	for _, s := range size {
		if s > 0 {
			present++
		}
	}
	if present < 2 {
		return JoinTest{}, ErrConstant
	}
	jg := joinsOf(g)
	J := len(jg.a)
	if J == 0 {
		return JoinTest{}, errNoLinks
	}
	var T float64
	for _, d := range jg.degree {
		T += float64(d) * float64(d-1)
	}
	fJ := float64(J)
	disjoint := fJ*fJ - fJ - T

	res := JoinTest{Areas: n, Joins: J}
	observed := make([]int, k)
	diff := 0
	for e := range jg.a {
		ca, cb := cat[jg.a[e]], cat[jg.b[e]]
		if ca == cb {
			observed[ca]++
		} else {
			diff++
		}
	}
	var sumE, sumVar float64
	var cats []int32
	for c := int32(0); c < k; c++ {
		if size[c] == 0 {
			continue
		}
		cats = append(cats, c)
		m := size[c]
		p2, p3, p4 := fallingRatio(m, n, 2), fallingRatio(m, n, 3), fallingRatio(m, n, 4)
		mean := fJ * p2
		v := fJ*p2 + T*p3 + disjoint*p4 - mean*mean
		sumE += mean
		sumVar += v
		res.Same = append(res.Same, SameCategory{Category: c, Areas: m,
			JoinStat: JoinStat{Joins: observed[c], Expected: mean, Variance: v, Z: zScore(float64(observed[c]), mean, v)}})
	}
	for x, c := range cats {
		for _, d := range cats[x+1:] {
			pc, pd := fallingRatio(size[c], n, 2), fallingRatio(size[d], n, 2)
			both := float64(size[c]) * float64(size[c]-1) * float64(size[d]) * float64(size[d]-1) /
				(float64(n) * float64(n-1) * float64(n-2) * float64(n-3))
			sumVar += 2 * (disjoint*both - fJ*fJ*pc*pd)
		}
	}
	res.Different = JoinStat{Joins: diff, Expected: fJ - sumE, Variance: sumVar, Z: zScore(float64(diff), fJ-sumE, sumVar)}
	return res, nil
}

// SameJoinsFactory returns an evaluator factory counting the joins of g
// between two areas labelled c; run it on category codes as labels.
func SameJoinsFactory(g *weights.Graph, c int32) shuffle.Factory {
	return sameJoins(joinsOf(g), c)
}

func sameJoins(jg joinGraph, c int32) shuffle.Factory {
	a, b := jg.a, jg.b
	return func() shuffle.Evaluator {
		return func(lab []int32) float64 {
			// (x⊕c)|(y⊕c) is zero only when both labels are c; (u|−u)>>31
			// is 1 for any non-zero u: a count with no branch on the
			// shuffled labels, whose outcome no predictor can guess.
			count := 0
			for e := range a {
				u := uint32((lab[a[e]] ^ c) | (lab[b[e]] ^ c))
				count += 1 - int((u|-u)>>31)
			}
			return float64(count)
		}
	}
}

// DifferentJoinsFactory returns an evaluator factory counting the joins of
// g between areas of different labels.
func DifferentJoinsFactory(g *weights.Graph) shuffle.Factory {
	return differentJoins(joinsOf(g))
}

func differentJoins(jg joinGraph) shuffle.Factory {
	a, b := jg.a, jg.b
	return func() shuffle.Evaluator {
		return func(lab []int32) float64 {
			count := 0
			for e := range a {
				u := uint32(lab[a[e]] ^ lab[b[e]])
				count += int((u | -u) >> 31)
			}
			return float64(count)
		}
	}
}

// RunJoins computes the join counts of cat on g with their moments and a
// permutation test of each count planned by plan (whose Labels are set to
// cat). Labels are the category codes themselves, so on a small layer every
// distinct arrangement is enumerated. All counts share the plan's seed and
// purpose, so they are judged on the same shuffles.
func RunJoins(cat []int32, g *weights.Graph, plan shuffle.Plan) (JoinTest, error) {
	res, err := JoinCounts(cat, g)
	if err != nil {
		return res, err
	}
	plan.Labels = cat
	plan.Scale = 1
	jg := joinsOf(g)
	for s := range res.Same {
		if res.Same[s].Permutation, err = shuffle.Run(plan, sameJoins(jg, res.Same[s].Category)); err != nil {
			return res, err
		}
	}
	res.Different.Permutation, err = shuffle.Run(plan, differentJoins(jg))
	return res, err
}
