// Package partial reads and writes the partial-result documents of a run
// cut into shards for a batch scheduler, and checks that a set of them
// belongs together: one run's settings, seed, inputs and count of parts,
// every part once. The document holds what a merge needs to fold the
// parts into the whole run's result (the blocks' tallies, see
// shuffle.Shard) and what it needs to trust them (the SHA-256 of every
// input file and the release that wrote it).
package partial

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"

	"github.com/areatest/areatest/spatial/shuffle"
)

// Format is the version of the document's layout. A merge reads only its
// own format: a part of another layout is refused, not guessed at.
const Format = 1

// Document is one part's partial result.
type Document struct {
	Format int `json:"format"`
	// Version is the release of areatest that wrote the part; the merge
	// runs the deterministic stages again, so it must be the same.
	Version string `json:"areatest_version"`
	// Command is the command the part ran ("compare").
	Command string `json:"command"`
	// Settings are the command's flags that decide the result, one
	// "--name=value" each, sorted by name (output, format, workers and
	// shard left out): the merge runs the command with them again.
	Settings []string `json:"settings"`
	Seed     uint64   `json:"seed"`
	// Part is K of Parts N: the part owns block b of every random stage
	// when b mod N = K−1.
	Part  int `json:"part"`
	Parts int `json:"parts"`
	// Inputs are the files read, with their digests.
	Inputs []Input `json:"inputs"`
	// Stages hold the tallies of the part's blocks.
	Stages *shuffle.Ledger `json:"stages"`
}

// Input is a file a part read.
type Input struct {
	// Role is "layer", "table" or "weights"; Path the path as given.
	Role   string `json:"role"`
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
}

// Write writes d as indented JSON.
func Write(w io.Writer, d *Document) error {
	b, err := json.MarshalIndent(d, "", "  ")
	if err != nil {
		return fmt.Errorf("partial: %w", err)
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

// Read reads the document at path. A document of another Format is an
// error naming both formats.
func Read(path string) (*Document, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	var probe struct {
		Format *int `json:"format"`
	}
	if err := json.Unmarshal(b, &probe); err != nil || probe.Format == nil {
		return nil, fmt.Errorf("%s: not a partial result of areatest (written with --shard)", path)
	}
	if *probe.Format != Format {
		return nil, fmt.Errorf("%s: a partial result of format %d; this areatest reads format %d", path, *probe.Format, Format)
	}
	d := &Document{}
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	if err := dec.Decode(d); err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	if d.Stages == nil || d.Parts < 1 || d.Part < 1 || d.Part > d.Parts {
		return nil, fmt.Errorf("%s: part %d of %d, or no stages: not a whole partial result", path, d.Part, d.Parts)
	}
	return d, nil
}

// Check checks that docs (read from names) are the parts of one run of
// release version, every part once, and returns the ledger of the whole
// run. Each violation is an error naming the parts concerned.
func Check(docs []*Document, names []string, version string) (*shuffle.Ledger, error) {
	if len(docs) == 0 {
		return nil, fmt.Errorf("no part to merge")
	}
	first, name0 := docs[0], names[0]
	byPart := make([]int, first.Parts+1) // the doc of part K, +1; 0 none
	for i, d := range docs {
		if d.Version != version {
			return nil, fmt.Errorf("%s was written by areatest %s; this is areatest %s: merge with the release that ran the parts", names[i], d.Version, version)
		}
		if err := sameRun(first, d, name0, names[i]); err != nil {
			return nil, err
		}
		if j := byPart[d.Part]; j > 0 {
			return nil, fmt.Errorf("%s and %s are both part %d of %d", names[j-1], names[i], d.Part, d.Parts)
		}
		byPart[d.Part] = i + 1
	}
	var missing, given []string
	ledgers := make([]*shuffle.Ledger, first.Parts)
	for k := 1; k <= first.Parts; k++ {
		if byPart[k] == 0 {
			missing = append(missing, fmt.Sprint(k))
			continue
		}
		given = append(given, fmt.Sprint(k))
		ledgers[k-1] = docs[byPart[k]-1].Stages
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("part %s of %d missing (given: part %s)", strings.Join(missing, ", "), first.Parts, strings.Join(given, ", "))
	}
	all, err := shuffle.Combine(ledgers)
	if err != nil {
		return nil, fmt.Errorf("the parts do not fit together: %w", err)
	}
	return all, nil
}

// sameRun checks that b (file nb) is a part of the same run as a (na).
func sameRun(a, b *Document, na, nb string) error {
	differ := func(what string, x, y any) error {
		return fmt.Errorf("%s and %s are parts of different runs: %s %v and %v", na, nb, what, x, y)
	}
	switch {
	case a.Command != b.Command:
		return differ("command", a.Command, b.Command)
	case a.Seed != b.Seed:
		return differ("seed", a.Seed, b.Seed)
	case a.Parts != b.Parts:
		return differ("count of parts", a.Parts, b.Parts)
	}
	if !slices.Equal(a.Settings, b.Settings) {
		x, y := firstDifference(a.Settings, b.Settings)
		return differ("settings", x, y)
	}
	if len(a.Inputs) != len(b.Inputs) {
		return differ("count of input files", len(a.Inputs), len(b.Inputs))
	}
	for i, in := range a.Inputs {
		o := b.Inputs[i]
		if in.Role != o.Role || in.Path != o.Path {
			return differ(in.Role+" file", in.Path, o.Role+" file "+o.Path)
		}
		if in.SHA256 != o.SHA256 {
			return fmt.Errorf("%s and %s were computed from different contents of %s (SHA-256 %s and %s)", na, nb, in.Path, in.SHA256, o.SHA256)
		}
	}
	return nil
}

// firstDifference is the first setting in which a and b differ ("none"
// where one list ends).
func firstDifference(a, b []string) (string, string) {
	for i := range max(len(a), len(b)) {
		x, y := "none", "none"
		if i < len(a) {
			x = a[i]
		}
		if i < len(b) {
			y = b[i]
		}
		if x != y {
			return x, y
		}
	}
	return "", ""
}
