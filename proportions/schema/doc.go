// Package schema documents the JSON that propscope's results write, as JSON
// Schemas (draft 2020-12) shipped with the library.
//
// Each result has its own schema, named after the result: [Analysis] for
// proportions.Analysis, [SampleSize] for planning.SampleSizeResult,
// [CoverageSurface] for operating.Surface, and so on (see the constants).
// The definitions they share (interval, test result, warning, plan,
// hypothesis, group, comparison, ...) live in the [Common] schema, which the
// others reference as "common.schema.json#/$defs/NAME" (the clustered
// analysis also references the [Analysis] schema for its unit-level
// analysis). The references are
// relative and the schemas carry no $id, so a validator resolves them
// against wherever the files are loaded from: a directory written from
// [FS], or any base URI under which a program registers every file by its
// [FileName].
//
// The conventions the schemas pin down:
//   - field names are snake_case and every field is described;
//   - an object has exactly the fields listed (additionalProperties is
//     false) and every field the library always writes is required, so a
//     new field that is not documented here fails the package's tests;
//   - a list is always an array, [] when empty, never null;
//   - an infinite number is the string "Infinity" or "-Infinity" (see
//     proportions.JSONFloat) and a value that is not defined, such as a
//     ratio 0/0, is null, only where the schema says so;
//   - enumerated strings (scale, alternative, scope, better, goal,
//     variance, warning codes, ...) list their values.
package schema
