// Package report renders results for people and programs: it lays out and
// formats what the result structs hold and computes nothing of its own.
// The reports it renders:
//
//   - CompareText: the report of `areatest compare` (a compare.Result).
//   - AutocorrText: the report of `areatest autocorr` (a clustering.Result).
//   - ScreenText and ScreenCSV: the ranked table of `areatest screen` (a
//     clustering.ScreenResult), for the terminal and as CSV.
//   - LocalText and LocalCSV: the summary and the per-area table of
//     `areatest local` (a local.Result); LocalColumns the result columns
//     added to a GeoJSON copy of the layer, LocalPictures its maps and
//     charts (drawn by io/figure).
//   - WeightsText: the summary of a neighbour graph for `areatest weights`
//     (a WeightsDocument).
//   - JSON: any of these results as one indented JSON document.
//   - HTML: any of these results as one self-contained page (an HTMLDoc:
//     the result, the files read with their SHA-256, and the pictures,
//     drawn by DrawPicture as SVG or, when heavy, PNG). The page is built
//     with html/template from html/*.tmpl and html/page.css, embedded; the
//     SVG is checked and rewritten by inlineSVG (svginline.go) before it
//     goes in unescaped. htmlview.go holds the page's model, html_*.go fill
//     it from each result with the text reports' own sentences.
//
// The JSON is the result structs' own: their field tags, in spatial/… and
// weights/ or, for WeightsDocument, here, decide its names and shape, so the text report and the JSON are two views of one
// struct. Wrap, PValue and Number (report.go) are the shared text helpers.
package report
