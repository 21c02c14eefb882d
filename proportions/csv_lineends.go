package proportions

import (
	"bufio"
	"bytes"
	"io"
)

// utf8BOM is the byte-order mark some spreadsheet programs write at the
// start of a UTF-8 file.
var utf8BOM = []byte("\xef\xbb\xbf")

// lineEnds feeds encoding/csv, which ends records only at LF (taking CRLF
// as LF): it skips a leading byte-order mark, which csv would read as part
// of the first field (so a quoted first header failed with `bare "`), and
// turns a CR that is not followed by LF into LF, so that files with CR line
// ends (classic Mac OS and some exports) are read row by row instead of as
// one long header. CRLF becomes LF, as csv does itself; inside a quoted
// field a lone CR becomes LF as well, the same change csv makes to CRLF
// there.
type lineEnds struct {
	r *bufio.Reader
	// cr is set when the last byte passed on was a CR (written as LF): an
	// LF right after it is dropped.
	cr bool
}

// headerPeek is how far ahead the delimiter detection looks for the end of
// the header line; a longer header is judged on its first 64 KiB.
const headerPeek = 64 << 10

func newLineEnds(r io.Reader) *lineEnds {
	br := bufio.NewReaderSize(r, headerPeek)
	if b, err := br.Peek(len(utf8BOM)); err == nil && bytes.Equal(b, utf8BOM) {
		_, _ = br.Discard(len(utf8BOM))
	}
	return &lineEnds{r: br}
}

// Read never returns 0 bytes with a nil error: a chunk that was only the
// LF of a CRLF is followed by the next read.
func (l *lineEnds) Read(p []byte) (int, error) {
	for {
		n, err := l.r.Read(p)
		out := 0
		for _, c := range p[:n] {
			if c == '\n' && l.cr {
				l.cr = false
				continue
			}
			l.cr = c == '\r'
			if c == '\r' {
				c = '\n'
			}
			p[out] = c
			out++
		}
		if out > 0 || err != nil || n == 0 {
			return out, err
		}
	}
}

// peekLine returns the first line still to be read (the header), without
// consuming it; at most headerPeek bytes.
func (l *lineEnds) peekLine() []byte {
	b, _ := l.r.Peek(headerPeek)
	if i := bytes.IndexAny(b, "\r\n"); i >= 0 {
		b = b[:i]
	}
	return b
}
