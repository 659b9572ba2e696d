package shapefile

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"path"
	"sort"
	"strings"
)

// Limits on what a zip may unpack to: a zip bomb (a small archive that
// inflates to gigabytes) must fail with a message, not exhaust memory. The
// cap is generous because dBASE tables, padded with spaces to their field
// widths, often deflate 30 to 60 times.
const (
	maxUnpacked    = 4 << 30  // bytes, whatever the zip's size
	minUnpackedCap = 64 << 20 // bytes any zip may unpack to
	unpackRatio    = 100      // times the zip's size, above minUnpackedCap
)

// unpackCap is how many bytes the members read from a zip of size bytes
// may hold in all.
func unpackCap(size int64) int64 {
	if size >= maxUnpacked/unpackRatio {
		return maxUnpacked
	}
	return max(minUnpackedCap, unpackRatio*size)
}

// readZip finds the shapefile in a zip and reads its files.
func readZip(r io.ReaderAt, size int64, source string, opt Options) (*fileSet, error) {
	zr, err := zip.NewReader(r, size)
	if err != nil {
		return nil, wrapf(err, source, "is not a readable zip archive")
	}
	var shps []*zip.File
	byStem := make(map[string][]*zip.File) // path without extension → members
	var names []string
	for _, f := range zr.File {
		if ignoredMember(f.Name) {
			continue
		}
		names = append(names, f.Name)
		ext := path.Ext(f.Name)
		stem := f.Name[:len(f.Name)-len(ext)]
		byStem[stem] = append(byStem[stem], f)
		if strings.EqualFold(ext, ".shp") {
			shps = append(shps, f)
		}
	}
	shp, err := pickLayer(shps, names, source, opt.Layer)
	if err != nil {
		return nil, err
	}
	stem := strings.TrimSuffix(shp.Name, path.Ext(shp.Name))
	fs := &fileSet{where: "in " + path.Base(strings.ReplaceAll(source, "\\", "/"))}
	budget := unpackCap(size)
	for _, s := range []struct {
		m   *member
		ext string
	}{{&fs.shp, ".shp"}, {&fs.shx, ".shx"}, {&fs.dbf, ".dbf"}, {&fs.prj, ".prj"}, {&fs.cpg, ".cpg"}} {
		s.m.name = source + ":" + stem + s.ext
		f := siblingMember(byStem[stem], s.ext)
		if f == nil {
			continue
		}
		if err := readMember(f, source, size, &budget, s.m); err != nil {
			return nil, err
		}
	}
	return fs, nil
}

// ignoredMember passes over folders and the resource forks the macOS
// archiver adds (__MACOSX/…, ._states.shp), which would otherwise look like
// a second shapefile.
func ignoredMember(name string) bool {
	return strings.HasSuffix(name, "/") || strings.HasPrefix(name, "__MACOSX/") || strings.HasPrefix(path.Base(name), "._")
}

// pickLayer chooses the .shp to read: the only one, or the one Options.Layer
// names by base name or by path without ".shp".
func pickLayer(shps []*zip.File, names []string, source, want string) (*zip.File, error) {
	if len(shps) == 0 {
		sort.Strings(names)
		if len(names) == 0 {
			return nil, errorf(source, 0, "is an empty zip; it holds no shapefile")
		}
		return nil, errorf(source, 0, "holds no shapefile (no .shp file); it holds %s", listNames(names, 8))
	}
	layers := layerNames(shps)
	if want == "" {
		if len(shps) == 1 {
			return shps[0], nil
		}
		e := errorf(source, 0, "holds several shapefiles: %s; name the one to read", listNames(layers, 20))
		e.Layers = layers
		return nil, e
	}
	var match []*zip.File
	for i, f := range shps {
		stem := strings.TrimSuffix(f.Name, path.Ext(f.Name))
		if layers[i] == want || stem == want || path.Base(stem) == want {
			match = append(match, f)
		}
	}
	switch len(match) {
	case 1:
		return match[0], nil
	case 0:
		e := errorf(source, 0, "holds no shapefile named %q; it holds %s", want, listNames(layers, 20))
		e.Layers = layers
		return nil, e
	}
	e := errorf(source, 0, "holds several shapefiles named %q; name one by its folder: %s", want, listNames(layers, 20))
	e.Layers = layers
	return nil, e
}

// layerNames names each .shp by its base name without the extension, or by
// its whole path without it when two folders hold the same base name.
func layerNames(shps []*zip.File) []string {
	count := make(map[string]int)
	for _, f := range shps {
		count[strings.TrimSuffix(path.Base(f.Name), path.Ext(f.Name))]++
	}
	names := make([]string, len(shps))
	for i, f := range shps {
		stem := strings.TrimSuffix(f.Name, path.Ext(f.Name))
		names[i] = path.Base(stem)
		if count[names[i]] > 1 {
			names[i] = stem
		}
	}
	return names
}

// siblingMember finds, among the members sharing a path without extension,
// the one with extension ext in any case (the lower case spelling first).
func siblingMember(files []*zip.File, ext string) *zip.File {
	var best *zip.File
	for _, f := range files {
		e := path.Ext(f.Name)
		if strings.EqualFold(e, ext) && (best == nil || e == ext) {
			best = f
		}
	}
	return best
}

// readMember reads one member into m, within what is left of the budget of
// unpacked bytes.
func readMember(f *zip.File, source string, size int64, budget *int64, m *member) error {
	bomb := func() error {
		return errorf(m.name, 0, "unpacks to more than %s in all (the limit for a zip of %s); the zip is damaged or hostile", byteSize(unpackCap(size)), byteSize(size))
	}
	if f.UncompressedSize64 > uint64(*budget) {
		return bomb()
	}
	rc, err := f.Open()
	if err != nil {
		return wrapf(err, m.name, "cannot be unpacked")
	}
	defer rc.Close()
	var buf bytes.Buffer
	if f.UncompressedSize64 < 1<<30 { // the size declared, at most what int holds everywhere
		buf.Grow(int(f.UncompressedSize64))
	}
	n, err := buf.ReadFrom(io.LimitReader(rc, *budget+1))
	if err != nil {
		return wrapf(err, m.name, "cannot be unpacked")
	}
	if n > *budget {
		return bomb()
	}
	*budget -= n
	m.data, m.ok = buf.Bytes(), true
	return nil
}

// byteSize writes a size in bytes, KiB, MiB or GiB.
func byteSize(n int64) string {
	switch {
	case n >= 1<<30:
		return fmt.Sprintf("%.1f GiB", float64(n)/(1<<30))
	case n >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(n)/(1<<20))
	case n >= 1<<10:
		return fmt.Sprintf("%.1f KiB", float64(n)/(1<<10))
	}
	return fmt.Sprintf("%d bytes", n)
}
