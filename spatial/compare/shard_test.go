package compare

import (
	"reflect"
	"testing"

	"github.com/areatest/areatest/spatial/shuffle"
)

// A comparison run in parts and replayed is the whole run, field for
// field: the shuffles, the surrogates, the false-positive and SAR checks
// and the spatial check, with more parts than some stages have blocks;
// the parts' worker counts do not matter.
func TestShardedComparisonIsTheWholeRun(t *testing.T) {
	in := sarRunInput(t)
	opt := Options{Permutations: 2*shuffle.BlockSize + 99, Surrogates: 99, FalsePositives: 2*FPRBlock + 5, FalsePositiveShuffles: 39,
		SARChecks: 3*SARBlock + 1, Alpha: 0.05, Seed: 4, Workers: 2}
	whole, err := Run(in, opt)
	if err != nil {
		t.Fatal(err)
	}
	if whole.SARCheck == nil || whole.SARCheck.Skipped != "" {
		t.Fatalf("no SAR check: %+v", whole.SARCheck)
	}
	for _, parts := range []int{1, 2, 3, 7} {
		ledgers := make([]*shuffle.Ledger, parts)
		for k := 1; k <= parts; k++ {
			o := opt
			o.Workers = 1 + k%3
			if o.Shard, err = shuffle.NewPart(k, parts); err != nil {
				t.Fatal(err)
			}
			if _, err := Run(in, o); err != nil {
				t.Fatalf("part %d of %d: %v", k, parts, err)
			}
			ledgers[k-1] = o.Shard.Ledger()
		}
		all, err := shuffle.Combine(ledgers)
		if err != nil {
			t.Fatal(err)
		}
		o := opt
		o.Shard = shuffle.NewReplay(all)
		got, err := Run(in, o)
		if err != nil {
			t.Fatalf("replay of %d parts: %v", parts, err)
		}
		if !reflect.DeepEqual(got, whole) {
			t.Errorf("%d parts replayed:\n%+v\nwhole run:\n%+v", parts, got, whole)
		}
		// Parts of another count of surrogates do not fit this run.
		o.Surrogates = 2*shuffle.BlockSize + 1
		if _, err := Run(in, o); err == nil {
			t.Errorf("%d parts replayed into a run of other settings", parts)
		}
	}
}
