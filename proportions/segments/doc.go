// Package segments analyses a breakdown one segment at a time: each row
// (a plant, a region, a customer group) gets the headline interval and
// test of proportions.Analyze, and because many segments are tested at
// once their p-values are adjusted for multiplicity (Holm, Hochberg,
// Benjamini–Hochberg, Benjamini–Yekutieli or Bonferroni) and each segment
// gets a simultaneous interval at the Bonferroni level.
//
// Every output states the number of segments, how many entered the
// adjustment (m: the segments with trials in both groups) and the
// adjustment used. A segment with an empty group is kept and flagged,
// never dropped, and is left out of the adjustment with a note; a sparse
// segment (smallest expected count below 5, or a group with fewer trials
// than the minimum) is analysed and flagged.
//
// Two ways in:
//   - [Analyze] takes a proportions.Breakdown in memory and returns a
//     [Result] with every segment and every adjusted value.
//   - [Stream] reads rows from a [Source] and writes the per-segment
//     results as JSON Lines and CSV while it reads (first pass), then the
//     adjusted p-values and simultaneous intervals (second pass, reading
//     the rows again). Memory is flat in the number of segments except for
//     what the adjustment cannot do without: the p-values. See Stream for
//     the design and its figures.
//
// Both use all cores, and both produce the same records: a line of the
// per-segment stream is the JSON of the matching Result.Segments entry,
// and a line of the adjusted stream that of Result.Adjusted.
package segments
