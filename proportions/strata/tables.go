package strata

import "github.com/propscope/propscope/proportions"

// table is one usable stratum as the formulas write it: a events of n1 in
// the first group, c of n2 in the second, b = n1 − a and d = n2 − c, n the
// stratum's size and m1, m0 its events and non-events.
type table struct {
	a, b, c, d float64
	n1, n2, n  float64
	m1, m0     float64
	counts     proportions.Counts
	value      string
}

func newTable(value string, k proportions.Counts) table {
	a, c := float64(k.X1), float64(k.X2)
	n1, n2 := float64(k.N1), float64(k.N2)
	return table{
		a: a, b: n1 - a, c: c, d: n2 - c,
		n1: n1, n2: n2, n: n1 + n2,
		m1: a + c, m0: n1 + n2 - a - c,
		counts: k, value: value,
	}
}

// weight is the Cochran–Mantel–Haenszel weight of the stratum on the
// difference scale, n1·n2/n.
func (t table) weight() float64 { return t.n1 * t.n2 / t.n }

// difference is the stratum's p1 − p2.
func (t table) difference() float64 { return t.a/t.n1 - t.c/t.n2 }

// usable returns the rows of b that have trials in both groups, as tables;
// the others are reported by the analysis, never used by a method.
func usable(b proportions.Breakdown) []table {
	out := make([]table, 0, len(b.Rows))
	for _, r := range b.Rows {
		if !r.Empty() {
			out = append(out, newTable(r.Value, r.Counts))
		}
	}
	return out
}

// sum returns Σ f(t) over the tables.
func sum(ts []table, f func(t table) float64) float64 {
	s := 0.0
	for _, t := range ts {
		s += f(t)
	}
	return s
}
