package operating

import (
	"encoding/json"

	"github.com/propscope/propscope/internal/jsonlist"
)

// The operating results write every list as an array, [] when empty, even
// for a result built by hand: a reader of the JSON (and its schema in
// package proportions/schema) then never has to tell null from an empty
// list. Each method marshals the type without its methods (type plain), so
// every other field is written exactly as before. The receivers are values,
// not pointers, so that a result held by value is written the same way.
// (Surface keeps its own MarshalJSON, in surface.go.)

// MarshalJSON writes the slice with its points as an array.
func (s Slice) MarshalJSON() ([]byte, error) {
	type plain Slice
	p := plain(s)
	p.Points = jsonlist.NonNil(p.Points)
	return json.Marshal(p)
}

// MarshalJSON writes the curve with its points as an array.
func (s TypeIErrorCurve) MarshalJSON() ([]byte, error) {
	type plain TypeIErrorCurve
	p := plain(s)
	p.Points = jsonlist.NonNil(p.Points)
	return json.Marshal(p)
}

// MarshalJSON writes the recommendation with its ranking and its skipped
// methods as arrays ("skipped" is [] when no method was left out).
func (r Recommendation) MarshalJSON() ([]byte, error) {
	type plain Recommendation
	p := plain(r)
	p.Ranking = jsonlist.NonNil(p.Ranking)
	p.Skipped = jsonlist.NonNil(p.Skipped)
	return json.Marshal(p)
}

// MarshalJSON writes the decision with its hypotheses as an array.
func (d Decision) MarshalJSON() ([]byte, error) {
	type plain Decision
	p := plain(d)
	p.Hypotheses = jsonlist.NonNil(p.Hypotheses)
	return json.Marshal(p)
}
