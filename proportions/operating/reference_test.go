package operating

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
)

// referenceCheck is one entry of testdata/reference/coverage.json. Each
// entry carries its source and status: "reference-library" values come from
// SciPy/NumPy (a general-purpose reference library) and are hard checks;
// "recomputed" values are independent recomputations, not published
// numbers, and serve as cross-implementation checks only.
type referenceCheck struct {
	ID       string   `json:"id"`
	Source   string   `json:"source"`
	Status   string   `json:"status"`
	Method   string   `json:"method"`
	Level    float64  `json:"level"`
	N1       int      `json:"n1"`
	N2       int      `json:"n2"`
	Pi1      *float64 `json:"pi1"`
	Pi2      *float64 `json:"pi2"`
	Quantity string   `json:"quantity"`
	Value    float64  `json:"value"`
}

func loadReference(t *testing.T) []referenceCheck {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "..", "testdata", "reference", "coverage.json"))
	if err != nil {
		t.Fatal(err)
	}
	var f struct {
		Checks []referenceCheck `json:"checks"`
	}
	if err := json.Unmarshal(b, &f); err != nil {
		t.Fatal(err)
	}
	if len(f.Checks) == 0 {
		t.Fatal("no reference checks")
	}
	return f.Checks
}
