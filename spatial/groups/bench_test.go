package groups

import (
	"math"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// benchData is 3,000 areas with a skewed outcome and two groups of 1,200 and
// 1,800 (made-up numbers for timing only).
func benchData(b *testing.B, k int) *Data {
	n := 3000
	y := make([]float64, n)
	lab := make([]int32, n)
	for i := range y {
		y[i] = math.Exp(math.Sin(float64(i)*12.9898) * 1.3)
		lab[i] = int32((i * 7 % 10) * k / 10)
	}
	d, err := Prepare(y, lab, k)
	if err != nil {
		b.Fatal(err)
	}
	return d
}

func benchStatistic(b *testing.B, s Statistic, k int) {
	d := benchData(b, k)
	f := d.Factory(s)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		_, err := shuffle.Run(shuffle.Plan{Labels: d.Labels, Permutations: 9999, Seed: 1}, f)
		if err != nil {
			b.Fatal(err)
		}
	}
}

// Target (issue 2): difference in medians, 3,000 areas, 9,999 shuffles, ≤ 60 ms.
func BenchmarkDiffMedians3000x9999(b *testing.B) { benchStatistic(b, DiffMedians, 2) }
func BenchmarkDiffMeans3000x9999(b *testing.B)   { benchStatistic(b, DiffMeans, 2) }
func BenchmarkWelchT3000x9999(b *testing.B)      { benchStatistic(b, WelchT, 2) }
func BenchmarkRankSum3000x9999(b *testing.B)     { benchStatistic(b, RankSum, 2) }
func BenchmarkKruskal3000x9999(b *testing.B)     { benchStatistic(b, KruskalWallis, 4) }
func BenchmarkOneWayF3000x9999(b *testing.B)     { benchStatistic(b, OneWayF, 4) }

// The evaluator itself must not allocate.
func TestEvaluatorsDoNotAllocate(t *testing.T) {
	y := []float64{1, 5, 2, 8, 3, 3, 9, 4, 7, 6}
	lab := []int32{0, 1, 0, 1, 2, 2, 0, 1, 2, 0}
	d, err := Prepare(y, lab, 3)
	if err != nil {
		t.Fatal(err)
	}
	two, _ := Prepare(y, []int32{0, 1, 0, 1, 1, 1, 0, 1, 0, 0}, 2)
	for s := DiffMedians; s <= OneWayF; s++ {
		data := d
		if s.TwoGroupsOnly() {
			data = two
		}
		eval := data.Factory(s)()
		if a := testing.AllocsPerRun(100, func() { eval(data.Labels) }); a != 0 {
			t.Errorf("%s allocates %v times per evaluation", s, a)
		}
	}
}

// Reprepare gives exactly what Prepare gives on the new outcome, reaches
// evaluators made before it, and allocates nothing.
func TestReprepare(t *testing.T) {
	lab := []int32{0, 1, 0, 1, 2, 2, 0, 1, 2, 0, 1, 1}
	y1 := []float64{1, 5, 2, 8, 3, 3, 9, 4, 7, 6, 2, 5}
	y2 := []float64{4, 4, 1, 7, 7, 2, 0.5, 3, 9, 9, 9, 1}
	two := []int32{0, 1, 0, 1, 1, 1, 0, 1, 0, 0, 1, 0}
	for s := DiffMedians; s <= OneWayF; s++ {
		l := lab
		k := 3
		if s.TwoGroupsOnly() {
			l, k = two, 2
		}
		d, err := Prepare(y1, l, k)
		if err != nil {
			t.Fatal(err)
		}
		eval := d.Factory(s)()
		if err := d.Reprepare(y2); err != nil {
			t.Fatal(err)
		}
		fresh, _ := Prepare(y2, l, k)
		if got, want := eval(d.Labels), fresh.Observed(s); got != want {
			t.Errorf("%s: after Reprepare %v, fresh Prepare %v", s, got, want)
		}
		if a := testing.AllocsPerRun(50, func() { d.Reprepare(y1) }); a != 0 {
			t.Errorf("Reprepare allocates %v times", a)
		}
	}
	d, _ := Prepare(y1, two, 2)
	if err := d.Reprepare(y1[:5]); err == nil {
		t.Error("a shorter outcome was accepted")
	}
}
