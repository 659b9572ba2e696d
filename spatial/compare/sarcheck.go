package compare

import (
	"cmp"
	"errors"
	"fmt"
	"slices"
	"sync/atomic"

	"github.com/areatest/areatest/internal/parallel"
	"github.com/areatest/areatest/spatial/groups"
	"github.com/areatest/areatest/spatial/sar"
	"github.com/areatest/areatest/spatial/shuffle"
	"github.com/areatest/areatest/spatial/surrogate"
	"github.com/areatest/areatest/weights"
)

// DefaultSARChecks and DefaultSARCheckSurrogates are the number of
// outcomes simulated from the fitted SAR model and the number of spectral
// surrogates of each one's test when SAROptions (or Options) leave them 0.
// 39 surrogates make p ≤ 0.05 exactly 5% of a null p-value's values, one-
// or two-sided, like the default 999 of the reported row, and are the
// fewest that can reject two-sided at 5%. 40 outcomes keep the check's
// cost on 3,000 areas at that of the label-shuffle check
// (BenchmarkSARCheck3000: 0.91 s against 0.87 s for
// BenchmarkFalsePositives3000x500x199 on two cores); the rate's 95%
// interval is then wide (2 of 40: 0.6–17%), so a row is marked only from 6
// rejections of 40 (15%).
const (
	DefaultSARChecks          = 40
	DefaultSARCheckSurrogates = 39
)

// SARBlock is the number of simulated outcomes in one block of the SAR
// check: block k draws its outcomes from NewStream(seed, purpose, k), so
// it is part of the definition of a seeded result.
const SARBlock = 4

// SARCheckInfo describes the SAR check of the spectral surrogates: the
// model fitted to the outcome, and how many outcomes were simulated from
// it, each run through the spectral surrogate test with Surrogates
// surrogates. Skipped, when set, says why the check could not run.
type SARCheckInfo struct {
	// Rho is the fitted ρ, RhoSE its standard error; AtBound is set when
	// the maximum lies at an end of the interval searched.
	Rho     float64 `json:"rho"`
	RhoSE   float64 `json:"rho_se"`
	AtBound bool    `json:"at_bound,omitempty"`
	// LogDet names how ln|I − ρW| was evaluated.
	LogDet      string `json:"log_determinant"`
	Simulations int    `json:"simulations"`
	Surrogates  int    `json:"surrogates"`
	Skipped     string `json:"skipped,omitempty"`
}

// Calibration is a p-value calibrated to the SAR null generator: PValue
// = (1 + #{s : p_s ≤ p}) / (1 + S) over the S simulated nulls' surrogate
// p-values p_s and the observed surrogate p-value p, and Level = α′, the
// largest p_s at or below which no more than a share Alpha of the p_s
// lie (0 when none qualifies): the level at which the surrogate test
// rejects Alpha of the simulated nulls.
type Calibration struct {
	PValue float64 `json:"p_value"`
	Level  float64 `json:"level"`
	Alpha  float64 `json:"alpha"`
}

// SAROptions tune SARNullPValues. Zero values take the defaults.
type SAROptions struct {
	// Simulations is the number of simulated outcomes S (default
	// DefaultSARChecks), Surrogates the spectral surrogates of each test
	// (default DefaultSARCheckSurrogates).
	Simulations, Surrogates int
	// Alternative of the surrogate tests, used as given.
	Alternative shuffle.Alternative
	// Seed and Purpose fix the streams: block k of outcomes draws from
	// (Seed, Purpose, k), outcome d's surrogates from the seed with a
	// purpose derived from (Purpose, d).
	Seed, Purpose uint64
	// Workers is the number of goroutines; 0 means all cores. The result
	// does not depend on it.
	Workers int
	// Progress, when set, is called after each block with the outcomes
	// done and the total; it must be safe for concurrent use.
	Progress func(done, total int)
	// Shard, when set, runs one part of the blocks of outcomes or replays
	// the parts' p-values (see shuffle.Shard).
	Shard *shuffle.Shard
}

// SARNullPValues simulates opt.Simulations outcomes from m (independent of
// any grouping by construction) and runs on each the spectral surrogate
// test of stat with the grouping labels held fixed, with opt.Surrogates
// surrogates from basis; it returns the p-values in draw order. Inside
// each test the statistic is the one the comparison reports
// (groups.Data.Observed) and the surrogates' tie scale the range of the
// simulated outcome, as for the observed outcome.
func SARNullPValues(m *sar.Model, basis *surrogate.Basis, stat groups.Statistic, labels []int32, k int, opt SAROptions) ([]float64, error) {
	if len(labels) != basis.Len() {
		return nil, fmt.Errorf("compare: a basis of %d areas and %d labels", basis.Len(), len(labels))
	}
	gs, err := NewGroupStatistic(stat, labels, k)
	if err != nil {
		return nil, err
	}
	return sarNullPValues(m, basis, func() (nullTest, error) { return newGroupNull(gs, opt.Alternative), nil }, opt)
}

// sarNullPValues is SARNullPValues for any test (nullTest): each simulated
// outcome is loaded into the worker's own test, and the surrogates are
// drawn of the vector the test names (the outcome, or its residuals from
// the covariates).
func sarNullPValues(m *sar.Model, basis *surrogate.Basis, newTest func() (nullTest, error), opt SAROptions) ([]float64, error) {
	n := basis.Len()
	if m.Weights().Len() != n {
		return nil, fmt.Errorf("compare: a model of %d areas and a basis of %d", m.Weights().Len(), n)
	}
	S, B := cmp.Or(opt.Simulations, DefaultSARChecks), cmp.Or(opt.Surrogates, DefaultSARCheckSurrogates)
	if S < 1 || B < 1 {
		return nil, errors.New("compare: the SAR check needs at least one simulation and one surrogate")
	}
	p := make([]float64, S)
	blocks := (S + SARBlock - 1) / SARBlock
	shape := func(b int) (int, int) { return 0, min((b+1)*SARBlock, S) - b*SARBlock }
	if err := opt.Shard.Stage(opt.Purpose, "SAR check", blocks, shape); err != nil {
		return nil, err
	}
	var done atomic.Int64
	var failed firstError
	parallel.ForBlocks(blocks, opt.Workers, func() func(int) {
		test, terr := newTest()
		w := newSARWorker(m, basis, test)
		var rng shuffle.Stream
		return func(b int) {
			lo, hi := b*SARBlock, min((b+1)*SARBlock, S)
			if replayed(opt.Shard, opt.Purpose, b, p[lo:hi], &failed) || !opt.Shard.Draws(b) {
				return
			}
			fail := func(err error) {
				failed.set(b, err)
				opt.Shard.Record(opt.Purpose, b, shuffle.Tally{Error: err.Error()})
			}
			if terr != nil {
				fail(terr)
				return
			}
			rng.Reset(opt.Seed, opt.Purpose, b)
			for d := lo; d < hi; d++ {
				v, err := w.test(&rng, shuffle.SurrogatePlan{Scheme: SpectralScheme, Draws: B, Seed: opt.Seed,
					Purpose: innerPurpose(opt.Purpose, d), Workers: 1, Alternative: opt.Alternative})
				if err != nil {
					fail(err)
					return
				}
				p[d] = v
			}
			opt.Shard.Record(opt.Purpose, b, shuffle.Tally{Values: slices.Clone(p[lo:hi])})
			if opt.Progress != nil {
				opt.Progress(int(done.Add(int64(hi-lo))), S)
			}
		}
	})
	if failed.err != nil {
		return nil, failed.err
	}
	return p, nil
}

// sarWorker is one goroutine's working space for SARNullPValues.
type sarWorker struct {
	m     *sar.Model
	basis *surrogate.Basis
	t     nullTest
	sim   *sar.Scratch
	sur   *surrogate.Scratch
	y     []float64
	eval  shuffle.OutcomeEvaluator
	o     *surrogate.Outcome
	draw  shuffle.OutcomeDraw
}

func newSARWorker(m *sar.Model, basis *surrogate.Basis, t nullTest) *sarWorker {
	w := &sarWorker{m: m, basis: basis, t: t, sim: m.NewScratch(), sur: basis.NewScratch(), y: make([]float64, basis.Len())}
	if t != nil {
		w.eval = t.onSurrogates()
	}
	w.draw = func(rng *shuffle.Stream, out []float64) { w.o.Draw(rng, out, w.sur) }
	return w
}

// test simulates one outcome from rng and returns its surrogate test's
// p-value under plan p.
func (w *sarWorker) test(rng *shuffle.Stream, p shuffle.SurrogatePlan) (float64, error) {
	if err := w.m.Simulate(rng, w.y, w.sim); err != nil {
		return 0, fmt.Errorf("compare: SAR check: %w", err)
	}
	target, err := w.t.load(w.y)
	if err != nil {
		return 0, fmt.Errorf("compare: SAR check: %w", err)
	}
	observed := w.t.observed()
	p.Scale = w.t.scale()
	o, err := w.basis.Prepare(target)
	if err != nil {
		return 0, fmt.Errorf("compare: SAR check: %w", err)
	}
	w.o = o
	// One worker: the draw and the evaluator are this goroutine's own.
	res, err := shuffle.RunSurrogates(p, observed, func() shuffle.OutcomeDraw { return w.draw },
		func() shuffle.OutcomeEvaluator { return w.eval }, len(w.y))
	if err != nil {
		return 0, fmt.Errorf("compare: SAR check: %w", err)
	}
	return res.PValue, nil
}

// SARRate is the false-positive rate of the surrogate test over simulated
// nulls' p-values: the share at or below alpha, with its 95%
// Clopper–Pearson interval. Surrogates is the count of each test.
func SARRate(p []float64, alpha float64, surrogates int) FalsePositiveRate {
	r := FalsePositiveRate{Scheme: SpectralScheme, Alpha: alpha, Surrogates: len(p), Permutations: surrogates}
	for _, v := range p {
		if v <= alpha*(1+1e-12) {
			r.Rejected++
		}
	}
	r.Rate = float64(r.Rejected) / float64(len(p))
	r.Interval[0], r.Interval[1] = shuffle.ClopperPearson(r.Rejected, len(p), 0.95)
	return r
}

// Calibrate calibrates the observed surrogate p-value to the simulated
// nulls' p-values p (see Calibration). This is the adjusted p-value of the
// double bootstrap, Pr*(P* ≤ p) (Davison & Hinkley 1997, Bootstrap Methods
// and their Application, §4.5; Beran 1988, J. Am. Stat. Assoc.
// 83:687–697), with the simulated nulls in place of the resamples and
// counted as a Monte Carlo p-value, (1 + count) / (1 + S), so that it is
// never 0 and is itself a valid p-value when the observed outcome is
// exchangeable with the simulated ones.
func Calibrate(observed float64, p []float64, alpha float64) Calibration {
	tol := 1e-12
	c := Calibration{Alpha: alpha}
	below := 0
	for _, v := range p {
		if v <= observed*(1+tol) {
			below++
		}
	}
	c.PValue = float64(1+below) / float64(1+len(p))
	sorted := slices.Sorted(slices.Values(p))
	for j := 0; j < len(sorted); {
		e := j
		for e < len(sorted) && sorted[e] <= sorted[j]*(1+tol) {
			e++
		}
		if float64(e) > alpha*float64(len(sorted))*(1+tol) {
			break
		}
		c.Level, j = sorted[j], e
	}
	return c
}

// sarCheck fits the SAR model to target (the outcome, or with covariates
// its residuals from them) on g (the restricted graph of
// the surrogates' basis), measures the spectral row's false-positive rate
// on outcomes simulated from it, and calibrates the row's p-value. Weights
// the model cannot take (asymmetric ones), an outcome it cannot fit and
// simulations that fail skip the check with a warning, not an error.
func (c *comparison) sarCheck(t *tester, g *weights.Graph, basis *surrogate.Basis, target []float64, res *Result) error {
	row := findRow(res, SpectralScheme)
	if row < 0 {
		return nil
	}
	opt := c.opt
	skip := func(err error) error {
		res.SARCheck = &SARCheckInfo{Skipped: err.Error()}
		res.Warnings = append(res.Warnings, fmt.Sprintf("The spectral surrogates' false-positive rate was not measured: the SAR check could not run (%v).", err))
		return nil
	}
	w, err := sar.Prepare(g, sar.Options{Seed: opt.Seed, Workers: opt.Workers})
	if err != nil {
		return skip(err)
	}
	m, err := w.Fit(target)
	if err != nil {
		return skip(err)
	}
	alpha := cmp.Or(opt.Alpha, 0.05)
	B := cmp.Or(opt.SARCheckSurrogates, DefaultSARCheckSurrogates)
	var cs *CheckShufflesError
	if err := checkShuffles(B, alpha, t.testAlt()); errors.As(err, &cs) {
		B = cs.Need
	}
	alt := t.testAlt()
	if c.rates != nil && t.counts != nil {
		alt = c.rates.scoreAlt(t.alt)
	}
	p, err := sarNullPValues(m, basis, t.spectralNull(c), SAROptions{Simulations: opt.SARChecks, Surrogates: B,
		Alternative: alt, Seed: opt.Seed, Purpose: streamSARCheck, Workers: opt.Workers, Progress: opt.progress("SAR check"), Shard: opt.Shard})
	var se *shuffle.ShardError
	if errors.As(err, &se) {
		return err // parts that do not fit this run: no warning, an error
	}
	if err != nil {
		// A simulation that does not converge (ρ at the edge of its
		// range) says the model does not suit these data: skip, as above.
		return skip(err)
	}
	rate := SARRate(p, alpha, B)
	cal := Calibrate(res.Tests[row].PValue, p, alpha)
	res.Tests[row].FalsePositives, res.Tests[row].Calibrated = &rate, &cal
	res.SARCheck = &SARCheckInfo{Rho: m.Rho, RhoSE: m.RhoSE, AtBound: m.AtBound, LogDet: w.Method().String(),
		Simulations: len(p), Surrogates: B}
	return nil
}

// replayed copies block b's recorded p-values into p (or its recorded
// error into failed) when s replays parts, and reports whether it did.
func replayed(s *shuffle.Shard, purpose uint64, b int, p []float64, failed *firstError) bool {
	if !s.Replaying() {
		return false
	}
	t := s.Recorded(purpose, b)
	if t.Error != "" {
		failed.set(b, errors.New(t.Error))
		return true
	}
	copy(p, t.Values)
	return true
}
