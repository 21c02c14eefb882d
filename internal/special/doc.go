// Package special holds the numerical kernels of propscope that speak no
// statistics of their own: the normal and one-degree-of-freedom chi-square
// tails and the normal quantile, the trigamma and tetragamma functions,
// the incomplete-beta quantile, the binomial and hypergeometric
// log-probabilities with their deviance terms (Loader's saddle-point form)
// and the hypergeometric tail sums, and log-space arithmetic. Every
// function works on plain float64 and int64 values and is allocation-free;
// the statistical methods in package proportions build on them. Its tests check each kernel against independent references.
package special
