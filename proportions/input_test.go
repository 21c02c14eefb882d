package proportions

import (
	"errors"
	"strings"
	"testing"
)

func TestNewComparisonErrors(t *testing.T) {
	cases := []struct {
		name           string
		x1, n1, x2, n2 int64
		want           error
	}{
		{"negative events", -1, 10, 2, 10, ErrNegativeCount},
		{"negative trials", 1, -10, 2, 10, ErrNegativeCount},
		{"events above trials", 11, 10, 2, 10, ErrEventsExceedTrials},
		{"second events above trials", 1, 10, 12, 10, ErrEventsExceedTrials},
		{"no trials", 0, 0, 2, 10, ErrNoTrials},
		{"too large", 1, MaxTrials + 1, 2, 10, ErrTooLarge},
	}
	for _, c := range cases {
		_, err := NewComparison(c.x1, c.n1, c.x2, c.n2, Labels{})
		if !errors.Is(err, c.want) {
			t.Errorf("%s: got %v, want %v", c.name, err, c.want)
		}
	}
	// 2^31 and more per group is allowed (no int32 overflow anywhere).
	big := int64(1) << 33
	c, err := NewComparison(big/2, big, big/3, big, Labels{First: "a", Second: "b", Event: "hit"})
	if err != nil {
		t.Fatal(err)
	}
	if c.First.Trials != big || c.First.Label != "a" || c.Event != "hit" {
		t.Errorf("unexpected comparison %+v", c)
	}
}

func TestFromTableOrientation(t *testing.T) {
	// Rows are groups, columns event / no event.
	c, err := FromTable(Table{{56, 14}, {48, 32}}, Labels{})
	if err != nil {
		t.Fatal(err)
	}
	if got := c.Counts(); got != (Counts{X1: 56, N1: 70, X2: 48, N2: 80}) {
		t.Errorf("got %+v", got)
	}
	if c.First.Label != DefaultFirstLabel || c.Event != DefaultEventName {
		t.Errorf("defaults not applied: %+v", c)
	}
	if c.Table() != (Table{{56, 14}, {48, 32}}) {
		t.Errorf("Table round trip: %v", c.Table())
	}
	if _, err := FromTable(Table{{1, -1}, {2, 3}}, Labels{}); !errors.Is(err, ErrNegativeCount) {
		t.Errorf("negative cell: %v", err)
	}
	if _, err := FromTable(Table{{0, 0}, {2, 3}}, Labels{}); !errors.Is(err, ErrNoTrials) {
		t.Errorf("empty row: %v", err)
	}
}

func TestFromRecords(t *testing.T) {
	recs := []Record{{"bare", "no"}, {"coated", "yes"}, {"coated", " YES "}, {"bare", "yes"}, {"coated", "no"}}
	c, err := FromRecords(recs, RecordSpec{FirstGroup: "coated", EventName: "germinated"})
	if err != nil {
		t.Fatal(err)
	}
	want := Comparison{First: Group{"coated", 2, 3}, Second: Group{"bare", 1, 2}, Event: "germinated"}
	if c != want {
		t.Errorf("got %+v, want %+v", c, want)
	}
	// Without FirstGroup the first group met comes first.
	c, _ = FromRecords(recs, RecordSpec{})
	if c.First.Label != "bare" || c.Event != DefaultEventName {
		t.Errorf("default order: %+v", c)
	}
	errCases := []struct {
		name string
		recs []Record
		spec RecordSpec
		want error
	}{
		{"empty", nil, RecordSpec{}, ErrEmptyInput},
		{"one group", []Record{{"a", "1"}, {"a", "0"}}, RecordSpec{}, ErrGroupCount},
		{"three groups", []Record{{"a", "1"}, {"b", "0"}, {"c", "1"}}, RecordSpec{}, ErrGroupCount},
		{"unknown outcome", []Record{{"a", "1"}, {"b", "maybe"}}, RecordSpec{}, ErrOutcomeValue},
		{"unknown first group", []Record{{"a", "1"}, {"b", "0"}}, RecordSpec{FirstGroup: "z"}, ErrUnknownGroup},
		{"only event values", []Record{{"a", "1"}}, RecordSpec{EventValues: []string{"1"}}, ErrOutcomeValue},
		{"value in both lists", []Record{{"a", "1"}}, RecordSpec{EventValues: []string{"x"}, NonEventValues: []string{"X"}}, ErrOutcomeValue},
		{"empty group", []Record{{" ", "1"}}, RecordSpec{}, ErrMalformedRow},
	}
	for _, c := range errCases {
		if _, err := FromRecords(c.recs, c.spec); !errors.Is(err, c.want) {
			t.Errorf("%s: got %v, want %v", c.name, err, c.want)
		}
	}
}

func TestReadCSV(t *testing.T) {
	const data = "\ufeffplot,treatment,germinated\n1,coated,yes\n2,bare,no\n3,coated,no\n4,bare,yes\n5,coated,yes\n"
	c, err := ReadCSV(strings.NewReader(data), CSVSpec{GroupColumn: "treatment", OutcomeColumn: "germinated", RecordSpec: RecordSpec{FirstGroup: "coated"}})
	if err != nil {
		t.Fatal(err)
	}
	want := Comparison{First: Group{"coated", 2, 3}, Second: Group{"bare", 1, 2}, Event: "germinated"}
	if c != want {
		t.Errorf("got %+v, want %+v", c, want)
	}
	// Defaults: columns "group" and "outcome" (matched ignoring case), ';' separator.
	c, err = ReadCSV(strings.NewReader("Group;Outcome\nA;1\nB;0\nA;0\n"), CSVSpec{Comma: ';'})
	if err != nil {
		t.Fatal(err)
	}
	if c.First != (Group{"A", 1, 2}) || c.Event != "outcome" {
		t.Errorf("defaults: %+v", c)
	}
}

func TestReadCSVErrors(t *testing.T) {
	cases := []struct {
		name, data string
		want       error
		inMessage  string
	}{
		{"empty file", "", ErrEmptyInput, ""},
		{"header only", "group,outcome\n", ErrEmptyInput, ""},
		{"missing column", "group,result\na,1\n", ErrMissingColumn, "outcome"},
		{"ragged row", "group,outcome\na,1\nb,0,extra\n", ErrMalformedRow, "line 3"},
		{"bad quote", "group,outcome\na,1\n\"b,0\n", ErrMalformedRow, "line"},
		{"bad outcome", "group,outcome\na,1\nb,0\nb,perhaps\n", ErrOutcomeValue, "line 4"},
		{"three groups", "group,outcome\na,1\nb,0\nc,1\n", ErrGroupCount, `the data hold 3 groups, "a", "b", "c": keep only`},
		{"one group", "group,outcome\na,1\na,0\n", ErrGroupCount, `need exactly two groups; the data hold one group, "a":`},
		{"empty group", "group,outcome\na,1\n,0\n", ErrMalformedRow, "line 3"},
	}
	for _, c := range cases {
		_, err := ReadCSV(strings.NewReader(c.data), CSVSpec{})
		if !errors.Is(err, c.want) {
			t.Errorf("%s: got %v, want %v", c.name, err, c.want)
			continue
		}
		if !strings.Contains(err.Error(), c.inMessage) {
			t.Errorf("%s: message %q lacks %q", c.name, err, c.inMessage)
		}
	}
}

// FuzzReadCSV: the reader never panics, and whatever it accepts is a valid
// comparison whose counts add up to the rows read.
func FuzzReadCSV(f *testing.F) {
	f.Add("group,outcome\na,1\nb,0\n")
	f.Add("group,outcome\na,yes\nb,no\na,TRUE\n")
	f.Add("x,group,outcome\n1,a,1\n2,b,\"0\"\n")
	f.Add("group,outcome\n\"a\nb\",1\nc,0\n")
	f.Add("")
	f.Add("group\n")
	// Issue 20: CR line ends, a byte-order mark before a quoted header,
	// a repeated column.
	f.Add("\ufeff\"group\",\"outcome\"\ra,1\rb,0\r\na,0\r")
	f.Add("group,outcome,group\na,1,b\nb,0,a\n")
	f.Fuzz(func(t *testing.T, data string) {
		c, err := ReadCSV(strings.NewReader(data), CSVSpec{})
		if err != nil {
			if err.Error() == "" {
				t.Fatal("empty error message")
			}
			return
		}
		if err := c.Counts().Validate(); err != nil {
			t.Fatalf("accepted invalid comparison %+v: %v", c, err)
		}
		if c.First.Label == c.Second.Label {
			t.Fatalf("same label twice: %+v", c)
		}
	})
}

// TestGroupCountSaidOnce: the message says once that two groups are
// needed and counts in words a reader would write ("one group", not
// "1 groups").
func TestGroupCountSaidOnce(t *testing.T) {
	for _, data := range []string{"group,outcome\na,1\na,0\n", "group,outcome\na,1\nb,0\nc,1\n"} {
		_, err := ReadCSV(strings.NewReader(data), CSVSpec{})
		msg := err.Error()
		if strings.Count(msg, "two groups") != 1 || strings.Contains(msg, "1 groups") {
			t.Errorf("message %q", msg)
		}
	}
}
