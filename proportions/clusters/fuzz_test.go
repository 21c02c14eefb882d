package clusters

import (
	"encoding/json"
	"math"
	"regexp"
	"testing"

	"github.com/propscope/propscope/proportions"
)

// FuzzAnalyze builds two groups of clusters from fuzzed counts: Analyze
// either refuses them with an error or returns finite numbers whose JSON
// holds no NaN, and never panics.
func FuzzAnalyze(f *testing.F) {
	f.Add([]byte{3, 10, 5, 10, 1, 10, 2, 10}, uint8(2))
	f.Add([]byte{1, 1, 0, 1, 1, 1, 0, 1}, uint8(2))
	f.Add([]byte{0, 5, 0, 5, 0, 5, 0, 5, 0, 5}, uint8(3))
	f.Add([]byte{255, 255, 0, 255, 255, 255, 1, 200}, uint8(1))
	f.Fuzz(func(t *testing.T, raw []byte, split uint8) {
		var all []Cluster
		for i := 0; i+1 < len(raw) && len(all) < 64; i += 2 {
			n := int64(raw[i+1])
			all = append(all, Cluster{Value: string(rune('a' + len(all))), Events: min(int64(raw[i]), n), Trials: n})
		}
		k := int(split)
		if k > len(all) {
			k = len(all)
		}
		d, err := New("tray", proportions.Labels{}, all[:k], all[k:])
		if err != nil {
			return
		}
		a, err := Analyze(d)
		if err != nil {
			return
		}
		for _, v := range []float64{a.Correlation.Estimate, a.Correlation.Lower, a.Correlation.Upper, a.DesignEffects[0].Value,
			a.DesignEffects[1].EffectiveSize, a.Interval.RawLower, a.Interval.RawUpper, a.Test.PValue, a.ClusterLevel.RawUpper} {
			if math.IsNaN(v) {
				t.Fatalf("NaN in %v", a)
			}
		}
		b, err := json.Marshal(a)
		if err != nil {
			t.Fatal(err)
		}
		if regexp.MustCompile(`NaN`).Match(b) {
			t.Fatalf("NaN in JSON %s", b)
		}
	})
}

// Keys follow the registry's rule (lower-case words with hyphens, tests
// ending in -test), differ from every unit-level key, and names are unique.
func TestRegistryNaming(t *testing.T) {
	key := regexp.MustCompile(`^[a-z0-9]+(-[a-z0-9]+)*$`)
	seen := map[string]bool{}
	check := func(k, name string, test bool) {
		if !key.MatchString(k) || (regexp.MustCompile(`-test$`).MatchString(k) != test) || seen[k] || seen[name] {
			t.Errorf("key %q / name %q", k, name)
		}
		if _, err := proportions.LookupInterval(k); err == nil {
			t.Errorf("key %q is also a unit-level interval", k)
		}
		if _, err := proportions.LookupTest(k); err == nil {
			t.Errorf("key %q is also a unit-level test", k)
		}
		seen[k], seen[name] = true, true
	}
	for _, m := range IntervalMethods() {
		check(m.Key, m.Name, false)
		if got, err := LookupInterval(m.Key); err != nil || got.Name != m.Name {
			t.Errorf("LookupInterval(%q): %v", m.Key, err)
		}
	}
	for _, m := range Tests() {
		check(m.Key, m.Name, true)
		if got, err := LookupTest(m.Key); err != nil || got.Name != m.Name {
			t.Errorf("LookupTest(%q): %v", m.Key, err)
		}
	}
	if _, err := LookupTest("nope"); err == nil {
		t.Error("unknown key found")
	}
}
