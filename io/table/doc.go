// Package table reads a table of delimited text (CSV) and joins it onto a
// layer by key, so that attributes kept in a spreadsheet — rates, counts,
// policy flags per county — can be tested on the polygons of another file.
//
// Sources: RFC 4180 (Common Format and MIME Type for Comma-Separated Values
// (CSV) Files, 2005) for records, quoting and line breaks inside quotes,
// read through encoding/csv; and what spreadsheets write beyond it: a UTF-8
// byte-order mark, semicolons or tabs as delimiters, CRLF or LF line ends.
//
// Reading, decided behaviours:
//
//   - The delimiter is sniffed from the header line (outside quotes): of
//     comma, semicolon and tab, the most frequent that splits the header
//     into at least two fields and the first five data rows into as many;
//     ties go to comma, then semicolon. A header without any of them is an
//     error: a table needs a key column and at least one more.
//   - Header names are trimmed; an empty or repeated name is an error. A
//     row with another number of fields than the header is an error naming
//     its line (1-based, as an editor numbers lines, counting the lines
//     inside quoted fields) and both counts. Blank lines, and rows whose
//     fields are all empty (spreadsheets write them after the data), are
//     skipped, the latter with one warning.
//   - Values go through layer.Builder, the rules every reader shares: empty
//     values and NA, N/A, NaN, null are missing; a column of numbers is
//     Number; a numeric code with a leading zero ("01001") makes the column
//     Text.
//   - A column whose present values are all whole numbers or digits,digits,
//     one at least with the comma ("12,5"), is an error naming the first
//     such value: numbers must be written with a decimal point. A comma file
//     can only hold such values quoted; the rule is the same.
//   - Text must be UTF-8: another encoding is an error naming the line of
//     the first byte that is not, with the hint to save the file as UTF-8.
//     An empty file, or one with a header but no rows, is an error.
//
// Join, decided behaviours:
//
//   - The layer's key is the column JoinOptions.LayerKey, or the areas' ids
//     when LayerKey is "" or names the column the ids came from. The
//     table's key is the column TableKey, by default the one named as
//     LayerKey, or the table's first column when LayerKey is "". A key
//     column that does not exist is an error listing the columns there are
//     (the first 10).
//   - Keys are compared as text (Column.Label: numbers in shortest form),
//     spaces trimmed. A key repeated in the table, or a row without a key,
//     is an error naming the lines. Several areas may share a key (a table
//     of states joined onto counties by state code): each gets the row.
//   - Leading zeros: spreadsheets save codes such as "01001" as the number
//     1001. When the layer's keys made of digits all have one width (a
//     FIPS code of 2 or 5 digits), a table key of digits that is shorter is
//     also entered padded with zeros to that width, unless another row has
//     the padded key itself; the other way round, when the table's keys of
//     digits share a width, a shorter layer key of digits is looked up
//     padded to it. Keys with any other character are never padded. The
//     areas matched so are counted (JoinReport.Padded) in one warning.
//   - A join that matches no area is an error showing a few keys of each
//     side. Otherwise areas without a row get missing values in every
//     joined column (the statistics leave them out as they leave out any
//     missing value), and the report counts them and the rows without an
//     area, naming the first five of each; both are warnings too.
//   - Every table column but the key is added to the layer, keeping the
//     kind it has in the whole table. The key column is not added: on every
//     matched area it repeats the layer's key. A table column with the name
//     of a layer column replaces it, in place, with one warning naming the
//     columns; one with the name of the layer's key column is left out, with
//     a warning, so that the key stays.
//   - Join returns a new layer sharing the input's ids, geometry and
//     untouched columns; the input layer is not changed.
//
// The package never prints; warnings are returned to the caller, one line
// each starting with the source, and every error is an *Error naming the
// source, the line and the column where known.
//
// # Where to start
//
// Read (read.go) checks the text, sniffs the delimiter and hands the rows
// to parser.run, which builds the columns; comma.go watches for decimal
// commas. Join (join.go) collects the keys of both sides (keysOfLayer,
// indexRows, with the zero padding), matches them and picks the joined
// columns.
package table
