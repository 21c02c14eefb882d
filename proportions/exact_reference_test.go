package proportions

import (
	"encoding/json"
	"math"
	"math/big"
	"os"
	"path/filepath"
	"testing"
)

// exactCheck is one entry of testdata/reference/exact.json: a p-value with
// its source and status (see that file's status_legend).
type exactCheck struct {
	ID            string  `json:"id"`
	Test          string  `json:"test"`
	Alternative   string  `json:"alternative"`
	X1            int64   `json:"x1"`
	N1            int64   `json:"n1"`
	X2            int64   `json:"x2"`
	N2            int64   `json:"n2"`
	P             float64 `json:"p"`
	Exact         string  `json:"exact"`
	Tolerance     float64 `json:"tolerance"`
	ToleranceKind string  `json:"tolerance_kind"`
	Status        string  `json:"status"`
	Source        string  `json:"source"`
}

func (c exactCheck) counts() Counts { return Counts{X1: c.X1, N1: c.N1, X2: c.X2, N2: c.N2} }

func (c exactCheck) alternative(t *testing.T) Alternative {
	var a Alternative
	if err := a.UnmarshalJSON([]byte(`"` + c.Alternative + `"`)); err != nil {
		t.Fatal(err)
	}
	return a
}

// within reports whether got matches the check at its stated tolerance.
func (c exactCheck) within(got float64) bool {
	if c.ToleranceKind == "relative" {
		return math.Abs(got-c.P) <= c.Tolerance*math.Abs(c.P)
	}
	return math.Abs(got-c.P) <= c.Tolerance
}

func loadExactChecks(t *testing.T) []exactCheck {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "testdata", "reference", "exact.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Checks []exactCheck `json:"checks"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	return doc.Checks
}

// ratFloat parses a fraction such as "17/70".
func ratFloat(t *testing.T, s string) float64 {
	r, ok := new(big.Rat).SetString(s)
	if !ok {
		t.Fatalf("bad fraction %q", s)
	}
	f, _ := r.Float64()
	return f
}
