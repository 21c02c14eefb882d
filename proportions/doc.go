// Package proportions is the numerical core of propscope: it compares two
// independent binomial proportions.
//
// Data come in as counts, a 2×2 table, records or CSV and become a
// [Comparison]: two labelled groups (events out of trials) and the name of the
// event. Published methods (intervals for the difference, the ratio and the
// odds ratio; intervals for one group's proportion; tests) are named values
// in one registry (see registry.go), so every table, card, chart and coverage
// map iterates over the same list.
//
// Conventions used throughout:
//   - Group 1 is the first group (x1 events out of n1 trials), group 2 the
//     second; the difference is π1 − π2, the ratio π1/π2, the odds ratio
//     π1(1−π2) / (π2(1−π1)).
//   - A level is the two-sided confidence level in [MinLevel, MaxLevel]
//     (10⁻⁶ to 1 − 10⁻¹², where every method is correct), 0.95 by default;
//     z is the standard normal quantile at (1 + level)/2, computed to full
//     double precision (z = 1.959963984540054 at 0.95, not 1.96).
//   - Results are plain structs with stable JSON field names and a String
//     method. Nothing in this package renders HTML.
//   - Bad input is an error value that wraps one of the sentinel errors in
//     errors.go, so callers can test it with errors.Is.
package proportions
