// Package source reads breakdowns (proportions.Breakdown) from Parquet
// files and from any database/sql connection, for the stratified,
// per-segment and clustered analyses. It is a package of its own so that
// the core package proportions stays on the standard library: only
// programs that import source link the Parquet reader.
//
// Both readers stream: a Parquet file page by page of each column chunk,
// a database by one grouped query that returns counts per breakdown value
// and group, never the rows. Both follow a proportions.BreakdownSpec
// (layout, column names, outcome values, first group, SkipNulls) and count
// through a proportions.Tally, so they give the same breakdown, with the
// same checks and errors, as proportions.ReadBreakdownCSV on the same data.
package source
