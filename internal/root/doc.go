// Package root finds roots of monotone or bracketed functions of one real
// variable: a crossing search on a logarithmic scale, Brent's method and a
// bracketed Halley iteration. The interval and test inversions of package
// proportions build on them.
package root
