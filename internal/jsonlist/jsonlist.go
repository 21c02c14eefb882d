// Package jsonlist keeps empty lists empty in JSON: a nil slice marshals as
// null, which a reader of a result's JSON must not have to tell apart from
// an empty list. Result types pass their list fields through NonNil before
// marshalling.
package jsonlist

// NonNil returns s, or an empty non-nil slice when s is nil.
func NonNil[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
}
