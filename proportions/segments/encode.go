package segments

import (
	"encoding/json"
	"math"
	"strconv"
	"unicode/utf8"

	"github.com/propscope/propscope/internal/jsonlist"
	"github.com/propscope/propscope/proportions"
)

// The records are encoded by hand, not with encoding/json's reflection:
// at a million segments the encoder is most of the stream's time. The
// same functions write Result's JSON and the streams' lines, so the two
// are equal byte for byte.

// segmentColumns and adjustedColumns are the CSV headers: the JSON field
// names, with the counts spread over four columns.
var (
	segmentColumns = []string{"number", "value", "x1", "n1", "x2", "n2", "empty", "sparse", "smallest_expected",
		"rate1", "rate2", "difference", "lower", "upper", "statistic", "p_value", "reject"}
	adjustedColumns = []string{"number", "value", "adjustment", "tested", "adjusted_p_value", "simultaneous_lower", "simultaneous_upper", "reject"}
)

// numberTexts holds the numbers of one record formatted once (shortest
// decimal form, exact on reading back), for its JSON line and its CSV
// record alike: formatting is most of the encoders' time.
type numberTexts struct {
	buf  []byte
	ends [8]int
	kind [8]uint8 // a number, or one of the values below
	n    int
}

const (
	finite uint8 = iota
	notANumber
	plusInf
	minusInf
)

func (t *numberTexts) reset() { t.buf, t.n = t.buf[:0], 0 }

func (t *numberTexts) add(v float64) {
	switch {
	case math.IsNaN(v):
		t.kind[t.n] = notANumber
	case math.IsInf(v, 1):
		t.kind[t.n] = plusInf
	case math.IsInf(v, -1):
		t.kind[t.n] = minusInf
	default:
		t.kind[t.n] = finite
		t.buf = strconv.AppendFloat(t.buf, v, 'g', -1, 64)
	}
	t.ends[t.n] = len(t.buf)
	t.n++
}

func (t *numberTexts) text(i int) []byte {
	start := 0
	if i > 0 {
		start = t.ends[i-1]
	}
	return t.buf[start:t.ends[i]]
}

// appendJSON writes number i, NaN as null and infinities as the strings
// "Infinity" and "-Infinity", as proportions.JSONFloat does.
func (t *numberTexts) appendJSON(b []byte, i int) []byte {
	switch t.kind[i] {
	case notANumber:
		return append(b, "null"...)
	case plusInf:
		return append(b, `"Infinity"`...)
	case minusInf:
		return append(b, `"-Infinity"`...)
	}
	return append(b, t.text(i)...)
}

// appendCSV writes number i, NaN as an empty cell.
func (t *numberTexts) appendCSV(b []byte, i int) []byte {
	switch t.kind[i] {
	case notANumber:
		return b
	case plusInf:
		return append(b, "Infinity"...)
	case minusInf:
		return append(b, "-Infinity"...)
	}
	return append(b, t.text(i)...)
}

// numbers formats the segment's numbers in the order of both outputs.
func (s Segment) numbers(t *numberTexts) {
	t.reset()
	for _, v := range [...]float64{s.SmallestExpected, s.Rate1, s.Rate2, s.Difference, s.Lower, s.Upper, s.Statistic, s.PValue} {
		t.add(v)
	}
}

var segmentNumberKeys = [...]string{`,"smallest_expected":`, `,"rate1":`, `,"rate2":`, `,"difference":`, `,"lower":`, `,"upper":`,
	`,"statistic":`, `,"p_value":`}

// appendJSON appends the segment as one JSON object, its numbers from t
// (filled by numbers).
func (s Segment) appendJSON(b []byte, t *numberTexts) []byte {
	b = append(b, `{"number":`...)
	b = strconv.AppendInt(b, int64(s.Number), 10)
	b = append(b, `,"value":`...)
	b = appendJSONString(b, s.Value)
	b = append(b, `,"counts":{"x1":`...)
	b = strconv.AppendInt(b, s.Counts.X1, 10)
	b = append(b, `,"n1":`...)
	b = strconv.AppendInt(b, s.Counts.N1, 10)
	b = append(b, `,"x2":`...)
	b = strconv.AppendInt(b, s.Counts.X2, 10)
	b = append(b, `,"n2":`...)
	b = strconv.AppendInt(b, s.Counts.N2, 10)
	b = append(b, `},"empty":`...)
	b = strconv.AppendBool(b, s.Empty)
	b = append(b, `,"sparse":`...)
	b = strconv.AppendBool(b, s.Sparse)
	for i, key := range segmentNumberKeys {
		b = append(b, key...)
		b = t.appendJSON(b, i)
	}
	b = append(b, `,"reject":`...)
	b = strconv.AppendBool(b, s.Reject)
	return append(b, '}')
}

// appendCSV appends the segment as one CSV record with its line end, its
// numbers from t.
func (s Segment) appendCSV(b []byte, t *numberTexts) []byte {
	b = strconv.AppendInt(b, int64(s.Number), 10)
	b = append(b, ',')
	b = appendCSVText(b, s.Value)
	for _, n := range [...]int64{s.Counts.X1, s.Counts.N1, s.Counts.X2, s.Counts.N2} {
		b = append(b, ',')
		b = strconv.AppendInt(b, n, 10)
	}
	b = append(b, ',')
	b = strconv.AppendBool(b, s.Empty)
	b = append(b, ',')
	b = strconv.AppendBool(b, s.Sparse)
	for i := range segmentNumberKeys {
		b = append(b, ',')
		b = t.appendCSV(b, i)
	}
	b = append(b, ',')
	b = strconv.AppendBool(b, s.Reject)
	return append(b, '\n')
}

// numbers formats the adjusted record's numbers in the order of both
// outputs.
func (a Adjusted) numbers(t *numberTexts) {
	t.reset()
	for _, v := range [...]float64{a.AdjustedPValue, a.SimultaneousLower, a.SimultaneousUpper} {
		t.add(v)
	}
}

var adjustedNumberKeys = [...]string{`,"adjusted_p_value":`, `,"simultaneous_lower":`, `,"simultaneous_upper":`}

// appendJSON appends the adjusted record as one JSON object, its numbers
// from t.
func (a Adjusted) appendJSON(b []byte, t *numberTexts) []byte {
	b = append(b, `{"number":`...)
	b = strconv.AppendInt(b, int64(a.Number), 10)
	b = append(b, `,"value":`...)
	b = appendJSONString(b, a.Value)
	b = append(b, `,"adjustment":"`...)
	b = append(b, a.Adjustment.String()...)
	b = append(b, `","tested":`...)
	b = strconv.AppendInt(b, int64(a.Tested), 10)
	for i, key := range adjustedNumberKeys {
		b = append(b, key...)
		b = t.appendJSON(b, i)
	}
	b = append(b, `,"reject":`...)
	b = strconv.AppendBool(b, a.Reject)
	return append(b, '}')
}

// appendCSV appends the adjusted record as one CSV record with its line
// end, its numbers from t.
func (a Adjusted) appendCSV(b []byte, t *numberTexts) []byte {
	b = strconv.AppendInt(b, int64(a.Number), 10)
	b = append(b, ',')
	b = appendCSVText(b, a.Value)
	b = append(b, ',')
	b = append(b, a.Adjustment.String()...)
	b = append(b, ',')
	b = strconv.AppendInt(b, int64(a.Tested), 10)
	for i := range adjustedNumberKeys {
		b = append(b, ',')
		b = t.appendCSV(b, i)
	}
	b = append(b, ',')
	b = strconv.AppendBool(b, a.Reject)
	return append(b, '\n')
}

// MarshalJSON writes the segment; numbers it does not have are null.
func (s Segment) MarshalJSON() ([]byte, error) {
	var t numberTexts
	s.numbers(&t)
	return s.appendJSON(nil, &t), nil
}

// MarshalJSON writes the adjusted record; numbers it does not have are null.
func (a Adjusted) MarshalJSON() ([]byte, error) {
	var t numberTexts
	a.numbers(&t)
	return a.appendJSON(nil, &t), nil
}

// MarshalJSON writes the summary with notes as a list, never null, and a
// simultaneous level that does not exist as null.
func (s Summary) MarshalJSON() ([]byte, error) {
	type plain Summary // without this method
	p := struct {
		plain
		SimultaneousLevel proportions.JSONFloat `json:"simultaneous_level"`
	}{plain: plain(s), SimultaneousLevel: proportions.JSONFloat(s.SimultaneousLevel)}
	p.Notes = jsonlist.NonNil(p.Notes)
	return json.Marshal(p)
}

// MarshalJSON writes the summary's fields, then "segments" and "adjusted",
// each record as the streams write it.
func (r Result) MarshalJSON() ([]byte, error) {
	head, err := r.Summary.MarshalJSON()
	if err != nil {
		return nil, err
	}
	var t numberTexts
	b := append(head[:len(head)-1], `,"segments":[`...)
	for i, s := range r.Segments {
		if i > 0 {
			b = append(b, ',')
		}
		s.numbers(&t)
		b = s.appendJSON(b, &t)
	}
	b = append(b, `],"adjusted":[`...)
	for i, a := range r.Adjusted {
		if i > 0 {
			b = append(b, ',')
		}
		a.numbers(&t)
		b = a.appendJSON(b, &t)
	}
	return append(b, "]}"...), nil
}

const hexDigits = "0123456789abcdef"

// appendJSONString appends s as a JSON string. Like encoding/json it
// escapes <, > and & (so a line pasted into HTML cannot open a tag), the
// line separators U+2028 and U+2029, and replaces invalid UTF-8 with
// U+FFFD.
func appendJSONString(b []byte, s string) []byte {
	b = append(b, '"')
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			switch {
			case c == '"' || c == '\\':
				b = append(b, '\\', c)
			case c == '\n':
				b = append(b, `\n`...)
			case c == '\r':
				b = append(b, `\r`...)
			case c == '\t':
				b = append(b, `\t`...)
			case c == '\b':
				b = append(b, `\b`...)
			case c == '\f':
				b = append(b, `\f`...)
			case c < 0x20 || c == '<' || c == '>' || c == '&':
				b = append(b, '\\', 'u', '0', '0', hexDigits[c>>4], hexDigits[c&0xf])
			default:
				b = append(b, c)
			}
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			b = append(b, `\ufffd`...)
		case r == '\u2028' || r == '\u2029':
			b = append(b, `\u202`...)
			b = append(b, hexDigits[r&0xf])
		default:
			b = append(b, s[i:i+size]...)
		}
		i += size
	}
	return append(b, '"')
}

// appendCSVText appends user text as one CSV field. A spreadsheet would
// run a cell that starts with =, +, -, @, a tab or a carriage return as a
// formula, so such text gets a leading apostrophe (which spreadsheets
// hide and treat as "this is text"); a field holding a comma, a quote or
// a line break, or starting or ending with a space, is quoted with its
// quotes doubled (RFC 4180).
func appendCSVText(b []byte, s string) []byte {
	if s != "" && (s[0] == '=' || s[0] == '+' || s[0] == '-' || s[0] == '@' || s[0] == '\t' || s[0] == '\r') {
		s = "'" + s
	}
	quote := s != "" && (s[0] == ' ' || s[len(s)-1] == ' ')
	for i := 0; i < len(s) && !quote; i++ {
		quote = s[i] == ',' || s[i] == '"' || s[i] == '\n' || s[i] == '\r'
	}
	if !quote {
		return append(b, s...)
	}
	b = append(b, '"')
	for i := 0; i < len(s); i++ {
		if s[i] == '"' {
			b = append(b, '"')
		}
		b = append(b, s[i])
	}
	return append(b, '"')
}

// appendCSVHeader appends a header record.
func appendCSVHeader(b []byte, columns []string) []byte {
	for i, c := range columns {
		if i > 0 {
			b = append(b, ',')
		}
		b = append(b, c...)
	}
	return append(b, '\n')
}

// segmentJSON is Segment with the numbers that may be null or infinite
// read through proportions.JSONFloat.
type segmentJSON struct {
	Number           int                   `json:"number"`
	Value            string                `json:"value"`
	Counts           proportions.Counts    `json:"counts"`
	Empty            bool                  `json:"empty"`
	Sparse           bool                  `json:"sparse"`
	SmallestExpected proportions.JSONFloat `json:"smallest_expected"`
	Rate1            proportions.JSONFloat `json:"rate1"`
	Rate2            proportions.JSONFloat `json:"rate2"`
	Difference       proportions.JSONFloat `json:"difference"`
	Lower            proportions.JSONFloat `json:"lower"`
	Upper            proportions.JSONFloat `json:"upper"`
	Statistic        proportions.JSONFloat `json:"statistic"`
	PValue           proportions.JSONFloat `json:"p_value"`
	Reject           bool                  `json:"reject"`
}

// UnmarshalJSON reads what MarshalJSON writes (a line of the segment
// stream): null is NaN, "Infinity" and "-Infinity" are infinite.
func (s *Segment) UnmarshalJSON(b []byte) error {
	v := segmentJSON{SmallestExpected: nan(), Rate1: nan(), Rate2: nan(), Difference: nan(), Lower: nan(), Upper: nan(),
		Statistic: nan(), PValue: nan()}
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	*s = Segment{Number: v.Number, Value: v.Value, Counts: v.Counts, Empty: v.Empty, Sparse: v.Sparse,
		SmallestExpected: float64(v.SmallestExpected), Rate1: float64(v.Rate1), Rate2: float64(v.Rate2),
		Difference: float64(v.Difference), Lower: float64(v.Lower), Upper: float64(v.Upper),
		Statistic: float64(v.Statistic), PValue: float64(v.PValue), Reject: v.Reject}
	return nil
}

type adjustedJSON struct {
	Number            int                   `json:"number"`
	Value             string                `json:"value"`
	Adjustment        Adjustment            `json:"adjustment"`
	Tested            int                   `json:"tested"`
	AdjustedPValue    proportions.JSONFloat `json:"adjusted_p_value"`
	SimultaneousLower proportions.JSONFloat `json:"simultaneous_lower"`
	SimultaneousUpper proportions.JSONFloat `json:"simultaneous_upper"`
	Reject            bool                  `json:"reject"`
}

// UnmarshalJSON reads what MarshalJSON writes (a line of the adjusted
// stream): null is NaN.
func (a *Adjusted) UnmarshalJSON(b []byte) error {
	v := adjustedJSON{AdjustedPValue: nan(), SimultaneousLower: nan(), SimultaneousUpper: nan()}
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	*a = Adjusted{Number: v.Number, Value: v.Value, Adjustment: v.Adjustment, Tested: v.Tested,
		AdjustedPValue: float64(v.AdjustedPValue), SimultaneousLower: float64(v.SimultaneousLower),
		SimultaneousUpper: float64(v.SimultaneousUpper), Reject: v.Reject}
	return nil
}

func nan() proportions.JSONFloat { return proportions.JSONFloat(math.NaN()) }

// UnmarshalJSON reads what MarshalJSON writes: a null simultaneous level
// is NaN.
func (s *Summary) UnmarshalJSON(b []byte) error {
	type plain Summary // without this method
	v := struct {
		*plain
		SimultaneousLevel proportions.JSONFloat `json:"simultaneous_level"`
	}{plain: (*plain)(s), SimultaneousLevel: nan()}
	if err := json.Unmarshal(b, &v); err != nil {
		return err
	}
	s.SimultaneousLevel = float64(v.SimultaneousLevel)
	return nil
}
