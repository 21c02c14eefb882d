// Package proportions compares two independent binomial proportions: the
// data in, the registry of published methods, the tests, and Analyze with
// its result and plain-language conclusion.
//
// Where to start:
//
//	c, err := proportions.NewComparison(41, 50, 33, 50, proportions.Labels{
//		First: "coated", Second: "bare", Event: "germinated"})
//	// or FromTable, FromRecords, ReadCSV (one row per unit)
//	a, err := proportions.Analyze(c)            // estimates, intervals, tests, warnings
//	a, err = proportions.Analyze(c, proportions.WithScope(proportions.ScopeAll))
//	fmt.Println(a)                              // text; json.Marshal(a) for JSON
//	card := notebookui.NewResultCard(a)         // the notebook's result card
//
// Every published method is one named value in the registry (an
// [IntervalMethod], [RateMethod] or [TestMethod]); [IntervalMethods],
// [RateMethods] and [Tests] list them and every table, card, chart and
// coverage map iterates over those lists. Study planning is in the
// subpackage planning; the exact coverage, type I error and power of a
// method for a design is in the subpackage operating. GLOSSARY.md at the
// repository's top spells every term in Go, JSON and on screen.
//
// Conventions:
//   - Group 1 is (x1 events of n1 trials), group 2 (x2 of n2); the
//     difference is π1 − π2, the ratio π1/π2, the odds ratio
//     π1(1−π2)/(π2(1−π1)).
//   - A level is the two-sided confidence level in [MinLevel, MaxLevel]
//     (10⁻⁶ to 1 − 10⁻¹², where every method is correct), 0.95 by default;
//     z is the normal quantile at (1 + level)/2 to full precision
//     (1.959963984540054 at 0.95, not 1.96).
//   - Options are passed as ...Option (WithLevel, WithNull, WithAlternative,
//     WithScope, WithYatesTest); each function says which it reads.
//   - Results are plain structs with a String method and stable snake_case
//     JSON (schemas in the subpackage schema); nothing here renders HTML.
//   - Bad input is an error wrapping a sentinel of errors.go (errors.Is).
package proportions
