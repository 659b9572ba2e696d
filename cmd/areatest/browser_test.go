package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"image"
	"image/png"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/chromedp/cdproto/log"
	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/cdproto/runtime"
	"github.com/chromedp/chromedp"
)

// The report pages are opened in a real browser, Debian's Chromium driven
// headless through the DevTools protocol: each loads with no console
// error, no exception and no request but for the file itself, shows its
// text and pictures, and a layer with a hostile id and column name shows
// them as text and runs nothing.

const chromiumPath = "/usr/bin/chromium"

// repoRoot is the repository root, found before any test changes the
// working directory; the screenshot for the README goes there.
var repoRoot = func() string {
	wd, err := os.Getwd()
	if err != nil {
		panic(err)
	}
	return filepath.Join(wd, "..", "..")
}()

// browser starts Chromium for the test, or fails saying how to get it
// (skips, loudly, with AREATEST_NO_BROWSER=1).
func browser(t *testing.T) context.Context {
	t.Helper()
	if _, err := os.Stat(chromiumPath); err != nil {
		if os.Getenv("AREATEST_NO_BROWSER") == "1" {
			msg := "SKIPPING THE BROWSER TESTS: " + chromiumPath + " is missing and AREATEST_NO_BROWSER=1 is set; the report pages are not checked in a browser"
			fmt.Fprintln(os.Stderr, "areatest test: "+msg)
			t.Skip(msg)
		}
		t.Fatalf("%s is missing: the report pages are tested in Chromium; install it (apt-get install -y chromium), or set AREATEST_NO_BROWSER=1 to skip these tests", chromiumPath)
	}
	alloc, cancelAlloc := chromedp.NewExecAllocator(context.Background(),
		chromedp.ExecPath(chromiumPath), chromedp.Headless, chromedp.NoSandbox, chromedp.DisableGPU, chromedp.NoFirstRun,
		chromedp.Flag("disable-quic", true), chromedp.Flag("disable-background-networking", true),
		chromedp.Flag("disable-component-update", true), chromedp.Flag("disable-sync", true),
		chromedp.Flag("disable-dev-shm-usage", true), chromedp.UserDataDir(t.TempDir()), chromedp.WindowSize(1000, 1300))
	ctx, cancel := chromedp.NewContext(alloc)
	t.Cleanup(func() { cancel(); cancelAlloc() })
	if err := chromedp.Do(ctx); err != nil { // starts the browser
		t.Fatalf("starting %s: %v", chromiumPath, err)
	}
	return ctx
}

// visit is what the browser saw of one page.
type visit struct {
	mu       sync.Mutex
	requests []string
	problems []string // console errors, exceptions, dialogs
	shot     image.Image
}

func (v *visit) note(list *[]string, s string) {
	v.mu.Lock()
	defer v.mu.Unlock()
	*list = append(*list, s)
}

// listen records the page's requests, console errors, exceptions and
// dialogs.
func (v *visit) listen(ev any) {
	switch e := ev.(type) {
	case *network.EventRequestWillBeSent:
		v.note(&v.requests, e.Request.URL)
	case *runtime.EventConsoleAPICalled:
		if e.Type == "error" || e.Type == "assert" || e.Type == "warning" {
			v.note(&v.problems, fmt.Sprintf("console %s: %d arguments", e.Type, len(e.Args)))
		}
	case *runtime.EventExceptionThrown:
		v.note(&v.problems, "exception: "+e.ExceptionDetails.Text)
	case *log.EventEntryAdded:
		if e.Entry.Level == log.EntryLevelError || e.Entry.Level == log.EntryLevelWarning {
			v.note(&v.problems, fmt.Sprintf("log %s (%s): %s", e.Entry.Level, e.Entry.Source, e.Entry.Text))
		}
	case *page.EventJavascriptDialogOpening:
		v.note(&v.problems, fmt.Sprintf("a %s dialog opened: %q", e.Type, e.Message))
	}
}

// open loads the page at path in a new tab, lets it settle, runs check and
// takes a screenshot of the whole page.
func open(t *testing.T, ctx context.Context, path string, check func(ctx context.Context)) *visit {
	t.Helper()
	v := &visit{}
	tab, cancel := chromedp.NewContext(ctx, chromedp.WithListener(v.listen))
	defer cancel()
	abs, err := filepath.Abs(path)
	if err != nil {
		t.Fatal(err)
	}
	tab, stop := context.WithTimeout(tab, 60*time.Second)
	defer stop()
	if err := chromedp.Do(tab, chromedp.Navigate("file://"+abs), chromedp.Sleep(300*time.Millisecond)); err != nil {
		t.Fatalf("opening %s: %v", path, err)
	}
	check(tab)
	shot, err := chromedp.Run(tab, chromedp.FullScreenshot(100))
	if err != nil {
		t.Fatal(err)
	}
	if v.shot, err = png.Decode(bytes.NewReader(shot)); err != nil {
		t.Fatal(err)
	}
	if len(v.requests) != 1 || v.requests[0] != "file://"+abs {
		t.Errorf("requests: %q, want only the file itself", v.requests)
	}
	for _, p := range v.problems {
		t.Errorf("%s: %s", filepath.Base(path), p)
	}
	return v
}

// eval runs a JavaScript expression in the tab (the page itself has none).
func eval[T any](t *testing.T, ctx context.Context, expr string) T {
	t.Helper()
	v, err := chromedp.Run(ctx, chromedp.Evaluate[T](expr))
	if err != nil {
		t.Fatalf("%s: %v", expr, err)
	}
	return v
}

// colours counts the distinct colours of img within r, and the share of
// its pixels that are not the page's white.
func colours(img image.Image, r image.Rectangle) (distinct int, inked float64) {
	seen := map[uint32]bool{}
	r = r.Intersect(img.Bounds())
	n, ink := 0, 0
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			cr, cg, cb, _ := img.At(x, y).RGBA()
			c := cr>>8<<16 | cg>>8<<8 | cb>>8
			seen[c] = true
			n++
			if c != 0xffffff {
				ink++
			}
		}
	}
	if n == 0 {
		return 0, 0
	}
	return len(seen), float64(ink) / float64(n)
}

// The report of the sample region, of compare and of local, in Chromium.
func TestReportInBrowser(t *testing.T) {
	ctx := browser(t)
	sampleDir(t)
	for _, args := range [][]string{
		append([]string{"compare", "-i", "region.geojson", "-y", "rate", "-g", "policy", "--report", "compare.html"}, smallCompare...),
		{"local", "-i", "region.geojson", "--variable", "rate", "-n", "999", "--report", "local.html"},
	} {
		if r := runIn("", args...); r.code != 0 {
			t.Fatalf("%s: exit %d: %s", args[0], r.code, r.stderr)
		}
	}
	t.Run("compare", func(t *testing.T) {
		v := open(t, ctx, "compare.html", func(tab context.Context) {
			read := eval[string](t, tab, `document.querySelector(".read p").innerText`)
			if !strings.HasPrefix(read, "Read: spectral surrogates, p = ") {
				t.Errorf("recommendation %q", read)
			}
			if n := eval[int](t, tab, `document.querySelectorAll("table caption").length`); n < 4 {
				t.Errorf("%d tables with a caption, want 4 or more", n)
			}
		})
		if n, _ := colours(v.shot, v.shot.Bounds()); n < 8 {
			t.Errorf("the screenshot has %d colours: blank", n)
		}
		if os.Getenv("AREATEST_SCREENSHOT") == "1" {
			var b bytes.Buffer
			if err := png.Encode(&b, v.shot); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(filepath.Join(repoRoot, "README-report.png"), b.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
		}
	})
	t.Run("local", func(t *testing.T) {
		var maps []image.Rectangle
		v := open(t, ctx, "local.html", func(tab context.Context) {
			if s := eval[string](t, tab, `document.body.innerText`); !strings.Contains(s, "Where does rate cluster?") || !strings.Contains(s, "high-high") {
				t.Error("the page's text lacks its title or the categories")
			}
			printsOnA4(t, tab)
			boxes := eval[[][4]float64](t, tab, `[...document.querySelectorAll("figure svg")].map(e => { const r = e.getBoundingClientRect(); return [r.left + scrollX, r.top + scrollY, r.width, r.height] })`)
			for _, b := range boxes {
				maps = append(maps, image.Rect(int(b[0]), int(b[1]), int(b[0]+b[2]), int(b[1]+b[3])))
			}
		})
		if len(maps) != 3 {
			t.Fatalf("%d pictures shown, want 3", len(maps))
		}
		// The two maps are mostly areas; the scatter mostly white space.
		for i, r := range maps {
			n, inked := colours(v.shot, r)
			if least := []float64{0.3, 0.3, 0.02}[i]; n < 6 || inked < least || r.Dx() < 300 {
				t.Errorf("picture %d (%v): %d colours, %.0f%% not white", i+1, r, n, 100*inked)
			}
		}

	})
}

// printsOnA4 prints the page as the browser's print dialog would, with
// the page size the stylesheet asks for: A4 sheets, a handful of them.
func printsOnA4(t *testing.T, tab context.Context) {
	t.Helper()
	pdf, err := chromedp.Run(tab, chromedp.PrintToPDF(chromedp.PDFPreferCSSPageSize()))
	if err != nil {
		t.Fatal(err)
	}
	boxes := regexp.MustCompile(`/MediaBox \[0 0 ([0-9.]+) ([0-9.]+)\]`).FindAllSubmatch(pdf, -1)
	if len(boxes) < 2 || len(boxes) > 12 {
		t.Errorf("printed on %d pages, want 2 to 12", len(boxes))
	}
	for _, b := range boxes {
		// A4 is 210 × 297 mm: 595.3 × 841.9 points.
		w, _ := strconv.ParseFloat(string(b[1]), 64)
		h, _ := strconv.ParseFloat(string(b[2]), 64)
		if math.Abs(w-595.3) > 2 || math.Abs(h-841.9) > 2 {
			t.Errorf("a printed page is %g × %g points, not A4", w, h)
			break
		}
	}
}

// hostileLayer is a 4×4 grid whose first area's id and whose outcome's
// name would run script if a page let them through as markup.
func hostileLayer(t *testing.T, id, column string) []byte {
	t.Helper()
	var feats []map[string]any
	for i := range 16 {
		x, y := float64(i%4), float64(i/4)
		fid := fmt.Sprintf("A%02d", i)
		if i == 0 {
			fid = id
		}
		feats = append(feats, map[string]any{"type": "Feature", "id": fid,
			"properties": map[string]any{column: float64((i*7)%11 + i/4), "g": []string{"a", "b"}[i%2]},
			"geometry":   map[string]any{"type": "Polygon", "coordinates": [][][2]float64{{{x, y}, {x + 1, y}, {x + 1, y + 1}, {x, y + 1}, {x, y}}}}})
	}
	b, err := json.Marshal(map[string]any{"type": "FeatureCollection", "features": feats})
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// A hostile id and column name are shown as text and run nothing.
func TestReportInBrowserHostileNames(t *testing.T) {
	const id, column = `<img src=x onerror=alert(1)>`, `</script><script>alert(2)</script>`
	ctx := browser(t)
	t.Chdir(t.TempDir())
	if err := os.WriteFile("hostile.geojson", hostileLayer(t, id, column), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		args []string
	}{
		{"local", []string{"local", "-i", "hostile.geojson", "--variable", column, "-n", "99"}},
		{"compare", []string{"compare", "-i", "hostile.geojson", "-y", column, "-g", "g", "-n", "99", "--surrogates", "19", "--false-positive-check", "0"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			if r := runIn("", append(c.args, "--report", c.name+".html")...); r.code != 0 {
				t.Fatalf("exit %d: %s", r.code, r.stderr)
			}
			open(t, ctx, c.name+".html", func(tab context.Context) {
				if n := eval[int](t, tab, `document.querySelectorAll("script, img[src='x'], [onerror]").length`); n != 0 {
					t.Errorf("%d script, img or onerror elements in the page", n)
				}
				if s := eval[string](t, tab, `document.body.innerText`); !strings.Contains(s, column) {
					t.Error("the column name is not shown as text")
				}
				if c.name == "local" && !eval[bool](t, tab, `[...document.querySelectorAll("svg title")].some(e => e.textContent.startsWith(`+jsString(id)+`))`) {
					t.Error("the map's tooltip does not show the id as text")
				}
			})
		})
	}
}

// jsString quotes s for a JavaScript expression.
func jsString(s string) string {
	b, _ := json.Marshal(s)
	return string(b)
}
