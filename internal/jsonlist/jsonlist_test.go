package jsonlist

import (
	"encoding/json"
	"testing"
)

// TestNonNil checks the promise of the package against encoding/json
// itself: a nil slice passed through NonNil marshals as [] (a bare nil
// slice marshals as null, which the first check confirms so the test
// would notice if that ever changed), and a non-nil slice, empty or not,
// comes back as the very same slice (same backing array, same length),
// not a copy.
func TestNonNil(t *testing.T) {
	var none []int
	if raw, _ := json.Marshal(none); string(raw) != "null" {
		t.Fatalf("encoding/json marshals a nil slice as %s; the package's premise is null", raw)
	}
	if raw, err := json.Marshal(NonNil(none)); err != nil || string(raw) != "[]" {
		t.Errorf("NonNil(nil) marshals as %s (%v), want []", raw, err)
	}
	if got := NonNil[string](nil); got == nil || len(got) != 0 {
		t.Errorf("NonNil[string](nil) = %#v, want an empty non-nil slice", got)
	}

	type row struct {
		Items []float64 `json:"items"`
	}
	if raw, _ := json.Marshal(row{Items: NonNil[float64](nil)}); string(raw) != `{"items":[]}` {
		t.Errorf("a nil list field through NonNil marshals as %s, want {\"items\":[]}", raw)
	}

	full := []int{3, 1, 4}
	if got := NonNil(full); len(got) != 3 || &got[0] != &full[0] {
		t.Errorf("NonNil(%v) = %v, want the same slice", full, got)
	}
	empty := make([]int, 0, 4)
	if got := NonNil(empty); got == nil || len(got) != 0 || cap(got) != 4 {
		t.Errorf("NonNil(empty, cap 4) = %#v (cap %d), want it unchanged", got, cap(got))
	}
}
