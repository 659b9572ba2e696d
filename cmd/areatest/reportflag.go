package main

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io"
	"os"
	"path/filepath"
	"strings"
	"sync"

	"github.com/areatest/areatest/io/figure"
	"github.com/areatest/areatest/io/report"
)

// checkReport checks --report and asks for its file: an HTML page, so a
// name ending in .html or .htm.
func (c *sharedFlags) checkReport() error {
	switch ext := strings.ToLower(filepath.Ext(c.report)); {
	case c.report == "":
		return nil
	case c.report == "-":
		return usagef("--report writes a file, not standard output: give a name ending in .html")
	case ext != ".html" && ext != ".htm":
		return usagef("--report writes an HTML page: give a name ending in .html, not %q", ext)
	}
	c.wantOutput("--report", c.report)
	return nil
}

// stdinDigest hashes what the layer's reader takes from standard input.
type stdinDigest struct {
	h hash.Hash
	n int64
}

func (d *stdinDigest) Write(p []byte) (int, error) {
	d.n += int64(len(p))
	return d.h.Write(p)
}

// digestStdin passes stdin on through a hash when --report asks for the
// digest of a layer read from standard input.
func (c *sharedFlags) digestStdin(stdin io.Reader) (io.Reader, *stdinDigest) {
	if c.report == "" || c.input != "-" {
		return stdin, nil
	}
	d := &stdinDigest{h: sha256.New()}
	return io.TeeReader(stdin, d), d
}

// digestInputs records the SHA-256 of each file read (the layer, the
// table, the edge list), for the page of --report; fromStdin holds the
// layer's when it came from standard input.
func (c *sharedFlags) digestInputs(fromStdin *stdinDigest) error {
	if c.report == "" {
		return nil
	}
	for _, in := range c.inputFiles() {
		switch {
		case in.path == "-" && fromStdin != nil && fromStdin.n > 0:
			c.digests = append(c.digests, report.InputFile{Role: in.role, Name: "standard input", SHA256: hex.EncodeToString(fromStdin.h.Sum(nil))})
		case in.path == "-":
			c.digests = append(c.digests, report.InputFile{Role: in.role, Name: "standard input"})
		default:
			sum, err := fileDigest(in.path)
			if err != nil {
				return err
			}
			c.digests = append(c.digests, report.InputFile{Role: in.role, Name: in.path, SHA256: sum})
		}
	}
	return nil
}

// inputFile is a file the run reads, and its role.
type inputFile struct{ role, path string }

// inputFiles are the files the run reads: the layer (with the companions
// of a shapefile given by its .shp: .shx, .dbf, .prj, .cpg, those that
// are there), the table and the edge list.
func (c *sharedFlags) inputFiles() []inputFile {
	var out []inputFile
	for _, in := range []inputFile{{"layer", c.input}, {"table", c.table}, {"weights", c.weights.file}} {
		if in.path == "" {
			continue
		}
		out = append(out, in)
		ext := filepath.Ext(in.path)
		if in.role != "layer" || !strings.EqualFold(ext, ".shp") {
			continue
		}
		stem := strings.TrimSuffix(in.path, ext)
		for _, side := range []string{".shx", ".dbf", ".prj", ".cpg"} {
			for _, p := range []string{stem + side, stem + strings.ToUpper(side)} {
				if _, err := os.Stat(p); err == nil {
					out = append(out, inputFile{"layer " + side[1:], p})
					break
				}
			}
		}
	}
	return out
}

// fileDigest is the hex SHA-256 of the file at path.
func fileDigest(path string) (string, error) {
	f, err := os.Open(path)
	if err != nil {
		return "", fmt.Errorf("%s: %w", path, err)
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", fmt.Errorf("%s: %w", path, err)
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// pagePicture is a picture for the page of --report, drawn only when the
// page is written.
type pagePicture struct {
	title, caption string
	draw           func(io.Writer, figure.Format) error
}

// page renders the page of --report for result (see report.HTMLDoc),
// with the pictures and, for a local result, the top strongest areas.
func (c *sharedFlags) page(result any, top int, pics ...pagePicture) func(io.Writer) error {
	return func(w io.Writer) error {
		doc := report.HTMLDoc{Result: result, Inputs: c.digests, Top: top, Pictures: make([]report.Picture, len(pics))}
		// The pictures are drawn side by side (a large layer's maps and
		// scatter take seconds each), each into its own place.
		errs := make([]error, len(pics))
		var wg sync.WaitGroup
		for i, p := range pics {
			wg.Go(func() { doc.Pictures[i], errs[i] = report.DrawPicture(p.title, p.caption, p.draw) })
		}
		wg.Wait()
		if err := errors.Join(errs...); err != nil {
			return err
		}
		return report.HTML(w, doc)
	}
}
