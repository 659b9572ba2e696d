package geojson

import "io"

// spaceChunk is the size of the reads that skip leading white space.
const spaceChunk = 64 << 10

// isSpace reports whether b is all JSON white space (RFC 8259: space, tab,
// line feed, carriage return).
func isSpace(b []byte) bool {
	for _, c := range b {
		if c != ' ' && c != '\t' && c != '\n' && c != '\r' {
			return false
		}
	}
	return true
}

// skipLeadingSpace reads r past the white space that starts it, in chunks
// of spaceChunk bytes, and returns the first bytes after it (at most a
// chunk), how many bytes of white space came before them (already bytes
// were read before the call) and the read error met: nil while more input
// may follow, io.EOF at its end. Memory stays at one chunk however long the
// run of white space.
func skipLeadingSpace(r io.Reader, already int) ([]byte, int, error) {
	buf := make([]byte, spaceChunk)
	skipped := already
	for {
		n, err := io.ReadFull(r, buf)
		k := 0
		for k < n && isSpace(buf[k:k+1]) {
			k++
		}
		skipped += k
		if k < n || err != nil {
			if err == io.ErrUnexpectedEOF && k < n {
				// The value starts in this last, short chunk: the caller
				// treats it as the whole rest of the input.
				return buf[k:n], skipped, io.EOF
			}
			return buf[k:n], skipped, err
		}
	}
}
