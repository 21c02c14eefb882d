package proportions

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// refCheck is one check value copied into testdata/reference with its
// source and status (see testdata/reference/README.md).
type refCheck struct {
	ID       string         `json:"id"`
	Source   string         `json:"source"`
	Status   string         `json:"status"`
	Method   string         `json:"method"`
	Quantity string         `json:"quantity"`
	Data     map[string]any `json:"data"`
	Level    float64        `json:"level"`
	Lower    float64        `json:"lower"`
	Upper    float64        `json:"upper"`
	// LowerFull and UpperFull are independent double-precision
	// recomputations (cross-implementation checks only).
	LowerFull float64     `json:"lower_full"`
	UpperFull float64     `json:"upper_full"`
	Value     json.Number `json:"value"`
	ValueFull json.Number `json:"value_full"`
	LogValue  float64     `json:"log_value"`
	Statistic float64     `json:"statistic"`
	PTwoSided float64     `json:"p_two_sided"`
	DF        int         `json:"df"`
	Note      string      `json:"note"`
}

func loadReference(t *testing.T, file string) []refCheck {
	t.Helper()
	b, err := os.ReadFile(filepath.Join("..", "testdata", "reference", file))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Checks []refCheck `json:"checks"`
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatalf("%s: %v", file, err)
	}
	return doc.Checks
}

// hard reports whether a value's status allows a hard check at its printed
// precision (verified-page, memory-recomputed) for both limits.
func (r refCheck) hard() bool {
	return r.Status == "verified-page" || r.Status == "memory-recomputed"
}

// hardLower and hardUpper report the same for one limit: the status
// "memory-recomputed (lower only); upper recomputed" allows a hard check
// of the lower limit only.
func (r refCheck) hardLower() bool {
	return r.hard() || strings.HasPrefix(r.Status, "memory-recomputed (lower only)")
}

func (r refCheck) hardUpper() bool { return r.hard() }

func (r refCheck) int(t *testing.T, key string) int64 {
	t.Helper()
	v, ok := r.Data[key].(float64)
	if !ok {
		t.Fatalf("%s: data field %q missing", r.ID, key)
	}
	return int64(v)
}

func (r refCheck) float(t *testing.T, key string) float64 {
	t.Helper()
	v, ok := r.Data[key].(float64)
	if !ok {
		t.Fatalf("%s: data field %q missing", r.ID, key)
	}
	return v
}

func (r refCheck) counts(t *testing.T) Counts {
	return Counts{X1: r.int(t, "x1"), N1: r.int(t, "n1"), X2: r.int(t, "x2"), N2: r.int(t, "n2")}
}

func number(t *testing.T, n json.Number) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(string(n), 64)
	if err != nil {
		t.Fatalf("number %q: %v", n, err)
	}
	return v
}

// methodNumber is the leading method number of Newcombe's tables ("10 hybrid ...").
func (r refCheck) methodNumber() string {
	num, _, _ := strings.Cut(r.Method, " ")
	return num
}

// printedTolerance is the tolerance for a 4-decimal printed value: half a
// unit in the last place, or 1e−4 where the exact value lies within 2e−6 of
// a rounding boundary (the shared reference README's rule).
func printedTolerance(printed, exact float64) float64 {
	frac := exact*1e4 - float64(int64(exact*1e4))
	if d := frac - 0.5; d < 0.02 && d > -0.02 {
		return 1e-4
	}
	return 5e-5
}

func jsonNumber(s string) json.Number { return json.Number(s) }
