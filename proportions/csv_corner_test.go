package proportions

import (
	"errors"
	"strings"
	"testing"
	"testing/iotest"
)

// TestReadCSVLineEndsAndBOM reads the same five rows written with each
// line end, with and without a byte-order mark and quoted headers. The
// expected counts are from reading the rows by hand: coated 2 of 3
// germinated, bare 1 of 2.
func TestReadCSVLineEndsAndBOM(t *testing.T) {
	rows := []string{"plot,treatment,germinated", "1,coated,yes", "2,bare,no", "3,coated,no", "4,bare,yes", "5,coated,yes"}
	quoted := append([]string{`"plot","treatment","germinated"`}, rows[1:]...)
	want := Comparison{First: Group{"coated", 2, 3}, Second: Group{"bare", 1, 2}, Event: "germinated"}
	spec := CSVSpec{GroupColumn: "treatment", OutcomeColumn: "germinated", RecordSpec: RecordSpec{FirstGroup: "coated"}}
	for _, lines := range [][]string{rows, quoted} {
		for _, end := range []string{"\n", "\r\n", "\r"} {
			for _, bom := range []string{"", "\ufeff"} {
				for _, last := range []string{end, ""} {
					data := bom + strings.Join(lines, end) + last
					// One byte at a time too: a CRLF split across reads.
					for name, src := range map[string]interface{ Read([]byte) (int, error) }{
						"whole": strings.NewReader(data), "byte by byte": iotest.OneByteReader(strings.NewReader(data)),
					} {
						c, err := ReadCSV(src, spec)
						if err != nil {
							t.Errorf("%q (%s): %v", data, name, err)
							continue
						}
						if c != want {
							t.Errorf("%q (%s): got %+v, want %+v", data, name, c, want)
						}
					}
				}
			}
		}
	}
}

// TestReadCSVLineNumbersWithCR: with CR line ends, an error still names the
// line it is on (the fourth line, counting the header).
func TestReadCSVLineNumbersWithCR(t *testing.T) {
	_, err := ReadCSV(strings.NewReader("group,outcome\ra,1\rb,0\rb,perhaps\r"), CSVSpec{})
	if !errors.Is(err, ErrOutcomeValue) || !strings.Contains(err.Error(), "line 4") {
		t.Errorf("got %v, want an outcome error on line 4", err)
	}
}

// TestReadCSVDuplicateHeader: a header that names the group or outcome
// column twice cannot say which column holds the data; the error names
// the column and where it occurs.
func TestReadCSVDuplicateHeader(t *testing.T) {
	for _, c := range []struct{ data, col, where string }{
		{"group,outcome,group\na,1,b\nb,0,a\n", `"group"`, "columns 1 (\"group\"), 3 (\"group\")"},
		{"group,outcome,outcome\na,1,0\nb,0,1\n", `"outcome"`, "columns 2 (\"outcome\"), 3 (\"outcome\")"},
		{"Group,GROUP,outcome\na,b,1\nb,a,0\n", `"group"`, "columns 1 (\"Group\"), 2 (\"GROUP\")"},
	} {
		_, err := ReadCSV(strings.NewReader(c.data), CSVSpec{})
		if !errors.Is(err, ErrMalformedRow) {
			t.Errorf("%q: got %v, want ErrMalformedRow", c.data, err)
			continue
		}
		for _, want := range []string{c.col, c.where, "must occur once"} {
			if !strings.Contains(err.Error(), want) {
				t.Errorf("%q: message %q lacks %q", c.data, err, want)
			}
		}
	}
	// An exact match still wins over names that differ only in case, and
	// repeated columns that are not read stay allowed.
	c, err := ReadCSV(strings.NewReader("group,Group,outcome,note,note\na,x,1,,\nb,y,0,,\n"), CSVSpec{})
	if err != nil || c.First != (Group{"a", 1, 1}) {
		t.Errorf("exact match beside a case variant: %+v, %v", c, err)
	}
}
