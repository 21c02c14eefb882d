package planning

import (
	"encoding/json"

	"github.com/propscope/propscope/internal/jsonlist"
)

// The planning results write every list as an array, [] when empty, even
// for a result built by hand: a reader of the JSON (and its schema in
// package proportions/schema) then never has to tell null from an empty
// list. Each method marshals the type without its methods (type plain), so
// every other field is written exactly as before.

// MarshalJSON writes the result with its notes as an array.
func (r SampleSizeResult) MarshalJSON() ([]byte, error) {
	type plain SampleSizeResult
	p := plain(r)
	p.Notes = jsonlist.NonNil(p.Notes)
	return json.Marshal(p)
}

// MarshalJSON writes the result with its notes as an array.
func (r PowerResult) MarshalJSON() ([]byte, error) {
	type plain PowerResult
	p := plain(r)
	p.Notes = jsonlist.NonNil(p.Notes)
	return json.Marshal(p)
}

// MarshalJSON writes the curve with its points as an array.
func (c PowerCurve) MarshalJSON() ([]byte, error) {
	type plain PowerCurve
	p := plain(c)
	p.Points = jsonlist.NonNil(p.Points)
	return json.Marshal(p)
}

// MarshalJSON writes the result with its hypotheses and notes as arrays.
func (r ExactPowerResult) MarshalJSON() ([]byte, error) {
	type plain ExactPowerResult
	p := plain(r)
	p.Hypotheses = jsonlist.NonNil(p.Hypotheses)
	p.Notes = jsonlist.NonNil(p.Notes)
	return json.Marshal(p)
}

// MarshalJSON writes the result with its notes as an array; the asymptotic
// answer and the curve keep their lists through their own MarshalJSON.
func (r ExactSampleSizeResult) MarshalJSON() ([]byte, error) {
	type plain ExactSampleSizeResult
	p := plain(r)
	p.Notes = jsonlist.NonNil(p.Notes)
	return json.Marshal(p)
}
